/**
 * Prism: the record of a prism per eye (base in/out, up/down), its 360-degree base
 * notation, compounding and resolving, Prentice's rule for any spherocylinder and any
 * decentration (the power matrix times the decentration vector), the vertical imbalance at a
 * reading point, and the decentration that produces a prescribed prism.
 *
 * Frame: the standard axis frame (iso-13666-axis) as seen facing the wearer, x to the
 * right, y up, base angles 0–360 counter-clockwise. For the right eye base in points to +x
 * (0°); for the left eye base in points to −x (180°); base up is 90° and base down 270° for
 * both. Sources: prentice, long-1976.
 *
 * @example
 * ```ts
 * import { prismAt } from "./prism.ts";
 * prismAt({ sphere: 4, cylinder: 0, axis: 180 }, 0, -10, "R"); // { horizontal: 0, vertical: 4 } (4 Δ base up)
 * ```
 *
 * @module
 */

import { checkFinite, checkRange, LentilInputError, LentilParseError } from "./errors.ts";
import { type PowerMatrix, toPowerMatrix } from "./power_matrix.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";

/** Which eye: right or left. */
export type Eye = "R" | "L";

/** A prism before one eye, Δ. */
export interface Prism {
  /** Horizontal prism, Δ: positive base in, negative base out. */
  readonly horizontal: number;
  /** Vertical prism, Δ: positive base up, negative base down. */
  readonly vertical: number;
}

/** A prism as amount and base direction in 360-degree notation. */
export interface PolarPrism {
  /** Amount, Δ (≥ 0). */
  readonly amount: number;
  /** Base direction, degrees 0–360 in the standard frame (0 when the amount is 0). */
  readonly base: number;
}

/** A decentration or visual-point offset in the eye's own terms, mm. */
export interface Offset {
  /** Horizontal, mm: positive toward the nose (in), negative toward the temple (out). */
  readonly horizontal: number;
  /** Vertical, mm: positive up, negative down. */
  readonly vertical: number;
}

const RAD = Math.PI / 180;
/** Largest offset from the optical centre accepted, mm (half of an 80 mm blank). */
export const MAX_OFFSET_MM = 40;

/**
 * Read an eye: R, L, OD, OS, RE, LE, right, left (any case). Source: common-practice.
 *
 * @example
 * ```ts
 * import { parseEye } from "./prism.ts";
 * parseEye("OS"); // "L"
 * ```
 * @throws {LentilParseError} for anything else.
 */
export function parseEye(text: string): Eye {
  const t = text.trim().toLowerCase();
  if (["r", "od", "re", "right"].includes(t)) return "R";
  if (["l", "os", "le", "left"].includes(t)) return "L";
  throw new LentilParseError(text, "expected the eye: R or L (also OD/OS, RE/LE, right/left)");
}

function nasalSign(eye: Eye): number {
  return eye === "R" ? 1 : -1;
}

/**
 * The prism as a vector in the standard frame (x right, y up as seen facing the wearer),
 * pointing toward the base. Source: iso-13666-axis.
 *
 * @example
 * ```ts
 * import { prismVector } from "./prism.ts";
 * prismVector({ horizontal: 2, vertical: 0 }, "L"); // { x: -2, y: 0 }
 * ```
 */
export function prismVector(p: Prism, eye: Eye): { x: number; y: number } {
  return { x: p.horizontal * nasalSign(eye), y: p.vertical };
}

/**
 * The prism before `eye` whose base vector in the standard frame is (x, y).
 * Source: iso-13666-axis.
 *
 * @example
 * ```ts
 * import { prismFromVector } from "./prism.ts";
 * prismFromVector(-2, 1, "R"); // { horizontal: -2, vertical: 1 } (2 Δ base out, 1 Δ base up)
 * ```
 */
export function prismFromVector(x: number, y: number, eye: Eye): Prism {
  return { horizontal: x * nasalSign(eye) + 0, vertical: y + 0 };
}

/**
 * Resolve a prism given as amount and 360-degree base direction into horizontal (in/out)
 * and vertical (up/down) components for `eye`. Source: common-practice, iso-13666-axis.
 *
 * @example
 * ```ts
 * import { resolvePrism } from "./prism.ts";
 * resolvePrism(2, 30, "R"); // { horizontal: 1.732, vertical: 1 } (base in and up)
 * ```
 * @throws {LentilRangeError} for a negative amount or a base outside 0–360.
 */
export function resolvePrism(amount: number, base: number, eye: Eye): Prism {
  checkRange("prism amount", amount, 0, 50, "Δ");
  checkRange("prism base", base, 0, 360, "deg");
  // Trim the last bits of cos/sin so that 2 Δ base 120 gives exactly 1 Δ out, not 0.9999…
  const trim = (v: number) => Math.round(v * 1e12) / 1e12 + 0;
  const x = trim(amount * Math.cos(base * RAD));
  const y = trim(amount * Math.sin(base * RAD));
  return prismFromVector(x, y, eye);
}

/**
 * Amount and 360-degree base direction of a prism before `eye`. Source: common-practice.
 *
 * @example
 * ```ts
 * import { polarPrism } from "./prism.ts";
 * polarPrism({ horizontal: 0, vertical: -1.5 }, "L"); // { amount: 1.5, base: 270 }
 * ```
 */
export function polarPrism(p: Prism, eye: Eye): PolarPrism {
  const v = prismVector(p, eye);
  const amount = Math.hypot(v.x, v.y);
  if (amount < 1e-12) return { amount: 0, base: 0 };
  let base = Math.atan2(v.y, v.x) / RAD;
  if (base < 0) base += 360;
  if (Math.abs(base - 360) < 1e-9) base = 0;
  return { amount, base };
}

/**
 * Compound several prisms before the same eye into one (vector sum of the components).
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { compoundPrism } from "./prism.ts";
 * compoundPrism([{ horizontal: 3, vertical: 0 }, { horizontal: 0, vertical: 4 }]); // { horizontal: 3, vertical: 4 }
 * ```
 */
export function compoundPrism(prisms: readonly Prism[]): Prism {
  let h = 0;
  let v = 0;
  for (const p of prisms) {
    h += checkFinite("horizontal prism", p.horizontal);
    v += checkFinite("vertical prism", p.vertical);
  }
  return { horizontal: h, vertical: v };
}

function checkOffset(what: string, o: Offset): void {
  checkRange(`${what} horizontal`, o.horizontal, -MAX_OFFSET_MM, MAX_OFFSET_MM, "mm");
  checkRange(`${what} vertical`, o.vertical, -MAX_OFFSET_MM, MAX_OFFSET_MM, "mm");
}

function prismFromMatrix(f: PowerMatrix, point: Offset, eye: Eye): Prism {
  const x = point.horizontal * nasalSign(eye) / 10;
  const y = point.vertical / 10;
  return prismFromVector(-(f[0][0] * x + f[0][1] * y), -(f[1][0] * x + f[1][1] * y), eye);
}

/**
 * Prism at a point of a spherocylindrical lens, by Prentice's rule in matrix form:
 * P(Δ) = −F · c, with F the dioptric power matrix (D) and c the position of the point
 * relative to the optical centre (cm). For a sphere this is P = c × F with the base toward
 * the optical centre of a plus lens and away from it for a minus lens.
 * Sources: prentice, long-1976.
 *
 * @param horizontalMm position of the point, mm, positive toward the nose.
 * @param verticalMm position of the point, mm, positive up.
 * @example
 * ```ts
 * import { prismAt } from "./prism.ts";
 * prismAt({ sphere: -5, cylinder: 0, axis: 180 }, 4, 0, "R"); // { horizontal: 2, vertical: 0 } (2 Δ base in)
 * ```
 * @throws {LentilRangeError} for a point more than 40 mm from the optical centre.
 */
export function prismAt(
  rx: SpheroCylinder,
  horizontalMm: number,
  verticalMm: number,
  eye: Eye,
): Prism {
  const point = { horizontal: horizontalMm, vertical: verticalMm };
  checkOffset("point", point);
  return prismFromMatrix(toPowerMatrix(rx), point, eye);
}

/**
 * Decentration of the optical centre (relative to the visual point) that produces the
 * prism `p` before `eye`: d = F⁻¹ · P (cm), the inverse of Prentice's rule in matrix form.
 * A plus lens is decentred toward the base, a minus lens away from it.
 * Sources: prentice, long-1976.
 *
 * @example
 * ```ts
 * import { decentrationFor } from "./prism.ts";
 * decentrationFor({ sphere: 4, cylinder: 0, axis: 180 }, { horizontal: 1, vertical: 0 }, "R"); // { horizontal: 2.5, vertical: 0 } (2.5 mm in)
 * ```
 * @throws {LentilInputError} when the lens has no power in the direction needed.
 * @throws {LentilRangeError} when the decentration would exceed 40 mm.
 */
export function decentrationFor(rx: SpheroCylinder, p: Prism, eye: Eye): Offset {
  const f = toPowerMatrix(rx);
  const v = prismVector(p, eye);
  const det = f[0][0] * f[1][1] - f[0][1] * f[1][0];
  if (Math.abs(det) < 1e-9) {
    // Singular: a plano meridian. Solvable only when the prism lies in the powered meridian.
    const solved = solveSingular(f, v);
    if (!solved) {
      throw new LentilInputError(
        "this lens has no power in the meridian the prism needs, so no decentration produces it (order the prism worked instead)",
      );
    }
    return finishDecentration(solved.x, solved.y, eye);
  }
  const x = (f[1][1] * v.x - f[0][1] * v.y) / det;
  const y = (-f[1][0] * v.x + f[0][0] * v.y) / det;
  return finishDecentration(x, y, eye);
}

function solveSingular(f: PowerMatrix, v: { x: number; y: number }) {
  const trace = f[0][0] + f[1][1];
  if (Math.abs(trace) < 1e-12) return Math.hypot(v.x, v.y) < 1e-12 ? { x: 0, y: 0 } : undefined;
  // F = trace · n nᵀ; F d = v needs v ∥ n, and then d = v / trace (the least decentration).
  const nx = Math.sqrt(Math.max(0, f[0][0] / trace));
  const ny = Math.sign(f[0][1] / trace || 1) * Math.sqrt(Math.max(0, f[1][1] / trace));
  const cross = v.x * ny - v.y * nx;
  if (Math.abs(cross) > 1e-9 * Math.max(1, Math.hypot(v.x, v.y))) return undefined;
  return { x: v.x / trace, y: v.y / trace };
}

function finishDecentration(xCm: number, yCm: number, eye: Eye): Offset {
  const out = {
    horizontal: xCm * 10 * nasalSign(eye) + 0,
    vertical: yCm * 10 + 0,
  };
  checkOffset("decentration", out);
  return out;
}

/** Prism before each eye at a reading point and the vertical imbalance between them. */
export interface VerticalImbalance {
  /** Prism before the right eye at the reading point. */
  readonly right: Prism;
  /** Prism before the left eye at the reading point. */
  readonly left: Prism;
  /** Vertical imbalance |P_R − P_L|, Δ. */
  readonly imbalance: number;
  /** The eye whose prism is relatively base up ("none" when balanced). */
  readonly baseUpEye: Eye | "none";
}

/**
 * Vertical imbalance at a reading point `dropMm` below the optical centres (and `insetMm`
 * toward the nose in each eye), by Prentice's rule in matrix form for each lens.
 * Sources: prentice, long-1976.
 *
 * @example
 * ```ts
 * import { verticalImbalance } from "./prism.ts";
 * verticalImbalance({ sphere: 3, cylinder: 0, axis: 180 }, { sphere: 1, cylinder: 0, axis: 180 }, 10).imbalance; // 2
 * ```
 * @throws {LentilRangeError} for a drop outside 0–30 mm or an inset outside 0–10 mm.
 */
export function verticalImbalance(
  right: SpheroCylinder,
  left: SpheroCylinder,
  dropMm: number,
  insetMm = 0,
): VerticalImbalance {
  checkRange("reading drop", dropMm, 0, 30, "mm");
  checkRange("near inset", insetMm, 0, 10, "mm");
  const r = prismAt(right, insetMm, -dropMm, "R");
  const l = prismAt(left, insetMm, -dropMm, "L");
  const diff = r.vertical - l.vertical;
  const imbalance = Math.abs(diff);
  return {
    right: r,
    left: l,
    imbalance,
    baseUpEye: imbalance < 1e-9 ? "none" : diff > 0 ? "R" : "L",
  };
}
