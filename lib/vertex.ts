/**
 * Vertex distance: the effective power of a thin lens moved along the axis.
 *
 * Source: vertex-formula (any visual optics text, e.g. Tunnacliffe, Introduction to Visual
 * Optics): F' = F / (1 − d·F), d in metres, positive when the lens moves toward the eye.
 *
 * @example
 * ```ts
 * import { effectivePower } from "./vertex.ts";
 * effectivePower(-10, 0.012).toFixed(2); // "-8.93"
 * ```
 *
 * @module
 */

import { checkFinite, LentilRangeError } from "./errors.ts";

/**
 * Effective power of a lens of power `power` (D) moved `shift` metres toward the eye
 * (negative: away from the eye). Source: vertex-formula.
 *
 * @example
 * ```ts
 * import { effectivePower } from "./vertex.ts";
 * effectivePower(10, 0.012).toFixed(2); // "11.36"
 * ```
 * @throws {LentilRangeError} when the lens would be moved to its own focal point.
 */
export function effectivePower(power: number, shift: number): number {
  checkFinite("power", power);
  checkFinite("vertex shift", shift);
  const denom = 1 - shift * power;
  if (Math.abs(denom) < 1e-9) {
    throw new LentilRangeError("vertex shift", shift, -Infinity, Infinity, "m");
  }
  return power / denom;
}
