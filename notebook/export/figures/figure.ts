/**
 * What a figure module declares, and what it is given to draw with. A figure is one module
 * in this folder exporting a {@linkcode FigureDef}, listed in `mod.ts`: its name (the value
 * of `figure:`), the keys of its own with what they mean, whether it needs a vertical
 * column, and `draw`, which turns the plotted rows and the cells its keys name into chart
 * layers (`../_chart.ts`). Validation of the common keys, thinning of rows and the axes'
 * titles and ticks are done once, in `../plot.ts`.
 *
 * @example
 * ```ts
 * import type { FigureDef } from "./figure.ts";
 * const dots: FigureDef = {
 *   name: "dots",
 *   summary: "one mark a row",
 *   vertical: true,
 *   keys: {},
 *   draw: (input) => ({ layers: [input.rowMarks("rows")] }),
 * };
 * dots.name; // "dots"
 * ```
 *
 * @module
 */

import type { Column } from "../../../cells/table.ts";
import type { AxisSpec, Layer, Legend } from "../_chart.ts";

/** What a figure is given. */
export interface FigureInput {
  /** The horizontal column (numeric). */
  readonly horizontal: Column;
  /** The vertical column, for figures that take one. */
  readonly vertical?: Column;
  /** The `colour-by` column, if any. */
  readonly colourBy?: Column;
  /** Horizontal values of the rows drawn (thinned to the point cap). */
  readonly xs: Float64Array;
  /** Vertical values of the rows drawn (empty without a vertical column). */
  readonly ys: Float64Array;
  /** Every row's horizontal value, unthinned (for counting). */
  readonly allXs: ArrayLike<number>;
  /** The value of a key, or undefined when not given. */
  option(key: string): string | undefined;
  /**
   * The JSON value of the cell a key names (`cell` or `cell.part`), or undefined when the key
   * is not given or the cell cannot be read (the problem is then reported).
   */
  cell(key: string): unknown;
  /**
   * The table column a key names (the key's value, else `fallback`, a column name), or
   * undefined when neither names a column of the plotted table (the problem is reported).
   */
  column(key: string, fallback?: string): Column | undefined;
  /** The plotted table's declared subject and eye columns, when its block names them. */
  readonly pairing?: { readonly subject?: string; readonly eye?: string };
  /** The name the key gives, as written (for labels). */
  cellName(key: string): string | undefined;
  /** Report a problem with the block, at a key's line when given. */
  problem(message: string, key?: string): void;
  /** The rows drawn as marks, coloured and shaped by `colour-by`, with their key. */
  rowMarks(part: string, options?: { size?: number; opacity?: number }): Layer;
  /** Series index of each drawn row (all 0 without a text `colour-by`). */
  readonly series?: Uint16Array;
  /** Series names, by index. */
  readonly seriesNames: readonly string[];
  /** Whether a logMAR vertical axis is drawn with better acuity up. */
  readonly betterUp: boolean;
}

/** What a figure draws. */
export interface FigureDrawing {
  /** Layers, in any order (the kit draws areas, bars, lines, marks, rules, rings). */
  readonly layers: readonly Layer[];
  /** Changes to the horizontal axis (title, kind, values to include). */
  readonly x?: Partial<AxisSpec>;
  /** Changes to the vertical axis. */
  readonly y?: Partial<AxisSpec>;
  /** A key other than the `colour-by` one. */
  readonly legend?: Legend;
  /** A sentence added to the caption. */
  readonly note?: string;
  /** Height in px (default 380). */
  readonly height?: number;
}

/** One figure a plot block can draw. */
export interface FigureDef {
  /** The value of `figure:`. */
  readonly name: string;
  /** What it shows, one line (for `lentil check`'s messages and the docs). */
  readonly summary: string;
  /** Whether it needs `vertical:`. */
  readonly vertical: boolean;
  /** Keys of its own, with what each means. */
  readonly keys: Readonly<Record<string, string>>;
  /** Draw it; undefined when a problem stops it (reported through `input.problem`). */
  draw(input: FigureInput): FigureDrawing | undefined;
}
