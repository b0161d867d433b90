/**
 * Agreement between two methods (or two visits) measured on the same eyes: the per-row
 * difference, its mean (the bias) and the 95% limits of agreement, bias ± 1.96·SD of the
 * differences. For refractions the differences are taken on power vectors, so M, J0 and
 * J45 each get their own bias and limits. Beyond the limits: confidence intervals of the
 * bias and of each limit (approximate and exact), proportional bias (regression of the
 * difference on the mean), limits when subjects give several pairs, and the dioptric
 * length of the power-vector difference.
 *
 * Sources: bland-altman-1986, bland-altman-1999, carkeet-2015, thibos-1997.
 *
 * @example
 * ```ts
 * import { limitsOfAgreement } from "./agreement.ts";
 * limitsOfAgreement([1, 2, 3], [1, 1, 1]).bias; // 1
 * ```
 *
 * @module
 */

import { toPowerVector } from "./power_vector.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";
import {
  checkPaired,
  meanAndVariance,
  type Numbers,
  quantileSorted,
  RunningMoments,
  sortedValues,
} from "./stats.ts";
import { noncentralTQuantile, tCdf, tQuantile } from "./distributions.ts";
import { LentilInputError } from "./errors.ts";

/** Bias and limits of agreement of paired measurements. */
export interface Agreement {
  /** Pairs counted (pairs with an empty value are left out). */
  readonly n: number;
  /** Pairs left out because a value was empty. */
  readonly missing: number;
  /** Mean difference a − b. */
  readonly bias: number;
  /** Sample SD of the differences. */
  readonly sd: number;
  /** Lower limit of agreement, bias − 1.96·SD. */
  readonly lower: number;
  /** Upper limit of agreement, bias + 1.96·SD. */
  readonly upper: number;
}

/** The multiplier of the SD for 95% limits. Source: bland-altman-1986. */
export const LOA_Z = 1.96;

/**
 * Bias and 95% limits of agreement from running moments of the differences.
 * Source: bland-altman-1986.
 *
 * @example
 * ```ts
 * import { RunningMoments } from "./stats.ts";
 * import { agreementFrom } from "./agreement.ts";
 * const r = new RunningMoments(1); [0, 2].forEach((d) => r.push1(d));
 * agreementFrom(r, 0).upper.toFixed(3); // "3.772"
 * ```
 */
export function agreementFrom(r: RunningMoments, a: number): Agreement {
  const bias = r.mean(a);
  const sd = r.sd(a);
  return {
    n: r.count,
    missing: r.missing,
    bias,
    sd,
    lower: bias - LOA_Z * sd,
    upper: bias + LOA_Z * sd,
  };
}

/**
 * Bias and 95% limits of agreement of paired measurements a and b (difference a − b).
 * Source: bland-altman-1986.
 *
 * @example
 * ```ts
 * import { limitsOfAgreement } from "./agreement.ts";
 * limitsOfAgreement([2, 4], [1, 1]).sd.toFixed(3); // "1.414"
 * ```
 * @throws {LentilInputError} when a and b differ in length.
 */
export function limitsOfAgreement(a: Numbers, b: Numbers): Agreement {
  const n = checkPaired("first", a.length, "second", b.length);
  const r = new RunningMoments(1);
  for (let i = 0; i < n; i++) r.push1(a[i] - b[i]);
  return agreementFrom(r, 0);
}

/** Agreement of two refraction methods on each power-vector component. */
export interface VectorAgreement {
  /** Spherical equivalent M. */
  readonly m: Agreement;
  /** J0. */
  readonly j0: Agreement;
  /** J45. */
  readonly j45: Agreement;
}

/**
 * Power-vector difference a − b of two refractions of the same eye.
 * Sources: thibos-1997, bland-altman-1986.
 *
 * @example
 * ```ts
 * import { vectorDifference } from "./agreement.ts";
 * vectorDifference({ sphere: -1, cylinder: 0, axis: 180 }, { sphere: -1.5, cylinder: 0, axis: 180 }).m; // 0.5
 * ```
 */
export function vectorDifference(
  a: SpheroCylinder,
  b: SpheroCylinder,
): { m: number; j0: number; j45: number } {
  const va = toPowerVector(a);
  const vb = toPowerVector(b);
  return { m: va.m - vb.m, j0: va.j0 - vb.j0, j45: va.j45 - vb.j45 };
}

/**
 * Bland–Altman agreement on M, J0 and J45 of paired refractions given as power vectors
 * (three paired lists each).
 * Sources: bland-altman-1986, thibos-1997.
 *
 * @example
 * ```ts
 * import { vectorAgreement } from "./agreement.ts";
 * const a = { m: [1, 2, 3], j0: [0, 0, 0], j45: [0, 0, 0] };
 * const b = { m: [1, 1, 1], j0: [0, 0, 0], j45: [0, 0, 0] };
 * vectorAgreement(a, b).m.bias; // 1
 * ```
 * @throws {LentilInputError} when the lists differ in length.
 */
export function vectorAgreement(
  a: { m: Numbers; j0: Numbers; j45: Numbers },
  b: { m: Numbers; j0: Numbers; j45: Numbers },
): VectorAgreement {
  return {
    m: limitsOfAgreement(a.m, b.m),
    j0: limitsOfAgreement(a.j0, b.j0),
    j45: limitsOfAgreement(a.j45, b.j45),
  };
}

/** A confidence interval. */
export interface Interval {
  /** Lower end. */
  readonly lower: number;
  /** Upper end. */
  readonly upper: number;
}

/** Confidence intervals on the bias and on each limit of agreement. */
export interface AgreementIntervals {
  /** Confidence level (0.95). */
  readonly level: number;
  /** Bias ± t(n − 1)·s/√n. */
  readonly bias: Interval;
  /** Approximate: each limit ± t(n − 1)·√(3s²/n) (Bland & Altman). */
  readonly lowerApprox: Interval;
  /** Approximate interval of the upper limit. */
  readonly upperApprox: Interval;
  /** Exact: each limit considered alone, through the non-central t (Carkeet). */
  readonly lowerExact: Interval;
  /** Exact interval of the upper limit. */
  readonly upperExact: Interval;
}

/**
 * Confidence intervals of the bias and of the limits of agreement bias ± z·s, for
 * normally distributed differences: the bias by Student's t; each limit approximately,
 * limit ± t(n − 1, (1 + level)/2)·√(3s²/n) (bland-altman-1986, bland-altman-1999), and
 * exactly, each limit considered alone, d̄ ± s·t′/√n with t′ the quantiles (1 ∓ level)/2
 * of the non-central t with n − 1 degrees of freedom and non-centrality z·√n
 * (carkeet-2015).
 * Sources: bland-altman-1986, bland-altman-1999, carkeet-2015.
 *
 * @example
 * ```ts
 * import { agreementIntervals } from "./agreement.ts";
 * const ci = agreementIntervals({ n: 17, bias: -2.1, sd: 38.8 }, 0.95, 2);
 * ci.lowerApprox.lower.toFixed(1); // "-114.3"
 * ```
 * @throws {LentilInputError} with fewer than 3 pairs.
 */
export function agreementIntervals(
  a: Pick<Agreement, "n" | "bias" | "sd">,
  level = 0.95,
  z = LOA_Z,
): AgreementIntervals {
  if (!(a.n >= 3)) {
    throw new LentilInputError(
      `confidence intervals of the limits need at least 3 pairs, got ${a.n}`,
    );
  }
  const { n, bias, sd } = a;
  const t = tQuantile((1 + level) / 2, n - 1);
  const seBias = sd / Math.sqrt(n);
  const seLimit = Math.sqrt((3 * sd * sd) / n);
  const lo = bias - z * sd;
  const hi = bias + z * sd;
  const delta = z * Math.sqrt(n);
  const kLow = noncentralTQuantile((1 - level) / 2, n - 1, delta) / Math.sqrt(n);
  const kHigh = noncentralTQuantile((1 + level) / 2, n - 1, delta) / Math.sqrt(n);
  return {
    level,
    bias: { lower: bias - t * seBias, upper: bias + t * seBias },
    lowerApprox: { lower: lo - t * seLimit, upper: lo + t * seLimit },
    upperApprox: { lower: hi - t * seLimit, upper: hi + t * seLimit },
    lowerExact: { lower: bias - kHigh * sd, upper: bias - kLow * sd },
    upperExact: { lower: bias + kLow * sd, upper: bias + kHigh * sd },
  };
}

/** A straight-line regression of the difference on the mean of each pair. */
export interface ProportionalBias {
  /** Pairs used. */
  readonly n: number;
  /** Intercept (difference at a mean of zero). */
  readonly intercept: number;
  /** Slope: change of the difference per unit of the mean. */
  readonly slope: number;
  /** Standard error of the slope. */
  readonly slopeSE: number;
  /** Confidence interval of the slope. */
  readonly slopeCI: Interval;
  /** t statistic of the slope against zero, n − 2 d.f. */
  readonly t: number;
  /** Two-sided p-value of the slope against zero. */
  readonly p: number;
}

/**
 * Proportional bias: least-squares regression of the difference a − b on the mean (a + b)/2,
 * with the t test of the slope against zero (n − 2 d.f.).
 * Source: bland-altman-1999.
 *
 * @example
 * ```ts
 * import { proportionalBias } from "./agreement.ts";
 * proportionalBias([1, 2, 3, 4.1], [1, 1.9, 2.8, 3.7]).slope > 0; // true
 * ```
 * @throws {LentilInputError} with fewer than 3 complete pairs or no spread in the means.
 */
export function proportionalBias(a: Numbers, b: Numbers, level = 0.95): ProportionalBias {
  const len = checkPaired("first", a.length, "second", b.length);
  const r = new RunningMoments(2);
  for (let i = 0; i < len; i++) r.push([(a[i] + b[i]) / 2, a[i] - b[i]]);
  const n = r.count;
  if (n < 3) throw new LentilInputError(`a regression of the difference needs 3 pairs, got ${n}`);
  const sxx = r.variance(0) * (n - 1);
  if (!(sxx > 0)) {
    throw new LentilInputError("every pair has the same mean: no regression on the mean");
  }
  const slope = r.covariance(0, 1) / r.variance(0);
  const intercept = r.mean(1) - slope * r.mean(0);
  const syy = r.variance(1) * (n - 1);
  const residual = Math.max(0, syy - slope * slope * sxx) / (n - 2);
  const slopeSE = Math.sqrt(residual / sxx);
  const t = slopeSE > 0 ? slope / slopeSE : slope === 0 ? 0 : Infinity * Math.sign(slope);
  const tq = tQuantile((1 + level) / 2, n - 2);
  const p = Number.isFinite(t) ? 2 * (1 - tCdf(Math.abs(t), n - 2)) : 0;
  return {
    n,
    intercept,
    slope,
    slopeSE,
    slopeCI: { lower: slope - tq * slopeSE, upper: slope + tq * slopeSE },
    t,
    p,
  };
}

/** Limits of agreement when subjects give several pairs. */
export interface RepeatedAgreement extends Agreement {
  /** Subjects. */
  readonly subjects: number;
  /** Within-subject SD of the differences. */
  readonly sdWithin: number;
  /** Between-subject SD of the differences (0 when the estimate is negative). */
  readonly sdBetween: number;
}

/**
 * Limits of agreement when each subject gives several pairs and the true value may vary
 * between a subject's pairs: the variance of a difference is the between-subject component
 * plus the within-subject one, from the one-way analysis of variance of the differences by
 * subject, σ²_b = (MSB − MSW)/((N² − Σmᵢ²)/((n − 1)N)), σ²_d = σ²_b + MSW; the bias is the
 * mean of all differences.
 * Source: bland-altman-1999 (section 5.2).
 *
 * @example
 * ```ts
 * import { repeatedAgreement } from "./agreement.ts";
 * repeatedAgreement([1, 1.2, -0.5, -0.1, 0.3, 0.4], ["a", "a", "b", "b", "c", "c"]).subjects; // 3
 * ```
 * @throws {LentilInputError} with fewer than two subjects, or the lists of unequal length.
 */
export function repeatedAgreement(d: Numbers, subject: ArrayLike<string>): RepeatedAgreement {
  checkPaired("differences", d.length, "subjects", subject.length);
  const bySubject = new Map<string, { n: number; sum: number; ss: number }>();
  let missing = 0;
  let total = 0;
  let sum = 0;
  for (let i = 0; i < d.length; i++) {
    if (Number.isNaN(d[i]) || subject[i] === "") {
      missing++;
      continue;
    }
    const g = bySubject.get(subject[i]) ?? { n: 0, sum: 0, ss: 0 };
    g.n++;
    g.sum += d[i];
    g.ss += d[i] * d[i];
    bySubject.set(subject[i], g);
    total++;
    sum += d[i];
  }
  const n = bySubject.size;
  if (n < 2) {
    throw new LentilInputError(
      `limits over repeated pairs need at least two subjects, got ${n}`,
    );
  }
  const mean = sum / total;
  let ssb = 0;
  let ssw = 0;
  let sumM2 = 0;
  for (const g of bySubject.values()) {
    const gm = g.sum / g.n;
    ssb += g.n * (gm - mean) ** 2;
    ssw += g.ss - g.n * gm * gm;
    sumM2 += g.n * g.n;
  }
  if (total === n) {
    throw new LentilInputError(
      "each subject gives one pair: use the ordinary limits of agreement",
    );
  }
  const msb = ssb / (n - 1);
  const msw = Math.max(0, ssw) / (total - n);
  const divisor = (total * total - sumM2) / ((n - 1) * total);
  const varB = Math.max(0, (msb - msw) / divisor);
  const sd = Math.sqrt(varB + msw);
  return {
    n: total,
    missing,
    bias: mean,
    sd,
    lower: mean - LOA_Z * sd,
    upper: mean + LOA_Z * sd,
    subjects: n,
    sdWithin: Math.sqrt(msw),
    sdBetween: Math.sqrt(varB),
  };
}

/** How long the power-vector differences are. */
export interface VectorDifferenceLength {
  /** Pairs counted. */
  readonly n: number;
  /** Mean length (D). */
  readonly mean: number;
  /** SD of the lengths (D). */
  readonly sd: number;
  /** Median length (D). */
  readonly median: number;
  /** 95th percentile of the lengths: 95% of pairs differ by no more (D). */
  readonly upper95: number;
}

/**
 * The dioptric length of each power-vector difference, √(ΔM² + ΔJ0² + ΔJ45²), and its
 * distribution: mean, SD, median and the 95th percentile (definition 7), the one-sided
 * limit within which 95% of pairs differ. A length is never negative, so no ± limits.
 * Sources: thibos-1997, hyndman-fan-1996.
 *
 * @example
 * ```ts
 * import { vectorDifferenceLength } from "./agreement.ts";
 * vectorDifferenceLength([0.3, 0], [0.4, 0], [0, 0.5]).mean; // 0.5
 * ```
 * @throws {LentilInputError} when no pair is complete.
 */
export function vectorDifferenceLength(
  dm: Numbers,
  dj0: Numbers,
  dj45: Numbers,
): VectorDifferenceLength {
  checkPaired("M", dm.length, "J0", dj0.length);
  checkPaired("M", dm.length, "J45", dj45.length);
  const lengths = Array.from({ length: dm.length }, (_, i) => Math.hypot(dm[i], dj0[i], dj45[i]));
  const { values } = sortedValues(lengths);
  if (values.length === 0) throw new LentilInputError("no complete pair of refractions");
  const { mean, variance } = meanAndVariance(values);
  return {
    n: values.length,
    mean,
    sd: Math.sqrt(variance),
    median: quantileSorted(values, 0.5),
    upper95: quantileSorted(values, 0.95),
  };
}
