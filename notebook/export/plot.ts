/**
 * Plot blocks: what their options mean, and their rendering to inline SVG on the server
 * with `@observablehq/plot` and a `linkedom` document (no browser, no script in the page).
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

import * as Plot from "@observablehq/plot";
import { parseHTML } from "linkedom";
import type { Notebook } from "../engine/engine.ts";
import type { OptionDef, PlotBlock } from "../format/parse.ts";
import type { Diagnostic } from "../format/diagnostic.ts";
import { type Column, tableInfo } from "../../cells/table.ts";
import { formatNumber } from "../../cells/display.ts";
import { limitsOf, markOf, pointsOf, type XY } from "./_plot_values.ts";

/** The figures a plot block can draw. */
export const PLOT_FIGURES = ["curve", "scatter", "distribution", "agreement"] as const;

/** A figure a plot block can draw. */
export type PlotFigure = typeof PLOT_FIGURES[number];

/** Every option key a plot block accepts, with what it means. */
export const PLOT_OPTIONS: Readonly<Record<string, string>> = {
  figure: `one of ${PLOT_FIGURES.join(", ")}`,
  table: "the table whose rows are plotted",
  horizontal: "column for the horizontal axis",
  vertical: "column for the vertical axis (not for distribution)",
  heading: "heading above the plot",
  caption: "text below the plot",
  "horizontal-title": "title of the horizontal axis (default: the column and its unit)",
  "vertical-title": "title of the vertical axis (default: the column and its unit)",
  "colour-by": "column whose values colour the dots",
  mark: "cell whose value marks a point or a power (curve); `cell.part` picks a part of a record",
  fitted: "cell holding fitted curve points, drawn dashed (curve)",
  ellipse: "cell holding an outline, e.g. a confidence ellipse (scatter)",
  limits: "cell holding the bias and limits of agreement (agreement)",
  classes: "number of equal classes the horizontal column is counted in (distribution)",
  "better-up": "no to draw a logMAR vertical axis with smaller values down (default yes)",
};

/** Largest number of dots drawn; beyond it every k-th row is drawn and the caption says so. */
export const MAX_PLOT_POINTS = 4000;

/** A rendered plot block. */
export interface RenderedPlot {
  /** The block's name, or `plot-LINE`. */
  readonly name: string;
  /** Heading text (unescaped), if any. */
  readonly heading?: string;
  /** Caption text (unescaped), including a note when rows were thinned. */
  readonly caption?: string;
  /** The SVG (or Plot's figure around it) markup; "" when the block has an error. */
  readonly svg: string;
  /** Problems with the block: with an error, no plot is drawn. */
  readonly problems: readonly Diagnostic[];
}

const INK = "#1d3557";
const ACCENT = "#c0392b";
const FIT = "#2a9d8f";

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

function axisLabel(
  ctx: Ctx,
  axis: "horizontal" | "vertical",
  c: Column | undefined,
): string | undefined {
  const given = opt(ctx, `${axis}-title`);
  if (given) return given;
  return c ? (c.unit ? `${c.name} [${c.unit}]` : c.name) : undefined;
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

/** A logMAR column: smaller is better acuity. */
function isLogMAR(c: Column | undefined): boolean {
  return c?.unit?.toLowerCase() === "logmar";
}

type PlotDocument = NonNullable<Plot.PlotOptions["document"]>;

let doc: PlotDocument | undefined;
function svgDocument(): PlotDocument {
  doc ??= (parseHTML("<!doctype html><html><head></head><body></body></html>") as unknown as {
    document: PlotDocument;
  }).document;
  return doc;
}

/** Rows as records for Plot, thinned to at most MAX_PLOT_POINTS. */
function rowsOf(columns: (Column | undefined)[], rowCount: number) {
  const step = Math.max(1, Math.ceil(rowCount / MAX_PLOT_POINTS));
  const out: Record<string, unknown>[] = [];
  for (let i = 0; i < rowCount; i += step) {
    const r: Record<string, unknown> = {};
    for (const c of columns) if (c) r[c.name] = c.data[i];
    out.push(r);
  }
  return { rows: out, step };
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
 * Render one plot block to SVG markup. User text (titles, labels, values) reaches the SVG
 * only as text content, escaped by the serialiser.
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
  let caption = opt(ctx, "caption");
  const none = (): RenderedPlot => ({ name, heading, caption, svg: "", problems: ctx.problems });
  for (const [key, o] of Object.entries(block.options)) {
    if (!(key in PLOT_OPTIONS)) {
      problem(
        ctx,
        `unknown key "${key}" (valid keys: ${Object.keys(PLOT_OPTIONS).join(", ")})`,
        o,
      );
    }
  }
  const kind = opt(ctx, "figure") as PlotFigure | undefined;
  if (!kind || !(PLOT_FIGURES as readonly string[]).includes(kind)) {
    problem(
      ctx,
      kind
        ? `figure "${kind}" is not one of ${PLOT_FIGURES.join(", ")}`
        : `needs \`figure:\` (${PLOT_FIGURES.join(", ")})`,
      block.options.figure,
    );
    return none();
  }
  const tableName = opt(ctx, "table");
  if (!tableName) {
    problem(ctx, "needs `table:` naming the table to plot");
    return none();
  }
  const tr = nb.result(tableName);
  const info = tr && !tr.error ? tableInfo(tr.value) : undefined;
  if (!info) {
    problem(
      ctx,
      tr?.error
        ? `table ${tableName} has an error: ${tr.error.message}`
        : `no table "${tableName}"`,
      block.options.table,
    );
    return none();
  }
  if (!opt(ctx, "horizontal")) problem(ctx, "needs `horizontal:` naming a column");
  if (kind !== "distribution" && !opt(ctx, "vertical")) {
    problem(ctx, "needs `vertical:` naming a column");
  }
  const xc = columnOf(ctx, info.columns, "horizontal", true);
  const yc = kind === "distribution" ? undefined : columnOf(ctx, info.columns, "vertical", true);
  const gc = columnOf(ctx, info.columns, "colour-by", false);
  const invert = yes(ctx, "better-up", true) && isLogMAR(yc);
  const markV = kind === "curve" ? cellJson(ctx, "mark") : undefined;
  const fitV = kind === "curve" ? cellJson(ctx, "fitted") : undefined;
  const ellipseV = kind === "scatter" ? cellJson(ctx, "ellipse") : undefined;
  const limitsV = kind === "agreement" ? cellJson(ctx, "limits") : undefined;
  for (const [key, kinds] of Object.entries(KIND_ONLY)) {
    if (block.options[key] && !kinds.includes(kind)) {
      problem(
        ctx,
        `${key} applies to ${kinds.join(", ")} figures, not ${kind}`,
        block.options[key],
      );
    }
  }
  let bins: number | undefined;
  if (opt(ctx, "classes")) {
    bins = Number(opt(ctx, "classes"));
    if (!Number.isInteger(bins) || bins < 1 || bins > 500) {
      problem(ctx, `classes: expected a whole number from 1 to 500`, block.options.classes);
    }
  }
  const mark = markV === undefined ? undefined : markOf(markV);
  if (markV !== undefined && !mark) problem(ctx, "mark: the cell holds no point or power");
  const fit = fitV === undefined ? undefined : pointsOf(fitV);
  if (fitV !== undefined && !fit) problem(ctx, "fitted: the cell holds no curve points");
  const ring = ellipseV === undefined ? undefined : pointsOf(ellipseV);
  if (ellipseV !== undefined && !ring) problem(ctx, "ellipse: the cell holds no outline points");
  const limits = limitsV === undefined ? undefined : limitsOf(limitsV);
  if (limitsV !== undefined && !limits) problem(ctx, "limits: the cell holds no limits");
  if (ctx.problems.some((p) => p.severity === "error") || !xc) return none();

  const { rows, step } = rowsOf([xc, yc, gc], info.rowCount);
  if (step > 1 && kind !== "distribution") {
    const note = `One row in ${step} drawn, of ${info.rowCount.toLocaleString("en")}.`;
    caption = caption ? `${caption} ${note}` : note;
  }
  const x = xc.name;
  const y = yc?.name;
  const dotColour = gc ? gc.name : INK;
  const marks: Plot.Markish[] = [];
  const num = (v: number) => formatNumber(v);
  if (kind === "curve") {
    marks.push(
      Plot.line(rows, { x, y, sort: { channel: "x" }, stroke: gc ? gc.name : INK, z: gc?.name }),
      Plot.dot(rows, { x, y, fill: dotColour, r: 3 }),
    );
    if (fit) {
      marks.push(Plot.line(fit, { x: "x", y: "y", stroke: FIT, strokeDasharray: "5 4" }));
    }
    if (mark) {
      const label = `${opt(ctx, "mark")} ${num(mark.x)}`;
      marks.push(Plot.ruleX([mark.x], { stroke: ACCENT, strokeDasharray: "3 3" }));
      if (mark.y !== undefined) {
        marks.push(
          Plot.dot([mark], { x: "x", y: "y", r: 7, stroke: ACCENT, strokeWidth: 2 }),
          Plot.text([mark], {
            x: "x",
            y: "y",
            text: () => label,
            dy: invert ? 16 : -14,
            fill: ACCENT,
          }),
        );
      } else {
        marks.push(Plot.text([mark.x], { x: (d) => d, frameAnchor: "top", text: () => label }));
      }
    }
  } else if (kind === "scatter") {
    marks.push(Plot.dot(rows, { x, y, fill: dotColour, r: 2.5, fillOpacity: 0.7 }));
    if (ring) {
      const closed: XY[] = [...ring, ring[0]];
      marks.push(Plot.line(closed, { x: "x", y: "y", stroke: ACCENT, strokeWidth: 1.5 }));
    }
  } else if (kind === "distribution") {
    marks.push(
      Plot.rectY(rows, {
        ...Plot.binX({ y: "count" }, { x, ...(bins ? { thresholds: bins } : {}) }),
        fill: INK,
        inset: 0.5,
      }),
      Plot.ruleY([0]),
    );
  } else {
    marks.push(Plot.dot(rows, { x, y, fill: dotColour, r: 2.5, fillOpacity: 0.7 }));
    if (limits) {
      const lines = [
        ...(limits.bias !== undefined
          ? [{ y: limits.bias, label: `bias ${num(limits.bias)}`, dash: "" }]
          : []),
        { y: limits.lower, label: `lower limit ${num(limits.lower)}`, dash: "6 4" },
        { y: limits.upper, label: `upper limit ${num(limits.upper)}`, dash: "6 4" },
      ];
      for (const l of lines) {
        marks.push(
          Plot.ruleY([l.y], { stroke: ACCENT, strokeDasharray: l.dash || undefined }),
          Plot.text([l], {
            y: "y",
            text: "label",
            frameAnchor: "right",
            textAnchor: "end",
            dy: -6,
            fill: ACCENT,
          }),
        );
      }
    } else marks.push(Plot.ruleY([0], { stroke: "#888" }));
  }
  const el = Plot.plot({
    document: svgDocument(),
    width: 640,
    height: kind === "distribution" ? 320 : 380,
    marginLeft: 56,
    marginRight: 24,
    grid: true,
    style: { fontSize: "12px", background: "white", color: "#222" },
    x: { label: axisLabel(ctx, "horizontal", xc) },
    y: {
      label: kind === "distribution"
        ? (opt(ctx, "vertical-title") ?? "number of rows")
        : axisLabel(ctx, "vertical", yc),
      reverse: invert,
    },
    color: gc ? { legend: true, type: gc.numeric ? "linear" : "categorical" } : undefined,
    marks,
  }) as unknown as { outerHTML: string };
  return { name, heading, caption, svg: el.outerHTML, problems: ctx.problems };
}

/** Options that apply only to some figures. */
const KIND_ONLY: Readonly<Record<string, readonly PlotFigure[]>> = {
  mark: ["curve"],
  fitted: ["curve"],
  ellipse: ["scatter"],
  limits: ["agreement"],
  classes: ["distribution"],
};
