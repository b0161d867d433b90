/**
 * Records of statistics as values of the formula language: plain records (fields read as
 * `s.sd`, quantities kept for arithmetic) registered as the "statistics" value type, so
 * every surface shows them as statistics, not lens powers, each field a part labelled in
 * words. Sample statistics read as a paper's table prints them (n, mean ± SD, range, IQR).
 *
 * @module
 */

import { countText } from "../lib/number_text.ts";
import { markExact, quantity, quantityParts } from "./quantity.ts";
import { defineValueType, type DisplayOptions, typeOfValue, type ValuePart } from "./types.ts";
import { formatMeasure, formatNumber, formatQuantity, signed } from "./display.ts";
import type { SampleStats } from "../lib/stats.ts";

/**
 * Records of statistics. They stay plain records (fields read as `s.sd`, quantities kept for
 * arithmetic) but are shown as statistics, not as lens powers: dioptric values exact (two
 * decimals, three below 0.1 D) rather than rounded to the notebook's power step, and spreads
 * (SDs, semi-axes) without a sign. Each field is a part with a label in words.
 */
const STAT_RECORDS = new WeakMap<object, StatShape>();

/** How one kind of statistics record reads: its headline and its display line. */
interface StatShape {
  /** Display of a part where the common rule is not enough (undefined: the common rule). */
  readonly partDisplay?: (
    key: string,
    value: unknown,
    options: DisplayOptions,
  ) => string | undefined;
  /** Labels of this record's parts where they differ from the common ones. */
  readonly labels?: Readonly<Record<string, string>>;
  readonly headline?: (r: Record<string, unknown>, options: DisplayOptions) => string;
  readonly display?: (r: Record<string, unknown>, options: DisplayOptions) => string;
}

/** Keys of spreads: never negative, shown without a sign. */
const SPREAD_KEYS = new Set([
  "sd",
  "sdM",
  "sdJ0",
  "sdJ45",
  "semiMajor",
  "semiMinor",
  "se",
  "sw",
  "swFrom",
  "swTo",
  "repeatability",
  "upper95",
]);

/** Labels in words of the parts of statistics records, by key. */
const PART_LABELS: Record<string, string> = {
  n: "number of values",
  missing: "empty cells left out",
  mean: "mean",
  sd: "standard deviation",
  median: "median",
  lowest: "lowest",
  highest: "highest",
  lowerQuartile: "lower quartile",
  upperQuartile: "upper quartile",
  rx: "mean prescription",
  M: "mean M (spherical equivalent)",
  J0: "mean J0",
  J45: "mean J45",
  meanM: "mean M (spherical equivalent)",
  meanJ0: "mean J0",
  meanJ45: "mean J45",
  sdM: "standard deviation of M",
  sdJ0: "standard deviation of J0",
  sdJ45: "standard deviation of J45",
  covMJ0: "covariance of M and J0 (D²)",
  covMJ45: "covariance of M and J45 (D²)",
  covJ0J45: "covariance of J0 and J45 (D²)",
  region: "region",
  centreJ0: "centre, J0",
  centreJ45: "centre, J45",
  semiMajor: "major semi-axis",
  semiMinor: "minor semi-axis",
  angle: "angle of the major axis",
  bias: "mean difference, first − second (bias)",
  lower: "lower limit of agreement",
  upper: "upper limit of agreement",
  note: "note",
  eyes: "both eyes of one person",
  warning: "warning",
  subjects: "persons",
  se: "standard error",
  from: "95% confidence interval, from",
  to: "95% confidence interval, to",
  designEffect: "design effect (variance ratio, persons to eyes)",
  r: "correlation between fellow eyes (Pearson's r)",
  pairs: "persons with both eyes",
  fellowEyeJ0: "correlation between fellow eyes, J0",
  fellowEyeJ45: "correlation between fellow eyes, J45",
  biasFrom: "bias, 95% confidence interval from",
  biasTo: "bias, 95% confidence interval to",
  lowerFrom: "lower limit, 95% confidence interval from (approximate)",
  lowerTo: "lower limit, 95% confidence interval to (approximate)",
  upperFrom: "upper limit, 95% confidence interval from (approximate)",
  upperTo: "upper limit, 95% confidence interval to (approximate)",
  lowerExactFrom: "lower limit, 95% confidence interval from (exact)",
  lowerExactTo: "lower limit, 95% confidence interval to (exact)",
  upperExactFrom: "upper limit, 95% confidence interval from (exact)",
  upperExactTo: "upper limit, 95% confidence interval to (exact)",
  length: "length of the power-vector difference",
  upper95: "95% of pairs differ by no more than",
  slope: "slope of the difference on the mean",
  slopeFrom: "slope, 95% confidence interval from",
  slopeTo: "slope, 95% confidence interval to",
  intercept: "intercept",
  t: "t statistic of the slope",
  p: "p-value (two-sided)",
};

/** The label in words of a statistics part (its key spelt out when none is declared). */
export function partLabel(key: string): string {
  return PART_LABELS[key] ?? key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();
}

/**
 * Mark a record as statistics, so its parts display as measures (SDs unsigned, figures
 * exact) rather than lens powers, labelled in words; returns it.
 */
export function statRecord<T extends Record<string, unknown>>(record: T, shape: StatShape = {}): T {
  STAT_RECORDS.set(record, shape);
  return record;
}

/** A statistic as displayed: exact figures, spreads unsigned, nothing shown as NaN. */
export function showStat(key: string, v: unknown, options: DisplayOptions): string {
  const q = quantityParts(v);
  if (q) {
    if (!Number.isFinite(q.value)) return "not available";
    if (q.unit !== "D") return formatQuantity(q.value, q.unit);
    // Two decimals as powers are written; three for small values (a mean's ellipse, a bias).
    const x = Math.round(q.value * 1000) / 1000;
    if (x !== 0 && Math.abs(x) < 0.1) {
      const digits = Math.abs(x).toFixed(3);
      return SPREAD_KEYS.has(key) ? `${digits} D` : `${x > 0 ? "+" : "-"}${digits} D`;
    }
    return SPREAD_KEYS.has(key) ? `${Math.abs(q.value).toFixed(2)} D` : `${signed(q.value)} D`;
  }
  if (typeof v === "number") {
    if (!Number.isFinite(v)) return "not available";
    // A covariance of powers is in D² (the record holds the bare number).
    return COVARIANCE_KEYS.has(key) ? formatMeasure(v, "covariance") : formatNumber(v);
  }
  if (typeof v === "string") return v;
  const t = typeOfValue(v);
  return t ? t.display(v, options) : String(v);
}

/** Keys of covariances of powers, shown in D². */
const COVARIANCE_KEYS = new Set(["covMJ0", "covMJ45", "covJ0J45"]);

/**
 * The line read first of a statistics record that declares none: its main figures by what it
 * holds (a mean prescription, an agreement, an ellipse, power-vector statistics), else its
 * first part.
 */
function defaultHeadline(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  const n = typeof r.n === "number" ? ` (n ${countText(r.n)})` : "";
  if (r.rx !== undefined) return `${show("rx")}${n}`;
  if (r.bias !== undefined && r.lower !== undefined && r.upper !== undefined) {
    return `bias ${show("bias")}, limits ${joinShared(show("lower"), " to ", show("upper"))}${n}`;
  }
  if (r.centreJ0 !== undefined && r.semiMajor !== undefined) {
    return `centre J0 ${show("centreJ0")}, J45 ${show("centreJ45")}; semi-axes ${
      joinShared(show("semiMajor"), " × ", show("semiMinor"))
    }`;
  }
  if (r.meanM !== undefined && r.sdM !== undefined) {
    const pm = (m: string, sd: string) => joinShared(show(m), " ± ", show(sd));
    return `M ${pm("meanM", "sdM")}, J0 ${pm("meanJ0", "sdJ0")}, J45 ${pm("meanJ45", "sdJ45")}${n}`;
  }
  // Agreement of M, J0 and J45: M's bias and limits first.
  const m = r.M;
  if (m !== null && typeof m === "object" && STAT_RECORDS.has(m) && "bias" in m) {
    return `M ${defaultHeadline(m as Record<string, unknown>, options)}`;
  }
  return shortLine(r, options);
}

function statJson(v: unknown): unknown {
  const q = quantityParts(v);
  if (q) return Number.isFinite(q.value) ? q.value : null;
  if (typeof v === "number") return Number.isFinite(v) ? v : null;
  if (v === null || typeof v !== "object") return v;
  const t = typeOfValue(v);
  return t ? t.json(v) : v;
}

const statParts = (r: Record<string, unknown>, options: DisplayOptions): ValuePart[] =>
  Object.entries(r).map(([key, value]) => ({
    key,
    label: STAT_RECORDS.get(r)?.labels?.[key] ?? partLabel(key),
    value,
    display: STAT_RECORDS.get(r)?.partDisplay?.(key, value, options) ??
      plainFigure(key, value) ?? showStat(key, value, options),
  }));

const statDisplay = (r: Record<string, unknown>, options: DisplayOptions) =>
  STAT_RECORDS.get(r)?.display?.(r, options) ??
    statParts(r, options).map((p) => `${p.label}: ${p.display}`).join(", ");

/** The first figures of a record, for a headline when its kind declares none. */
function shortLine(r: Record<string, unknown>, options: DisplayOptions): string {
  return statParts(r, options)
    .filter((p) => typeof p.value !== "string" && typeOfValue(p.value)?.name !== "statistics")
    .slice(0, 3)
    .map((p) => `${p.label} ${p.display}`)
    .join(", ") || statDisplay(r, options);
}

/** A plain figure (a correlation, a ratio, a p-value) to the decimals it is read at. */
export function plainFigure(key: string, v: unknown): string | undefined {
  if (typeof v !== "number" || !Number.isFinite(v)) return undefined;
  if (key === "p") return v < 0.001 ? "< 0.001" : v.toFixed(3);
  if (/^(r$|fellowEye|designEffect|icc|t$)/.test(key)) return v.toFixed(2);
  if (/^slope/.test(key)) return v.toFixed(3);
  return undefined;
}

defineValueType<Record<string, unknown>>({
  name: "statistics",
  summary: "a record of statistics (means, SDs, limits) with units",
  is: (x): x is Record<string, unknown> => STAT_RECORDS.has(x as object),
  display: statDisplay,
  headline: (r, options) =>
    STAT_RECORDS.get(r)?.headline?.(r, options) ?? defaultHeadline(r, options),
  parts: statParts,
  json: (r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, statJson(v)])),
});

/**
 * A quantity of the shared language, made when a formula runs (never at module load). A
 * statistic is a measure, not a lens power: it is shown exactly, not in the power step.
 */
export function qty(value: number, unit: string): unknown {
  return unit ? markExact(quantity(value, unit)) : value;
}

/** Figures of sample statistics; the order statistics are absent when not computed. */
export type SampleStatsFigures =
  & Pick<SampleStats, "n" | "missing" | "mean" | "sd">
  & Partial<Omit<SampleStats, "n" | "missing" | "mean" | "sd">>;

const ORDER_KEYS = ["median", "lowest", "highest", "lowerQuartile", "upperQuartile"] as const;

/**
 * How a paper's table prints sample statistics: n, mean ± SD, range, IQR (and the median).
 * Nothing not computed is shown as a number.
 */
function sampleStatsLine(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  const two = (a: string, sep: string, b: string) => joinShared(show(a), sep, show(b));
  const has = (k: string) => r[k] !== undefined && Number.isFinite(toNumber(r[k]));
  const out = [`n ${r.n}`];
  if (r.missing) out.push(`${r.missing} empty left out`);
  if (has("mean")) {
    out.push(has("sd") ? `mean ± SD ${two("mean", " ± ", "sd")}` : `mean ${show("mean")}`);
  }
  if (has("median")) out.push(`median ${show("median")}`);
  if (has("lowest") && has("highest")) out.push(`range ${two("lowest", " to ", "highest")}`);
  if (has("lowerQuartile") && has("upperQuartile")) {
    out.push(`IQR ${two("lowerQuartile", " to ", "upperQuartile")}`);
  }
  if (typeof r.note === "string") out.push(r.note);
  return out.join("; ");
}

/** Two displayed figures joined, their shared unit written once ("-1.44 ± 0.43 D"). */
export function joinShared(a: string, sep: string, b: string): string {
  const unit = / [^\d\s]+$/.exec(b)?.[0];
  return unit && a.endsWith(unit) ? `${a.slice(0, -unit.length)}${sep}${b}` : `${a}${sep}${b}`;
}

function sampleStatsHeadline(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  if (!Number.isFinite(toNumber(r.mean))) return `n ${r.n}, no mean`;
  return Number.isFinite(toNumber(r.sd))
    ? `${joinShared(show("mean"), " ± ", show("sd"))} (n ${r.n})`
    : `${show("mean")} (n ${r.n})`;
}

function toNumber(v: unknown): number {
  const q = quantityParts(v);
  return q ? q.value : typeof v === "number" ? v : NaN;
}

/**
 * Sample statistics as a record of the language (quantities in `unit`): n, missing, mean,
 * sd, median, lowest, highest, lowerQuartile, upperQuartile; `note` says what is left out.
 */
export function sampleStatsRecord(
  s: SampleStatsFigures,
  unit: string,
  note?: string,
): Record<string, unknown> {
  const record: Record<string, unknown> = {
    n: s.n,
    missing: s.missing,
    mean: qty(s.mean, unit),
    sd: qty(s.sd, unit),
  };
  for (const k of ORDER_KEYS) if (s[k] !== undefined) record[k] = qty(s[k]!, unit);
  if (note) record.note = note;
  return statRecord(record, { headline: sampleStatsHeadline, display: sampleStatsLine });
}
