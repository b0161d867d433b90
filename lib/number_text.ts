/**
 * Numbers as the trade writes them, declared once for every surface: how many decimals each
 * kind of measure carries and how its unit is written (µm, never `um`; Δ for prism dioptres;
 * whole degrees for axes). `cells/display.ts` builds the displays of results on these rules;
 * {@linkcode numberInMessage} writes a number inside a message (an error, a warning) by the
 * same rules, so a message never shows a raw float such as `38.73592452822642 mm`.
 *
 * Source: common-practice (the decimals of each kind are the trade's usual writing).
 *
 * @example
 * ```ts
 * import { numberInMessage } from "./number_text.ts";
 * numberInMessage(38.73592452822642, "mm"); // "38.74 mm"
 * numberInMessage(1.5, "um"); // "2 µm"
 * ```
 *
 * @module
 */

/** The kinds of measure that have a display rule of their own. */
export type MeasureKind =
  | "power"
  | "measure"
  | "spread"
  | "prism"
  | "axis"
  | "logMAR"
  | "letters"
  | "decimal"
  | "arcmin"
  | "micrometre"
  | "nanometre"
  | "length"
  | "covariance"
  | "ratio"
  | "count"
  | "chance"
  | "plain";

/** The rule of one kind of measure. */
export interface MeasureRule {
  /** What the kind is, in words (for the reference and the README). */
  readonly doc: string;
  /** Decimals shown; `undefined` for four significant figures. */
  readonly decimals?: number;
  /** Whether the sign is always written (`+1.25`). */
  readonly signed?: boolean;
  /** The unit as written after the number ("" for none). */
  readonly unit: string;
  /** The unit is written without a space (`175°`). */
  readonly tight?: boolean;
}

/**
 * The display rule of every kind of measure: the one declaration that results, table
 * cells, plot labels and messages follow. Source: common-practice.
 */
export const MEASURE_RULES: Readonly<Record<MeasureKind, MeasureRule>> = {
  power: {
    doc:
      "a lens power: signed, two decimals, in the notebook's power step with the exact figure beside",
    decimals: 2,
    signed: true,
    unit: "D",
  },
  measure: {
    doc:
      "a measure in D that is not a lens power (a mean, a bias, a vergence): signed, two decimals",
    decimals: 2,
    signed: true,
    unit: "D",
  },
  spread: {
    doc: "a spread in D (an SD, a semi-axis): unsigned, two decimals",
    decimals: 2,
    unit: "D",
  },
  prism: { doc: "prism dioptres: two decimals, written Δ", decimals: 2, unit: "Δ" },
  axis: { doc: "an axis or angle: whole degrees", decimals: 0, unit: "°", tight: true },
  logMAR: { doc: "logMAR: two decimals", decimals: 2, unit: "logMAR" },
  letters: { doc: "a letter score: whole letters", decimals: 0, unit: "letters" },
  decimal: { doc: "decimal acuity: two decimals", decimals: 2, unit: "" },
  arcmin: { doc: "an angle in minutes of arc: one decimal", decimals: 1, unit: "arcmin" },
  micrometre: { doc: "micrometres: whole, written µm", decimals: 0, unit: "µm" },
  nanometre: { doc: "nanometres: whole", decimals: 0, unit: "nm" },
  length: { doc: "a length in mm or cm: two decimals", decimals: 2, unit: "mm" },
  covariance: { doc: "a covariance of powers: four significant figures, in D²", unit: "D²" },
  ratio: { doc: "a ratio: two decimals", decimals: 2, unit: "" },
  count: { doc: "a count: whole, with thousands separators", decimals: 0, unit: "" },
  chance: {
    doc: "a chance: three significant figures, with 1 in N when below one half (0.00856, 1 in 117)",
    unit: "",
  },
  plain: { doc: "any other number: four significant figures", unit: "" },
};

/** The kind of measure a unit names, or undefined for units without a rule of their own. */
export function kindOfUnit(unit: string): MeasureKind | undefined {
  switch (unit) {
    case "D":
    case "dpt":
      return "power";
    case "prism":
    case "pdpt":
    case "Δ":
      return "prism";
    case "deg":
    case "°":
      return "axis";
    case "logMAR":
    case "logmar":
      return "logMAR";
    case "letters":
      return "letters";
    case "arcmin":
      return "arcmin";
    case "um":
    case "µm":
      return "micrometre";
    case "nm":
      return "nanometre";
    case "mm":
    case "cm":
      return "length";
    case "D^2":
    case "D²":
      return "covariance";
    default:
      return undefined;
  }
}

/** How a unit is written after a number (`um` → `µm`, `prism` → `Δ`, `deg` → `°`). */
export function unitText(unit: string): string {
  switch (unit) {
    case "um":
      return "µm";
    case "prism":
    case "pdpt":
      return "Δ";
    case "deg":
      return "°";
    case "D^2":
      return "D²";
    default:
      return unit;
  }
}

/**
 * Four significant figures without trailing zeros; integers as they are.
 *
 * @example
 * ```ts
 * import { significant } from "./number_text.ts";
 * significant(8.7266); // "8.727"
 * significant(1 / 729); // "0.001372"
 * ```
 */
export function significant(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  if (Number.isInteger(value) && Math.abs(value) < 1e15) return String(value);
  const abs = Math.abs(value);
  if (abs !== 0 && (abs < 1e-6 || abs >= 1e15)) return value.toExponential(digits - 1);
  const s = value.toPrecision(digits);
  return s.includes("e") ? s : s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}

/**
 * A number to a fixed number of decimals, halves away from zero (−1.375 → −1.38), with the
 * sign written when `sign` is set; zero is never signed and never negative.
 *
 * @example
 * ```ts
 * import { fixed } from "./number_text.ts";
 * fixed(-1.375, 2, true); // "-1.38"
 * fixed(-0.001, 2, true); // "0.00"
 * fixed(2000, 0); // "2,000"
 * ```
 */
export function fixed(value: number, decimals: number, sign = false): string {
  if (!Number.isFinite(value)) return String(value);
  const f = 10 ** decimals;
  // The small nudge absorbs binary representation (1.375 × 100 is 137.49999…).
  const r = Math.round(Math.abs(value) * f + 1e-7) / f;
  if (r === 0) return (0).toFixed(decimals);
  const body = decimals === 0 && r >= 10000 ? countText(r) : r.toFixed(decimals);
  return (value < 0 ? "-" : sign ? "+" : "") + body;
}

/**
 * A whole number with commas between thousands, as `toLocaleString("en")` writes it, without
 * loading the locale data (about 18 ms on a command's first call). Common practice, no source.
 *
 * @example
 * ```ts
 * import { countText } from "./number_text.ts";
 * countText(1234567); // "1,234,567"
 * countText(-2000.4); // "-2,000"
 * countText(999); // "999"
 * ```
 */
export function countText(n: number): string {
  const r = Math.round(n);
  if (!Number.isFinite(r) || Math.abs(r) >= 1e21) return String(r);
  const digits = String(Math.abs(r));
  let out = "";
  for (let i = 0; i < digits.length; i++) {
    if (i > 0 && (digits.length - i) % 3 === 0) out += ",";
    out += digits[i];
  }
  return (r < 0 ? "-" : "") + out;
}

/**
 * The number of a measure by its kind's rule, without the unit.
 *
 * @example
 * ```ts
 * import { measureNumber } from "./number_text.ts";
 * measureNumber(0.1996, "logMAR"); // "0.20"
 * measureNumber(75.02, "letters"); // "75"
 * measureNumber(36.14, "arcmin"); // "36.1"
 * ```
 */
export function measureNumber(value: number, kind: MeasureKind): string {
  const rule = MEASURE_RULES[kind];
  if (kind === "count" && Number.isFinite(value)) return countText(value);
  if (kind === "chance") return significant(value, 3);
  return rule.decimals === undefined
    ? significant(value)
    : fixed(value, rule.decimals, rule.signed ?? false);
}

/**
 * A measure with its unit by its kind's rule (`unit` overrides the rule's unit word, e.g.
 * `cm` for a length).
 *
 * @example
 * ```ts
 * import { measureText } from "./number_text.ts";
 * measureText(175.2, "axis"); // "175°"
 * measureText(0.01234, "covariance"); // "0.01234 D²"
 * measureText(12.3, "micrometre"); // "12 µm"
 * measureText(0.008561, "chance"); // "0.00856 (1 in 117)"
 * ```
 */
export function measureText(value: number, kind: MeasureKind, unit?: string): string {
  const rule = MEASURE_RULES[kind];
  const u = unit === undefined ? rule.unit : unitText(unit);
  const n = measureNumber(value, kind);
  if (kind === "chance" && value > 0 && value < 0.5) {
    return `${n} (1 in ${countText(1 / value)})`;
  }
  if (!u) return n;
  return rule.tight ? `${n}${u}` : `${n} ${u}`;
}

/**
 * A number inside a message (an error, a warning, a note), by the display rule of its unit:
 * never a raw float. Call it from any module that writes a number into words.
 *
 * @example
 * ```ts
 * import { numberInMessage } from "./number_text.ts";
 * numberInMessage(0.39764, "deg"); // "0°"
 * numberInMessage(-8.928, "D"); // "-8.93 D"
 * numberInMessage(1 / 3); // "0.3333"
 * ```
 */
export function numberInMessage(value: number, unit = ""): string {
  const kind = kindOfUnit(unit);
  if (kind === "power") return measureText(value, "measure");
  if (kind) return measureText(value, kind, unit);
  const n = significant(value);
  return unit ? `${n} ${unitText(unit)}` : n;
}
