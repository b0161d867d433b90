/**
 * Prescriptions in the formula language: the `rx` value type (read from the notations
 * practitioners write, shown in the trade's way) and the formulas for forms and
 * equivalents, power vectors, the power matrix, combining lenses and vertex distance.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * const v = lang.compile(lang.parse('transpose(rx("-2.25 -0.75 x 170"))')).evaluate({});
 * lang.describe(v).display; // "-3.00 / +0.75 × 80"
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec, type OptionSpec, type ParamSpec } from "./catalogue.ts";
import { defineValueType, type DisplayOptions } from "./types.ts";
import { markExact, markRounded, quantity, toNumberIn } from "./quantity.ts";
import { defineRecordType, describeValue } from "./present.ts";
import { combineLenses, lensDifference, overRefraction } from "../lib/combine.ts";
import {
  checkPowerMatrix,
  fromPowerMatrix,
  principalPowers,
  toPowerMatrix,
} from "../lib/power_matrix.ts";
import { blurStrength, fromPowerVector, toPowerVector } from "../lib/power_vector.ts";
import {
  CYLINDER_RANGE,
  parsePrescription,
  type Prescription,
  SPHERE_RANGE,
} from "../lib/prescription.ts";
import { formatPrescription } from "../lib/prescription_format.ts";
import { normaliseAxis, type SpheroCylinder } from "../lib/spherocylinder.ts";
import {
  meridianPower,
  sphericalEquivalent,
  toMinusCylinder,
  toPlusCylinder,
  transpose,
} from "../lib/transpose.ts";
import {
  cornealPower,
  ROUNDING_RULES,
  type RoundingRule,
  roundPower,
  roundToStep,
  vertexSpheroCylinder,
} from "../lib/vertex.ts";

/** A prescription as a value of the formula language. */
export class RxValue {
  /**
   * @param rx the prescription record.
   * @param exactOnly shown exact, never stepped to the notebook's power step (a measure such
   * as a mean prescription, or a figure beside its own rounded form, as the contact-lens
   * power is).
   * @param rounding for a prescription rounded on request: the step and rule, said beside it.
   */
  constructor(
    readonly rx: Prescription,
    readonly exactOnly = false,
    readonly rounding?: string,
  ) {}

  /** The trade's text, exact to 0.01 D and whole degrees. */
  toString(): string {
    return formatPrescription(this.rx);
  }
}

/** Wrap a record (or any spherocylinder) as an {@linkcode RxValue}. */
export function rxValue(rx: Prescription): RxValue {
  return new RxValue(rx);
}

function displayRx(v: RxValue, options: DisplayOptions): string {
  const exact = formatPrescription(v.rx);
  if (v.rounding) return `${exact} (rounded: ${v.rounding})`;
  const step = options.powerStep;
  if (v.exactOnly || !(step >= 0.01 && step <= 1)) return exact;
  const stepped = formatPrescription(roundToStep(v.rx, step));
  return stepped === exact ? exact : `${stepped} (exact ${exact})`;
}

/** The `rx` value type. */
export const RX_TYPE = defineValueType<RxValue>({
  name: "rx",
  summary: 'a prescription (rx("-2.25 / -0.75 x 170") or text such as "+1.00 DS")',
  is: (x): x is RxValue => x instanceof RxValue,
  fromText: (text) => new RxValue(parsePrescription(text)),
  display: displayRx,
  json: (v) => ({ ...v.rx }),
});

const RX = (name = "rx", doc = "a prescription"): ParamSpec => ({ name, type: "rx", doc });
const RETURNS_RX = { type: "rx", doc: "a prescription" } as const;
const rxOf = (x: unknown): Prescription => (x as RxValue).rx;
const VERTEX_MM = (name: string, doc: string, optional = false): ParamSpec => ({
  name,
  type: "quantity",
  unit: "mm",
  range: [0, 25],
  doc,
  ...(optional ? { optional: true, default: 0 } : {}),
});
const STEP: OptionSpec = {
  name: "step",
  type: "quantity",
  unit: "D",
  range: [0.01, 1],
  default: 0.25,
  doc: "the available step, usually 0.25 D (0.125 D for some lenses)",
};
const RULE: OptionSpec = {
  name: "rule",
  type: "text",
  default: "nearest",
  choices: ["nearest", "plus", "minus"],
  doc: `"nearest" (halves toward plus), "plus" (round up) or "minus" (round down)`,
};

function ruleOf(x: unknown): RoundingRule {
  if (x === "nearest" || x === "plus" || x === "minus") return x;
  throw new TypeError(`rounding rule "${x}" is not one of "nearest", "plus", "minus"`);
}

const shown = (x: unknown) => describeValue(x).display;

/** A power vector: M, J0, J45 and the blur strength B, measures in D (not lens powers). */
export const POWER_VECTOR_RECORD = defineRecordType<
  { M: unknown; J0: unknown; J45: unknown; B: unknown }
>({
  name: "powerVector",
  summary: "a power vector M, J0, J45 with the blur strength B",
  headline: (r) => `M ${shown(r.M)}, J0 ${shown(r.J0)}, J45 ${shown(r.J45)}`,
  parts: [
    { key: "M", label: "M, spherical equivalent" },
    { key: "J0", label: "J0, cross-cylinder at 0° and 90°" },
    { key: "J45", label: "J45, cross-cylinder at 45° and 135°" },
    { key: "B", label: "B, blur strength" },
  ],
});

/** Power vector of a spherocylinder as a record of quantities. */
function vectorRecord(rx: SpheroCylinder) {
  const v = toPowerVector(rx);
  return POWER_VECTOR_RECORD.make({
    M: markExact(quantity(v.m, "D")),
    J0: markExact(quantity(v.j0, "D")),
    J45: markExact(quantity(v.j45, "D")),
    B: markExact(quantity(blurStrength(v), "D"), { unsigned: true }),
  });
}

/** The principal powers of a lens and their meridians. */
export const PRINCIPAL_POWERS_RECORD = defineRecordType<
  { power1: unknown; meridian1: unknown; power2: unknown; meridian2: unknown }
>({
  name: "principalPowers",
  summary: "the two principal powers of a lens and their meridians",
  headline: (r) =>
    `${shown(r.power1)} along ${shown(r.meridian1)}, ${shown(r.power2)} along ${
      shown(r.meridian2)
    }`,
  parts: [
    { key: "power1", label: "first principal power" },
    { key: "meridian1", label: "its meridian" },
    { key: "power2", label: "second principal power" },
    { key: "meridian2", label: "its meridian" },
  ],
});

/** A contact-lens power at the cornea: exact, rounded to the step, and the rule used. */
export const CORNEA_POWER_RECORD = defineRecordType<
  { atCornea: unknown; rounded: unknown; rule: unknown }
>({
  name: "corneaPower",
  summary: "a power at the cornea, exact and rounded to the available step",
  headline: (r) => shown(r.rounded),
  parts: [
    { key: "rounded", label: "to order (rounded to the step)" },
    { key: "atCornea", label: "exact, at the cornea" },
    { key: "rule", label: "rounding rule" },
  ],
});

/** Prescription formulas. */
export const RX_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "rx",
    group: "prescription",
    summary:
      "Read a prescription as written: sphere / cylinder × axis (with or without / and x, ×, @), DS, plano, an add and a prism with its base.",
    params: [{ name: "text", type: "text", doc: 'the prescription, e.g. "-2.25 / -0.75 x 170"' }],
    returns: RETURNS_RX,
    sources: ["common-practice", "iso-13666-axis"],
    example: 'rx("-2.25 -0.75 x 170 add +2.00")',
    fn: (text) => rxValue(parsePrescription(text as string)),
  }),
  defineFormula({
    name: "spheroCylinder",
    group: "prescription",
    summary: "A prescription from its sphere, cylinder and axis.",
    params: [
      { name: "sphere", type: "quantity", unit: "D", range: SPHERE_RANGE, doc: "sphere" },
      {
        name: "cylinder",
        type: "quantity",
        unit: "D",
        range: CYLINDER_RANGE,
        optional: true,
        default: 0,
        doc: "cylinder (either sign)",
      },
      {
        name: "axis",
        type: "quantity",
        unit: "deg",
        range: [0, 180],
        optional: true,
        default: 180,
        doc: "axis, 0–180 (0 is read as 180)",
      },
    ],
    returns: RETURNS_RX,
    sources: ["iso-13666-axis"],
    example: "spheroCylinder(-2.25 D, -0.75 D, 170 deg)",
    fn: (s, c, a) =>
      rxValue({ sphere: s as number, cylinder: c as number, axis: normaliseAxis(a as number) }),
  }),
  defineFormula({
    name: "transpose",
    group: "prescription",
    summary: "The same lens in the other cylinder form: (S + C) / −C × (axis ± 90).",
    params: [RX()],
    returns: RETURNS_RX,
    sources: ["common-practice", "iso-13666-axis"],
    caution: true,
    example: 'transpose(rx("-2.25 / -0.75 x 170"))',
    fn: (r) => rxValue(transpose(rxOf(r))),
  }),
  defineFormula({
    name: "minusCylinder",
    group: "prescription",
    summary: "The prescription in minus-cylinder form.",
    params: [RX()],
    returns: RETURNS_RX,
    sources: ["common-practice"],
    caution: true,
    example: 'minusCylinder(rx("-3.00 / +0.75 x 80"))',
    fn: (r) => rxValue(toMinusCylinder(rxOf(r))),
  }),
  defineFormula({
    name: "plusCylinder",
    group: "prescription",
    summary: "The prescription in plus-cylinder form.",
    params: [RX()],
    returns: RETURNS_RX,
    sources: ["common-practice"],
    caution: true,
    example: 'plusCylinder(rx("-2.25 / -0.75 x 170"))',
    fn: (r) => rxValue(toPlusCylinder(rxOf(r))),
  }),
  defineFormula({
    name: "sphericalEquivalent",
    group: "prescription",
    summary: "Spherical equivalent M = S + C/2.",
    params: [RX()],
    returns: {
      type: "quantity",
      unit: "D",
      display: "exact",
      doc: "spherical equivalent, a measure shown exact (roundPower rounds it to a step)",
    },
    sources: ["thibos-1997"],
    example: 'sphericalEquivalent(rx("-2.25 / -0.75 x 170"))',
    fn: (r) => sphericalEquivalent(rxOf(r)),
  }),
  defineFormula({
    name: "powerVector",
    group: "power vectors",
    summary: "Power vector M, J0, J45 and blur strength B of a prescription.",
    params: [RX()],
    returns: { type: "any", doc: "record M, J0, J45, B (D)" },
    sources: ["thibos-1997"],
    example: 'powerVector(rx("-2.25 / -0.75 x 170"))',
    fn: (r) => vectorRecord(rxOf(r)),
  }),
  ...(["m", "j0", "j45"] as const).map((key) =>
    defineFormula({
      name: `power${key.toUpperCase()}`,
      group: "power vectors",
      summary: `The ${key.toUpperCase()} component of the power vector.`,
      params: [RX()],
      returns: { type: "quantity", unit: "D", display: "exact", doc: `${key.toUpperCase()} (D)` },
      sources: ["thibos-1997"],
      example: `power${key.toUpperCase()}(rx("-2.25 / -0.75 x 170"))`,
      fn: (r) => toPowerVector(rxOf(r))[key],
    })
  ),
  defineFormula({
    name: "blurStrength",
    group: "power vectors",
    summary: "Blur strength B = √(M² + J0² + J45²).",
    params: [RX()],
    returns: { type: "quantity", unit: "D", display: "exact", doc: "blur strength" },
    sources: ["thibos-1997"],
    example: 'blurStrength(rx("-2.25 / -0.75 x 170"))',
    fn: (r) => blurStrength(toPowerVector(rxOf(r))),
  }),
  defineFormula({
    name: "fromVector",
    group: "power vectors",
    summary: "The prescription (minus-cylinder form) of a power vector M, J0, J45.",
    params: [
      { name: "m", type: "quantity", unit: "D", range: SPHERE_RANGE, doc: "M" },
      { name: "j0", type: "quantity", unit: "D", range: [-10, 10], doc: "J0" },
      { name: "j45", type: "quantity", unit: "D", range: [-10, 10], doc: "J45" },
    ],
    returns: RETURNS_RX,
    sources: ["thibos-1997"],
    example: "fromVector(-2.625 D, 0.35 D, 0.13 D)",
    fn: (m, j0, j45) =>
      rxValue(fromPowerVector({ m: m as number, j0: j0 as number, j45: j45 as number })),
  }),
  defineFormula({
    name: "meridianPower",
    group: "prescription",
    summary: "Power in any meridian by the sine-squared law, S + C·sin²(θ − axis).",
    params: [
      RX(),
      { name: "meridian", type: "quantity", unit: "deg", range: [0, 360], doc: "the meridian" },
    ],
    returns: { type: "quantity", unit: "D", doc: "power in that meridian" },
    sources: ["sine-squared"],
    example: 'meridianPower(rx("-2.00 / -1.00 x 180"), 45 deg)',
    fn: (r, a) => meridianPower(rxOf(r), a as number),
  }),
  defineFormula({
    name: "powerMatrix",
    group: "power matrix",
    summary:
      "Dioptric power matrix [[S + C·sin²α, −C·sinα·cosα], [−C·sinα·cosα, S + C·cos²α]] (D).",
    params: [RX()],
    returns: { type: "list", doc: "2×2 matrix of numbers in D" },
    sources: ["long-1976"],
    example: 'powerMatrix(rx("-2.00 / -1.00 x 30"))',
    fn: (r) => toPowerMatrix(rxOf(r)).map((row) => [...row]),
  }),
  defineFormula({
    name: "fromMatrix",
    group: "power matrix",
    summary: "The prescription (minus-cylinder form) of a symmetric 2×2 dioptric power matrix.",
    params: [{ name: "matrix", type: "list", doc: "[[fxx, fxy], [fyx, fyy]] in D" }],
    returns: RETURNS_RX,
    sources: ["long-1976"],
    example: "fromMatrix([[-2.25, 0.433], [0.433, -2.75]])",
    fn: (m) => {
      const rows = (m as unknown[]).map((row) => {
        const r = Array.isArray(row) ? row : (row as { toArray(): unknown[] }).toArray?.();
        if (!Array.isArray(r)) throw new TypeError("expected a 2×2 matrix [[a, b], [c, d]]");
        return r.map((x) => toNumberIn(x, "D"));
      });
      return rxValue(fromPowerMatrix(checkPowerMatrix(rows)));
    },
  }),
  defineFormula({
    name: "principalPowers",
    group: "power matrix",
    summary:
      "Principal powers and their meridians (eigenvalues and eigenvectors of the power matrix).",
    params: [RX()],
    returns: { type: "any", doc: "record power1, meridian1, power2, meridian2" },
    sources: ["long-1976"],
    example: 'principalPowers(rx("-2.00 / -1.00 x 30"))',
    fn: (r) => {
      const p = principalPowers(toPowerMatrix(rxOf(r)));
      return PRINCIPAL_POWERS_RECORD.make({
        power1: quantity(p.power1, "D"),
        meridian1: quantity(p.meridian1, "deg"),
        power2: quantity(p.power2, "D"),
        meridian2: quantity(p.meridian2, "deg"),
      });
    },
  }),
  defineFormula({
    name: "combine",
    group: "combining lenses",
    summary:
      "The single lens equivalent to two thin lenses in contact at any axes (obliquely crossed cylinders).",
    params: [RX("a", "first lens"), RX("b", "second lens")],
    returns: RETURNS_RX,
    sources: ["long-1976", "keating-1981", "thompson-1899"],
    caution: true,
    example: 'combine(rx("+1.00 / -2.00 x 30"), rx("plano / +1.00 x 90"))',
    fn: (a, b) => rxValue(combineLenses(rxOf(a), rxOf(b))),
  }),
  defineFormula({
    name: "difference",
    group: "combining lenses",
    summary: "The lens a − b: what, in contact with b, gives a.",
    params: [RX("a", "the lens to reach"), RX("b", "the lens taken away")],
    returns: RETURNS_RX,
    sources: ["long-1976", "keating-1981"],
    caution: true,
    example: 'difference(rx("-2.25 / -0.75 x 170"), rx("-2.00 DS"))',
    fn: (a, b) => rxValue(lensDifference(rxOf(a), rxOf(b))),
  }),
  defineFormula({
    name: "overRefraction",
    group: "combining lenses",
    summary: "The over-refraction that turns the current prescription into the target.",
    params: [RX("current", "the lens worn or held"), RX("target", "the prescription wanted")],
    returns: RETURNS_RX,
    sources: ["long-1976", "keating-1981"],
    caution: true,
    example: 'overRefraction(rx("-2.00 / -0.50 x 180"), rx("-2.25 / -0.75 x 170"))',
    fn: (c, t) => rxValue(overRefraction(rxOf(c), rxOf(t))),
  }),
  defineFormula({
    name: "vertexRx",
    group: "vertex",
    summary:
      "A prescription moved from one vertex distance to another, per principal meridian (F / (1 − d·F)).",
    params: [
      { ...RX(), hints: { quantity: "a single power moves with vertexPower(power, from, to)" } },
      VERTEX_MM("from", "vertex distance at which it was refracted"),
      VERTEX_MM("to", "new vertex distance (0 = at the cornea)", true),
    ],
    returns: RETURNS_RX,
    sources: ["vertex-formula"],
    caution: true,
    example: 'vertexRx(rx("-10.00 / -2.00 x 90"), 12 mm, 8 mm)',
    fn: (r, from, to) => rxValue(vertexSpheroCylinder(rxOf(r), from as number, to as number)),
  }),
  defineFormula({
    name: "contactLensPower",
    group: "vertex",
    summary:
      "Contact-lens power at the cornea for a spectacle prescription, exact and rounded to the available step with the rule stated.",
    params: [RX(), VERTEX_MM("vertex", "vertex distance of the refraction")],
    options: [STEP, RULE],
    returns: { type: "any", doc: "record atCornea (exact), rounded, rule" },
    sources: ["vertex-formula", "common-practice"],
    caution: true,
    example: 'contactLensPower(rx("-6.00 / -1.50 x 180"), 12 mm)',
    fn: (r, v, step, rule) => {
      const exact = cornealPower(rxOf(r), v as number);
      const how = ruleOf(rule);
      return CORNEA_POWER_RECORD.make({
        atCornea: new RxValue(exact, true),
        rounded: rxValue(roundToStep(exact, step as number, how)),
        rule: `${ROUNDING_RULES[how]}, step ${(step as number).toFixed(3).replace(/0$/, "")} D`,
      });
    },
  }),
  defineFormula({
    name: "roundToStep",
    group: "vertex",
    summary:
      "A prescription rounded to the available step: each principal meridian power by the rule (default nearest, halves toward plus); axis to the degree.",
    params: [RX()],
    options: [STEP, RULE],
    returns: RETURNS_RX,
    sources: ["common-practice"],
    caution: true,
    example: 'roundToStep(vertexRx(rx("-8.00 / -1.25 x 10"), 12 mm), {step: 0.25 D})',
    fn: (r, step, rule) =>
      new RxValue(
        roundToStep(rxOf(r), step as number, ruleOf(rule)),
        true,
        roundingText(step as number, ruleOf(rule)),
      ),
  }),
  defineFormula({
    name: "roundPower",
    group: "vertex",
    summary:
      "One power (a spherical equivalent, a mean) rounded to the available step by the rule, when a figure to order is wanted; measures are otherwise shown exact.",
    params: [{ name: "power", type: "quantity", unit: "D", doc: "the power" }],
    options: [STEP, RULE],
    returns: { type: "quantity", unit: "D", doc: "the power on the step, shown with the rounding" },
    sources: ["common-practice"],
    example: 'roundPower(sphericalEquivalent(rx("-2.25 / -0.75 x 90")), {step: 0.25 D})',
    fn: (p, step, rule) =>
      markRounded(
        quantity(roundPower(p as number, step as number, ruleOf(rule)), "D"),
        roundingText(step as number, ruleOf(rule)),
      ),
  }),
];

/** The step and rule of a rounding asked for, in words ("0.25 D step, nearest"). */
function roundingText(step: number, rule: RoundingRule): string {
  const s = step.toFixed(3).replace(/0$/, "");
  return `${s} D step, ${rule === "nearest" ? "nearest" : `toward ${rule}`}`;
}
