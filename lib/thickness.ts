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
import { numberInMessage } from "./number_text.ts";
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
      `semi-diameter ${numberInMessage(y, "mm")} is larger than the surface radius ${
        numberInMessage(r, "mm")
      }: the curve is too steep for this lens size (a diameter under ${
        numberInMessage(2 * r, "mm")
      }, or a flatter curve, would fit)`,
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
  checkSteepness([p.power1, p.power2], f1, index, options.diameter);
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
 * What would make a lens fit when a surface is too steep for its size: the largest
 * diameter at which every surface fits with the front curve kept, and the range of front
 * curves that fit at the diameter kept (each surface's semi-diameter at most its radius,
 * 1000·(n − 1)/|F| mm). Source: jalie-lenses.
 *
 * @param meridianPowers the lens power in its principal meridians, D.
 * @example
 * ```ts
 * import { steepnessLimits } from "./thickness.ts";
 * const l = steepnessLimits([-10, -10], 4, 1.5, 77.5);
 * l.largestDiameter.toFixed(1); // "71.4"
 * l.frontCurves?.[1].toFixed(2); // "2.90"
 * ```
 */
export function steepnessLimits(
  meridianPowers: readonly number[],
  frontCurve: number,
  index: number,
  diameter: number,
): { largestDiameter: number; frontCurves?: readonly [number, number] } {
  const steepest = Math.max(
    Math.abs(frontCurve),
    ...meridianPowers.map((f) => Math.abs(f - frontCurve)),
  );
  const largestDiameter = steepest === 0 ? Infinity : 2 * 1000 * (index - 1) / steepest;
  // At this diameter, every surface's |F| may reach fMax: |F1| ≤ fMax and |F − F1| ≤ fMax.
  const fMax = 1000 * (index - 1) / (diameter / 2);
  const lo = Math.max(-fMax, ...meridianPowers.map((f) => f - fMax));
  const hi = Math.min(fMax, ...meridianPowers.map((f) => f + fMax));
  return { largestDiameter, ...(lo <= hi ? { frontCurves: [lo, hi] as const } : {}) };
}

/** Refuse, with what would work, a lens whose surfaces cannot reach the given diameter. */
function checkSteepness(
  meridianPowers: readonly number[],
  frontCurve: number,
  index: number,
  diameter: number,
): void {
  const limits = steepnessLimits(meridianPowers, frontCurve, index, diameter);
  if (diameter <= limits.largestDiameter + 1e-9) return;
  // Suggestions stay inside the limits: the diameter down to 0.5 mm, curves to 0.25 D.
  const d = Math.floor(limits.largestDiameter * 2 - 1e-9) / 2;
  const ways = [`a diameter of ${numberInMessage(d, "mm")} or less with this front curve`];
  if (limits.frontCurves) {
    const [lo, hi] = limits.frontCurves;
    const clamp = Math.min(Math.max(frontCurve, lo), hi);
    const step = clamp > frontCurve
      ? Math.ceil(clamp * 4 - 1e-9) / 4
      : Math.floor(clamp * 4 + 1e-9) / 4;
    const suggested = step >= lo - 1e-9 && step <= hi + 1e-9 ? step : clamp;
    ways.push(
      `a ${suggested < frontCurve ? "flatter" : "steeper"} front curve of ${
        numberInMessage(suggested, "D")
      } at this diameter (fits from ${numberInMessage(Math.ceil(lo * 100) / 100, "D")} to ${
        numberInMessage(Math.floor(hi * 100) / 100, "D")
      })`,
    );
  }
  throw new LentilInputError(
    `a surface is too steep for a ${numberInMessage(diameter, "mm")} lens (front curve ${
      numberInMessage(frontCurve, "D")
    }, index ${index}): try ${
      ways.join(", or ")
    }; a box-corner blank size is an upper bound, the frame's effective diameter gives a smaller one (blankSize)`,
  );
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

/** The usual allowance for edging added to a minimum blank, mm (common practice, no source). */
export const EDGING_ALLOWANCE = 2;

/**
 * Minimum blank size (mm), the trade's rule: the frame's effective diameter plus twice the
 * decentration of the optical centre from the box centre, plus an allowance for edging
 * (default 2 mm): ED + 2·|dec| + allowance. The effective diameter is twice the longest
 * radius of the frame's shape from the box centre, smaller than the box diagonal.
 * Source: common-practice (minimum-blank).
 *
 * @param decentration optical centre from the box centre, mm (either sign; in or out).
 * @example
 * ```ts
 * import { blankSize } from "./thickness.ts";
 * blankSize(57, 5); // 69
 * ```
 * @throws {LentilRangeError} for an ED outside 20–90 mm, a decentration over 15 mm or an
 * allowance outside 0–10 mm.
 */
export function blankSize(
  effectiveDiameter: number,
  decentration: number,
  allowance = EDGING_ALLOWANCE,
): number {
  checkRange("effective diameter", effectiveDiameter, 20, 90, "mm");
  checkRange("decentration", decentration, -15, 15, "mm");
  checkRange("allowance", allowance, 0, 10, "mm");
  return effectiveDiameter + 2 * Math.abs(decentration) + allowance;
}

/**
 * Diameter (mm) of the smallest uncut lens that fills a frame of boxed size `boxA` × `boxB`
 * (mm) with the optical centre decentred `decentration` mm from the box centre, taking the
 * farthest box corner: 2·√((A/2 + |dec|)² + (B/2)²) plus `margin` (default 2 mm).
 * A fallback for when the frame's effective diameter is not known, and an upper bound: a
 * real shape's farthest point is inside the box, so this can be several millimetres larger
 * than {@linkcode blankSize} and refuse a strong lens that the frame would take.
 * Source: common-practice.
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

/** Where an edge of the frame lies, as an optician names it. */
export type FrameEdge = "nasal" | "temporal" | "upper" | "lower";

/** Edge thickness at one edge of the frame. */
export interface FrameEdgeThickness {
  /** Which edge. */
  readonly edge: FrameEdge;
  /** Distance of that edge from the optical centre, mm. */
  readonly distance: number;
  /** The meridian the edge lies in: 180 (horizontal) or 90 (vertical), degrees. */
  readonly meridian: 90 | 180;
  /** Lens power in that meridian, D. */
  readonly power: number;
  /** Edge thickness there, mm. */
  readonly thickness: number;
}

/** Edge thickness of an edged lens where the frame is. */
export interface FrameEdges {
  /** Centre thickness, mm. */
  readonly centre: number;
  /** The four edges: nasal, temporal, upper, lower. */
  readonly edges: readonly FrameEdgeThickness[];
  /** The thickest of the four. */
  readonly thickest: FrameEdgeThickness;
  /** The thinnest of the four. */
  readonly thinnest: FrameEdgeThickness;
}

/** The frame and the optical centre's place in it. */
export interface FrameOptions {
  /** Refractive index of the lens material, 1.4–1.9. */
  readonly index: number;
  /** Box width A, mm. */
  readonly boxA: number;
  /** Box depth B, mm. */
  readonly boxB: number;
  /** Optical centre from the box centre toward the nose, mm (negative: toward the temple). */
  readonly decentration: number;
  /** Optical centre above the box centre, mm (negative: below). Default 0. */
  readonly verticalDecentration?: number;
  /** Minimum thickness at the thinnest point, mm. */
  readonly minThickness: number;
  /** Front surface power in the lens material, D (default +4.00). */
  readonly frontCurve?: number;
}

/**
 * Edge thickness where the frame is: at the nasal, temporal, upper and lower edges of the
 * box, each at its distance from the decentred optical centre, in the power of its own
 * meridian (horizontal for nasal and temporal, vertical for upper and lower, by
 * F(θ) = S + C·sin²(θ − axis)); the thickest edge with its meridian. The thinnest point
 * is held at the minimum thickness: the centre of a minus lens, the thinnest of the four
 * edges of a plus lens (a real outline may have a thinner point between them, and its
 * corners are nearer than the box's). Thin-lens estimate as {@linkcode lensThickness}.
 * Sources: jalie-lenses, sine-squared, common-practice.
 *
 * @example
 * ```ts
 * import { frameEdges } from "./thickness.ts";
 * const e = frameEdges({ sphere: -4, cylinder: -2, axis: 90 }, {
 *   index: 1.6, boxA: 54, boxB: 40, decentration: 3, minThickness: 1.5,
 * });
 * e.thickest.edge; // "temporal"
 * ```
 * @throws {LentilRangeError} for an index, box, decentration, minimum thickness or front
 * curve out of range.
 * @throws {LentilInputError} when a surface is too steep to reach the farthest edge.
 */
export function frameEdges(rx: SpheroCylinder, options: FrameOptions): FrameEdges {
  const { index } = options;
  checkRange("refractive index", index, INDEX_RANGE[0], INDEX_RANGE[1]);
  checkRange("box width A", options.boxA, 20, 80, "mm");
  checkRange("box depth B", options.boxB, 10, 80, "mm");
  const dx = checkRange("decentration", options.decentration, -15, 15, "mm");
  const dy = checkRange("vertical decentration", options.verticalDecentration ?? 0, -15, 15, "mm");
  checkRange("minimum thickness", options.minThickness, 0, 10, "mm");
  const f1 = checkRange("front curve", options.frontCurve ?? DEFAULT_FRONT_CURVE, -20, 20, "D");
  const m = toPowerMatrix(rx);
  const horizontal = m[0][0];
  const vertical = m[1][1];
  const places: [FrameEdge, number, 90 | 180, number][] = [
    ["nasal", options.boxA / 2 - dx, 180, horizontal],
    ["temporal", options.boxA / 2 + dx, 180, horizontal],
    ["upper", options.boxB / 2 - dy, 90, vertical],
    ["lower", options.boxB / 2 + dy, 90, vertical],
  ];
  const farthest = Math.max(...places.map((p) => p[1]));
  checkSteepness([horizontal, vertical], f1, index, 2 * farthest);
  // centre − edge at each place: front sag less the back sag in that meridian's power
  const rise = places.map(([, y, , f]) => signedSag(f1, index, y) + signedSag(f - f1, index, y));
  const centre = options.minThickness + Math.max(0, ...rise);
  const edges = places.map(([edge, distance, meridian, power], i): FrameEdgeThickness => ({
    edge,
    distance,
    meridian,
    power: power + 0,
    thickness: centre - rise[i],
  }));
  const by = (pick: (a: number, b: number) => boolean) =>
    edges.reduce((best, e) => pick(e.thickness, best.thickness) ? e : best);
  return {
    centre,
    edges,
    thickest: by((a, b) => a > b + 1e-12),
    thinnest: by((a, b) => a < b - 1e-12),
  };
}
