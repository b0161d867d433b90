/**
 * Chart geometry: the height of a letter for an acuity at a distance (the reference
 * optotype subtends 5′ overall at V = 1.0), the acuity a physical letter gives at a
 * distance, and the vergence a test distance presents.
 *
 * Sources: iso-8596 (h = d·tan(5′/V); 8.73 mm at 6 m for V = 1.0), test-distance-vergence.
 *
 * @example
 * ```ts
 * import { letterHeight } from "./chart.ts";
 * letterHeight(1, 6).toFixed(2); // "8.73"
 * ```
 *
 * @module
 */

import { checkFinite, checkRange } from "./errors.ts";
import { REFERENCE_VALUES } from "../shared/constants.ts";

const ARCMIN = Math.PI / (180 * 60);
const OPTOTYPE = REFERENCE_VALUES.referenceOptotypeArcmin.value;

/** Accepted test distances, metres (a near card at 10 cm to a long corridor). */
export const DISTANCE_RANGE = [0.1, 100] as const;

/**
 * Overall angular size (arcmin) of an optotype for decimal acuity `decimal`: 5′/V.
 * Source: iso-8596.
 *
 * @example
 * ```ts
 * import { optotypeAngle } from "./chart.ts";
 * optotypeAngle(0.5); // 10
 * ```
 * @throws {LentilRangeError} for a decimal acuity outside 0.001–10.
 */
export function optotypeAngle(decimal: number): number {
  checkRange("decimal acuity", decimal, 0.001, 10);
  return OPTOTYPE / decimal;
}

/**
 * Letter height (mm) for decimal acuity `decimal` at `distance` metres:
 * h = d·tan(5′/V). Source: iso-8596.
 *
 * @example
 * ```ts
 * import { letterHeight } from "./chart.ts";
 * letterHeight(0.1, 6).toFixed(1); // "87.3"
 * ```
 * @throws {LentilRangeError} for a distance outside 0.1–100 m or a bad acuity.
 */
export function letterHeight(decimal: number, distance: number): number {
  checkRange("test distance", distance, DISTANCE_RANGE[0], DISTANCE_RANGE[1], "m");
  return 1000 * distance * Math.tan(optotypeAngle(decimal) * ARCMIN);
}

/**
 * Decimal acuity that a letter `height` mm high presents at `distance` metres: the inverse
 * of {@linkcode letterHeight}. Source: iso-8596.
 *
 * @example
 * ```ts
 * import { acuityForLetter } from "./chart.ts";
 * acuityForLetter(8.7266, 6).toFixed(3); // "1.000"
 * ```
 * @throws {LentilRangeError} for a height outside 0.01–2000 mm or a bad distance.
 */
export function acuityForLetter(height: number, distance: number): number {
  checkRange("letter height", height, 0.01, 2000, "mm");
  checkRange("test distance", distance, DISTANCE_RANGE[0], DISTANCE_RANGE[1], "m");
  const angle = Math.atan(height / (1000 * distance)) / ARCMIN;
  return OPTOTYPE / angle;
}

/**
 * Vergence (D) of light from a chart at `distance` metres arriving at the eye: −1/d
 * (−0.17 D at 6 m, −0.25 D at 4 m). Source: test-distance-vergence.
 *
 * @example
 * ```ts
 * import { testDistanceVergence } from "./chart.ts";
 * testDistanceVergence(4); // -0.25
 * ```
 * @throws {LentilRangeError} for a distance outside 0.1–100 m.
 */
export function testDistanceVergence(distance: number): number {
  checkRange("test distance", distance, DISTANCE_RANGE[0], DISTANCE_RANGE[1], "m");
  return -1 / distance;
}

/**
 * A refraction found with a chart at `distance` metres, referred to infinity: the power
 * plus the vergence the chart presented (−1.00 D found at 4 m → −1.25 D).
 * Source: test-distance-vergence.
 *
 * @example
 * ```ts
 * import { referToInfinity } from "./chart.ts";
 * referToInfinity(-1, 4); // -1.25
 * ```
 * @throws {LentilRangeError} for a bad power or distance.
 */
export function referToInfinity(power: number, distance: number): number {
  checkFinite("power", power);
  return power + testDistanceVergence(distance);
}
