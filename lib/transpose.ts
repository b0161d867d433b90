/**
 * Cylinder forms and single-number equivalents of a spherocylinder: transposition between
 * plus- and minus-cylinder form, the spherical equivalent and the power in any meridian.
 *
 * Sources: common-practice (transposition S/C×α ↔ (S+C)/−C×(α±90)), thibos-1997 (spherical
 * equivalent M = S + C/2), sine-squared (F(θ) = S + C·sin²(θ − α)), iso-13666-axis.
 *
 * @example
 * ```ts
 * import { transpose } from "./transpose.ts";
 * transpose({ sphere: -2.25, cylinder: -0.75, axis: 170 }); // { sphere: -3, cylinder: 0.75, axis: 80 }
 * ```
 *
 * @module
 */

import { checkFinite } from "./errors.ts";
import { normaliseAxis, type SpheroCylinder } from "./spherocylinder.ts";

const RAD = Math.PI / 180;

/** `-0` becomes `0`, so that formatting never shows a signed zero. */
function unsignedZero(x: number): number {
  return x === 0 ? 0 : x;
}

/**
 * Transpose to the other cylinder form: (S + C) / −C × (α ± 90). Other fields of the record
 * (add, prism, eye) are kept. Source: common-practice, iso-13666-axis.
 *
 * @example
 * ```ts
 * import { transpose } from "./transpose.ts";
 * transpose({ sphere: 1, cylinder: 2, axis: 90 }).axis; // 180
 * ```
 */
export function transpose<T extends SpheroCylinder>(rx: T): T {
  return {
    ...rx,
    sphere: unsignedZero(rx.sphere + rx.cylinder),
    cylinder: unsignedZero(-rx.cylinder),
    axis: normaliseAxis(rx.axis + 90),
  };
}

/**
 * The same lens in minus-cylinder form (unchanged when already there or spherical).
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { toMinusCylinder } from "./transpose.ts";
 * toMinusCylinder({ sphere: -3, cylinder: 0.75, axis: 80 }).cylinder; // -0.75
 * ```
 */
export function toMinusCylinder<T extends SpheroCylinder>(rx: T): T {
  return rx.cylinder > 0 ? transpose(rx) : rx;
}

/**
 * The same lens in plus-cylinder form (unchanged when already there or spherical).
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { toPlusCylinder } from "./transpose.ts";
 * toPlusCylinder({ sphere: -2.25, cylinder: -0.75, axis: 170 }).sphere; // -3
 * ```
 */
export function toPlusCylinder<T extends SpheroCylinder>(rx: T): T {
  return rx.cylinder < 0 ? transpose(rx) : rx;
}

/**
 * Spherical equivalent M = S + C/2, D. Source: thibos-1997.
 *
 * @example
 * ```ts
 * import { sphericalEquivalent } from "./transpose.ts";
 * sphericalEquivalent({ sphere: -2.25, cylinder: -0.75, axis: 170 }); // -2.625
 * ```
 */
export function sphericalEquivalent(rx: SpheroCylinder): number {
  return rx.sphere + rx.cylinder / 2;
}

/**
 * Power in the meridian at `meridian` degrees by the sine-squared law,
 * F(θ) = S + C·sin²(θ − α). Source: sine-squared.
 *
 * @example
 * ```ts
 * import { meridianPower } from "./transpose.ts";
 * meridianPower({ sphere: -2, cylinder: -1, axis: 180 }, 90); // -3
 * ```
 */
export function meridianPower(rx: SpheroCylinder, meridian: number): number {
  checkFinite("meridian", meridian);
  const s = Math.sin((meridian - rx.axis) * RAD);
  return rx.sphere + rx.cylinder * s * s;
}
