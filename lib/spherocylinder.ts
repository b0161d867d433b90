/**
 * The spherocylinder record: sphere and cylinder in diopters, axis in degrees (standard axis
 * notation, 1–180; 0 is normalised to 180). Source: iso-13666-axis.
 *
 * @example
 * ```ts
 * import { normaliseAxis } from "./spherocylinder.ts";
 * normaliseAxis(0); // 180
 * ```
 *
 * @module
 */

/** A spherocylindrical power: sphere S and cylinder C in D, axis α in degrees. */
export interface SpheroCylinder {
  /** Sphere, D. */
  readonly sphere: number;
  /** Cylinder, D (either sign). */
  readonly cylinder: number;
  /** Axis, degrees, 1–180 (meaningless when cylinder is 0; kept as given). */
  readonly axis: number;
}

/**
 * Bring any angle in degrees into the 1–180 axis range (0 and 180 both become 180), to the
 * nearest 1e-9 to absorb float noise. Source: iso-13666-axis.
 *
 * @example
 * ```ts
 * import { normaliseAxis } from "./spherocylinder.ts";
 * normaliseAxis(200); // 20
 * normaliseAxis(-10); // 170
 * ```
 */
export function normaliseAxis(deg: number): number {
  let a = ((deg % 180) + 180) % 180;
  if (Math.abs(a) < 1e-9 || Math.abs(a - 180) < 1e-9) a = 180;
  return a;
}
