/**
 * The dioptric power matrix of a thin spherocylinder and its decomposition back into
 * principal powers and meridians (the eigenvalues and eigenvectors of the symmetric 2×2
 * matrix), in the standard axis frame: x to the right and y up as seen facing the wearer,
 * angles counter-clockwise.
 *
 * Source: long-1976 (matrix formalism), keating-1981 (thin lenses in contact add).
 * F = [[S + C·sin²α, −C·sinα·cosα], [−C·sinα·cosα, S + C·cos²α]].
 *
 * @example
 * ```ts
 * import { toPowerMatrix } from "./power_matrix.ts";
 * toPowerMatrix({ sphere: -2, cylinder: -1, axis: 90 }); // [[-3, ~0], [~0, -2]]
 * ```
 *
 * @module
 */

import { checkFinite, LentilInputError } from "./errors.ts";
import { normaliseAxis, type SpheroCylinder } from "./spherocylinder.ts";

/** A symmetric 2×2 dioptric power matrix, D: `[[fxx, fxy], [fyx, fyy]]`. */
export type PowerMatrix = readonly [readonly [number, number], readonly [number, number]];

/** Principal powers and their meridians (degrees, 1–180); `power1` is the more positive. */
export interface PrincipalPowers {
  /** The more positive principal power, D. */
  readonly power1: number;
  /** Meridian of `power1`, degrees 1–180. */
  readonly meridian1: number;
  /** The less positive principal power, D. */
  readonly power2: number;
  /** Meridian of `power2`, degrees 1–180 (always `meridian1` ± 90). */
  readonly meridian2: number;
}

const RAD = Math.PI / 180;

/**
 * Dioptric power matrix of a spherocylinder. Source: long-1976.
 *
 * @example
 * ```ts
 * import { toPowerMatrix } from "./power_matrix.ts";
 * toPowerMatrix({ sphere: 1, cylinder: 0, axis: 180 }); // [[1, 0], [0, 1]]
 * ```
 */
export function toPowerMatrix(rx: SpheroCylinder): PowerMatrix {
  const s = Math.sin(rx.axis * RAD);
  const c = Math.cos(rx.axis * RAD);
  const off = -rx.cylinder * s * c;
  return [
    [rx.sphere + rx.cylinder * s * s, off],
    [off, rx.sphere + rx.cylinder * c * c],
  ];
}

/**
 * Check that `m` is a finite symmetric 2×2 matrix, as every thin spherocylinder's is.
 * Source: long-1976.
 *
 * @example
 * ```ts
 * import { checkPowerMatrix } from "./power_matrix.ts";
 * checkPowerMatrix([[1, 0], [0, 2]]).length; // 2
 * ```
 * @throws {LentilInputError} when the matrix is not 2×2 or not symmetric.
 */
export function checkPowerMatrix(m: readonly (readonly number[])[]): PowerMatrix {
  if (m.length !== 2 || m[0].length !== 2 || m[1].length !== 2) {
    throw new LentilInputError("a dioptric power matrix must be 2×2: [[fxx, fxy], [fyx, fyy]]");
  }
  for (const row of m) for (const v of row) checkFinite("power matrix entry", v);
  const scale = Math.max(1, Math.abs(m[0][1]), Math.abs(m[1][0]));
  if (Math.abs(m[0][1] - m[1][0]) > 1e-9 * scale) {
    throw new LentilInputError(
      `a thin spherocylinder's power matrix is symmetric; got fxy ${m[0][1]} and fyx ${
        m[1][0]
      } (a matrix with unequal off-diagonal entries describes a thick or tilted system)`,
    );
  }
  return [[m[0][0], m[0][1]], [m[1][0], m[1][1]]];
}

/**
 * Principal powers and meridians of a power matrix (eigen-decomposition of the symmetric
 * 2×2 matrix). A spherical matrix reports meridians 180 and 90. Source: long-1976.
 *
 * @example
 * ```ts
 * import { principalPowers } from "./power_matrix.ts";
 * principalPowers([[-3, 0], [0, -2]]); // { power1: -2, meridian1: 90, power2: -3, meridian2: 180 }
 * ```
 */
export function principalPowers(matrix: PowerMatrix): PrincipalPowers {
  const m = checkPowerMatrix(matrix);
  const mean = (m[0][0] + m[1][1]) / 2;
  const half = (m[0][0] - m[1][1]) / 2;
  const off = (m[0][1] + m[1][0]) / 2;
  const r = Math.hypot(half, off);
  const meridian1 = r < 1e-12 ? 180 : normaliseAxis(0.5 * Math.atan2(2 * off, 2 * half) / RAD);
  return {
    power1: mean + r,
    meridian1,
    power2: mean - r,
    meridian2: normaliseAxis(meridian1 + 90),
  };
}

/**
 * Spherocylinder (minus-cylinder form) of a power matrix: the sphere is the more positive
 * principal power and the axis its meridian. Source: long-1976.
 *
 * @example
 * ```ts
 * import { fromPowerMatrix } from "./power_matrix.ts";
 * fromPowerMatrix([[-3, 0], [0, -2]]); // { sphere: -2, cylinder: -1, axis: 90 }
 * ```
 */
export function fromPowerMatrix(matrix: PowerMatrix): SpheroCylinder {
  const p = principalPowers(matrix);
  return { sphere: p.power1, cylinder: p.power2 - p.power1, axis: p.meridian1 };
}

/**
 * Sum of two power matrices (thin lenses in contact). Source: keating-1981.
 *
 * @example
 * ```ts
 * import { addMatrices } from "./power_matrix.ts";
 * addMatrices([[1, 0], [0, 1]], [[0, 0], [0, 2]]); // [[1, 0], [0, 3]]
 * ```
 */
export function addMatrices(a: PowerMatrix, b: PowerMatrix, sign = 1): PowerMatrix {
  return [
    [a[0][0] + sign * b[0][0], a[0][1] + sign * b[0][1]],
    [a[1][0] + sign * b[1][0], a[1][1] + sign * b[1][1]],
  ];
}
