/**
 * Distribution functions the study statistics need: the normal, Student's t, F and χ²
 * distributions (cumulative probability and quantile), and the non-central t (cumulative
 * probability and quantile) for exact intervals on limits of agreement. Everything is
 * computed from the log-gamma function and the regularised incomplete beta and gamma
 * functions (continued fractions and series); quantiles invert the cumulative function by
 * bracketing and bisection to full double precision.
 *
 * Sources: numerical-recipes-2007 (log-gamma, incomplete beta and gamma),
 * abramowitz-stegun-1964 (starting value of the normal quantile, 26.2.23),
 * lenth-1989 (non-central t as a Poisson mixture of incomplete beta functions).
 *
 * @example
 * ```ts
 * import { tQuantile } from "./distributions.ts";
 * tQuantile(0.975, 16).toFixed(4); // "2.1199"
 * ```
 *
 * @module
 */

import { LentilRangeError } from "./errors.ts";

const LANCZOS = [
  0.99999999999980993,
  676.5203681218851,
  -1259.1392167224028,
  771.32342877765313,
  -176.61502916214059,
  12.507343278686905,
  -0.13857109526572012,
  9.9843695780195716e-6,
  1.5056327351493116e-7,
];

/**
 * Natural logarithm of the gamma function, x > 0 (Lanczos approximation, g = 7).
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { logGamma } from "./distributions.ts";
 * Math.exp(logGamma(5)).toFixed(6); // "24.000000"
 * ```
 */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  x -= 1;
  let a = LANCZOS[0];
  const t = x + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i] / (x + i);
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(t) - t + Math.log(a);
}

const EPS = 1e-15;
const TINY = 1e-300;

/** Continued fraction of the incomplete beta function (modified Lentz). */
function betaFraction(x: number, a: number, b: number): number {
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 10000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h;
}

/**
 * The regularised incomplete beta function I_x(a, b), 0 ≤ x ≤ 1.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { incompleteBeta } from "./distributions.ts";
 * incompleteBeta(0.5, 2, 2); // 0.5
 * ```
 */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(
    logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log1p(-x),
  );
  if (x < (a + 1) / (a + b + 2)) return (front * betaFraction(x, a, b)) / a;
  return 1 - (front * betaFraction(1 - x, b, a)) / b;
}

/**
 * The regularised lower incomplete gamma function P(a, x), x ≥ 0.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { incompleteGamma } from "./distributions.ts";
 * incompleteGamma(1, 1).toFixed(6); // "0.632121"
 * ```
 */
export function incompleteGamma(a: number, x: number): number {
  if (x <= 0) return 0;
  const lead = -x + a * Math.log(x) - logGamma(a);
  if (x < a + 1) {
    let ap = a;
    let sum = 1 / a;
    let del = sum;
    for (let n = 0; n < 100000; n++) {
      ap += 1;
      del *= x / ap;
      sum += del;
      if (Math.abs(del) < Math.abs(sum) * EPS) break;
    }
    return sum * Math.exp(lead);
  }
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 100000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return 1 - Math.exp(lead) * h;
}

/**
 * Cumulative probability of the standard normal distribution.
 * Source: numerical-recipes-2007 (through the incomplete gamma function).
 *
 * @example
 * ```ts
 * import { normalCdf } from "./distributions.ts";
 * normalCdf(1.959963984540054).toFixed(6); // "0.975000"
 * ```
 */
export function normalCdf(z: number): number {
  if (!Number.isFinite(z)) return z > 0 ? 1 : 0;
  const p = incompleteGamma(0.5, (z * z) / 2);
  return z >= 0 ? 0.5 + p / 2 : 0.5 - p / 2;
}

function normalDensity(z: number): number {
  return Math.exp(-(z * z) / 2) / Math.sqrt(2 * Math.PI);
}

function checkProbability(p: number): void {
  if (!(p > 0 && p < 1)) throw new LentilRangeError("probability", p, 0, 1);
}

/**
 * Quantile of the standard normal distribution: a rational start (Abramowitz & Stegun
 * 26.2.23), refined by Newton's method on the cumulative probability.
 * Sources: abramowitz-stegun-1964, numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { normalQuantile } from "./distributions.ts";
 * normalQuantile(0.975).toFixed(4); // "1.9600"
 * ```
 * @throws {LentilRangeError} when p is not strictly between 0 and 1.
 */
export function normalQuantile(p: number): number {
  checkProbability(p);
  const q = p < 0.5 ? p : 1 - p;
  const t = Math.sqrt(-2 * Math.log(q));
  let z = t - (2.515517 + 0.802853 * t + 0.010328 * t * t) /
      (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  if (p < 0.5) z = -z;
  for (let i = 0; i < 6; i++) {
    const step = (normalCdf(z) - p) / normalDensity(z);
    z -= step;
    if (Math.abs(step) < 1e-14 * Math.max(1, Math.abs(z))) break;
  }
  return z;
}

function checkDf(what: string, df: number): void {
  if (!(df > 0) || !Number.isFinite(df)) throw new LentilRangeError(what, df, 1, Infinity);
}

/**
 * Cumulative probability of Student's t distribution with `df` degrees of freedom.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { tCdf } from "./distributions.ts";
 * tCdf(0, 5); // 0.5
 * ```
 * @throws {LentilRangeError} when df is not positive.
 */
export function tCdf(t: number, df: number): number {
  checkDf("degrees of freedom", df);
  if (!Number.isFinite(t)) return t > 0 ? 1 : 0;
  const tail = 0.5 * incompleteBeta(df / (df + t * t), df / 2, 0.5);
  return t > 0 ? 1 - tail : tail;
}

/**
 * Cumulative probability of the F distribution with d1 and d2 degrees of freedom.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { fCdf } from "./distributions.ts";
 * fCdf(1, 4, 4); // 0.5
 * ```
 * @throws {LentilRangeError} when a df is not positive.
 */
export function fCdf(x: number, d1: number, d2: number): number {
  checkDf("numerator degrees of freedom", d1);
  checkDf("denominator degrees of freedom", d2);
  if (x <= 0) return 0;
  if (!Number.isFinite(x)) return 1;
  return incompleteBeta((d1 * x) / (d1 * x + d2), d1 / 2, d2 / 2);
}

/**
 * Cumulative probability of the χ² distribution with k degrees of freedom.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { chiSquareCdf } from "./distributions.ts";
 * chiSquareCdf(5.991464547107979, 2).toFixed(6); // "0.950000"
 * ```
 * @throws {LentilRangeError} when k is not positive.
 */
export function chiSquareCdf(x: number, k: number): number {
  checkDf("degrees of freedom", k);
  return x <= 0 ? 0 : incompleteGamma(k / 2, x / 2);
}

/**
 * The x at which an increasing cumulative function reaches p: a bracket grown outward
 * from `start`, then bisection to the limit of double precision.
 */
function invert(cdf: (x: number) => number, p: number, start: number, lowest = -Infinity) {
  let lo = start;
  let hi = start;
  let width = Math.max(1, Math.abs(start));
  while (cdf(lo) > p) {
    lo = Math.max(lowest, lo - width);
    width *= 2;
    if (lo === lowest) break;
  }
  width = Math.max(1, Math.abs(start));
  while (cdf(hi) < p) {
    hi += width;
    width *= 2;
    if (!Number.isFinite(hi)) return hi;
  }
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid === lo || mid === hi) break;
    if (cdf(mid) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/**
 * Quantile of Student's t distribution with `df` degrees of freedom.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { tQuantile } from "./distributions.ts";
 * tQuantile(0.975, 1e6).toFixed(3); // "1.960"
 * ```
 * @throws {LentilRangeError} when p is outside (0, 1) or df is not positive.
 */
export function tQuantile(p: number, df: number): number {
  checkProbability(p);
  checkDf("degrees of freedom", df);
  if (p === 0.5) return 0;
  return invert((t) => tCdf(t, df), p, normalQuantile(p));
}

/**
 * Quantile of the F distribution with d1 and d2 degrees of freedom.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { fQuantile } from "./distributions.ts";
 * fQuantile(0.95, 2, 10).toFixed(4); // "4.1028"
 * ```
 * @throws {LentilRangeError} when p is outside (0, 1) or a df is not positive.
 */
export function fQuantile(p: number, d1: number, d2: number): number {
  checkProbability(p);
  return invert((x) => fCdf(x, d1, d2), p, 1, 0);
}

/**
 * Quantile of the χ² distribution with k degrees of freedom.
 * Source: numerical-recipes-2007.
 *
 * @example
 * ```ts
 * import { chiSquareQuantile } from "./distributions.ts";
 * chiSquareQuantile(0.95, 2).toFixed(4); // "5.9915"
 * ```
 * @throws {LentilRangeError} when p is outside (0, 1) or k is not positive.
 */
export function chiSquareQuantile(p: number, k: number): number {
  checkProbability(p);
  return invert((x) => chiSquareCdf(x, k), p, k, 0);
}

/** Non-central t for t ≥ 0: Φ(−δ) + ½ Σ [p_j I_x(j + ½, ν/2) + q_j I_x(j + 1, ν/2)]. */
function noncentralUpper(t: number, df: number, delta: number): number {
  const base = normalCdf(-delta);
  if (t === 0) return base;
  const x = (t * t) / (t * t + df);
  const lambda = (delta * delta) / 2;
  if (lambda === 0) return base + 0.5 * incompleteBeta(x, 0.5, df / 2);
  const logL = Math.log(lambda);
  const logD = Math.log(Math.abs(delta)) - 0.5 * Math.LN2;
  const sign = delta < 0 ? -1 : 1;
  const term = (j: number) => {
    const common = -lambda + j * logL;
    const pj = Math.exp(common - logGamma(j + 1));
    const qj = sign * Math.exp(logD + common - logGamma(j + 1.5));
    return {
      sum: pj * incompleteBeta(x, j + 0.5, df / 2) + qj * incompleteBeta(x, j + 1, df / 2),
      w: pj + Math.abs(qj),
    };
  };
  const mode = Math.floor(lambda);
  let sum = 0;
  for (let j = mode; j >= 0; j--) {
    const r = term(j);
    sum += r.sum;
    if (r.w < 1e-17 && j < mode) break;
  }
  for (let j = mode + 1; j < mode + 100000; j++) {
    const r = term(j);
    sum += r.sum;
    if (r.w < 1e-17) break;
  }
  return Math.min(1, Math.max(0, base + 0.5 * sum));
}

/**
 * Cumulative probability of the non-central t distribution with `df` degrees of freedom
 * and non-centrality δ.
 * Source: lenth-1989.
 *
 * @example
 * ```ts
 * import { noncentralTCdf } from "./distributions.ts";
 * noncentralTCdf(0, 10, 0); // 0.5
 * ```
 * @throws {LentilRangeError} when df is not positive.
 */
export function noncentralTCdf(t: number, df: number, delta: number): number {
  checkDf("degrees of freedom", df);
  if (!Number.isFinite(t)) return t > 0 ? 1 : 0;
  return t >= 0 ? noncentralUpper(t, df, delta) : 1 - noncentralUpper(-t, df, -delta);
}

/**
 * Quantile of the non-central t distribution.
 * Source: lenth-1989.
 *
 * @example
 * ```ts
 * import { noncentralTQuantile } from "./distributions.ts";
 * noncentralTQuantile(0.975, 20, 0).toFixed(3); // "2.086"
 * ```
 * @throws {LentilRangeError} when p is outside (0, 1) or df is not positive.
 */
export function noncentralTQuantile(p: number, df: number, delta: number): number {
  checkProbability(p);
  checkDf("degrees of freedom", df);
  // The Poisson mixture needs about δ²/2 terms: past LARGE_NONCENTRAL d.f. and δ (a million
  // pairs gives δ ≈ 1,960) the normal approximation is exact to the digits a limit shows.
  if (df >= LARGE_NONCENTRAL && Math.abs(delta) >= Math.sqrt(LARGE_NONCENTRAL)) {
    return noncentralTQuantileLarge(p, df, delta);
  }
  return invert((t) => noncentralTCdf(t, df, delta), p, delta);
}

/** Degrees of freedom (and δ²) from which the non-central t quantile is approximated. */
const LARGE_NONCENTRAL = 10_000;

/**
 * Quantile of the non-central t for large d.f. by the normal approximation
 * P(T ≤ t) ≈ Φ((t·(1 − 1/(4ν)) − δ) / √(1 + t²/(2ν))), solved for t (a quadratic).
 * Source: abramowitz-stegun-1964.
 *
 * @example
 * ```ts
 * import { noncentralTQuantileLarge } from "./distributions.ts";
 * noncentralTQuantileLarge(0.5, 1e6, 1960).toFixed(1); // "1960.0"
 * ```
 */
export function noncentralTQuantileLarge(p: number, df: number, delta: number): number {
  const z = normalQuantile(p);
  const a = 1 - 1 / (4 * df);
  // (a·t − δ)² = z²·(1 + t²/(2ν)), on the branch where a·t − δ has the sign of z.
  const qa = a * a - (z * z) / (2 * df);
  const qb = -2 * a * delta;
  const qc = delta * delta - z * z;
  if (z === 0) return delta / a;
  const root = Math.sqrt(Math.max(0, qb * qb - 4 * qa * qc));
  const t1 = (-qb + root) / (2 * qa);
  const t2 = (-qb - root) / (2 * qa);
  return Math.sign(a * t1 - delta) === Math.sign(z) ? t1 : t2;
}
