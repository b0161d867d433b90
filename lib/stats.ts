/**
 * Sample statistics of a column of numbers (n, mean, sample SD, median, quantiles) and
 * one-pass running moments (Welford's update, with co-moments for covariance) for data too
 * large to hold. Empty cells (NaN) are left out and counted apart.
 *
 * Refractions are summarised through power vectors: each row's sphere, cylinder and axis
 * become (M, J0, J45), the vectors are averaged, and the mean vector is turned back into a
 * prescription. Averaging the sphere, cylinder and axis columns themselves is wrong.
 *
 * Sources: welford-1962 (running mean and variance), hyndman-fan-1996 (quantile definition 7:
 * linear interpolation between order statistics), thibos-1997 (power vectors).
 *
 * @example
 * ```ts
 * import { sampleStats } from "./stats.ts";
 * sampleStats([1, 2, 3, 4]).median; // 2.5
 * ```
 *
 * @module
 */

import { LentilInputError, LentilRangeError } from "./errors.ts";
import { fromPowerVector, type PowerVector, toPowerVector } from "./power_vector.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";

/** A list of numbers: a typed array or a plain array. */
export type Numbers = ArrayLike<number>;

/** The sample statistics of a column (the figures a paper's table prints). */
export interface SampleStats {
  /** Values counted (empty cells left out). */
  readonly n: number;
  /** Empty cells (NaN) left out. */
  readonly missing: number;
  /** Arithmetic mean (NaN when n is 0). */
  readonly mean: number;
  /** Sample standard deviation, n − 1 in the denominator (NaN when n < 2). */
  readonly sd: number;
  /** Smallest value. */
  readonly lowest: number;
  /** Lower quartile (definition 7). */
  readonly lowerQuartile: number;
  /** Median. */
  readonly median: number;
  /** Upper quartile (definition 7). */
  readonly upperQuartile: number;
  /** Largest value. */
  readonly highest: number;
}

/**
 * The finite values of a list, sorted ascending, and how many were empty (NaN).
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { sortedValues } from "./stats.ts";
 * sortedValues([3, NaN, 1]).values; // Float64Array [1, 3]
 * ```
 * @throws {LentilRangeError} on an infinite value, naming its row (1-based).
 */
export function sortedValues(xs: Numbers): { values: Float64Array; missing: number } {
  let missing = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    if (Number.isNaN(x)) missing++;
    else if (!Number.isFinite(x)) throw new LentilRangeError(`row ${i + 1}: value`, x, 0, 0);
  }
  const values = new Float64Array(xs.length - missing);
  let k = 0;
  for (let i = 0; i < xs.length; i++) if (!Number.isNaN(xs[i])) values[k++] = xs[i];
  values.sort();
  return { values, missing };
}

/**
 * Quantile of already-sorted values by linear interpolation between order statistics
 * (definition 7: h = (n − 1)·p). Source: hyndman-fan-1996.
 *
 * @example
 * ```ts
 * import { quantileSorted } from "./stats.ts";
 * quantileSorted(new Float64Array([1, 2, 3, 4]), 0.25); // 1.75
 * ```
 * @throws {LentilRangeError} when p is outside 0–1.
 */
export function quantileSorted(sorted: Numbers, p: number): number {
  if (!(p >= 0 && p <= 1)) throw new LentilRangeError("quantile probability", p, 0, 1);
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * Quantile of a list (empty cells left out). Source: hyndman-fan-1996.
 *
 * @example
 * ```ts
 * import { quantile } from "./stats.ts";
 * quantile([4, 1, 3, 2], 0.5); // 2.5
 * ```
 * @throws {LentilRangeError} when p is outside 0–1.
 */
export function quantile(xs: Numbers, p: number): number {
  return quantileSorted(sortedValues(xs).values, p);
}

/**
 * Mean and sample variance in one pass by Welford's update (stable for large n).
 * Source: welford-1962.
 *
 * @example
 * ```ts
 * import { meanAndVariance } from "./stats.ts";
 * meanAndVariance([2, 4, 4, 4, 5, 5, 7, 9]); // { count: 8, mean: 5, variance: 4.571428571428571 }
 * ```
 */
export function meanAndVariance(xs: Numbers): { count: number; mean: number; variance: number } {
  const r = new RunningMoments(1);
  for (let i = 0; i < xs.length; i++) r.push1(xs[i]);
  return { count: r.count, mean: r.mean(0), variance: r.variance(0) };
}

/**
 * The sample statistics of a list: n, mean, sample SD, lowest, quartiles, median, highest.
 * Sources: welford-1962, hyndman-fan-1996.
 *
 * @example
 * ```ts
 * import { sampleStats } from "./stats.ts";
 * sampleStats([1, 2, 3, NaN]).missing; // 1
 * ```
 */
export function sampleStats(xs: Numbers): SampleStats {
  const { values, missing } = sortedValues(xs);
  const { mean, variance } = meanAndVariance(values);
  const n = values.length;
  return {
    n,
    missing,
    mean,
    sd: Math.sqrt(variance),
    lowest: n ? values[0] : NaN,
    lowerQuartile: quantileSorted(values, 0.25),
    median: quantileSorted(values, 0.5),
    upperQuartile: quantileSorted(values, 0.75),
    highest: n ? values[n - 1] : NaN,
  };
}

/**
 * Running means, variances and covariances of `k` variables observed together, updated one
 * observation at a time in constant memory (Welford's update with co-moments). An
 * observation with any NaN is counted as missing and left out.
 * Source: welford-1962.
 *
 * @example
 * ```ts
 * import { RunningMoments } from "./stats.ts";
 * const r = new RunningMoments(2);
 * r.push([1, 2]); r.push([2, 4]); r.push([3, 6]);
 * r.covariance(0, 1); // 2
 * ```
 */
export class RunningMoments {
  #n = 0;
  #missing = 0;
  readonly #mean: Float64Array;
  readonly #co: Float64Array;
  readonly #delta: Float64Array;
  #min: Float64Array;
  #max: Float64Array;

  /**
   * Running moments of `k` variables observed together.
   *
   * @param k number of variables observed together
   */
  constructor(readonly k: number) {
    this.#mean = new Float64Array(k);
    this.#co = new Float64Array(k * k);
    this.#delta = new Float64Array(k);
    this.#min = new Float64Array(k).fill(Infinity);
    this.#max = new Float64Array(k).fill(-Infinity);
  }

  /**
   * Running moments restored from totals computed elsewhere (for example by a database):
   * `count` complete observations, `missing` left out, the means, the co-moments
   * Σ(x_a − mean_a)(x_b − mean_b) as a k × k row-major array (sample covariance × (n − 1)),
   * and the smallest and largest values. Source: welford-1962.
   *
   * @example
   * ```ts
   * import { RunningMoments } from "./stats.ts";
   * const r = RunningMoments.fromTotals({ count: 3, missing: 0, mean: [2], co: [2], min: [1], max: [3] });
   * r.sd(0); // 1
   * ```
   */
  static fromTotals(t: {
    readonly count: number;
    readonly missing: number;
    readonly mean: ArrayLike<number>;
    readonly co: ArrayLike<number>;
    readonly min: ArrayLike<number>;
    readonly max: ArrayLike<number>;
  }): RunningMoments {
    const k = t.mean.length;
    const r = new RunningMoments(k);
    r.#n = t.count;
    r.#missing = t.missing;
    r.#mean.set(Array.from(t.mean));
    r.#co.set(Array.from(t.co));
    r.#min = Float64Array.from(t.min);
    r.#max = Float64Array.from(t.max);
    return r;
  }

  /** Observations counted. */
  get count(): number {
    return this.#n;
  }

  /** Observations left out because a value was missing. */
  get missing(): number {
    return this.#missing;
  }

  /** Add one observation of a single variable (k = 1). */
  push1(x: number): void {
    if (Number.isNaN(x)) {
      this.#missing++;
      return;
    }
    const n = ++this.#n;
    const d = x - this.#mean[0];
    this.#mean[0] += d / n;
    this.#co[0] += d * (x - this.#mean[0]);
    if (x < this.#min[0]) this.#min[0] = x;
    if (x > this.#max[0]) this.#max[0] = x;
  }

  /** Count one observation as missing. */
  push1Missing(): void {
    this.#missing++;
  }

  /** Add one observation of all k variables. */
  push(xs: ArrayLike<number>): void {
    const k = this.k;
    for (let a = 0; a < k; a++) {
      if (Number.isNaN(xs[a])) {
        this.#missing++;
        return;
      }
    }
    const n = ++this.#n;
    const mean = this.#mean;
    const delta = this.#delta;
    for (let a = 0; a < k; a++) {
      delta[a] = xs[a] - mean[a];
      mean[a] += delta[a] / n;
      if (xs[a] < this.#min[a]) this.#min[a] = xs[a];
      if (xs[a] > this.#max[a]) this.#max[a] = xs[a];
    }
    // C[a][b] += (x_a − old mean_a)(x_b − new mean_b)
    for (let a = 0; a < k; a++) {
      for (let b = 0; b < k; b++) this.#co[a * k + b] += delta[a] * (xs[b] - mean[b]);
    }
  }

  /** Mean of variable a (NaN when nothing was counted). */
  mean(a: number): number {
    return this.#n ? this.#mean[a] : NaN;
  }

  /** Sample covariance of variables a and b (n − 1; NaN when fewer than 2). */
  covariance(a: number, b: number): number {
    return this.#n > 1 ? this.#co[a * this.k + b] / (this.#n - 1) : NaN;
  }

  /** Sample variance of variable a. */
  variance(a: number): number {
    return this.covariance(a, a);
  }

  /** Sample SD of variable a. */
  sd(a: number): number {
    return Math.sqrt(this.variance(a));
  }

  /** Smallest value of variable a. */
  min(a: number): number {
    return this.#n ? this.#min[a] : NaN;
  }

  /** Largest value of variable a. */
  max(a: number): number {
    return this.#n ? this.#max[a] : NaN;
  }
}

/**
 * Check that two paired lists have the same length.
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { checkPaired } from "./stats.ts";
 * checkPaired("a", 3, "b", 3); // 3
 * ```
 * @throws {LentilInputError} when they differ.
 */
export function checkPaired(aName: string, a: number, bName: string, b: number): number {
  if (a !== b) {
    throw new LentilInputError(
      `paired data must have one row each: ${aName} has ${a} rows, ${bName} has ${b}`,
    );
  }
  return a;
}

/** Summary of refractions through power vectors. */
export interface VectorSummary {
  /** Rows counted. */
  readonly n: number;
  /** Rows left out because sphere, cylinder or axis was empty. */
  readonly missing: number;
  /** Mean power vector. */
  readonly mean: PowerVector;
  /** The mean vector as a prescription (minus cylinder, axis 1–180). */
  readonly meanRx: SpheroCylinder;
  /** Sample SDs of M, J0, J45. */
  readonly sd: PowerVector;
  /** Sample covariances of the pairs. */
  readonly cov: { readonly mJ0: number; readonly mJ45: number; readonly j0J45: number };
}

/**
 * Feed one refraction into running moments of (M, J0, J45). Source: thibos-1997.
 *
 * @example
 * ```ts
 * import { pushRefraction, RunningMoments } from "./stats.ts";
 * const r = new RunningMoments(3);
 * pushRefraction(r, -2, -1, 180);
 * r.mean(0); // -2.5
 * ```
 */
export function pushRefraction(r: RunningMoments, sph: number, cyl: number, axis: number): void {
  if (Number.isNaN(sph) || Number.isNaN(cyl) || Number.isNaN(axis)) {
    r.push1Missing();
    return;
  }
  const v = toPowerVector({ sphere: sph, cylinder: cyl, axis });
  r.push([v.m, v.j0, v.j45]);
}

/**
 * The vector summary held by running moments of (M, J0, J45). Source: thibos-1997.
 *
 * @example
 * ```ts
 * import { pushRefraction, RunningMoments, vectorSummaryFrom } from "./stats.ts";
 * const r = new RunningMoments(3);
 * pushRefraction(r, 1, 0, 180);
 * vectorSummaryFrom(r).meanRx.sphere; // 1
 * ```
 * @throws {LentilInputError} when no row was counted.
 */
export function vectorSummaryFrom(r: RunningMoments): VectorSummary {
  if (r.count === 0) throw new LentilInputError("no refraction to summarise (every row empty)");
  const mean = { m: r.mean(0), j0: r.mean(1), j45: r.mean(2) };
  return {
    n: r.count,
    missing: r.missing,
    mean,
    meanRx: fromPowerVector(mean),
    sd: { m: r.sd(0), j0: r.sd(1), j45: r.sd(2) },
    cov: { mJ0: r.covariance(0, 1), mJ45: r.covariance(0, 2), j0J45: r.covariance(1, 2) },
  };
}

/**
 * Mean prescription, SDs and covariances of refractions given as sphere, cylinder and axis
 * columns (D, D, degrees), through power vectors. Source: thibos-1997.
 *
 * @example
 * ```ts
 * import { vectorSummary } from "./stats.ts";
 * // +1.00 × 180 and +1.00 × 90 average to a sphere of +0.50 D.
 * vectorSummary([0, 0], [1, 1], [180, 90]).meanRx; // { sphere: 0.5, cylinder: 0, axis: 180 }
 * ```
 * @throws {LentilInputError} when the columns differ in length or every row is empty.
 */
export function vectorSummary(sph: Numbers, cyl: Numbers, axis: Numbers): VectorSummary {
  checkPaired("sphere", sph.length, "cylinder", cyl.length);
  checkPaired("sphere", sph.length, "axis", axis.length);
  const r = new RunningMoments(3);
  for (let i = 0; i < sph.length; i++) pushRefraction(r, sph[i], cyl[i], axis[i]);
  return vectorSummaryFrom(r);
}
