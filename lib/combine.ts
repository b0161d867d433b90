/**
 * Combining thin spherocylinders in contact at any axes (obliquely crossed cylinders): the
 * sum and the difference through the dioptric power matrix, and the over-refraction that
 * turns one prescription into another. Results are in minus-cylinder form.
 *
 * Sources: long-1976 and keating-1981 (power matrices add), thibos-1997 (equivalently,
 * power vectors add), thompson-1899 (the classical obliquely-crossed-cylinder result these
 * agree with).
 *
 * @example
 * ```ts
 * import { combineLenses } from "./combine.ts";
 * combineLenses({ sphere: 0, cylinder: 1, axis: 90 }, { sphere: 0, cylinder: 1, axis: 180 }); // +1.00 DS
 * ```
 *
 * @module
 */

import { addMatrices, fromPowerMatrix, toPowerMatrix } from "./power_matrix.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";

/**
 * The single spherocylinder equivalent to thin lenses `a` and `b` in contact.
 * Sources: long-1976, keating-1981.
 *
 * @example
 * ```ts
 * import { combineLenses } from "./combine.ts";
 * combineLenses({ sphere: -2, cylinder: 0, axis: 180 }, { sphere: 0, cylinder: -1, axis: 45 }); // { sphere: -2, cylinder: -1, axis: 45 }
 * ```
 */
export function combineLenses(a: SpheroCylinder, b: SpheroCylinder): SpheroCylinder {
  return fromPowerMatrix(addMatrices(toPowerMatrix(a), toPowerMatrix(b)));
}

/**
 * The spherocylinder `a − b`: the lens that, in contact with `b`, gives `a`.
 * Sources: long-1976, keating-1981.
 *
 * @example
 * ```ts
 * import { lensDifference } from "./combine.ts";
 * lensDifference({ sphere: -2, cylinder: -1, axis: 90 }, { sphere: -2, cylinder: 0, axis: 180 }); // { sphere: 0, cylinder: -1, axis: 90 }
 * ```
 */
export function lensDifference(a: SpheroCylinder, b: SpheroCylinder): SpheroCylinder {
  return fromPowerMatrix(addMatrices(toPowerMatrix(a), toPowerMatrix(b), -1));
}

/**
 * The over-refraction: the lens that, held over `current`, gives `target`
 * (target − current, thin lenses in contact). Sources: long-1976, keating-1981.
 *
 * @example
 * ```ts
 * import { overRefraction } from "./combine.ts";
 * overRefraction({ sphere: -2, cylinder: 0, axis: 180 }, { sphere: -2.5, cylinder: -0.5, axis: 180 }); // { sphere: -0.5, cylinder: -0.5, axis: 180 }
 * ```
 */
export function overRefraction(current: SpheroCylinder, target: SpheroCylinder): SpheroCylinder {
  return lensDifference(target, current);
}
