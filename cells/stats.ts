/**
 * Statistics over table columns in the formula language: sample statistics of any numeric
 * column, refraction summaries through power vectors (mean prescription, SDs and
 * covariances of M, J0, J45, the 95% ellipse of J0 against J45), Bland–Altman agreement
 * of paired columns, summaries by group, and the per-row power-vector components (which
 * the column compiler turns into loops).
 *
 * Refraction arguments are either one column of prescriptions (`[rx]`) or three columns:
 * sphere and cylinder in D, axis in degrees. Empty cells are left out and counted.
 * Columns are read straight from their arrays (no conversion to the language's lists).
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * lang.describe(lang.compile(lang.parse("vectorM(-2 D, -1 D)")).evaluate({})).display; // "-2.50 D"
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec, type ParamSpec } from "./catalogue.ts";
import { Column } from "./table.ts";
import { markExact, quantity, quantityParts, toNumberIn } from "./quantity.ts";
import { joinShared, qty, sampleStatsRecord, showStat, statRecord } from "./_stat_records.ts";
import type { DisplayOptions } from "./types.ts";
import { RxValue } from "./rx.ts";
import { readRxColumn } from "./_rx_column.ts";
import { toPowerVector } from "../lib/power_vector.ts";
import { CYLINDER_RANGE, SPHERE_RANGE } from "../lib/prescription.ts";
import { LentilInputError } from "../lib/errors.ts";
import {
  checkPaired,
  quantileSorted,
  RunningMoments,
  sampleStats,
  sortedValues,
  type VectorSummary,
  vectorSummary,
} from "../lib/stats.ts";
import { type Agreement, agreementIntervals, type Interval } from "../lib/agreement.ts";
import { type Ellipse, type EllipseMethod, ellipseOf } from "../lib/ellipse.ts";

/**
 * A column argument: a table column as it is, or a list written in the formula (numbers,
 * quantities in one unit, or text) made into a column.
 */
export function asColumn(x: unknown, what: string): Column {
  if (x instanceof Column) return x;
  const list = Array.isArray(x) ? x : (x as { isMatrix?: boolean } | null)?.isMatrix
    // The values themselves: toArray would copy each, and prescriptions cannot be copied.
    ? (x as { valueOf(): unknown[] }).valueOf()
    : undefined;
  if (!list) throw new LentilInputError(`${what}: expected a table column or a list [..]`);
  if (list.every((v) => typeof v === "number")) {
    return new Column(what, "number", "", Float64Array.from(list as number[]));
  }
  const first = quantityParts(list[0]);
  if (first && first.unit) {
    const data = Float64Array.from(list, (v) => toNumberIn(v, first.unit));
    return new Column(what, "quantity", first.unit, data);
  }
  return new Column(what, typeof list[0] === "string" ? "text" : "any", "", list);
}

/** The numbers of a numeric column, in `unit` when given (converted from the column's). */
export function columnNumbers(c: Column, unit?: string): Float64Array {
  if (!(c.data instanceof Float64Array)) {
    throw new LentilInputError(`column ${c.name} holds ${c.type} values, not numbers`);
  }
  if (!unit || c.unit === unit || c.type !== "quantity") return c.data;
  const f = toNumberIn(quantity(1, c.unit), unit);
  return c.data.map((x) => x * f);
}

/** Sphere, cylinder and axis arrays (D, D, deg) from an rx column or three columns. */
export function refractionArrays(
  a: Column,
  b?: Column,
  c?: Column,
): { sph: Float64Array; cyl: Float64Array; axis: Float64Array } {
  if (b && c) {
    return {
      sph: columnNumbers(a, "D"),
      cyl: columnNumbers(b, "D"),
      axis: columnNumbers(c, "deg"),
    };
  }
  if (b || c) {
    throw new LentilInputError(
      "give one column of prescriptions, or three columns: sphere, cylinder and axis",
    );
  }
  if (a.data instanceof Float64Array) {
    throw new LentilInputError(
      `column ${a.name} holds numbers; give sphere, cylinder and axis columns, or a column of prescriptions`,
    );
  }
  // Parsed once into arrays by the column parser (same results as the prescription parser).
  return readRxColumn(a.data, a.name);
}

/** The unit of a quantity column, "" otherwise. */
export function unitOf(c: Column): string {
  return c.type === "quantity" ? c.unit : "";
}

/** A vector summary as a mean-prescription record. */
export function meanRxRecord(v: VectorSummary): Record<string, unknown> {
  return statRecord({
    // A mean is a measure, not a lens to order: exact (roundToStep rounds it on request).
    rx: new RxValue(v.meanRx, true),
    M: qty(v.mean.m, "D"),
    J0: qty(v.mean.j0, "D"),
    J45: qty(v.mean.j45, "D"),
    n: v.n,
    missing: v.missing,
  });
}

/** Vector statistics as a record of the language. */
export function vectorStatsRecord(v: VectorSummary): Record<string, unknown> {
  return statRecord({
    n: v.n,
    missing: v.missing,
    meanM: qty(v.mean.m, "D"),
    meanJ0: qty(v.mean.j0, "D"),
    meanJ45: qty(v.mean.j45, "D"),
    sdM: qty(v.sd.m, "D"),
    sdJ0: qty(v.sd.j0, "D"),
    sdJ45: qty(v.sd.j45, "D"),
    covMJ0: v.cov.mJ0,
    covMJ45: v.cov.mJ45,
    covJ0J45: v.cov.j0J45,
  });
}

/** The 95% ellipse of (J0, J45) as a record of the language. */
export function ellipseRecord(
  v: VectorSummary,
  region: "mean" | "observations",
  method: EllipseMethod = "hotelling",
  extra: Record<string, unknown> = {},
): Record<string, unknown> {
  const e = ellipseOf(
    { x: v.mean.j0, y: v.mean.j45 },
    { xx: v.sd.j0 ** 2, yy: v.sd.j45 ** 2, xy: v.cov.j0J45 },
    v.n,
    region,
    0.95,
    method,
  );
  return ellipseFields(e, region, v.n, extra);
}

/** An ellipse as a record of the language, its region and scaling said in words. */
export function ellipseFields(
  e: Ellipse,
  region: "mean" | "observations",
  n: number,
  extra: Record<string, unknown> = {},
): Record<string, unknown> {
  const how = e.method === "chi-square"
    ? "large-sample χ² form (2 d.f.)"
    : "Hotelling's T² (exact for normal data)";
  return statRecord({
    region: region === "mean"
      ? `95% confidence ellipse of the mean (J0, J45), ${how}`
      : `ellipse expected to hold 95% of eyes (J0, J45), ${how}`,
    centreJ0: qty(e.cx, "D"),
    centreJ45: qty(e.cy, "D"),
    semiMajor: qty(e.semiMajor, "D"),
    semiMinor: qty(e.semiMinor, "D"),
    angle: qty(e.angle, "deg"),
    n,
    ...extra,
  }, { headline: ellipseHeadline });
}

function ellipseHeadline(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  const who = r.subjects !== undefined ? `${r.subjects} persons` : `n ${r.n}`;
  const how = String(r.region).includes("χ²") ? ", χ² form" : "";
  return `centre J0 ${show("centreJ0")}, J45 ${show("centreJ45")}; semi-axes ${
    joinShared(show("semiMajor"), " × ", show("semiMinor"))
  } at ${show("angle")}; ${who}${how}`;
}

/**
 * Agreement as a record of the language (quantities in `unit`): bias and limits, with the
 * 95% confidence interval of the bias and of each limit (approximate and exact) when there
 * are at least 3 pairs.
 */
export function agreementRecord(
  a: Agreement,
  unit: string,
  extra: Record<string, unknown> = {},
  intervals = true,
): Record<string, unknown> {
  const record: Record<string, unknown> = {
    n: a.n,
    missing: a.missing,
    bias: qty(a.bias, unit),
    sd: qty(a.sd, unit),
    lower: qty(a.lower, unit),
    upper: qty(a.upper, unit),
  };
  if (intervals && a.n >= 3 && a.sd > 0) {
    const ci = agreementIntervals(a);
    const put = (key: string, i: Interval) => {
      record[`${key}From`] = qty(i.lower, unit);
      record[`${key}To`] = qty(i.upper, unit);
    };
    put("bias", ci.bias);
    put("lower", ci.lowerApprox);
    put("upper", ci.upperApprox);
    put("lowerExact", ci.lowerExact);
    put("upperExact", ci.upperExact);
  }
  return statRecord({ ...record, ...extra }, {
    display: agreementLine,
    headline: agreementHeadline,
  });
}

/** Bias and limits in one line: "bias -0.19 D; limits -0.73 to +0.35 D". */
export function agreementHeadline(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  return `bias ${show("bias")}; limits ${joinShared(show("lower"), " to ", show("upper"))}`;
}

function agreementLine(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  const range = (a: string, b: string) => joinShared(show(a), " to ", show(b));
  const out = [`bias ${show("bias")}`];
  if (r.biasFrom !== undefined) out[0] += ` (95% CI ${range("biasFrom", "biasTo")})`;
  out.push(`95% limits of agreement ${range("lower", "upper")}`);
  if (r.lowerFrom !== undefined) {
    out.push(
      `95% CI of the lower limit ${range("lowerFrom", "lowerTo")} (exact ${
        range("lowerExactFrom", "lowerExactTo")
      })`,
      `of the upper limit ${range("upperFrom", "upperTo")} (exact ${
        range("upperExactFrom", "upperExactTo")
      })`,
    );
  }
  out.push(`n ${r.n}`);
  if (r.subjects !== undefined) out.push(`${r.subjects} persons`);
  for (const k of ["eyes", "note", "warning"]) {
    if (typeof r[k] === "string") out.push(`${k}: ${r[k]}`);
  }
  return out.join("; ");
}

export function vectorsOf(r: { sph: Float64Array; cyl: Float64Array; axis: Float64Array }) {
  const n = r.sph.length;
  const m = new Float64Array(n);
  const j0 = new Float64Array(n);
  const j45 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = toPowerVector({ sphere: r.sph[i], cylinder: r.cyl[i], axis: r.axis[i] });
    m[i] = v.m;
    j0[i] = v.j0;
    j45[i] = v.j45;
  }
  return { m, j0, j45 };
}

function groupKeys(g: Column): string[] {
  return Array.from(g.data as ArrayLike<unknown>, (v) => {
    if (v === null || v === undefined || (typeof v === "number" && Number.isNaN(v))) return "";
    return String(v);
  });
}

/** Rows by group key, in order of first appearance (empty keys left out). */
function groups(g: Column, n: number): Map<string, number[]> {
  checkPaired(`column ${g.name}`, g.length, "the values", n);
  const out = new Map<string, number[]>();
  groupKeys(g).forEach((k, i) => {
    if (k === "") return;
    const rows = out.get(k) ?? [];
    rows.push(i);
    out.set(k, rows);
  });
  return out;
}

export {
  joinShared,
  partLabel,
  type SampleStatsFigures,
  sampleStatsRecord,
  showStat,
  statRecord,
} from "./_stat_records.ts";

const C = (x: unknown, what = "column"): Column => asColumn(x, what);
const O = (x: unknown): Column | undefined => (x === undefined ? undefined : C(x));

const pick = (xs: Float64Array, rows: number[]) => Float64Array.from(rows, (i) => xs[i]);

/** A column parameter. */
export const COL = (name: string, doc: string, optional = false): ParamSpec => ({
  name,
  type: "any",
  doc: `${doc} (a table column or a list)`,
  ...(optional ? { optional: true } : {}),
});

/** The refraction parameters: one rx column, or sphere, cylinder and axis columns. */
export const RX_PARAMS: readonly ParamSpec[] = [
  COL("rx", "a column of prescriptions, or the sphere column (D)"),
  COL("cyl", "the cylinder column (D), when the first is the sphere", true),
  COL("axis", "the axis column (deg), when the first is the sphere", true),
];

const STAT_SOURCES = ["welford-1962", "hyndman-fan-1996"];

/** The statistics formulas. */
export const STATS_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "countOf",
    group: "statistics",
    summary: "Number of values in a column, empty cells left out.",
    params: [COL("column", "a table column")],
    returns: { type: "number", doc: "values present" },
    sources: ["common-practice"],
    example: "countOf([0.1, 0.2, NaN])",
    fn: (c) => {
      const col = C(c);
      if (col.data instanceof Float64Array) {
        let n = 0;
        for (const x of col.data) if (!Number.isNaN(x)) n++;
        return n;
      }
      return col.data.filter((v) => v !== null && v !== undefined && v !== "").length;
    },
  }),
  ...([
    ["meanOf", "Mean of a numeric column, empty cells left out, in the column's unit.", "mean"],
    ["sdOf", "Sample standard deviation (n − 1) of a numeric column, empty cells left out.", "sd"],
  ] as const).map(([name, summary, part]) =>
    defineFormula({
      name,
      group: "statistics",
      summary,
      params: [COL("column", "a numeric column")],
      returns: { type: "any", doc: `the ${part === "sd" ? "SD" : "mean"}` },
      sources: ["welford-1962"],
      example: `${name}([-1.25 D, -1.5 D, -1 D])`,
      fn: (c) => {
        const col = C(c);
        const r = new RunningMoments(1);
        for (const x of columnNumbers(col)) r.push1(x);
        const unit = unitOf(col);
        if (part === "mean") return qty(r.mean(0), unit);
        return unit ? markExact(quantity(r.sd(0), unit), { unsigned: true }) : r.sd(0);
      },
    })
  ),
  defineFormula({
    name: "medianOf",
    group: "statistics",
    summary: "Median of a numeric column, empty cells left out.",
    params: [COL("column", "a numeric column")],
    returns: { type: "any", doc: "the median" },
    sources: ["hyndman-fan-1996"],
    example: "medianOf([0.3, 0.1, 0.2, 0.5])",
    fn: (c) => qty(quantileSorted(sortedValues(columnNumbers(C(c))).values, 0.5), unitOf(C(c))),
  }),
  defineFormula({
    name: "quantileOf",
    group: "statistics",
    summary:
      "Quantile of a numeric column by linear interpolation between order statistics (definition 7).",
    params: [
      COL("column", "a numeric column"),
      { name: "p", type: "number", range: [0, 1], doc: "probability, 0–1 (0.5 is the median)" },
    ],
    returns: { type: "any", doc: "the quantile" },
    sources: ["hyndman-fan-1996"],
    example: "quantileOf([0.1, 0.2, 0.3, 0.4], 0.9)",
    fn: (c, p) =>
      qty(
        quantileSorted(sortedValues(columnNumbers(C(c))).values, p as number),
        unitOf(C(c)),
      ),
  }),
  defineFormula({
    name: "sampleStats",
    group: "statistics",
    summary:
      "Sample statistics of a numeric column as a paper's table prints them: n, mean ± SD, median, range and interquartile range.",
    params: [COL("column", "a numeric column")],
    returns: {
      type: "any",
      doc: "n, missing, mean, sd, median, lowest, highest, lowerQuartile, upperQuartile",
    },
    sources: STAT_SOURCES,
    example: "sampleStats([-1.25 D, -1.5 D, -1 D, -2 D])",
    fn: (c) => sampleStatsRecord(sampleStats(columnNumbers(C(c))), unitOf(C(c))),
  }),
  defineFormula({
    name: "sampleStatsBy",
    group: "statistics",
    summary:
      "The sample statistics of a numeric column for each value of a grouping column (eye, visit, …).",
    params: [COL("column", "a numeric column"), COL("by", "the grouping column")],
    returns: { type: "any", doc: "a record: group → sample statistics" },
    sources: STAT_SOURCES,
    example: 'sampleStatsBy([0.1, 0.2, 0.0, 0.3], ["R", "L", "R", "L"])',
    fn: (c, g) => {
      const xs = columnNumbers(C(c));
      const out: Record<string, unknown> = {};
      for (const [k, rows] of groups(C(g, "by"), xs.length)) {
        out[k] = sampleStatsRecord(sampleStats(pick(xs, rows)), unitOf(C(c)));
      }
      return out;
    },
  }),
  defineFormula({
    name: "vectorM",
    group: "statistics",
    summary: "Spherical equivalent M = S + C/2 of one row's sphere and cylinder.",
    params: [
      { name: "sph", type: "quantity", unit: "D", range: SPHERE_RANGE, doc: "sphere" },
      { name: "cyl", type: "quantity", unit: "D", range: CYLINDER_RANGE, doc: "cylinder" },
    ],
    returns: { type: "quantity", unit: "D", display: "exact", doc: "M" },
    sources: ["thibos-1997"],
    example: "vectorM(-2 D, -1 D)",
    fn: (s, c) => toPowerVector({ sphere: s as number, cylinder: c as number, axis: 180 }).m,
  }),
  ...([
    ["j0", "J0", "cos", 180],
    ["j45", "J45", "sin", 45],
  ] as const).map(([key, label, trig, exampleAxis]) =>
    defineFormula({
      name: `vector${label}`,
      group: "statistics",
      summary: `${label} = −(C/2)·${trig} 2α of one row's cylinder and axis.`,
      params: [
        { name: "cyl", type: "quantity", unit: "D", range: CYLINDER_RANGE, doc: "cylinder" },
        { name: "axis", type: "quantity", unit: "deg", range: [0, 180], doc: "axis" },
      ],
      returns: { type: "quantity", unit: "D", display: "exact", doc: label },
      sources: ["thibos-1997"],
      example: `vector${label}(-1 D, ${exampleAxis} deg)`,
      fn: (c, ax) => toPowerVector({ sphere: 0, cylinder: c as number, axis: ax as number })[key],
    })
  ),
  defineFormula({
    name: "meanRx",
    group: "statistics",
    summary:
      "Mean prescription of refractions through power vectors, back to sphere, cylinder and axis.",
    params: RX_PARAMS,
    returns: { type: "any", doc: "sphere, cylinder, axis, M, J0, J45, n, missing" },
    sources: ["thibos-1997"],
    example: "meanRx([0 D, 0 D], [1 D, 1 D], [180 deg, 90 deg])",
    fn: (a, b, c) => {
      const r = refractionArrays(C(a), O(b), O(c));
      return meanRxRecord(vectorSummary(r.sph, r.cyl, r.axis));
    },
  }),
  defineFormula({
    name: "meanRxBy",
    group: "statistics",
    summary: "The mean prescription (through power vectors) for each value of a grouping column.",
    params: [COL("by", "the grouping column"), ...RX_PARAMS],
    returns: { type: "any", doc: "a record: group → mean prescription" },
    sources: ["thibos-1997"],
    example: 'meanRxBy(["R", "L", "R"], ["-1.00 / -0.50 x 90", "-2.00 DS", "-1.50 / -0.50 x 80"])',
    fn: (g, a, b, c) => {
      const r = refractionArrays(C(a), O(b), O(c));
      const out: Record<string, unknown> = {};
      for (const [k, rows] of groups(C(g, "by"), r.sph.length)) {
        out[k] = meanRxRecord(
          vectorSummary(pick(r.sph, rows), pick(r.cyl, rows), pick(r.axis, rows)),
        );
      }
      return out;
    },
  }),
  defineFormula({
    name: "vectorStats",
    group: "statistics",
    summary:
      "Means, sample SDs and covariances (D²) of M, J0 and J45 of refractions, with the mean prescription.",
    params: RX_PARAMS,
    returns: { type: "any", doc: "a record of the statistics" },
    sources: ["thibos-1997", "welford-1962"],
    example:
      "vectorStats([-1 D, -1.5 D, -2 D], [-0.5 D, -0.75 D, -0.25 D], [90 deg, 85 deg, 10 deg])",
    fn: (a, b, c) => {
      const r = refractionArrays(C(a), O(b), O(c));
      return vectorStatsRecord(vectorSummary(r.sph, r.cyl, r.axis));
    },
  }),
];
