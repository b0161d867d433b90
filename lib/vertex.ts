/**
 * Vertex distance: the effective power of a thin lens moved along the axis, for a single
 * power and for a spherocylinder (per principal meridian), contact-lens power at the cornea,
 * and rounding to the available step with the rule stated.
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

import { checkFinite, checkRange, LentilInputError } from "./errors.ts";
import { formatPower } from "./_power_text.ts";
import { normaliseAxis, type SpheroCylinder } from "./spherocylinder.ts";
import { toMinusCylinder } from "./transpose.ts";

/**
 * Effective power of a lens of power `power` (D) moved `shift` metres toward the eye
 * (negative: away from the eye). Source: vertex-formula.
 *
 * @example
 * ```ts
 * import { effectivePower } from "./vertex.ts";
 * effectivePower(10, 0.012).toFixed(2); // "11.36"
 * ```
 * @throws {LentilInputError} when the lens would be moved to its own focal point (no finite
 * power there).
 */
export function effectivePower(power: number, shift: number): number {
  checkFinite("power", power);
  checkFinite("vertex shift", shift);
  const denom = 1 - shift * power;
  if (Math.abs(denom) < 1e-9) {
    throw new LentilInputError(
      `a ${formatPower(power)} lens moved ${(Math.abs(shift) * 1000).toFixed(1)} mm ${
        shift > 0 ? "toward" : "away from"
      } the eye lands on its own focal point: no lens of finite power there corrects the same eye`,
    );
  }
  return power / denom;
}

/** Accepted vertex distances, mm. */
export const VERTEX_RANGE_MM = [0, 25] as const;

/**
 * A spherocylinder moved from vertex distance `fromMm` to `toMm` (0 = at the cornea): each
 * principal meridian (S and S + C) by F' = F / (1 − d·F), then back to sphere, cylinder and
 * the same axis. Other fields (add, prism, eye) are kept. Source: vertex-formula.
 *
 * @example
 * ```ts
 * import { vertexSpheroCylinder } from "./vertex.ts";
 * vertexSpheroCylinder({ sphere: -10, cylinder: -2, axis: 90 }, 12, 0).sphere.toFixed(2); // "-8.93"
 * ```
 * @throws {LentilRangeError} for a vertex distance outside 0–25 mm.
 */
export function vertexSpheroCylinder<T extends SpheroCylinder>(
  rx: T,
  fromMm: number,
  toMm: number,
): T {
  checkRange("vertex distance (from)", fromMm, VERTEX_RANGE_MM[0], VERTEX_RANGE_MM[1], "mm");
  checkRange("vertex distance (to)", toMm, VERTEX_RANGE_MM[0], VERTEX_RANGE_MM[1], "mm");
  const shift = (fromMm - toMm) / 1000;
  const s = effectivePower(rx.sphere, shift);
  const sc = effectivePower(rx.sphere + rx.cylinder, shift);
  return { ...rx, sphere: s, cylinder: sc - s, axis: rx.axis };
}

/** How a power is brought to an available step. */
export type RoundingRule = "nearest" | "plus" | "minus";

/** The rounding rules in words, as shown beside a rounded result. */
export const ROUNDING_RULES: Readonly<Record<RoundingRule, string>> = {
  nearest:
    "each principal meridian power rounded to the nearest step, halves toward plus (less minus); axis to the nearest degree",
  plus:
    "each principal meridian power rounded up to the next step (toward plus); axis to the nearest degree",
  minus:
    "each principal meridian power rounded down to the next step (toward minus); axis to the nearest degree",
};

/**
 * Round one power to a step by `rule`. Source: common-practice.
 *
 * @example
 * ```ts
 * import { roundPower } from "./vertex.ts";
 * roundPower(-8.93, 0.25); // -9
 * roundPower(-4.125, 0.25); // -4 (a half goes toward plus)
 * ```
 * @throws {LentilRangeError} for a step outside 0.01–1 D.
 */
export function roundPower(power: number, step: number, rule: RoundingRule = "nearest"): number {
  checkFinite("power", power);
  checkRange("rounding step", step, 0.01, 1, "D");
  const q = power / step;
  const n = rule === "plus"
    ? Math.ceil(q - 1e-9)
    : rule === "minus"
    ? Math.floor(q + 1e-9)
    : Math.floor(q + 0.5 + 1e-9);
  return n * step + 0;
}

/**
 * Round a spherocylinder to an available step (0.25 D for spectacle and most contact
 * lenses, 0.125 D for some): the two principal meridian powers S and S + C are rounded
 * independently by `rule` (see {@linkcode ROUNDING_RULES}) and the cylinder is their
 * difference; the axis goes to the nearest whole degree. Source: common-practice.
 *
 * @example
 * ```ts
 * import { roundToStep } from "./vertex.ts";
 * roundToStep({ sphere: -8.93, cylinder: -1.6, axis: 90.4 }, 0.25); // { sphere: -9, cylinder: -1.5, axis: 90 }
 * ```
 */
export function roundToStep<T extends SpheroCylinder>(
  rx: T,
  step: number,
  rule: RoundingRule = "nearest",
): T {
  const s = roundPower(rx.sphere, step, rule);
  const sc = roundPower(rx.sphere + rx.cylinder, step, rule);
  return { ...rx, sphere: s, cylinder: sc - s + 0, axis: normaliseAxis(Math.round(rx.axis)) };
}

/**
 * Contact-lens power at the cornea for a spectacle prescription refracted at `vertexMm`,
 * in minus-cylinder form, exact (round it with {@linkcode roundToStep}).
 * Source: vertex-formula.
 *
 * @example
 * ```ts
 * import { cornealPower } from "./vertex.ts";
 * cornealPower({ sphere: 10, cylinder: 0, axis: 180 }, 12).sphere.toFixed(2); // "11.36"
 * ```
 */
export function cornealPower<T extends SpheroCylinder>(rx: T, vertexMm: number): T {
  return toMinusCylinder(vertexSpheroCylinder(rx, vertexMm, 0));
}
