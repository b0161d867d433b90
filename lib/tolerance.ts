/**
 * Verification of finished lenses against the ANSI Z80.1-2015 tolerances (values as
 * published in summaries of the standard): each quantity of the ordered prescription
 * against the measured lens, the tolerance that applies, the deviation, pass or fail and
 * by how much.
 *
 * Tolerances used (source: ansi-z80.1-2015):
 * - sphere, in the meridian of highest absolute power: ±0.13 D up to ±6.50 D, ±2% above;
 * - cylinder: ±0.13 D up to 2.00 D, ±0.15 D above 2.00 to 4.50 D, ±4% above 4.50 D;
 * - axis, by ordered cylinder: ±14° up to 0.25 D, ±7° up to 0.50 D, ±5° up to 0.75 D,
 *   ±3° up to 1.50 D, ±2° above;
 * - add: ±0.12 D up to 4.00 D, ±0.18 D above;
 * - prism: 0.33 Δ vertical, 0.67 Δ horizontal (for a pair, on the vertical imbalance and
 *   the net horizontal prism; for one lens, applied to that lens's components).
 *
 * @example
 * ```ts
 * import { sphereTolerance } from "./tolerance.ts";
 * sphereTolerance(-8); // 0.16
 * ```
 *
 * @module
 */

import { LentilInputError } from "./errors.ts";
import { principalPowers, toPowerMatrix } from "./power_matrix.ts";
import type { Prescription } from "./prescription.ts";
import type { Prism } from "./prism.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";
import { toMinusCylinder, toPlusCylinder } from "./transpose.ts";

/** The standard's name, as reported with every check. */
export const TOLERANCE_STANDARD = "ANSI Z80.1-2015";

const EPS = 1e-9;

/** One quantity checked against its tolerance. */
export interface ToleranceCheck {
  /** What was checked ("sphere", "cylinder", "axis", "add", "vertical prism", …). */
  readonly quantity: string;
  /** Ordered value. */
  readonly ordered: number;
  /** Measured value. */
  readonly measured: number;
  /** Measured − ordered (for the axis, the signed smallest angle). */
  readonly deviation: number;
  /** The tolerance that applies (±). */
  readonly tolerance: number;
  /** Unit of the values: "D", "deg" or "prism". */
  readonly unit: string;
  /** |deviation| ≤ tolerance. */
  readonly pass: boolean;
  /** tolerance − |deviation|: how far inside (positive) or outside (negative) the limit. */
  readonly margin: number;
}

/** The result of a verification. */
export interface ToleranceReport {
  /** Always {@linkcode TOLERANCE_STANDARD}. */
  readonly standard: string;
  /** Every quantity checked. */
  readonly checks: readonly ToleranceCheck[];
  /** True when every check passes. */
  readonly pass: boolean;
}

/**
 * Sphere tolerance (±D) for the power of the meridian of highest absolute power.
 * Source: ansi-z80.1-2015.
 *
 * @example
 * ```ts
 * import { sphereTolerance } from "./tolerance.ts";
 * sphereTolerance(6.5); // 0.13
 * ```
 */
export function sphereTolerance(power: number): number {
  const a = Math.abs(power);
  return a <= 6.5 + EPS ? 0.13 : 0.02 * a;
}

/**
 * Cylinder tolerance (±D) for an ordered cylinder. Source: ansi-z80.1-2015.
 *
 * @example
 * ```ts
 * import { cylinderTolerance } from "./tolerance.ts";
 * cylinderTolerance(-3); // 0.15
 * ```
 */
export function cylinderTolerance(cylinder: number): number {
  const a = Math.abs(cylinder);
  if (a <= 2 + EPS) return 0.13;
  if (a <= 4.5 + EPS) return 0.15;
  return 0.04 * a;
}

/**
 * Axis tolerance (±degrees) for an ordered cylinder. Source: ansi-z80.1-2015.
 *
 * @example
 * ```ts
 * import { axisTolerance } from "./tolerance.ts";
 * axisTolerance(-1); // 3
 * ```
 */
export function axisTolerance(cylinder: number): number {
  const a = Math.abs(cylinder);
  if (a <= 0.25 + EPS) return 14;
  if (a <= 0.5 + EPS) return 7;
  if (a <= 0.75 + EPS) return 5;
  if (a <= 1.5 + EPS) return 3;
  return 2;
}

/**
 * Add tolerance (±D). Source: ansi-z80.1-2015.
 *
 * @example
 * ```ts
 * import { addTolerance } from "./tolerance.ts";
 * addTolerance(4.25); // 0.18
 * ```
 */
export function addTolerance(add: number): number {
  return Math.abs(add) <= 4 + EPS ? 0.12 : 0.18;
}

/** Vertical prism tolerance, Δ. Source: ansi-z80.1-2015. */
export const VERTICAL_PRISM_TOLERANCE = 0.33;
/** Horizontal prism tolerance, Δ. Source: ansi-z80.1-2015. */
export const HORIZONTAL_PRISM_TOLERANCE = 0.67;

function check(
  quantity: string,
  ordered: number,
  measured: number,
  tolerance: number,
  unit: string,
  deviation = measured - ordered,
): ToleranceCheck {
  const d = Math.round(deviation * 1e9) / 1e9 + 0;
  const margin = Math.round((tolerance - Math.abs(d)) * 1e9) / 1e9 + 0;
  return { quantity, ordered, measured, deviation: d, tolerance, unit, pass: margin >= 0, margin };
}

function highestMeridian(rx: SpheroCylinder): number {
  const p = principalPowers(toPowerMatrix(rx));
  return Math.abs(p.power2) > Math.abs(p.power1) ? p.power2 : p.power1;
}

function prefix(label: string, name: string): string {
  return label ? `${label} ${name}` : name;
}

function lensChecks(ordered: Prescription, measured: Prescription, label: string) {
  const out: ToleranceCheck[] = [];
  const po = highestMeridian(ordered);
  out.push(
    check(
      prefix(label, "sphere (meridian of highest absolute power)"),
      po,
      highestMeridian(measured),
      sphereTolerance(po),
      "D",
    ),
  );
  // Compare cylinders in the ordered form (minus form for a spherical order).
  const form = ordered.cylinder > 0 ? toPlusCylinder : toMinusCylinder;
  const o = form(ordered);
  const m = form(measured);
  out.push(
    check(prefix(label, "cylinder"), o.cylinder, m.cylinder, cylinderTolerance(o.cylinder), "D"),
  );
  if (Math.abs(o.cylinder) > EPS) {
    const dev = ((m.axis - o.axis) % 180 + 270) % 180 - 90;
    out.push(check(prefix(label, "axis"), o.axis, m.axis, axisTolerance(o.cylinder), "deg", dev));
  }
  if (ordered.add !== undefined) {
    if (measured.add === undefined) {
      throw new LentilInputError(
        `the ordered ${
          label ? label + " " : ""
        }lens has add ${ordered.add}; give the measured add too`,
      );
    }
    out.push(
      check(prefix(label, "add"), ordered.add, measured.add, addTolerance(ordered.add), "D"),
    );
  }
  return out;
}

const NO_PRISM: Prism = { horizontal: 0, vertical: 0 };

function report(checks: ToleranceCheck[]): ToleranceReport {
  return { standard: TOLERANCE_STANDARD, checks, pass: checks.every((c) => c.pass) };
}

/**
 * Check one measured lens against the ordered prescription: sphere (meridian of highest
 * absolute power), cylinder, axis (when a cylinder is ordered), add (when ordered) and, when
 * either carries prism, the horizontal and vertical prism. Source: ansi-z80.1-2015.
 *
 * @example
 * ```ts
 * import { checkLens } from "./tolerance.ts";
 * const r = checkLens({ sphere: -2.25, cylinder: -0.75, axis: 170 }, { sphere: -2.3, cylinder: -0.7, axis: 174 });
 * r.pass; // true
 * ```
 * @throws {LentilInputError} when an add is ordered and none was measured.
 */
export function checkLens(ordered: Prescription, measured: Prescription): ToleranceReport {
  const checks = lensChecks(ordered, measured, "");
  if (ordered.prism || measured.prism) {
    const o = ordered.prism ?? NO_PRISM;
    const m = measured.prism ?? NO_PRISM;
    checks.push(
      check("horizontal prism", o.horizontal, m.horizontal, HORIZONTAL_PRISM_TOLERANCE, "prism"),
    );
    checks.push(check("vertical prism", o.vertical, m.vertical, VERTICAL_PRISM_TOLERANCE, "prism"));
  }
  return report(checks);
}

/**
 * Check a measured pair against the ordered pair: each lens as {@linkcode checkLens} does,
 * then the vertical imbalance (right − left vertical prism, base up positive) and the net
 * horizontal prism (right + left, base in positive) against the ordered values.
 * Source: ansi-z80.1-2015.
 *
 * @example
 * ```ts
 * import { checkPair } from "./tolerance.ts";
 * const rx = { sphere: -2, cylinder: 0, axis: 180 };
 * checkPair(rx, rx, rx, { ...rx, prism: { horizontal: 0, vertical: 0.5 } }).pass; // false
 * ```
 */
export function checkPair(
  orderedRight: Prescription,
  orderedLeft: Prescription,
  measuredRight: Prescription,
  measuredLeft: Prescription,
): ToleranceReport {
  const checks = [
    ...lensChecks(orderedRight, measuredRight, "R"),
    ...lensChecks(orderedLeft, measuredLeft, "L"),
  ];
  const p = (rx: Prescription) => rx.prism ?? NO_PRISM;
  const vo = p(orderedRight).vertical - p(orderedLeft).vertical;
  const vm = p(measuredRight).vertical - p(measuredLeft).vertical;
  checks.push(check("vertical imbalance", vo, vm, VERTICAL_PRISM_TOLERANCE, "prism"));
  const ho = p(orderedRight).horizontal + p(orderedLeft).horizontal;
  const hm = p(measuredRight).horizontal + p(measuredLeft).horizontal;
  checks.push(check("net horizontal prism", ho, hm, HORIZONTAL_PRISM_TOLERANCE, "prism"));
  return report(checks);
}
