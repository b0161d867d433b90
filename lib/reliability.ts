/**
 * Repeatability and reliability from repeated measures: the within-subject SD Sw and the
 * coefficient of repeatability 2.77·Sw (1.96·√2·Sw: 95% of differences between two
 * measurements of one subject lie within it), and the intraclass correlation in its named
 * forms — ICC(1,1), ICC(2,1), ICC(3,1) and their averages of k measurements — from the
 * mean squares of the analysis of variance, with F-based 95% confidence intervals.
 *
 * Sources: bland-altman-1996, shrout-fleiss-1979, mcgraw-wong-1996.
 *
 * @example
 * ```ts
 * import { intraclassForms } from "./reliability.ts";
 * const f = intraclassForms([[9, 2, 5, 8], [6, 1, 3, 2], [8, 4, 6, 8], [7, 1, 2, 6], [10, 5, 6, 9], [6, 2, 4, 7]]);
 * f.find((x) => x.form === "ICC(3,1)")!.value.toFixed(2); // "0.71"
 * ```
 *
 * @module
 */

import { LentilInputError } from "./errors.ts";
import { fQuantile } from "./distributions.ts";
import type { Numbers } from "./stats.ts";

/** The coefficient of repeatability per unit of Sw, 1.96·√2. Source: bland-altman-1996. */
export const REPEATABILITY_FACTOR = 1.96 * Math.SQRT2;

/** Within-subject variation from repeated measures of each subject. */
export interface Repeatability {
  /** Subjects. */
  readonly subjects: number;
  /** Measurements of each subject. */
  readonly repeats: number;
  /** Mean of all measurements. */
  readonly mean: number;
  /** Within-subject SD, √(within-subject mean square). */
  readonly sw: number;
  /** 95% confidence interval of Sw (standard error Sw/√(2n(m − 1))). */
  readonly swCI: { readonly lower: number; readonly upper: number };
  /** Coefficient of repeatability, 1.96·√2·Sw (≈ 2.77·Sw). */
  readonly repeatability: number;
  /** ICC(1,1): one-way random, single measure. */
  readonly icc: number;
  /** Mean squares between and within subjects. */
  readonly msBetween: number;
  /** Within-subject mean square. */
  readonly msWithin: number;
}

/**
 * Group values by subject key, refusing an unequal number of repeats (empty values left out
 * first). Source: common-practice.
 *
 * @throws {LentilInputError} with fewer than two subjects, one measurement per subject, or
 * unequal repeats.
 */
function bySubject(values: Numbers, subject: ArrayLike<string>): number[][] {
  if (values.length !== subject.length) {
    throw new LentilInputError(
      `the values have ${values.length} rows, the subject key ${subject.length}`,
    );
  }
  const groups = new Map<string, number[]>();
  for (let i = 0; i < values.length; i++) {
    if (Number.isNaN(values[i]) || subject[i] === "") continue;
    const g = groups.get(subject[i]) ?? [];
    g.push(values[i]);
    groups.set(subject[i], g);
  }
  if (groups.size < 2) {
    throw new LentilInputError(
      `repeatability needs at least two subjects, got ${groups.size}`,
    );
  }
  const sizes = new Map<number, string>();
  for (const [k, g] of groups) if (!sizes.has(g.length)) sizes.set(g.length, k);
  if (sizes.size > 1) {
    const [[a, ka], [b, kb]] = [...sizes];
    throw new LentilInputError(
      `unequal repeats: subject ${ka} has ${a} measurements, subject ${kb} has ${b}; give every subject the same number (leave out or complete the others)`,
    );
  }
  const k = [...sizes.keys()][0];
  if (k < 2) {
    throw new LentilInputError("each subject is measured once: repeatability needs repeats");
  }
  return [...groups.values()];
}

/**
 * Within-subject SD, coefficient of repeatability and ICC(1,1) of repeated measures: every
 * subject measured the same number of times (m ≥ 2). Sw = √MSW of the one-way analysis of
 * variance; the coefficient 1.96·√2·Sw; ICC(1,1) = (MSB − MSW)/(MSB + (m − 1)·MSW).
 * Sources: bland-altman-1996, shrout-fleiss-1979.
 *
 * @example
 * ```ts
 * import { repeatability } from "./reliability.ts";
 * repeatability([1, 1.2, 2, 2.2, 3, 2.8], ["a", "a", "b", "b", "c", "c"]).sw.toFixed(3); // "0.141"
 * ```
 * @throws {LentilInputError} with fewer than two subjects, no repeats, or unequal repeats.
 */
export function repeatability(values: Numbers, subject: ArrayLike<string>): Repeatability {
  const groups = bySubject(values, subject);
  const n = groups.length;
  const m = groups[0].length;
  const grand = groups.flat().reduce((s, x) => s + x, 0) / (n * m);
  let ssb = 0;
  let ssw = 0;
  for (const g of groups) {
    const gm = g.reduce((s, x) => s + x, 0) / m;
    ssb += m * (gm - grand) ** 2;
    for (const x of g) ssw += (x - gm) ** 2;
  }
  const msb = ssb / (n - 1);
  const msw = ssw / (n * (m - 1));
  const sw = Math.sqrt(msw);
  const se = sw / Math.sqrt(2 * n * (m - 1));
  const denom = msb + (m - 1) * msw;
  return {
    subjects: n,
    repeats: m,
    mean: grand,
    sw,
    swCI: { lower: Math.max(0, sw - 1.96 * se), upper: sw + 1.96 * se },
    repeatability: REPEATABILITY_FACTOR * sw,
    icc: denom > 0 ? (msb - msw) / denom : NaN,
    msBetween: msb,
    msWithin: msw,
  };
}

/** One named form of the intraclass correlation. */
export interface IntraclassForm {
  /** Shrout & Fleiss's name: ICC(1,1), ICC(2,1), ICC(3,1), ICC(1,k), ICC(2,k), ICC(3,k). */
  readonly form: string;
  /** McGraw & Wong's description in words. */
  readonly description: string;
  /** The coefficient. */
  readonly value: number;
  /** 95% confidence interval (F-based). */
  readonly lower: number;
  /** Upper end of the 95% confidence interval. */
  readonly upper: number;
}

/**
 * The six intraclass correlations of an n-target × k-rater table (every target rated by
 * every rater once) from the two-way analysis of variance: BMS (targets), JMS (raters), EMS
 * (residual), WMS (within targets), with the F-based 95% intervals of Shrout & Fleiss
 * (ICC(2,1) by Satterthwaite's degrees of freedom; its average by Spearman–Brown).
 * Sources: shrout-fleiss-1979, mcgraw-wong-1996.
 *
 * @example
 * ```ts
 * import { intraclassForms } from "./reliability.ts";
 * intraclassForms([[1, 2], [3, 4], [5, 7]]).length; // 6
 * ```
 * @throws {LentilInputError} with fewer than two targets or raters, or a ragged table.
 */
export function intraclassForms(
  table: readonly (readonly number[])[],
  level = 0.95,
): IntraclassForm[] {
  const n = table.length;
  const k = table[0]?.length ?? 0;
  if (n < 2 || k < 2) {
    throw new LentilInputError(
      `the intraclass correlation needs at least two subjects and two raters or occasions, got ${n} and ${k}`,
    );
  }
  if (table.some((row) => row.length !== k || row.some((x) => Number.isNaN(x)))) {
    throw new LentilInputError("every subject needs one measurement by every rater or occasion");
  }
  const grand = table.flat().reduce((s, x) => s + x, 0) / (n * k);
  const rowMean = table.map((r) => r.reduce((s, x) => s + x, 0) / k);
  const colMean = Array.from({ length: k }, (_, j) => table.reduce((s, r) => s + r[j], 0) / n);
  let sst = 0;
  for (const r of table) for (const x of r) sst += (x - grand) ** 2;
  const ssr = k * rowMean.reduce((s, m) => s + (m - grand) ** 2, 0);
  const ssc = n * colMean.reduce((s, m) => s + (m - grand) ** 2, 0);
  const sse = sst - ssr - ssc;
  const bms = ssr / (n - 1);
  const wms = (sst - ssr) / (n * (k - 1));
  const jms = ssc / (k - 1);
  const ems = sse / ((n - 1) * (k - 1));
  const a = (1 + level) / 2;
  const single = (f: number) => (f - 1) / (f + k - 1);
  const average = (f: number) => 1 - 1 / f;

  // ICC(1): one-way.
  const f1 = bms / wms;
  const f1L = f1 / fQuantile(a, n - 1, n * (k - 1));
  const f1U = f1 * fQuantile(a, n * (k - 1), n - 1);
  // ICC(3): two-way, consistency.
  const f3 = bms / ems;
  const f3L = f3 / fQuantile(a, n - 1, (n - 1) * (k - 1));
  const f3U = f3 * fQuantile(a, (n - 1) * (k - 1), n - 1);
  // ICC(2): two-way, absolute agreement.
  const icc2 = (bms - ems) / (bms + (k - 1) * ems + (k * (jms - ems)) / n);
  const fj = jms / ems;
  const vn = (k - 1) * (n - 1) * (k * icc2 * fj + n * (1 + (k - 1) * icc2) - k * icc2) ** 2;
  const vd = (n - 1) * k * k * icc2 * icc2 * fj * fj + (n * (1 + (k - 1) * icc2) - k * icc2) ** 2;
  const v = vn / vd;
  const fs = fQuantile(a, n - 1, v);
  const fss = fQuantile(a, v, n - 1);
  const l2 = (n * (bms - fs * ems)) / (fs * (k * jms + (k * n - k - n) * ems) + n * bms);
  const u2 = (n * (fss * bms - ems)) / (k * jms + (k * n - k - n) * ems + n * fss * bms);
  const sb = (r: number) => (k * r) / (1 + (k - 1) * r);
  return [
    {
      form: "ICC(1,1)",
      description: "one-way random, single measure",
      value: (bms - wms) / (bms + (k - 1) * wms),
      lower: single(f1L),
      upper: single(f1U),
    },
    {
      form: "ICC(2,1)",
      description: "two-way random, absolute agreement, single measure",
      value: icc2,
      lower: l2,
      upper: u2,
    },
    {
      form: "ICC(3,1)",
      description: "two-way mixed, consistency, single measure",
      value: (bms - ems) / (bms + (k - 1) * ems),
      lower: single(f3L),
      upper: single(f3U),
    },
    {
      form: "ICC(1,k)",
      description: `one-way random, average of ${k} measures`,
      value: (bms - wms) / bms,
      lower: average(f1L),
      upper: average(f1U),
    },
    {
      form: "ICC(2,k)",
      description: `two-way random, absolute agreement, average of ${k} measures`,
      value: (bms - ems) / (bms + (jms - ems) / n),
      lower: sb(l2),
      upper: sb(u2),
    },
    {
      form: "ICC(3,k)",
      description: `two-way mixed, consistency, average of ${k} measures`,
      value: (bms - ems) / bms,
      lower: average(f3L),
      upper: average(f3U),
    },
  ];
}

/** Each subject's mean and SD of repeated measures, for a plot of SD against mean. */
export interface SubjectSpread {
  /** Subject key. */
  readonly subject: string;
  /** Measurements counted. */
  readonly n: number;
  /** Mean of the subject's measurements. */
  readonly mean: number;
  /** SD of the subject's measurements (n − 1). */
  readonly sd: number;
}

/**
 * Each subject's mean and SD of repeated measures (subjects with fewer than two
 * measurements left out), and the pooled within-subject SD: plotted against each other
 * they show whether the error grows with the magnitude.
 * Source: bland-altman-1996.
 *
 * @example
 * ```ts
 * import { subjectSpreads } from "./reliability.ts";
 * subjectSpreads([1, 3, 2, 2], ["a", "a", "b", "b"]).spreads[0].sd.toFixed(3); // "1.414"
 * ```
 * @throws {LentilInputError} when no subject has two measurements.
 */
export function subjectSpreads(
  values: Numbers,
  subject: ArrayLike<string>,
): { spreads: SubjectSpread[]; sw: number } {
  const groups = new Map<string, number[]>();
  for (let i = 0; i < values.length; i++) {
    if (Number.isNaN(values[i]) || subject[i] === "") continue;
    groups.set(subject[i], [...(groups.get(subject[i]) ?? []), values[i]]);
  }
  const spreads: SubjectSpread[] = [];
  let ss = 0;
  let df = 0;
  for (const [k, g] of groups) {
    if (g.length < 2) continue;
    const mean = g.reduce((s, x) => s + x, 0) / g.length;
    const dev = g.reduce((s, x) => s + (x - mean) ** 2, 0);
    ss += dev;
    df += g.length - 1;
    spreads.push({ subject: k, n: g.length, mean, sd: Math.sqrt(dev / (g.length - 1)) });
  }
  if (!spreads.length) {
    throw new LentilInputError("no subject has two measurements: nothing to plot");
  }
  return { spreads, sw: Math.sqrt(ss / df) };
}
