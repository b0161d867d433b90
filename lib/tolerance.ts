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
 * - prism of one lens: at most 0.33 Δ at the reference point in each direction, or, above
 *   ±3.375 D, the reference point within 1.0 mm of where the prescribed prism is met;
 * - a mounted pair: vertical imbalance at most 0.33 Δ, or, above ±3.375 D in the vertical
 *   meridian, at most 1.0 mm difference in height of the reference points; net horizontal
 *   prism at most 0.67 Δ, or, above ±2.75 D in the horizontal meridian, within ±2.5 mm of
 *   the ordered distance between centres. Prism errors become positions by Prentice's rule
 *   (mm = 10 · Δ / F).
 *
 * Every deviation is measured − ordered. Every check names its clause (by title).
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

/**
 * The clause each check rests on, named by its title in the standard (titles as in published
 * summaries of the 2015 edition; the clause numbers are not given, since we could not
 * confirm them).
 */
export const CLAUSES = {
  sphere: "ANSI Z80.1-2015, tolerance on distance refractive power (meridian of highest power)",
  cylinder: "ANSI Z80.1-2015, tolerance on distance refractive power (cylinder)",
  axis: "ANSI Z80.1-2015, tolerance on the direction of the cylinder axis",
  add: "ANSI Z80.1-2015, tolerance on addition power",
  prism: "ANSI Z80.1-2015, tolerance on prism reference point location and prismatic power",
  imbalance: "ANSI Z80.1-2015, tolerance on prismatic imbalance (mounted)",
} as const;

/** How a figure of a check reads: its direction convention, for display. */
export type CheckDirection =
  /** Vertical prism of one lens, base up positive. */
  | "vertical"
  /** Horizontal prism of one lens, base in positive. */
  | "horizontal"
  /** Vertical imbalance, right − left, right relatively base up positive. */
  | "imbalance"
  /** Net horizontal prism, right + left, base in positive. */
  | "net-horizontal"
  /** Difference in height of the reference points, right − left, mm, right higher positive. */
  | "height"
  /** Distance between the centres, change from the ordered distance, mm, wider positive. */
  | "centres"
  /** Distance of a reference point from its specified position, mm. */
  | "offset";

/** One quantity checked against its tolerance. */
export interface ToleranceCheck {
  /** What was checked ("sphere", "cylinder", "axis", "add", "vertical prism", …). */
  readonly quantity: string;
  /** Ordered value. */
  readonly ordered: number;
  /** Measured value. */
  readonly measured: number;
  /**
   * Measured − ordered, the one convention of every check (for the axis, the signed smallest
   * angle; for prism, in the direction convention of {@linkcode ToleranceCheck.direction}).
   */
  readonly deviation: number;
  /** The tolerance that applies. */
  readonly tolerance: number;
  /** How the tolerance reads: ± the ordered value, or a largest amount. */
  readonly limit: "plus-minus" | "at-most";
  /** Unit of the values: "D", "deg", "prism" or "mm". */
  readonly unit: string;
  /** True when the quantity is accepted (by its own limit, or by the rule named in the remark). */
  readonly pass: boolean;
  /** tolerance − |deviation|: how far inside (positive) or outside (negative) its own limit. */
  readonly margin: number;
  /** The clause of the standard that sets the tolerance. */
  readonly clause: string;
  /** The direction convention of a prism or position figure. */
  readonly direction?: CheckDirection;
  /** Which rule accepted the quantity, or why a rule did not apply, in words. */
  readonly remark?: string;
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

/** Vertical prism tolerance (one lens, and the vertical imbalance of a pair), Δ. Source: ansi-z80.1-2015. */
export const VERTICAL_PRISM_TOLERANCE = 0.33;
/** Horizontal prism tolerance of a mounted pair (net horizontal prism), Δ. Source: ansi-z80.1-2015. */
export const HORIZONTAL_PRISM_TOLERANCE = 0.67;
/** Prism tolerance at the reference point of one lens, each direction, Δ. Source: ansi-z80.1-2015. */
export const LENS_PRISM_TOLERANCE = 0.33;
/**
 * Above this power in the vertical meridian (absolute, D), a pair is also accepted by the
 * difference in height of its reference points, and one lens by the position of its
 * reference point. Source: ansi-z80.1-2015.
 */
export const STRONG_VERTICAL_POWER = 3.375;
/**
 * Above this power in the horizontal meridian (absolute, D), a pair is also accepted by the
 * distance between its centres. Source: ansi-z80.1-2015.
 */
export const STRONG_HORIZONTAL_POWER = 2.75;
/** Largest difference in height of the reference points of a strong pair, mm. Source: ansi-z80.1-2015. */
export const HEIGHT_DIFFERENCE_TOLERANCE = 1.0;
/** Tolerance on the distance between centres of a strong pair, ± mm. Source: ansi-z80.1-2015. */
export const CENTRES_TOLERANCE = 2.5;
/** Largest distance of one lens's reference point from its specified position, mm. Source: ansi-z80.1-2015. */
export const REFERENCE_POINT_TOLERANCE = 1.0;

/** Below this meridian power (absolute, D) a prism error cannot be turned into a position. */
const LEAST_POWER_FOR_POSITION = 0.125;

/**
 * Where the prescribed prism is met, relative to the reference point, from the prism
 * error found there: Prentice's rule inverted in one meridian, mm = 10 · Δ / F (positive in
 * the direction of the base: up for base up, toward the nose for base in).
 * Sources: prentice, ansi-z80.1-2015.
 *
 * @param prismError measured − ordered prism at the reference point in that meridian, Δ.
 * @param meridianPower power of the lens in that meridian, D.
 * @example
 * ```ts
 * import { prismToPosition } from "./tolerance.ts";
 * prismToPosition(0.5, -6.4).toFixed(2); // "-0.78"
 * ```
 * @throws {LentilInputError} when the meridian is nearly plano (below 0.125 D) and the
 * prism error is not zero: no position produces it.
 */
export function prismToPosition(prismError: number, meridianPower: number): number {
  if (Math.abs(prismError) < EPS) return 0;
  if (Math.abs(meridianPower) < LEAST_POWER_FOR_POSITION) {
    throw new LentilInputError(
      `a prism error of ${
        Math.abs(prismError).toFixed(2)
      } Δ in a nearly plano meridian cannot come from the position of the lens`,
    );
  }
  return 10 * prismError / meridianPower + 0;
}

function check(
  quantity: string,
  ordered: number,
  measured: number,
  tolerance: number,
  unit: string,
  clause: string,
  more: {
    deviation?: number;
    limit?: "plus-minus" | "at-most";
    direction?: CheckDirection;
  } = {},
): ToleranceCheck {
  const d = Math.round((more.deviation ?? measured - ordered) * 1e9) / 1e9 + 0;
  const margin = Math.round((tolerance - Math.abs(d)) * 1e9) / 1e9 + 0;
  return {
    quantity,
    ordered,
    measured,
    deviation: d,
    tolerance,
    limit: more.limit ?? (unit === "prism" ? "at-most" : "plus-minus"),
    unit,
    pass: margin >= 0,
    margin,
    clause,
    ...(more.direction ? { direction: more.direction } : {}),
  };
}

/** Two checks of which either accepts the quantity: both carry the joint verdict. */
function either(
  byPrism: ToleranceCheck,
  byPosition: ToleranceCheck,
  positionWords: string,
): [ToleranceCheck, ToleranceCheck] {
  const pass = byPrism.pass || byPosition.pass;
  const prismRemark = byPrism.pass
    ? undefined
    : byPosition.pass
    ? `accepted by ${positionWords} (the next line)`
    : undefined;
  const positionRemark = byPosition.pass
    ? undefined
    : byPrism.pass
    ? "accepted by the prism limit (the line before)"
    : undefined;
  return [
    { ...byPrism, pass, ...(prismRemark ? { remark: prismRemark } : {}) },
    { ...byPosition, pass, ...(positionRemark ? { remark: positionRemark } : {}) },
  ];
}

function highestMeridian(rx: SpheroCylinder): number {
  const p = principalPowers(toPowerMatrix(rx));
  return Math.abs(p.power2) > Math.abs(p.power1) ? p.power2 : p.power1;
}

/** Power in the horizontal (x) and vertical (y) meridians, D. Source: long-1976. */
function meridians(rx: SpheroCylinder): { horizontal: number; vertical: number } {
  const m = toPowerMatrix(rx);
  return { horizontal: m[0][0], vertical: m[1][1] };
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
      CLAUSES.sphere,
    ),
  );
  // Compare cylinders in the ordered form (minus form for a spherical order).
  const form = ordered.cylinder > 0 ? toPlusCylinder : toMinusCylinder;
  const o = form(ordered);
  const m = form(measured);
  out.push(
    check(
      prefix(label, "cylinder"),
      o.cylinder,
      m.cylinder,
      cylinderTolerance(o.cylinder),
      "D",
      CLAUSES.cylinder,
    ),
  );
  if (Math.abs(o.cylinder) > EPS) {
    const dev = ((m.axis - o.axis) % 180 + 270) % 180 - 90;
    out.push(
      check(prefix(label, "axis"), o.axis, m.axis, axisTolerance(o.cylinder), "deg", CLAUSES.axis, {
        deviation: dev,
      }),
    );
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
      check(
        prefix(label, "add"),
        ordered.add,
        measured.add,
        addTolerance(ordered.add),
        "D",
        CLAUSES.add,
      ),
    );
  }
  return out;
}

const NO_PRISM: Prism = { horizontal: 0, vertical: 0 };

function report(checks: ToleranceCheck[]): ToleranceReport {
  return { standard: TOLERANCE_STANDARD, checks, pass: checks.every((c) => c.pass) };
}

/** The distance (mm) of a lens's reference point from where its prism is met, if it can be told. */
function referencePointOffset(rx: SpheroCylinder, dh: number, dv: number): number | undefined {
  const f = meridians(rx);
  try {
    return Math.hypot(prismToPosition(dh, f.horizontal), prismToPosition(dv, f.vertical));
  } catch {
    return undefined;
  }
}

/**
 * Check one measured lens against the ordered prescription: sphere (meridian of highest
 * absolute power), cylinder, axis (when a cylinder is ordered), add (when ordered) and, when
 * either carries prism, the horizontal and vertical prism at the reference point (at most
 * 0.33 Δ each). When the meridian of highest power exceeds ±3.375 D, the lens is also
 * accepted when its reference point lies within 1.0 mm of where the prescribed prism is met
 * (by Prentice's rule in each meridian, the cross terms of an oblique cylinder neglected).
 * Every check names its clause. Sources: ansi-z80.1-2015, prentice.
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
    const h = check(
      "horizontal prism",
      o.horizontal,
      m.horizontal,
      LENS_PRISM_TOLERANCE,
      "prism",
      CLAUSES.prism,
      {
        direction: "horizontal",
      },
    );
    const v = check(
      "vertical prism",
      o.vertical,
      m.vertical,
      LENS_PRISM_TOLERANCE,
      "prism",
      CLAUSES.prism,
      {
        direction: "vertical",
      },
    );
    const strong = Math.abs(highestMeridian(ordered)) > STRONG_VERTICAL_POWER + EPS;
    const offset = strong
      ? referencePointOffset(ordered, m.horizontal - o.horizontal, m.vertical - o.vertical)
      : undefined;
    if (offset === undefined) {
      checks.push(h, v);
    } else {
      const position = check(
        "reference point from where the prescribed prism is met",
        0,
        offset,
        REFERENCE_POINT_TOLERANCE,
        "mm",
        CLAUSES.prism,
        { limit: "at-most", direction: "offset" },
      );
      const prismPass = h.pass && v.pass;
      const pass = prismPass || position.pass;
      const note = (c: ToleranceCheck) =>
        c.pass || !pass ? c : {
          ...c,
          pass,
          remark: "accepted by the position of the reference point (the position line)",
        };
      checks.push(note(h), note(v), {
        ...position,
        pass,
        ...(!position.pass && pass
          ? { remark: "accepted by the prism limit (the prism lines)" }
          : {}),
      });
    }
  }
  return report(checks);
}

/**
 * Check a measured pair against the ordered pair: each lens as {@linkcode checkLens} does
 * for its powers, then the vertical imbalance (right − left vertical prism, right
 * relatively base up positive; at most 0.33 Δ) and the net horizontal prism (right + left,
 * base in positive; at most 0.67 Δ) against the ordered values.
 *
 * For strong lenses the pair is also accepted by the position of the reference points,
 * the prism errors turned into positions by Prentice's rule (mm = 10 · Δ / F, in each
 * lens's own meridian power): vertically, a difference in height of at most 1.0 mm where a
 * lens's vertical meridian exceeds ±3.375 D; horizontally, within ±2.5 mm of the ordered
 * distance between centres where a lens's horizontal meridian exceeds ±2.75 D. Either rule
 * accepts; the remark says which did. Every check names its clause.
 * Sources: ansi-z80.1-2015, prentice.
 *
 * @example
 * ```ts
 * import { checkPair } from "./tolerance.ts";
 * const rx = { sphere: -2, cylinder: 0, axis: 180 };
 * checkPair(rx, rx, rx, { ...rx, prism: { horizontal: 0, vertical: 0.5 } }).pass; // false
 * const strong = { sphere: -6.4, cylinder: 0, axis: 180 };
 * checkPair(strong, strong, { ...strong, prism: { horizontal: 0, vertical: 0.5 } }, strong).pass; // true
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
  const fR = meridians(orderedRight);
  const fL = meridians(orderedLeft);

  const vo = p(orderedRight).vertical - p(orderedLeft).vertical;
  const vm = p(measuredRight).vertical - p(measuredLeft).vertical;
  const vertical = check(
    "vertical imbalance",
    vo,
    vm,
    VERTICAL_PRISM_TOLERANCE,
    "prism",
    CLAUSES.imbalance,
    {
      direction: "imbalance",
    },
  );
  const strongV =
    Math.max(Math.abs(fR.vertical), Math.abs(fL.vertical)) > STRONG_VERTICAL_POWER + EPS;
  checks.push(...byPosition(
    vertical,
    strongV,
    () => {
      const hR = prismToPosition(p(measuredRight).vertical - p(orderedRight).vertical, fR.vertical);
      const hL = prismToPosition(p(measuredLeft).vertical - p(orderedLeft).vertical, fL.vertical);
      return check(
        "difference in height of the reference points (R − L)",
        0,
        hR - hL,
        HEIGHT_DIFFERENCE_TOLERANCE,
        "mm",
        CLAUSES.imbalance,
        { limit: "at-most", direction: "height" },
      );
    },
    "the difference in height of the reference points",
    "vertical",
  ));

  const ho = p(orderedRight).horizontal + p(orderedLeft).horizontal;
  const hm = p(measuredRight).horizontal + p(measuredLeft).horizontal;
  const horizontal = check(
    "net horizontal prism",
    ho,
    hm,
    HORIZONTAL_PRISM_TOLERANCE,
    "prism",
    CLAUSES.imbalance,
    {
      direction: "net-horizontal",
    },
  );
  const strongH = Math.max(Math.abs(fR.horizontal), Math.abs(fL.horizontal)) >
    STRONG_HORIZONTAL_POWER + EPS;
  checks.push(...byPosition(
    horizontal,
    strongH,
    () => {
      // Base in toward the nose is positive, so a point met nasally narrows the distance.
      const xR = prismToPosition(
        p(measuredRight).horizontal - p(orderedRight).horizontal,
        fR.horizontal,
      );
      const xL = prismToPosition(
        p(measuredLeft).horizontal - p(orderedLeft).horizontal,
        fL.horizontal,
      );
      return check(
        "change in the distance between centres",
        0,
        -(xR + xL),
        CENTRES_TOLERANCE,
        "mm",
        CLAUSES.imbalance,
        { limit: "plus-minus", direction: "centres" },
      );
    },
    "the distance between centres",
    "horizontal",
  ));
  return report(checks);
}

function byPosition(
  prismCheck: ToleranceCheck,
  strong: boolean,
  position: () => ToleranceCheck,
  words: string,
  meridian: string,
): ToleranceCheck[] {
  if (!strong) return [prismCheck];
  let pos: ToleranceCheck;
  try {
    pos = position();
  } catch {
    return [{
      ...prismCheck,
      remark:
        `a lens is nearly plano in the ${meridian} meridian, so its prism cannot be read as a position: the prism limit alone applies`,
    }];
  }
  return either(prismCheck, pos, words);
}
