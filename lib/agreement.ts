/**
 * Agreement between two methods (or two visits) measured on the same eyes: the per-row
 * difference, its mean (the bias) and the 95% limits of agreement, bias ± 1.96·SD of the
 * differences. For refractions the differences are taken on power vectors, so M, J0 and
 * J45 each get their own bias and limits.
 *
 * Sources: bland-altman-1986, thibos-1997.
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
import { checkPaired, type Numbers, RunningMoments } from "./stats.ts";

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
