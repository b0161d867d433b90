/**
 * Plot blocks: what their keys mean, and their drawing to inline SVG on the server in
 * Lentil's own look (`_chart.ts`, no browser, no script in the page). Each figure is a
 * module in `figures/`.
 *
 * ````text
 * ```lentil plot focus
 * figure: curve
 * table: trials
 * horizontal: lens
 * vertical: va      # a logMAR column: better acuity (smaller logMAR) is drawn up
 * mark: ep          # a cell: its endpoint is marked
 * fitted: ep        # a cell: its fitted curve is drawn dashed
 * heading: Acuity through focus
 * ```
 * ````
 *
 * Figures:
 * - `curve`: a line through the rows in order of the horizontal column, with a dot on each;
 *   `mark` (a cell) marks a point or a power, `fitted` (a cell) draws the fitted curve it
 *   holds;
 * - `scatter`: one dot a row; `ellipse` (a cell) draws the outline it holds;
 * - `distribution`: how many rows fall in each of `classes` equal classes of the horizontal
 *   column;
 * - `agreement`: a difference plot, horizontal the mean of two methods and vertical their
 *   difference (columns the notebook computes); `limits` (a cell) draws the bias and the
 *   limits of agreement, else a line at zero.
 *
 * Every figure takes `heading`, `caption`, `horizontal-title`, `vertical-title` and
 * `colour-by` (a column that colours the dots). A logMAR vertical axis puts better acuity
 * (smaller logMAR) up; `better-up: no` draws it the other way. Plot values are read from
 * cells and columns; nothing is computed here.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { renderPlot } from "./plot.ts";
 * const nb = Notebook.fromText(
 *   "~~~lentil table t\nx | y\n1 | 2\n2 | 3\n~~~\n\n~~~lentil plot\nfigure: scatter\ntable: t\nhorizontal: x\nvertical: y\n~~~\n",
 *   "p.lentil.md",
 * );
 * const block = nb.doc.blocks.find((b) => b.kind === "plot")!;
 * renderPlot(block, nb).svg.startsWith("<svg"); // true
 * ```
 *
 * @module
 */

import { countText } from "../../lib/number_text.ts";
import type { Notebook } from "../engine/engine.ts";
import type { OptionDef, PlotBlock } from "../format/parse.ts";
import type { Diagnostic } from "../format/diagnostic.ts";
import { type Column, tableInfo } from "../../cells/table.ts";
import { type AxisSpec, chartSvg, type Layer, type Legend, rampColour } from "./_chart.ts";
import { axisKind, axisTitle, valueText } from "./_axes.ts";
import { FIGURES } from "./figures/mod.ts";
import type { FigureDef, FigureInput } from "./figures/figure.ts";

/** The figures a plot block can draw. */
export const PLOT_FIGURES: readonly string[] = FIGURES.map((f) => f.name);

/** A figure a plot block can draw. */
export type PlotFigure = string;

const COMMON_KEYS: Readonly<Record<string, string>> = {
  figure: `one of ${PLOT_FIGURES.join(", ")}`,
  table: "the table whose rows are plotted",
  horizontal: "column for the horizontal axis",
  vertical: `column for the vertical axis (for ${
    FIGURES.filter((f) => f.vertical).map((f) => f.name).join(", ")
  })`,
  heading: "heading above the plot",
  caption: "text below the plot",
  "horizontal-title": "title of the horizontal axis (default: the column in words and its unit)",
  "vertical-title": "title of the vertical axis (default: the column in words and its unit)",
  "colour-by": "column whose values colour and shape the marks",
  "better-up": "no to draw a logMAR vertical axis with smaller values down (default yes)",
};

/** The figures that take each figure-specific key. */
const KEY_FIGURES = new Map<string, string[]>();
for (const f of FIGURES) {
  for (const k of Object.keys(f.keys)) {
    if (k in COMMON_KEYS) continue;
    KEY_FIGURES.set(k, [...(KEY_FIGURES.get(k) ?? []), f.name]);
  }
}

/** Every key a plot block accepts, with what it means. */
export const PLOT_OPTIONS: Readonly<Record<string, string>> = {
  ...COMMON_KEYS,
  ...Object.fromEntries(
    FIGURES.flatMap((f) => Object.entries(f.keys)).filter(([k]) => !(k in COMMON_KEYS)),
  ),
};

/** Largest number of marks drawn; beyond it every k-th row is drawn and the caption says so. */
export const MAX_PLOT_POINTS = 4000;

/** A rendered plot block. */
export interface RenderedPlot {
  /** The block's name, or `plot-LINE`. */
  readonly name: string;
  /** Heading text (unescaped), if any. */
  readonly heading?: string;
  /** Caption text (unescaped), including a note when rows were thinned. */
  readonly caption?: string;
  /** The SVG markup; "" when the block has an error. */
  readonly svg: string;
  /** Problems with the block: with an error, no plot is drawn. */
  readonly problems: readonly Diagnostic[];
}

interface Ctx {
  readonly block: PlotBlock;
  readonly nb: Notebook;
  readonly problems: Diagnostic[];
}

function problem(ctx: Ctx, message: string, o?: OptionDef): void {
  ctx.problems.push({
    file: ctx.nb.doc.file,
    line: o?.line ?? ctx.block.line,
    col: o?.col ?? 1,
    message: `plot ${ctx.block.name ?? `at line ${ctx.block.line}`}: ${message}`,
    severity: "error",
  });
}

function opt(ctx: Ctx, key: string): string | undefined {
  const v = ctx.block.options[key]?.value;
  return v === undefined || v === "" ? undefined : v;
}

function columnOf(ctx: Ctx, columns: readonly Column[], key: string, numeric: boolean) {
  const name = opt(ctx, key);
  const o = ctx.block.options[key];
  if (!name) return undefined;
  const c = columns.find((col) => col.name === name);
  if (!c) {
    problem(
      ctx,
      `no column "${name}" for ${key} (columns: ${columns.map((k) => k.name).join(", ")})`,
      o,
    );
    return undefined;
  }
  if (numeric && !c.numeric) problem(ctx, `column "${name}" for ${key} is not numeric`, o);
  return c;
}

function cellJson(ctx: Ctx, key: string): unknown {
  const name = opt(ctx, key);
  if (!name) return undefined;
  const o = ctx.block.options[key];
  // `cell` or `cell.part.part`: a part of a record value (e.g. `loa.J0`).
  const [cellName, ...path] = name.split(".");
  const r = ctx.nb.result(cellName);
  if (!r || r.kind !== "cell") {
    problem(ctx, `no cell named "${cellName}" for ${key}`, o);
    return undefined;
  }
  if (r.error) {
    problem(ctx, `cell "${cellName}" for ${key} has an error: ${r.error.message}`, o);
    return undefined;
  }
  let v = ctx.nb.language.describe(r.value, ctx.nb.display).value;
  for (const [i, part] of path.entries()) {
    const next = v !== null && typeof v === "object"
      ? (v as Record<string, unknown>)[part]
      : undefined;
    if (next === undefined) {
      const at = [cellName, ...path.slice(0, i)].join(".");
      problem(ctx, `${key}: ${at} has no part "${part}"`, o);
      return undefined;
    }
    v = next;
  }
  return v;
}

function yes(ctx: Ctx, key: string, byDefault: boolean): boolean {
  const v = opt(ctx, key)?.toLowerCase();
  if (v === undefined) return byDefault;
  if (["yes", "true", "on"].includes(v)) return true;
  if (!["no", "false", "off"].includes(v)) {
    problem(ctx, `${key}: expected yes or no, got "${v}"`, ctx.block.options[key]);
    return byDefault;
  }
  return false;
}

/** The axis a column gets: its title in words with the unit, and ticks by its measure. */
function axisOf(ctx: Ctx, which: "horizontal" | "vertical", c: Column | undefined): AxisSpec {
  const title = opt(ctx, `${which}-title`) ?? (c ? axisTitle(c.name, c.unit) : "");
  return { title, kind: axisKind(c?.unit) };
}

/**
 * What a plot block's drawing depends on: its keys, and the very columns and cell values it
 * reads. Two lists that are equal item by item (`===`) draw the same figure, so a live page
 * redraws a plot only when one of them changed.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { plotDependencies } from "./plot.ts";
 * const nb = Notebook.fromText(
 *   "~~~lentil table t\nx | y\n1 | 2\n2 | 3\n~~~\n\n~~~lentil plot\nfigure: scatter\ntable: t\nhorizontal: x\nvertical: y\n~~~\n",
 *   "p.lentil.md",
 * );
 * const block = nb.doc.blocks.find((b) => b.kind === "plot")!;
 * plotDependencies(block, nb).length > 0; // true
 * ```
 */
export function plotDependencies(block: PlotBlock, nb: Notebook): unknown[] {
  const keys = Object.entries(block.options).map(([k, o]) => `${k}:${o.value}`).join("\n");
  const deps: unknown[] = [keys, JSON.stringify(nb.display)];
  const tableName = block.options.table?.value;
  const tr = tableName ? nb.result(tableName) : undefined;
  deps.push(tr?.value, tr?.error);
  const info = tr && !tr.error ? tableInfo(tr.value) : undefined;
  for (const key of ["horizontal", "vertical", "colour-by"]) {
    const name = block.options[key]?.value;
    deps.push(name ? info?.columns.find((c) => c.name === name) : undefined);
  }
  for (const key of KEY_FIGURES.keys()) {
    const name = block.options[key]?.value?.split(".")[0];
    const r = name ? nb.result(name) : undefined;
    deps.push(r?.value, r?.error);
  }
  return deps;
}

/**
 * The problems of a plot block without drawing it: unknown keys, a missing table, column or
 * cell, a figure that does not exist.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { plotProblems } from "./plot.ts";
 * const nb = Notebook.fromText("~~~lentil plot\nfigure: pie\n~~~\n", "p.lentil.md");
 * plotProblems(nb.doc.blocks[0] as never, nb)[0].message.includes("figure"); // true
 * ```
 */
export function plotProblems(block: PlotBlock, nb: Notebook): Diagnostic[] {
  return [...renderPlot(block, nb).problems];
}

/**
 * Render one plot block to SVG markup. User text (headings, titles, values) reaches the SVG
 * only as escaped text.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { renderPlot } from "./plot.ts";
 * const nb = Notebook.fromText(
 *   "~~~lentil table t\nv [D]\n1\n2\n2\n~~~\n\n~~~lentil plot h\nfigure: distribution\ntable: t\nhorizontal: v\n~~~\n",
 *   "h.lentil.md",
 * );
 * const block = nb.doc.blocks.find((b) => b.kind === "plot")!;
 * renderPlot(block, nb).problems.length; // 0
 * ```
 */
export function renderPlot(block: PlotBlock, nb: Notebook): RenderedPlot {
  const ctx: Ctx = { block, nb, problems: [] };
  const name = block.name ?? `plot-${block.line}`;
  const heading = opt(ctx, "heading");
  const none = (): RenderedPlot => ({
    name,
    heading,
    caption: opt(ctx, "caption"),
    svg: "",
    problems: ctx.problems,
  });
  checkKeys(ctx);
  const figure = figureOf(ctx);
  if (!figure) return none();
  const table = tableOf(ctx);
  if (!table) return none();
  const { info } = table;
  if (!opt(ctx, "horizontal")) problem(ctx, "needs `horizontal:` naming a column");
  if (figure.vertical && !opt(ctx, "vertical")) problem(ctx, "needs `vertical:` naming a column");
  const xc = columnOf(ctx, info.columns, "horizontal", true);
  const yc = figure.vertical ? columnOf(ctx, info.columns, "vertical", true) : undefined;
  const gc = columnOf(ctx, info.columns, "colour-by", false);
  const betterUp = yes(ctx, "better-up", true);
  checkFigureKeys(ctx, figure);
  if (ctx.problems.some((p) => p.severity === "error") || !xc) return none();

  const rows = sampleRows(info.rowCount, xc, yc, gc);
  const groups = colourGroups(gc, rows.groupValues);
  const drawing = figure.draw(figureInput(ctx, table, { xc, yc, gc, betterUp }, rows, groups));
  if (!drawing || ctx.problems.some((p) => p.severity === "error")) return none();
  const { x, y } = axesOf(ctx, drawing, xc, yc, betterUp);
  const svg = chartSvg({
    label: heading ?? `${figure.name}: ${y.title} against ${x.title}`,
    x,
    y,
    layers: drawing.layers,
    legend: drawing.legend ?? groups.legend,
    height: drawing.height,
  });
  const caption = captionOf(ctx, figure, drawing, rows.step, info.rowCount);
  return { name, heading, caption, svg, problems: ctx.problems };
}

type TableFacts = NonNullable<ReturnType<typeof tableInfo>>;
type Drawing = NonNullable<ReturnType<FigureDef["draw"]>>;

/** A problem for each key a plot block does not know. */
function checkKeys(ctx: Ctx): void {
  for (const [key, o] of Object.entries(ctx.block.options)) {
    if (!(key in PLOT_OPTIONS)) {
      problem(
        ctx,
        `unknown key "${key}" (valid keys: ${Object.keys(PLOT_OPTIONS).join(", ")})`,
        o,
      );
    }
  }
}

/** The figure named by `figure:`, or a problem. */
function figureOf(ctx: Ctx): FigureDef | undefined {
  const figureName = opt(ctx, "figure");
  const figure: FigureDef | undefined = FIGURES.find((f) => f.name === figureName);
  if (!figure) {
    problem(
      ctx,
      figureName
        ? `figure "${figureName}" is not one of ${PLOT_FIGURES.join(", ")}`
        : `needs \`figure:\` (${PLOT_FIGURES.join(", ")})`,
      ctx.block.options.figure,
    );
  }
  return figure;
}

/** The table named by `table:` with its columns, or a problem. */
function tableOf(ctx: Ctx): { tableName: string; info: TableFacts } | undefined {
  const tableName = opt(ctx, "table");
  if (!tableName) {
    problem(ctx, "needs `table:` naming the table to plot");
    return undefined;
  }
  const tr = ctx.nb.result(tableName);
  const info = tr && !tr.error ? tableInfo(tr.value) : undefined;
  if (!info) {
    problem(
      ctx,
      tr?.error
        ? `table ${tableName} has an error: ${tr.error.message}`
        : `no table "${tableName}"`,
      ctx.block.options.table,
    );
    return undefined;
  }
  return { tableName, info };
}

/** A problem for each key given to a figure it does not apply to. */
function checkFigureKeys(ctx: Ctx, figure: FigureDef): void {
  for (const [key, figures] of KEY_FIGURES) {
    if (ctx.block.options[key] && !figures.includes(figure.name)) {
      problem(
        ctx,
        `${key} applies to ${figures.join(", ")} figures, not ${figure.name}`,
        ctx.block.options[key],
      );
    }
  }
}

interface Rows {
  readonly step: number;
  readonly xs: Float64Array;
  readonly ys: Float64Array;
  readonly groupValues: unknown[];
}

/** The rows drawn: every one, or one in `step` past {@linkcode MAX_PLOT_POINTS}. */
function sampleRows(
  rowCount: number,
  xc: Column,
  yc: Column | undefined,
  gc: Column | undefined,
): Rows {
  const step = Math.max(1, Math.ceil(rowCount / MAX_PLOT_POINTS));
  const drawn = Math.ceil(rowCount / step);
  const xs = new Float64Array(drawn), ys = new Float64Array(yc ? drawn : 0);
  const groupValues: unknown[] = [];
  for (let i = 0, j = 0; i < rowCount; i += step, j++) {
    xs[j] = xc.data[i] as number;
    if (yc) ys[j] = yc.data[i] as number;
    if (gc) groupValues.push(gc.data[i]);
  }
  return { step, xs, ys, groupValues };
}

interface Groups {
  readonly series?: Uint16Array;
  readonly colours?: string[];
  readonly legend?: Legend;
  readonly seriesNames: string[];
}

/** Colours by `colour-by:`: a ramp for a numeric column, one series per value otherwise. */
function colourGroups(gc: Column | undefined, groupValues: unknown[]): Groups {
  const seriesNames: string[] = [];
  if (gc?.numeric) {
    const vs = groupValues as number[];
    let lo = Infinity, hi = -Infinity;
    for (const v of vs) {
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
    return {
      colours: vs.map((v) => rampColour(v, lo, hi)),
      legend: {
        type: "ramp",
        title: axisTitle(gc.name, gc.unit),
        low: valueText(lo, gc.unit),
        high: valueText(hi, gc.unit),
      },
      seriesNames,
    };
  }
  if (!gc) return { seriesNames };
  const index = new Map<string, number>();
  const series = new Uint16Array(groupValues.length);
  groupValues.forEach((v, i) => {
    const key = v === null || v === undefined ? "" : String(v);
    let k = index.get(key);
    if (k === undefined) {
      index.set(key, k = index.size);
      seriesNames.push(key || "(none)");
    }
    series[i] = k;
  });
  return {
    series,
    legend: { type: "series", title: axisTitle(gc.name, gc.unit), names: seriesNames },
    seriesNames,
  };
}

interface Chosen {
  readonly xc: Column;
  readonly yc: Column | undefined;
  readonly gc: Column | undefined;
  readonly betterUp: boolean;
}

/** What a figure's `draw` reads: the chosen columns, the drawn rows and the block's keys. */
function figureInput(
  ctx: Ctx,
  table: { tableName: string; info: TableFacts },
  { xc, yc, gc, betterUp }: Chosen,
  { xs, ys }: Rows,
  { series, colours, seriesNames }: Groups,
): FigureInput {
  const { block } = ctx;
  const { tableName, info } = table;
  return {
    horizontal: xc,
    vertical: yc,
    colourBy: gc,
    xs,
    ys,
    allXs: xc.data as Float64Array,
    option: (key) => opt(ctx, key),
    cell: (key) => cellJson(ctx, key),
    cellName: (key) => opt(ctx, key)?.split(".")[0],
    column: (key, fallback) => {
      const name = opt(ctx, key) ?? fallback;
      const c = name ? info.columns.find((c) => c.name === name) : undefined;
      if (!c) {
        problem(
          ctx,
          name
            ? `${key}: table ${tableName} has no column "${name}"`
            : `needs \`${key}:\` naming a column`,
          block.options[key],
        );
      }
      return c;
    },
    pairing: { subject: info.subject, eye: info.eye },
    problem: (message, key) => problem(ctx, message, key ? block.options[key] : undefined),
    rowMarks: (part, o = {}): Layer => ({
      type: "marks",
      part,
      xs,
      ys,
      ...(series ? { series } : {}),
      ...(colours ? { colours } : {}),
      ...o,
    }),
    series,
    seriesNames,
    betterUp,
  };
}

/** The caption: the block's own, then a note on sampled rows, then the figure's note. */
function captionOf(
  ctx: Ctx,
  figure: FigureDef,
  drawing: Drawing,
  step: number,
  rowCount: number,
): string | undefined {
  let caption = opt(ctx, "caption");
  if (step > 1 && figure.name !== "distribution") {
    const note = `One row in ${step} drawn, of ${countText(rowCount)}.`;
    caption = caption ? `${caption} ${note}` : note;
  }
  if (drawing.note) caption = caption ? `${caption} ${drawing.note}` : drawing.note;
  return caption;
}

/** Both axes: titles and ticks by column, the figure's overrides, logMAR better up. */
function axesOf(
  ctx: Ctx,
  drawing: Drawing,
  xc: Column,
  yc: Column | undefined,
  betterUp: boolean,
): { x: AxisSpec; y: AxisSpec } {
  const x: AxisSpec = { ...axisOf(ctx, "horizontal", xc), ...drawing.x };
  let y: AxisSpec = { ...axisOf(ctx, "vertical", yc), ...drawing.y };
  if (!yc && !opt(ctx, "vertical-title") && !drawing.y?.title) {
    y = { ...y, title: "number of rows" };
  }
  if (y.kind === "logmar" && betterUp) {
    y = {
      ...y,
      reverse: true,
      title: opt(ctx, "vertical-title") ?? `${y.title.replace(/\)$/, "")}, better up)`,
    };
  }
  return { x, y };
}
