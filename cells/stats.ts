/**
 * Statistics over table columns in the formula language: ordinary summaries of any numeric
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
import { rxValue } from "./rx.ts";
import { defineValueType, type DisplayOptions, getValueType, typeOfValue } from "./types.ts";
import { formatNumber, formatQuantity, signed } from "./display.ts";
import { toPowerVector } from "../lib/power_vector.ts";
import { CYLINDER_RANGE, SPHERE_RANGE } from "../lib/prescription.ts";
import { LentilInputError } from "../lib/errors.ts";
import {
  checkPaired,
  quantileSorted,
  RunningMoments,
  sortedValues,
  summarise,
  type Summary,
  type VectorSummary,
  vectorSummary,
} from "../lib/stats.ts";
import { type Agreement, limitsOfAgreement, vectorAgreement } from "../lib/agreement.ts";
import { ellipseOf } from "../lib/ellipse.ts";

/**
 * Records of statistics. They stay plain records (fields read as `s.sd`, quantities kept for
 * arithmetic) but are shown as statistics, not as lens powers: dioptric values exact (two
 * decimals, three below 0.1 D) rather than rounded to the notebook's power step, and spreads
 * (SDs, semi-axes) without a sign.
 */
const STAT_RECORDS = new WeakSet<object>();

/** Keys of spreads: never negative, shown without a sign. */
const SPREAD_KEYS = new Set(["sd", "sdM", "sdJ0", "sdJ45", "semiMajor", "semiMinor"]);

/**
 * Mark a record as statistics, so its parts display as measures (SDs unsigned, figures
 * exact) rather than lens powers; returns it.
 */
export function statRecord<T extends Record<string, unknown>>(record: T): T {
  STAT_RECORDS.add(record);
  return record;
}

function showStat(key: string, v: unknown, options: DisplayOptions): string {
  const q = quantityParts(v);
  if (q) {
    if (q.unit !== "D") return formatQuantity(q.value, q.unit);
    if (!Number.isFinite(q.value)) return `${q.value} D`;
    // Two decimals as powers are written; three for small values (a mean's ellipse, a bias).
    const x = Math.round(q.value * 1000) / 1000;
    if (x !== 0 && Math.abs(x) < 0.1) {
      const digits = Math.abs(x).toFixed(3);
      return SPREAD_KEYS.has(key) ? `${digits} D` : `${x > 0 ? "+" : "-"}${digits} D`;
    }
    return SPREAD_KEYS.has(key) ? `${Math.abs(q.value).toFixed(2)} D` : `${signed(q.value)} D`;
  }
  if (typeof v === "number") return formatNumber(v);
  if (typeof v === "string") return v;
  const t = typeOfValue(v);
  return t ? t.display(v, options) : String(v);
}

function statJson(v: unknown): unknown {
  const q = quantityParts(v);
  if (q) return q.value;
  if (v === null || typeof v !== "object") return v;
  const t = typeOfValue(v);
  return t ? t.json(v) : v;
}

defineValueType<Record<string, unknown>>({
  name: "statistics",
  summary: "a record of statistics (means, SDs, limits) with units",
  is: (x): x is Record<string, unknown> => STAT_RECORDS.has(x as object),
  display: (r, options) =>
    Object.entries(r).map(([k, v]) => `${k}: ${showStat(k, v, options)}`).join(", "),
  json: (r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, statJson(v)])),
});

/**
 * A quantity of the shared language, made when a formula runs (never at module load). A
 * statistic is a measure, not a lens power: it is shown exactly, not in the power step.
 */
function qty(value: number, unit: string): unknown {
  return unit ? markExact(quantity(value, unit)) : value;
}

/**
 * A column argument: a table column as it is, or a list written in the formula (numbers,
 * quantities in one unit, or text) made into a column.
 */
export function asColumn(x: unknown, what: string): Column {
  if (x instanceof Column) return x;
  const list = Array.isArray(x)
    ? x
    : typeof (x as { toArray?: unknown })?.toArray === "function"
    ? (x as { toArray(): unknown[] }).toArray()
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
  const n = a.length;
  const sph = new Float64Array(n).fill(NaN);
  const cyl = new Float64Array(n).fill(NaN);
  const axis = new Float64Array(n).fill(NaN);
  const rxType = getValueType("rx");
  a.data.forEach((v, i) => {
    if (v === null || v === undefined || v === "") return;
    if (typeof v === "string") {
      if (!rxType?.fromText) {
        throw new LentilInputError(`column ${a.name}: text is not a prescription`);
      }
      v = rxType.fromText(v);
    }
    const rx = (v as { rx?: unknown }).rx ?? v;
    const r = rx as { sphere?: unknown; cylinder?: unknown; axis?: unknown };
    if (typeof r.sphere !== "number" || typeof r.cylinder !== "number") {
      throw new LentilInputError(`column ${a.name}, row ${i + 1}: not a prescription`);
    }
    sph[i] = r.sphere;
    cyl[i] = r.cylinder;
    axis[i] = typeof r.axis === "number" ? r.axis : 180;
  });
  return { sph, cyl, axis };
}

/** A summary as a record of the language (quantities in `unit`). */
export function summaryRecord(s: Summary, unit: string): Record<string, unknown> {
  return statRecord({
    count: s.count,
    missing: s.missing,
    mean: qty(s.mean, unit),
    sd: qty(s.sd, unit),
    min: qty(s.min, unit),
    q1: qty(s.q1, unit),
    median: qty(s.median, unit),
    q3: qty(s.q3, unit),
    max: qty(s.max, unit),
  });
}

function unitOf(c: Column): string {
  return c.type === "quantity" ? c.unit : "";
}

/** A vector summary as a mean-prescription record. */
export function meanRxRecord(v: VectorSummary): Record<string, unknown> {
  return statRecord({
    rx: rxValue(v.meanRx),
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
): Record<string, unknown> {
  const e = ellipseOf(
    { x: v.mean.j0, y: v.mean.j45 },
    { xx: v.sd.j0 ** 2, yy: v.sd.j45 ** 2, xy: v.cov.j0J45 },
    v.n,
    region,
  );
  return statRecord({
    region: region === "mean"
      ? "95% confidence ellipse of the mean (J0, J45)"
      : "ellipse expected to hold 95% of eyes (J0, J45)",
    centreJ0: qty(e.cx, "D"),
    centreJ45: qty(e.cy, "D"),
    semiMajor: qty(e.semiMajor, "D"),
    semiMinor: qty(e.semiMinor, "D"),
    angle: qty(e.angle, "deg"),
    n: v.n,
  });
}

/** Agreement as a record of the language (quantities in `unit`). */
export function agreementRecord(a: Agreement, unit: string): Record<string, unknown> {
  return statRecord({
    n: a.n,
    missing: a.missing,
    bias: qty(a.bias, unit),
    sd: qty(a.sd, unit),
    lower: qty(a.lower, unit),
    upper: qty(a.upper, unit),
  });
}

function vectorsOf(r: { sph: Float64Array; cyl: Float64Array; axis: Float64Array }) {
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

const C = (x: unknown, what = "column"): Column => asColumn(x, what);
const O = (x: unknown): Column | undefined => (x === undefined ? undefined : C(x));

const pick = (xs: Float64Array, rows: number[]) => Float64Array.from(rows, (i) => xs[i]);

const COL = (name: string, doc: string, optional = false): ParamSpec => ({
  name,
  type: "any",
  doc: `${doc} (a table column or a list)`,
  ...(optional ? { optional: true } : {}),
});

const RX_PARAMS: readonly ParamSpec[] = [
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
    name: "summary",
    group: "statistics",
    summary:
      "Count, missing, mean, SD, minimum, quartiles, median and maximum of a numeric column.",
    params: [COL("column", "a numeric column")],
    returns: { type: "any", doc: "a record of the summaries" },
    sources: STAT_SOURCES,
    example: "summary([-1.25 D, -1.5 D, -1 D, -2 D])",
    fn: (c) => summaryRecord(summarise(columnNumbers(C(c))), unitOf(C(c))),
  }),
  defineFormula({
    name: "summaryBy",
    group: "statistics",
    summary: "The summary of a numeric column for each value of a grouping column (eye, visit, …).",
    params: [COL("column", "a numeric column"), COL("by", "the grouping column")],
    returns: { type: "any", doc: "a record: group → summary" },
    sources: STAT_SOURCES,
    example: 'summaryBy([0.1, 0.2, 0.0, 0.3], ["R", "L", "R", "L"])',
    fn: (c, g) => {
      const xs = columnNumbers(C(c));
      const out: Record<string, unknown> = {};
      for (const [k, rows] of groups(C(g, "by"), xs.length)) {
        out[k] = summaryRecord(summarise(pick(xs, rows)), unitOf(C(c)));
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
  ...(["mean", "observations"] as const).map((region) =>
    defineFormula({
      name: region === "mean" ? "ellipse95" : "spread95",
      group: "statistics",
      summary: region === "mean"
        ? "95% confidence ellipse of the mean (J0, J45) of refractions (χ², 2 d.f.)."
        : "Ellipse expected to hold 95% of the eyes' (J0, J45) (χ², 2 d.f.).",
      params: RX_PARAMS,
      returns: { type: "any", doc: "centre, semi-axes (D), angle of the major axis (deg), n" },
      sources: ["chi2-ellipse", "thibos-1997"],
      example: `${
        region === "mean" ? "ellipse95" : "spread95"
      }([-1 D, -1.5 D, -2 D, -1 D], [-0.5 D, -0.75 D, -0.25 D, -1 D], [90 deg, 85 deg, 10 deg, 170 deg])`,
      fn: (a, b, c) => {
        const r = refractionArrays(C(a), O(b), O(c));
        return ellipseRecord(vectorSummary(r.sph, r.cyl, r.axis), region);
      },
    })
  ),
  defineFormula({
    name: "agreement",
    group: "statistics",
    summary:
      "Bland–Altman bias and 95% limits of agreement (bias ± 1.96 SD) of two paired numeric columns.",
    params: [COL("a", "first method's column"), COL("b", "second method's column, same rows")],
    returns: { type: "any", doc: "n, bias, sd, lower, upper (in a's unit)" },
    sources: ["bland-altman-1986"],
    example: "agreement([1, 2, 3.5], [0.75, 2.25, 3])",
    fn: (a, b) => {
      const ca = C(a, "a");
      const unit = unitOf(ca);
      return agreementRecord(
        limitsOfAgreement(columnNumbers(ca), columnNumbers(C(b, "b"), unit || undefined)),
        unit,
      );
    },
  }),
  defineFormula({
    name: "rxAgreement",
    group: "statistics",
    summary:
      "Bland–Altman agreement of paired refractions on M, J0 and J45: rxAgreement(a.rx, b.rx) or with sphere, cylinder and axis columns of each.",
    params: [
      COL("a", "first method's prescriptions, or its sphere column"),
      COL("b", "second method's prescriptions, or the first's cylinder column"),
      COL("aAxis", "first method's axis column", true),
      COL("bSph", "second method's sphere column", true),
      COL("bCyl", "second method's cylinder column", true),
      COL("bAxis", "second method's axis column", true),
    ],
    returns: { type: "any", doc: "n and, for M, J0 and J45: bias, sd, lower, upper" },
    sources: ["bland-altman-1986", "thibos-1997"],
    example:
      'rxAgreement(["-1.00 / -0.50 x 90", "-2.00 DS", "+0.50 / -0.25 x 180"], ["-1.25 / -0.50 x 85", "-2.25 DS", "+0.50 DS"])',
    fn: (...args) => {
      const cols = args.filter((x) => x !== undefined).map((x) => C(x));
      let ra, rb;
      if (cols.length === 2) {
        ra = refractionArrays(cols[0]);
        rb = refractionArrays(cols[1]);
      } else if (cols.length === 6) {
        ra = refractionArrays(cols[0], cols[1], cols[2]);
        rb = refractionArrays(cols[3], cols[4], cols[5]);
      } else {
        throw new LentilInputError(
          `give two columns of prescriptions, or six columns (sphere, cylinder, axis of each); got ${cols.length}`,
        );
      }
      const agg = vectorAgreement(vectorsOf(ra), vectorsOf(rb));
      return {
        n: agg.m.n,
        M: agreementRecord(agg.m, "D"),
        J0: agreementRecord(agg.j0, "D"),
        J45: agreementRecord(agg.j45, "D"),
      };
    },
  }),
];
