/**
 * Power vectors (M, J0, J45) of a spherocylinder, blur strength, and the inverse.
 *
 * Source: thibos-1997 — M = S + C/2, J0 = −(C/2)·cos 2α, J45 = −(C/2)·sin 2α,
 * B = √(M² + J0² + J45²).
 *
 * @example
 * ```ts
 * import { toPowerVector } from "./power_vector.ts";
 * toPowerVector({ sphere: -2, cylinder: -1, axis: 180 }); // { m: -2.5, j0: 0.5, j45: ~0 }
 * ```
 *
 * @module
 */

import { normaliseAxis, type SpheroCylinder } from "./spherocylinder.ts";

/** A power vector, all components in D. */
export interface PowerVector {
  /** Spherical equivalent M, D. */
  readonly m: number;
  /** Jackson cross-cylinder at 0°/90°, D. */
  readonly j0: number;
  /** Jackson cross-cylinder at 45°/135°, D. */
  readonly j45: number;
}

const RAD = Math.PI / 180;

/**
 * Power vector of a spherocylinder. Source: thibos-1997.
 *
 * @example
 * ```ts
 * import { toPowerVector } from "./power_vector.ts";
 * toPowerVector({ sphere: 1, cylinder: -2, axis: 90 }).j0; // -1
 * ```
 */
export function toPowerVector(rx: SpheroCylinder): PowerVector {
  const half = rx.cylinder / 2;
  const a = 2 * rx.axis * RAD;
  return { m: rx.sphere + half, j0: -half * Math.cos(a), j45: -half * Math.sin(a) };
}

/**
 * Blur strength B = √(M² + J0² + J45²). Source: thibos-1997.
 *
 * @example
 * ```ts
 * import { blurStrength } from "./power_vector.ts";
 * blurStrength({ m: 3, j0: 4, j45: 0 }); // 5
 * ```
 */
export function blurStrength(v: PowerVector): number {
  return Math.hypot(v.m, v.j0, v.j45);
}

/**
 * Spherocylinder (minus-cylinder form, axis 1–180) of a power vector. Source: thibos-1997.
 * A vector with no astigmatic part gives cylinder 0 and axis 180.
 *
 * @example
 * ```ts
 * import { fromPowerVector } from "./power_vector.ts";
 * fromPowerVector({ m: -2.5, j0: 0.5, j45: 0 }); // { sphere: -2, cylinder: -1, axis: 180 }
 * ```
 */
export function fromPowerVector(v: PowerVector): SpheroCylinder {
  const j = Math.hypot(v.j0, v.j45);
  if (j < 1e-12) return { sphere: v.m, cylinder: 0, axis: 180 };
  const cylinder = -2 * j;
  const axis = normaliseAxis(0.5 * Math.atan2(v.j45, v.j0) / RAD);
  return { sphere: v.m - cylinder / 2, cylinder, axis };
}
