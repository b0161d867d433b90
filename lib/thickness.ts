/**
 * Lens thickness and materials: surface sag, centre and edge thickness of a
 * spherocylindrical lens for a diameter (or the diameter a frame needs), index and minimum
 * thickness, the comparison across common indices, and the true power from a lens-measure
 * reading calibrated for another index.
 *
 * Model (thin-lens form, jalie-lenses): the front surface has power F1 (the base curve, in
 * the lens material) and the back surface F2(θ) = F(θ) − F1 in each principal meridian; a
 * surface of power F has radius r = (n − 1)/F and sag s = r − √(r² − y²) at semi-diameter
 * y; centre minus edge thickness is s(F1) + s(F2) with sags signed as the surface powers.
 * The thinnest point (the centre of a minus lens, the edge of a plus lens) is held at the
 * minimum thickness. Thickness does not alter the powers here (a thin-lens estimate).
 *
 * @example
 * ```ts
 * import { surfaceSag } from "./thickness.ts";
 * surfaceSag(100, 30).toFixed(3); // "4.606"
 * ```
 *
 * @module
 */

import { checkFinite, checkRange, LentilInputError } from "./errors.ts";
import { principalPowers, toPowerMatrix } from "./power_matrix.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";

/** Accepted refractive indices. */
export const INDEX_RANGE = [1.4, 1.9] as const;
/** Accepted lens diameters, mm. */
export const DIAMETER_RANGE = [10, 90] as const;
/** Common spectacle lens indices compared by {@linkcode thicknessByIndex}. */
export const COMMON_INDICES: readonly number[] = [1.5, 1.53, 1.59, 1.6, 1.67, 1.74];

/**
 * Sag of a spherical surface of radius `radiusMm` over a semi-diameter `semiDiameterMm`:
 * s = r − √(r² − y²), mm. Source: jalie-lenses.
 *
 * @example
 * ```ts
 * import { surfaceSag } from "./thickness.ts";
 * surfaceSag(50, 0); // 0
 * ```
 * @throws {LentilInputError} when the semi-diameter exceeds the radius.
 */
export function surfaceSag(radiusMm: number, semiDiameterMm: number): number {
  const r = Math.abs(checkFinite("surface radius", radiusMm));
  const y = Math.abs(checkFinite("semi-diameter", semiDiameterMm));
  if (y > r) {
    throw new LentilInputError(
      `semi-diameter ${y} mm is larger than the surface radius ${
        r.toFixed(1)
      } mm: the curve is too steep for this lens size`,
    );
  }
  return r - Math.sqrt(r * r - y * y);
}

/**
 * Radius (mm) of a surface of power `surfacePower` (D) in a material of index `index`:
 * r = 1000·(n − 1)/F (Infinity for a plano surface). Source: jalie-lenses.
 *
 * @example
 * ```ts
 * import { surfaceRadius } from "./thickness.ts";
 * surfaceRadius(5, 1.5); // 100
 * ```
 * @throws {LentilRangeError} for an index outside 1.4–1.9.
 */
export function surfaceRadius(surfacePower: number, index: number): number {
  checkRange("refractive index", index, INDEX_RANGE[0], INDEX_RANGE[1]);
  checkFinite("surface power", surfacePower);
  return surfacePower === 0 ? Infinity : 1000 * (index - 1) / Math.abs(surfacePower);
}

/** Sag signed as the surface power (positive for a convex front or a convex back). */
function signedSag(surfacePower: number, index: number, y: number): number {
  if (surfacePower === 0) return 0;
  return Math.sign(surfacePower) * surfaceSag(surfaceRadius(surfacePower, index), y);
}

/** Inputs of a thickness estimate. */
export interface ThicknessOptions {
  /** Refractive index of the lens material, 1.4–1.9. */
  readonly index: number;
  /** Diameter of the uncut lens, or twice the farthest edge point from the optical centre, mm. */
  readonly diameter: number;
  /** Minimum thickness at the thinnest point, mm (0 for a knife edge). */
  readonly minThickness: number;
  /** Front surface power in the lens material, D (default +4.00). */
  readonly frontCurve?: number;
}

/** A thickness estimate. */
export interface LensThickness {
  /** Refractive index used. */
  readonly index: number;
  /** Centre thickness, mm. */
  readonly centre: number;
  /** Edge thickness in the principal meridian of the more positive power, mm. */
  readonly edgeThin: number;
  /** Edge thickness in the principal meridian of the less positive power, mm. */
  readonly edgeThick: number;
  /** Back surface powers in the two principal meridians, D. */
  readonly backCurves: readonly [number, number];
}

/** The default front surface power, D. */
export const DEFAULT_FRONT_CURVE = 4;

/**
 * Centre and edge thickness of a spherocylindrical lens (see the module docs for the
 * model). Source: jalie-lenses.
 *
 * @example
 * ```ts
 * import { lensThickness } from "./thickness.ts";
 * const t = lensThickness({ sphere: -4, cylinder: 0, axis: 180 }, { index: 1.5, diameter: 60, minThickness: 2 });
 * t.edgeThick.toFixed(2); // "6.02"
 * ```
 * @throws {LentilRangeError} for an index, diameter, minimum thickness or front curve out of range.
 * @throws {LentilInputError} when a surface is too steep for the diameter.
 */
export function lensThickness(rx: SpheroCylinder, options: ThicknessOptions): LensThickness {
  const { index } = options;
  checkRange("refractive index", index, INDEX_RANGE[0], INDEX_RANGE[1]);
  checkRange("lens diameter", options.diameter, DIAMETER_RANGE[0], DIAMETER_RANGE[1], "mm");
  checkRange("minimum thickness", options.minThickness, 0, 10, "mm");
  const f1 = checkRange("front curve", options.frontCurve ?? DEFAULT_FRONT_CURVE, -20, 20, "D");
  const y = options.diameter / 2;
  const p = principalPowers(toPowerMatrix(rx));
  const back: [number, number] = [p.power1 - f1, p.power2 - f1];
  const front = signedSag(f1, index, y);
  const rise = back.map((f2) => front + signedSag(f2, index, y));
  const centre = options.minThickness + Math.max(0, ...rise);
  return {
    index,
    centre,
    edgeThin: centre - rise[0],
    edgeThick: centre - rise[1],
    backCurves: back,
  };
}

/**
 * The same lens estimated in each index of `indices` (default 1.50, 1.53, 1.59, 1.60,
 * 1.67, 1.74), with the same front surface power. Source: jalie-lenses.
 *
 * @example
 * ```ts
 * import { thicknessByIndex } from "./thickness.ts";
 * thicknessByIndex({ sphere: -6, cylinder: 0, axis: 180 }, { diameter: 60, minThickness: 1.5 }).length; // 6
 * ```
 */
export function thicknessByIndex(
  rx: SpheroCylinder,
  options: Omit<ThicknessOptions, "index">,
  indices: readonly number[] = COMMON_INDICES,
): LensThickness[] {
  return indices.map((index) => lensThickness(rx, { ...options, index }));
}

/**
 * Diameter (mm) of the smallest uncut lens that fills a frame of boxed size `boxA` × `boxB`
 * (mm) with the optical centre decentred `decentration` mm from the box centre, taking the
 * farthest box corner: 2·√((A/2 + |dec|)² + (B/2)²) plus `margin` (default 2 mm).
 * An upper bound: a real shape's farthest point is inside the box. Source: common-practice.
 *
 * @example
 * ```ts
 * import { frameDiameter } from "./thickness.ts";
 * frameDiameter(50, 40, 3, 0).toFixed(1); // "68.8"
 * ```
 * @throws {LentilRangeError} for a box size outside 20–80 mm or a decentration over 15 mm.
 */
export function frameDiameter(
  boxA: number,
  boxB: number,
  decentration: number,
  margin = 2,
): number {
  checkRange("box width A", boxA, 20, 80, "mm");
  checkRange("box depth B", boxB, 10, 80, "mm");
  checkRange("decentration", decentration, -15, 15, "mm");
  checkRange("margin", margin, 0, 10, "mm");
  return 2 * Math.hypot(boxA / 2 + Math.abs(decentration), boxB / 2) + margin;
}

/**
 * True surface (or lens) power from a lens-measure reading taken with a tool calibrated
 * for index `toolIndex` (usually 1.53): F_true = F_read × (n − 1)/(n_tool − 1).
 * Source: lens-measure.
 *
 * @example
 * ```ts
 * import { trueLensPower } from "./thickness.ts";
 * trueLensPower(6, 1.5).toFixed(2); // "5.66"
 * ```
 * @throws {LentilRangeError} for an index outside 1.4–1.9.
 */
export function trueLensPower(reading: number, index: number, toolIndex = 1.53): number {
  checkFinite("lens-measure reading", reading);
  checkRange("refractive index", index, INDEX_RANGE[0], INDEX_RANGE[1]);
  checkRange("lens-measure index", toolIndex, INDEX_RANGE[0], INDEX_RANGE[1]);
  return reading * (index - 1) / (toolIndex - 1);
}
