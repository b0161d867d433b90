/**
 * Prism in the formula language: the `prism` value type (base in/out, up/down per eye,
 * shown with the 360-degree base when the eye is known) and the formulas for Prentice's
 * rule at any point of a spherocylinder, compounding and resolving prisms, the vertical
 * imbalance at a reading point and the decentration that produces a prism.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * const v = lang.compile(lang.parse('prismAt(rx("+4.00 DS"), 0 mm, -10 mm, "R")')).evaluate({});
 * lang.describe(v).display; // "R: 4.00 Δ BU (4.00 Δ base 90°)"
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec, type ParamSpec } from "./catalogue.ts";
import { defineValueType } from "./types.ts";
import { EYE_PARAM, pickEye, requireEye } from "./_eye.ts";
import { quantity } from "./quantity.ts";
import { defineRecordType, describeValue } from "./present.ts";
import type { RxValue } from "./rx.ts";
import { toPowerMatrix } from "../lib/power_matrix.ts";
import type { SpheroCylinder } from "../lib/spherocylinder.ts";
import { parsePrism } from "../lib/prescription.ts";
import { formatPrism } from "../lib/prescription_format.ts";
import {
  compoundPrism,
  decentrationFor,
  type Eye,
  MAX_OFFSET_MM,
  polarPrism,
  type Prism,
  prismAt,
  resolvePrism,
  verticalImbalance,
} from "../lib/prism.ts";

/** A prism before one eye as a value of the formula language. */
export class PrismValue {
  /** @param prism the components; @param eye the eye, when known. */
  constructor(readonly prism: Prism, readonly eye?: Eye) {}
}

function displayPrism(v: PrismValue): string {
  const parts = formatPrism(v.prism) || "no prism";
  if (!v.eye) return parts;
  const p = polarPrism(v.prism, v.eye);
  const polar = p.amount > 0 ? ` (${p.amount.toFixed(2)} Δ base ${Math.round(p.base) % 360}°)` : "";
  return `${v.eye}: ${parts}${polar}`;
}

/** The `prism` value type. */
export const PRISM_TYPE = defineValueType<PrismValue>({
  name: "prism",
  summary: 'a prism with its base (readPrism("1.5 BU"), or text such as "2 BI", "R 2 base 30")',
  is: (x): x is PrismValue => x instanceof PrismValue,
  fromText: (text) => {
    const p = parsePrism(text);
    return new PrismValue(p.prism, p.eye);
  },
  display: displayPrism,
  json: (v) => ({ ...v.prism, ...(v.eye ? { eye: v.eye, ...polarPrism(v.prism, v.eye) } : {}) }),
});

const rxOf = (x: unknown) => (x as RxValue).rx;
const shown = (x: unknown) => describeValue(x).display;

/** A prism's components, and its amount and base direction when the eye is known. */
const COMPONENTS_RECORD = defineRecordType<
  { horizontal: unknown; vertical: unknown; amount: unknown; base?: unknown }
>({
  name: "prismComponents",
  summary: "a prism's horizontal and vertical components, amount and base",
  headline: (r) => `${shown(r.amount)}${r.base === undefined ? "" : ` base ${shown(r.base)}`}`,
  parts: [
    { key: "horizontal", label: "horizontal (base in positive)" },
    { key: "vertical", label: "vertical (base up positive)" },
    { key: "amount", label: "amount" },
    { key: "base", label: "base direction (360° notation)", when: (r) => r.base !== undefined },
  ],
});

/** The vertical prism before each eye at a reading point and the imbalance. */
const IMBALANCE_RECORD = defineRecordType<
  { right: unknown; left: unknown; imbalance: unknown; baseUpEye: unknown }
>({
  name: "verticalImbalance",
  summary: "the vertical prism before each eye at a reading point, and their imbalance",
  headline: (r) =>
    `${shown(r.imbalance)} vertical imbalance${
      r.baseUpEye === "R" || r.baseUpEye === "L" ? `, ${r.baseUpEye} relatively base up` : ""
    }`,
  parts: [
    { key: "right", label: "right eye" },
    { key: "left", label: "left eye" },
    { key: "imbalance", label: "vertical imbalance" },
    {
      key: "baseUpEye",
      label: "eye relatively base up",
      display: (v) => v === "R" ? "right (R)" : v === "L" ? "left (L)" : "neither",
    },
  ],
});

/** A decentration of the optical centre, in mm and in words. */
const DECENTRATION_RECORD = defineRecordType<
  { horizontal: unknown; vertical: unknown; move: unknown }
>({
  name: "decentration",
  summary: "a decentration of the optical centre (mm) and the move in words",
  headline: (r) => String(r.move),
  parts: [
    { key: "horizontal", label: "horizontal (in positive)" },
    { key: "vertical", label: "vertical (up positive)" },
    { key: "move", label: "the move, in words" },
  ],
});

/**
 * The eye to compute with and the eye to report: a lens whose power matrix has no oblique
 * part (sphere, or axis 90/180) gives the same in/out answer for either eye.
 */
function eyeFor(rx: SpheroCylinder, ...candidates: (string | undefined)[]): [Eye, Eye | undefined] {
  const given = pickEye(...candidates);
  if (given) return [given, given];
  if (Math.abs(toPowerMatrix(rx)[0][1]) < 1e-9) return ["R", undefined];
  return [requireEye("for a lens with an oblique cylinder"), undefined];
}
/** A decentration as the lab order reads: "optical centre 2.50 mm in, 1.00 mm down". */
function decentrationWords(horizontal: number, vertical: number): string {
  const part = (v: number, plus: string, minus: string) =>
    Math.round(Math.abs(v) * 100) === 0
      ? ""
      : `${Math.abs(v).toFixed(2)} mm ${v > 0 ? plus : minus}`;
  const parts = [part(horizontal, "in", "out"), part(vertical, "up", "down")].filter((p) => p);
  return parts.length ? `optical centre ${parts.join(", ")}` : "no decentration";
}
const RX: ParamSpec = { name: "rx", type: "rx", doc: "the lens" };
const OFFSET = (name: string, doc: string): ParamSpec => ({
  name,
  type: "quantity",
  unit: "mm",
  range: [-MAX_OFFSET_MM, MAX_OFFSET_MM],
  doc,
});
const PRISM_PARAM: ParamSpec = { name: "prism", type: "prism", doc: "a prism with its base" };

/** Prism formulas. */
export const PRISM_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "readPrism",
    group: "prism",
    summary:
      "Read a prism: amount and base (BU, BD, BI, BO, base up/down/in/out, or base 0–360° with the eye).",
    params: [{ name: "text", type: "text", doc: 'the prism, e.g. "1.5 BU" or "R 2 base 30"' }],
    returns: { type: "prism", doc: "a prism" },
    sources: ["common-practice"],
    example: 'readPrism("2 BI 1 BU")',
    fn: (text) => PRISM_TYPE.fromText!(text as string),
  }),
  defineFormula({
    name: "prismAt",
    group: "prism",
    summary:
      "Prism at a point of a spherocylindrical lens by Prentice's rule in matrix form (power matrix × position from the optical centre).",
    params: [
      RX,
      OFFSET(
        "horizontal",
        "position of the point from the optical centre, positive toward the nose",
      ),
      OFFSET("vertical", "position of the point from the optical centre, positive up"),
      EYE_PARAM,
    ],
    returns: { type: "prism", doc: "the prism at that point" },
    sources: ["prentice", "long-1976"],
    caution: true,
    example: 'prismAt(rx("-4.00 / -2.00 x 45"), 5 mm, -8 mm, "R")',
    fn: (r, h, v, eye) => {
      const [e, shown] = eyeFor(rxOf(r), eye as string | undefined, rxOf(r).eye);
      return new PrismValue(prismAt(rxOf(r), h as number, v as number, e), shown);
    },
  }),
  defineFormula({
    name: "compoundPrism",
    group: "prism",
    summary: "Several prisms before the same eye compounded into one.",
    params: [{ ...PRISM_PARAM, doc: "prisms before the same eye" }],
    variadic: true,
    returns: { type: "prism", doc: "the resultant prism" },
    sources: ["common-practice"],
    caution: true,
    example: 'compoundPrism(readPrism("3 BI"), readPrism("4 BU"))',
    fn: (...ps) => {
      const values = ps as PrismValue[];
      const eyes = new Set(values.map((p) => p.eye).filter((e) => e !== undefined));
      if (eyes.size > 1) throw new TypeError("the prisms are for different eyes");
      return new PrismValue(compoundPrism(values.map((p) => p.prism)), [...eyes][0]);
    },
  }),
  defineFormula({
    name: "resolvePrism",
    group: "prism",
    summary:
      "A prism given as amount and 360-degree base direction resolved into base in/out and up/down for one eye.",
    params: [
      { name: "amount", type: "quantity", unit: "prism", range: [0, 30], doc: "amount" },
      {
        name: "base",
        type: "quantity",
        unit: "deg",
        range: [0, 360],
        doc: "base direction, 0–360° (standard frame, as seen facing the wearer)",
      },
      { ...EYE_PARAM, optional: false, doc: 'the eye, "R" or "L"' },
    ],
    returns: { type: "prism", doc: "the prism in components" },
    sources: ["common-practice", "iso-13666-axis"],
    caution: true,
    example: 'resolvePrism(3 prism, 30 deg, "L")',
    fn: (amount, base, eye) => {
      const e = requireEye("for the base direction", eye as string);
      return new PrismValue(resolvePrism(amount as number, base as number, e), e);
    },
  }),
  defineFormula({
    name: "prismComponents",
    group: "prism",
    summary:
      "A prism's horizontal (base in positive) and vertical (base up positive) components, and its amount and 360-degree base when the eye is known.",
    params: [PRISM_PARAM, EYE_PARAM],
    returns: { type: "any", doc: "record horizontal, vertical, amount, base" },
    sources: ["common-practice", "iso-13666-axis"],
    example: 'prismComponents(readPrism("R 2 base 30"))',
    fn: (p, eye) => {
      const v = p as PrismValue;
      const e = pickEye(eye as string | undefined, v.eye);
      const polar = polarPrism(v.prism, e ?? "R");
      return COMPONENTS_RECORD.make({
        horizontal: quantity(v.prism.horizontal, "prism"),
        vertical: quantity(v.prism.vertical, "prism"),
        amount: quantity(polar.amount, "prism"),
        ...(e ? { base: quantity(polar.base, "deg") } : {}),
      });
    },
  }),
  defineFormula({
    name: "verticalImbalance",
    group: "prism",
    summary:
      "Vertical prism before each eye at a reading point below the optical centres, and the imbalance between them.",
    params: [
      { name: "right", type: "rx", doc: "right lens" },
      { name: "left", type: "rx", doc: "left lens" },
      {
        name: "drop",
        type: "quantity",
        unit: "mm",
        range: [0, 30],
        doc: "reading point below the optical centres",
      },
      {
        name: "inset",
        type: "quantity",
        unit: "mm",
        range: [0, 10],
        optional: true,
        default: 0,
        doc: "reading point toward the nose in each eye",
      },
    ],
    returns: { type: "any", doc: "record right, left, imbalance, baseUpEye" },
    sources: ["prentice", "long-1976"],
    caution: true,
    example: 'verticalImbalance(rx("+3.00 DS"), rx("+1.00 / -1.00 x 180"), 10 mm)',
    fn: (r, l, drop, inset) => {
      const v = verticalImbalance(rxOf(r), rxOf(l), drop as number, inset as number);
      return IMBALANCE_RECORD.make({
        right: new PrismValue(v.right, "R"),
        left: new PrismValue(v.left, "L"),
        imbalance: quantity(v.imbalance, "prism"),
        baseUpEye: v.baseUpEye,
      });
    },
  }),
  defineFormula({
    name: "decentrationFor",
    group: "prism",
    summary:
      "The decentration of the optical centre that produces a prescribed prism (inverse of Prentice's rule in matrix form).",
    params: [RX, PRISM_PARAM, EYE_PARAM],
    returns: {
      type: "any",
      doc: "record horizontal (mm, positive in), vertical (mm, positive up), and the move in words",
    },
    sources: ["prentice", "long-1976"],
    caution: true,
    example: 'decentrationFor(rx("+4.00 DS"), readPrism("1 BI"), "R")',
    fn: (r, p, eye) => {
      const pv = p as PrismValue;
      const [e] = eyeFor(rxOf(r), eye as string | undefined, pv.eye, rxOf(r).eye);
      const d = decentrationFor(rxOf(r), pv.prism, e);
      return DECENTRATION_RECORD.make({
        horizontal: quantity(d.horizontal, "mm"),
        vertical: quantity(d.vertical, "mm"),
        move: decentrationWords(d.horizontal, d.vertical),
      });
    },
  }),
];
