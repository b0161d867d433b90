/**
 * Acuity notations: Snellen fractions in feet and in metres at any test distance, decimal
 * acuity V, the minimum angle of resolution MAR (arcmin), logMAR and the letter score, in
 * both directions, read from text and written as the trade writes them.
 *
 * Relations (ico-1984, iso-8596): V = test distance / letter distance; MAR = 1/V;
 * logMAR = log10 MAR. Letter score ≈ 85 − 50·logMAR on 5-letter-per-line charts
 * (ferris-1982, bailey-lovie-1976).
 *
 * @example
 * ```ts
 * import { formatAcuity, parseAcuity } from "./acuity.ts";
 * formatAcuity(parseAcuity("20/40"), "snellenMetres"); // "6/12"
 * ```
 *
 * @module
 */

import { checkRange, LentilInputError, LentilParseError } from "./errors.ts";

/** The notations an acuity can be written in. */
export type AcuityNotation =
  | "logMAR"
  | "decimal"
  | "MAR"
  | "letters"
  | "snellenFeet"
  | "snellenMetres"
  | "nearM"
  | "nearN";

/**
 * The clinical categories below chart acuity: counting fingers, hand movements, light
 * perception, no light perception.
 */
export type LowVisionCategory = "CF" | "HM" | "LP" | "NLP";

/** A published (or conventional) logMAR value that stands in for a category in statistics. */
export interface CategorySubstitution {
  /** logMAR used for statistics. */
  readonly logMAR: number;
  /** Source id of the value. */
  readonly source: string;
  /** True for a convention of some studies, never a measured acuity. */
  readonly convention: boolean;
}

/**
 * logMAR substitutions for the low-vision categories. CF and HM: measured equivalents
 * (Schulze-Bonsel 2006: CF at 30 cm ≈ decimal 0.014, HM ≈ 0.005; Lange 2009: CF logMAR 1.98,
 * HM 2.28). LP and NLP: conventional values some studies use (from memory); they are not
 * measured acuities and a result that rests on them says so.
 */
export const CATEGORY_SUBSTITUTIONS: Readonly<
  Record<
    "schulze-bonsel-2006" | "lange-2009",
    Readonly<Record<LowVisionCategory, CategorySubstitution>>
  >
> = {
  "schulze-bonsel-2006": {
    CF: { logMAR: -Math.log10(0.014), source: "schulze-bonsel-2006", convention: false },
    HM: { logMAR: -Math.log10(0.005), source: "schulze-bonsel-2006", convention: false },
    LP: { logMAR: 2.7, source: "low-vision-conventions", convention: true },
    NLP: { logMAR: 3, source: "low-vision-conventions", convention: true },
  },
  "lange-2009": {
    CF: { logMAR: 1.98, source: "lange-2009", convention: false },
    HM: { logMAR: 2.28, source: "lange-2009", convention: false },
    LP: { logMAR: 2.7, source: "low-vision-conventions", convention: true },
    NLP: { logMAR: 3, source: "low-vision-conventions", convention: true },
  },
};

/** The substitution table used unless another is named. */
export const DEFAULT_SUBSTITUTION = "schulze-bonsel-2006";

/** The categories' names in words. */
export const CATEGORY_NAMES: Readonly<Record<LowVisionCategory, string>> = {
  CF: "counting fingers",
  HM: "hand movements",
  LP: "light perception",
  NLP: "no light perception",
};

/** Every notation, in the order the reference lists them. */
export const ACUITY_NOTATIONS: readonly AcuityNotation[] = [
  "snellenFeet",
  "snellenMetres",
  "decimal",
  "MAR",
  "logMAR",
  "letters",
];

/** An acuity: its logMAR value, the notation to show it in, and how it was written. */
export interface Acuity {
  /** logMAR, the canonical value (letter adjustments included). */
  readonly logMAR: number;
  /** Notation used to display it. */
  readonly notation: AcuityNotation;
  /** For a Snellen fraction: its numerator (test distance in the notation's unit). */
  readonly numerator?: number;
  /** For a Snellen fraction with letters: +n read on the next line, −n missed on this line. */
  readonly letters?: number;
  /** For a low-vision category: which; `logMAR` is then its substitution for statistics. */
  readonly category?: LowVisionCategory;
  /** For a category: the source id of its logMAR substitution. */
  readonly substitution?: string;
  /** For a near acuity: the test distance, m. */
  readonly nearDistance?: number;
}

/** Accepted logMAR range (decimal 10 to 0.001). */
export const LOGMAR_RANGE = [-1, 3] as const;

/** logMAR per letter on a chart of five-letter lines in 0.1 log steps (bailey-lovie-1976). */
export const LOGMAR_PER_LETTER = 0.02;

/** Default Snellen numerators: 20 ft and 6 m. */
export const DEFAULT_NUMERATOR = { snellenFeet: 20, snellenMetres: 6 } as const;

/**
 * An acuity from its logMAR value. Sources: ico-1984, iso-8596.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR } from "./acuity.ts";
 * acuityFromLogMAR(0.3).logMAR; // 0.3
 * ```
 * @throws {LentilRangeError} outside logMAR −1 to 3.
 */
export function acuityFromLogMAR(
  logMAR: number,
  notation: AcuityNotation = "logMAR",
): Acuity {
  checkRange("logMAR", logMAR, LOGMAR_RANGE[0], LOGMAR_RANGE[1]);
  return { logMAR, notation };
}

/**
 * An acuity from decimal acuity V. Sources: ico-1984, iso-8596.
 *
 * @example
 * ```ts
 * import { acuityFromDecimal } from "./acuity.ts";
 * acuityFromDecimal(0.1).logMAR; // 1
 * ```
 * @throws {LentilRangeError} outside 0.001–10.
 */
export function acuityFromDecimal(decimal: number): Acuity {
  checkRange("decimal acuity", decimal, 0.001, 10);
  return acuityFromLogMAR(-Math.log10(decimal), "decimal");
}

/**
 * An acuity from the minimum angle of resolution in arcmin. Sources: ico-1984, iso-8596.
 *
 * @example
 * ```ts
 * import { acuityFromMAR } from "./acuity.ts";
 * acuityFromMAR(10).logMAR; // 1
 * ```
 * @throws {LentilRangeError} outside 0.1–1000 arcmin.
 */
export function acuityFromMAR(arcmin: number): Acuity {
  checkRange("MAR", arcmin, 0.1, 1000, "arcmin");
  return acuityFromLogMAR(Math.log10(arcmin), "MAR");
}

/**
 * An acuity for a low-vision category (CF, HM, LP, NLP), its logMAR the substitution used
 * for statistics from `table` (default Schulze-Bonsel 2006 for CF and HM; LP and NLP are
 * conventions, never measured acuities). Sources: schulze-bonsel-2006, lange-2009,
 * low-vision-conventions.
 *
 * @example
 * ```ts
 * import { acuityFromCategory } from "./acuity.ts";
 * acuityFromCategory("HM").logMAR.toFixed(2); // "2.30"
 * acuityFromCategory("CF", "lange-2009").logMAR; // 1.98
 * ```
 * @throws {LentilInputError} for an unknown substitution table.
 */
export function acuityFromCategory(
  category: LowVisionCategory,
  table: string = DEFAULT_SUBSTITUTION,
): Acuity {
  const t =
    (CATEGORY_SUBSTITUTIONS as Record<string, Record<LowVisionCategory, CategorySubstitution>>)[
      table
    ];
  if (!t) {
    throw new LentilInputError(
      `substitution "${table}" is not one of ${Object.keys(CATEGORY_SUBSTITUTIONS).join(", ")}`,
    );
  }
  const sub = t[category];
  return { logMAR: sub.logMAR, notation: "logMAR", category, substitution: sub.source };
}

/** Height of a 1 M letter, mm: 5′ at 1 m (Sloan 1956). */
export const M_UNIT_MM: number = 1000 * Math.tan((5 / 60) * Math.PI / 180);

/** Print size in N (points) that matches 1 M (N8 ≈ 1 M, from memory). */
export const N_POINTS_PER_M = 8;

/**
 * A near acuity from the M size of the smallest print read at `distanceM` metres:
 * decimal V = distance (m) / M, so logMAR = log10(M / distance). Source: sloan-habel-1956.
 *
 * @example
 * ```ts
 * import { acuityFromM } from "./acuity.ts";
 * acuityFromM(1, 0.4).logMAR.toFixed(3); // "0.398"
 * ```
 * @throws {LentilRangeError} for an M size outside 0.1–100 or a distance outside 0.05–2 m.
 */
export function acuityFromM(mSize: number, distanceM: number): Acuity {
  checkRange("M size", mSize, 0.1, 100, "M");
  checkRange("near test distance", distanceM, 0.05, 2, "m");
  const a = acuityFromLogMAR(Math.log10(mSize / distanceM));
  return { ...a, notation: "nearM", nearDistance: distanceM };
}

/**
 * A near acuity from the N size (point size of the print) read at `distanceM` metres, by
 * N8 ≈ 1 M (from memory): M = N / 8. Sources: law-1951, sloan-habel-1956.
 *
 * @example
 * ```ts
 * import { acuityFromN } from "./acuity.ts";
 * acuityFromN(8, 0.4).logMAR.toFixed(3); // "0.398"
 * ```
 * @throws {LentilRangeError} for an N size outside 1–400 or a distance outside 0.05–2 m.
 */
export function acuityFromN(points: number, distanceM: number): Acuity {
  checkRange("N size", points, 1, 400, "points");
  return { ...acuityFromM(points / N_POINTS_PER_M, distanceM), notation: "nearN" };
}

/**
 * An acuity from a letter score, logMAR = (85 − score)/50. Sources: ferris-1982,
 * bailey-lovie-1976.
 *
 * @example
 * ```ts
 * import { acuityFromLetterScore } from "./acuity.ts";
 * acuityFromLetterScore(85).logMAR; // 0
 * ```
 * @throws {LentilRangeError} outside 0–100 letters.
 */
export function acuityFromLetterScore(score: number): Acuity {
  checkRange("letter score", score, 0, 100, "letters");
  return acuityFromLogMAR((85 - score) / 50, "letters");
}

/**
 * An acuity from a Snellen fraction `numerator/denominator` in feet or metres (both
 * distances in the same unit; any test distance). `letters` adds letter-by-letter credit:
 * −2 for two letters missed on the line, +1 for one read on the next (0.02 logMAR each).
 * Sources: ico-1984, bailey-lovie-1976.
 *
 * @example
 * ```ts
 * import { acuityFromSnellen } from "./acuity.ts";
 * acuityFromSnellen(4, 5, "m").logMAR.toFixed(3); // "0.097"
 * ```
 * @throws {LentilRangeError} for a distance that is not positive.
 */
export function acuityFromSnellen(
  numerator: number,
  denominator: number,
  unit: "ft" | "m",
  letters = 0,
): Acuity {
  const max = unit === "ft" ? 100 : 30;
  checkRange(`Snellen test distance (numerator)`, numerator, 0.1, max, unit);
  checkRange(`Snellen letter distance (denominator)`, denominator, 0.1, 10000, unit);
  checkRange("letters added or missed", letters, -20, 20, "letters");
  const logMAR = Math.log10(denominator / numerator) - LOGMAR_PER_LETTER * letters;
  checkRange(`logMAR of ${numerator}/${denominator}`, logMAR, LOGMAR_RANGE[0], LOGMAR_RANGE[1]);
  const notation = unit === "ft" ? "snellenFeet" : "snellenMetres";
  return letters ? { logMAR, notation, numerator, letters } : { logMAR, notation, numerator };
}

/**
 * Decimal acuity V = 10^−logMAR. Sources: ico-1984, iso-8596.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR, decimalOf } from "./acuity.ts";
 * decimalOf(acuityFromLogMAR(1)); // 0.1
 * ```
 */
export function decimalOf(a: Acuity): number {
  return 10 ** -a.logMAR;
}

/**
 * MAR in arcmin, 10^logMAR. Sources: ico-1984, iso-8596.
 *
 * @example
 * ```ts
 * import { acuityFromDecimal, marOf } from "./acuity.ts";
 * marOf(acuityFromDecimal(0.5)); // 2
 * ```
 */
export function marOf(a: Acuity): number {
  return 10 ** a.logMAR;
}

/**
 * Letter score 85 − 50·logMAR (5-letter lines, 0.1 log steps). Sources: ferris-1982,
 * bailey-lovie-1976.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR, letterScoreOf } from "./acuity.ts";
 * letterScoreOf(acuityFromLogMAR(0.3)); // 70
 * ```
 */
export function letterScoreOf(a: Acuity): number {
  return 85 - 50 * a.logMAR;
}

/** A Snellen fraction as numbers. */
export interface SnellenFraction {
  /** Test distance. */
  readonly numerator: number;
  /** Distance at which the letter's detail subtends 1′ (exact, not rounded). */
  readonly denominator: number;
  /** Unit of both distances. */
  readonly unit: "ft" | "m";
}

/**
 * The Snellen fraction of an acuity at a test distance `numerator` (in `unit`; default
 * 20 ft or 6 m). Sources: ico-1984.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR, snellenFraction } from "./acuity.ts";
 * snellenFraction(acuityFromLogMAR(1), "ft").denominator; // 200
 * ```
 * @throws {LentilRangeError} for a test distance that is not positive.
 */
export function snellenFraction(
  a: Acuity,
  unit: "ft" | "m",
  numerator?: number,
): SnellenFraction {
  const n = numerator ?? (unit === "ft" ? DEFAULT_NUMERATOR.snellenFeet : 6);
  checkRange("Snellen test distance", n, 0.1, unit === "ft" ? 100 : 30, unit);
  return { numerator: n, denominator: n / decimalOf(a), unit };
}

/** Denominators the trade writes at 20 ft. */
const FEET_SERIES = [
  10,
  12.5,
  15,
  16,
  20,
  25,
  30,
  32,
  40,
  50,
  60,
  63,
  70,
  80,
  100,
  125,
  160,
  200,
  250,
  320,
  400,
  500,
  630,
  800,
];
/** Denominators the trade writes at 6 m. */
const METRE_SERIES = [
  3,
  3.8,
  4.8,
  6,
  7.5,
  9,
  9.5,
  12,
  15,
  18,
  19,
  24,
  30,
  36,
  38,
  48,
  60,
  75,
  95,
  120,
  150,
  190,
  240,
];

/** Preferred steps (0.1 log units) that charts print, one decade. */
const DECIMAL_STEPS = [1, 1.25, 1.6, 2, 2.5, 3.2, 4, 5, 6.3, 8];

function formatDenominator(f: SnellenFraction): string {
  const standard = f.unit === "ft" && f.numerator === 20
    ? FEET_SERIES
    : f.unit === "m" && f.numerator === 6
    ? METRE_SERIES
    : undefined;
  if (standard) {
    let best = standard[0];
    for (const s of standard) {
      if (Math.abs(s - f.denominator) < Math.abs(best - f.denominator)) best = s;
    }
    if (Math.abs(best - f.denominator) / f.denominator <= 0.02) return String(best);
    return shortNumber(f.denominator, 2);
  }
  const stepped = onDecimalStep(f.denominator);
  return stepped === undefined ? shortNumber(f.denominator, 2) : String(stepped);
}

/** The chart step (1, 1.25, 1.6, … × 10^k) within 1.5% of `v`, if any. */
function onDecimalStep(v: number): number | undefined {
  const decade = 10 ** Math.floor(Math.log10(v));
  for (const step of [...DECIMAL_STEPS, 10]) {
    const x = step * decade;
    if (Math.abs(x - v) / v <= 0.015) return Number(x.toPrecision(3));
  }
  return undefined;
}

/** A number to `digits` significant figures, no trailing zeros, no exponent. */
function shortNumber(x: number, digits: number): string {
  return String(Number(x.toPrecision(digits)));
}

/**
 * A Snellen fraction as the trade writes it ("20/40", "6/7.5", "4/6.3"): denominators at
 * 20 ft and 6 m snap to the values charts print when within 2%, others take two significant
 * figures. Sources: ico-1984.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR, formatSnellen } from "./acuity.ts";
 * formatSnellen(acuityFromLogMAR(0.2), "m"); // "6/9.5"
 * formatSnellen(acuityFromLogMAR(0.1), "m", 4); // "4/5"
 * ```
 */
export function formatSnellen(a: Acuity, unit: "ft" | "m", numerator?: number): string {
  const own = unit === "ft" ? "snellenFeet" : "snellenMetres";
  const n = numerator ?? (a.notation === own ? a.numerator : undefined);
  if (a.letters && a.notation === own && n === a.numerator) {
    const base = { ...a, logMAR: a.logMAR + LOGMAR_PER_LETTER * a.letters };
    const f = snellenFraction(base, unit, n);
    const sign = a.letters > 0 ? "+" : "-";
    return `${shortNumber(f.numerator, 3)}/${formatDenominator(f)} ${sign}${Math.abs(a.letters)}`;
  }
  const f = snellenFraction(a, unit, n);
  return `${shortNumber(f.numerator, 3)}/${formatDenominator(f)}`;
}

/**
 * Decimal acuity as written: a value within 1.5% of a chart step (0.8, 0.63, 1.25, …) is
 * written as the step; otherwise two decimals with a trailing zero dropped ("0.67", "1.0"),
 * two significant figures below 0.1. Sources: iso-8596, ico-1984.
 *
 * @example
 * ```ts
 * import { formatDecimal } from "./acuity.ts";
 * formatDecimal(0.794); // "0.8"
 * formatDecimal(1); // "1.0"
 * formatDecimal(2 / 3); // "0.67"
 * ```
 */
export function formatDecimal(v: number): string {
  const step = onDecimalStep(v);
  if (step !== undefined && step < 0.1) return String(step);
  if (step !== undefined && step >= 0.1) v = step;
  if (v < 0.1) return shortNumber(v, 2);
  if (step !== undefined && Math.abs(step * 100 - Math.round(step * 100)) > 1e-9) {
    return String(step); // 0.125
  }
  const s = v.toFixed(2);
  return s.endsWith("0") ? s.slice(0, -1) : s;
}

/**
 * An acuity in a notation as the trade writes it (default: its own notation).
 * Sources: ico-1984, iso-8596, ferris-1982.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR, formatAcuity } from "./acuity.ts";
 * const a = acuityFromLogMAR(0.1);
 * formatAcuity(a); // "0.10 logMAR"
 * formatAcuity(a, "snellenFeet"); // "20/25"
 * formatAcuity(a, "decimal"); // "0.8 decimal"
 * formatAcuity(a, "MAR"); // "1.26′ MAR"
 * formatAcuity(a, "letters"); // "80 letters"
 * ```
 */
export function formatAcuity(a: Acuity, shownIn?: AcuityNotation): string {
  const notation = shownIn ?? a.notation;
  if (a.category) {
    // A category is shown as written; asked for a notation, with its substitution beside it.
    if (shownIn === undefined) return a.category;
    const sub = formatAcuity({ logMAR: a.logMAR, notation: "logMAR" }, notation);
    return `${a.category} (${sub} by substitution${
      a.category === "LP" || a.category === "NLP" ? ", a convention, not a measured acuity" : ""
    })`;
  }
  switch (notation) {
    case "nearM":
    case "nearN": {
      const d = a.nearDistance;
      if (d === undefined) return formatAcuity(a, "decimal");
      const m = 10 ** a.logMAR * d;
      const at = `at ${shortNumber(d * 100, 3)} cm`;
      return notation === "nearM"
        ? `${shortNumber(m, 2)} M ${at}`
        : `N${shortNumber(m * N_POINTS_PER_M, 2)} ${at}`;
    }
    case "logMAR": {
      const r = Math.round(a.logMAR * 100) / 100;
      return `${(r === 0 ? 0 : r).toFixed(2)} logMAR`;
    }
    case "decimal":
      // Named, as every other notation is, so the text reads back: a bare number is refused.
      return `${formatDecimal(decimalOf(a))} decimal`;
    case "MAR":
      return `${shortNumber(marOf(a), 3)}′ MAR`;
    case "letters": {
      const s = letterScoreOf(a);
      const r = Math.round(s * 10) / 10;
      return `${Number.isInteger(r) ? r : r.toFixed(1)} letters`;
    }
    case "snellenFeet":
      return formatSnellen(a, "ft");
    case "snellenMetres":
      return formatSnellen(a, "m");
  }
}

/**
 * The same acuity shown in another notation (a Snellen `numerator` may be given).
 * Sources: ico-1984.
 *
 * @example
 * ```ts
 * import { acuityFromLogMAR, formatAcuity, withNotation } from "./acuity.ts";
 * formatAcuity(withNotation(acuityFromLogMAR(0.1), "snellenMetres", 4)); // "4/5"
 * ```
 * @throws {LentilInputError} for an unknown notation.
 */
export function withNotation(a: Acuity, notation: string, numerator?: number): Acuity {
  const n = readNotation(notation);
  if (n === "snellenFeet" || n === "snellenMetres") {
    const unit = n === "snellenFeet" ? "ft" : "m";
    const f = snellenFraction(a, unit, numerator);
    return { ...keep(a), notation: n, numerator: f.numerator };
  }
  return { ...keep(a), notation: n };
}

/** What an acuity keeps when shown in another notation: its category or near distance. */
function keep(a: Acuity): Acuity {
  return {
    logMAR: a.logMAR,
    notation: a.notation,
    ...(a.category ? { category: a.category, substitution: a.substitution } : {}),
    ...(a.nearDistance !== undefined ? { nearDistance: a.nearDistance } : {}),
  };
}

const NOTATION_NAMES: Record<string, AcuityNotation> = {
  logmar: "logMAR",
  decimal: "decimal",
  dec: "decimal",
  mar: "MAR",
  arcmin: "MAR",
  letters: "letters",
  letter: "letters",
  score: "letters",
  feet: "snellenFeet",
  ft: "snellenFeet",
  snellenfeet: "snellenFeet",
  metres: "snellenMetres",
  meters: "snellenMetres",
  m: "snellenMetres",
  snellenmetres: "snellenMetres",
  snellenmeters: "snellenMetres",
};

/**
 * Read a notation name: "logMAR", "decimal", "MAR", "letters", "feet", "metres" (or the
 * full names such as "snellenFeet"), any case. Source: common-practice.
 *
 * @example
 * ```ts
 * import { readNotation } from "./acuity.ts";
 * readNotation("Feet"); // "snellenFeet"
 * ```
 * @throws {LentilInputError} for a name that is none of these.
 */
export function readNotation(name: string): AcuityNotation {
  const n = NOTATION_NAMES[name.trim().toLowerCase()];
  if (!n) {
    throw new LentilInputError(
      `acuity notation "${name}" is not one of logMAR, decimal, MAR, letters, feet, metres`,
    );
  }
  return n;
}

const NUM = String.raw`([+-]?(?:\d+(?:\.\d*)?|\.\d+))`;
const FRACTION = new RegExp(
  String
    .raw`^(\d+(?:\.\d+)?)\s*/\s*(\d+(?:\.\d+)?)\s*(ft|feet|foot|m|metres?|meters?)?\s*(?:([+\-−])\s*(\d+))?$`,
  "i",
);
const LOGMAR = new RegExp(String.raw`^(?:logmar\s*${NUM}|${NUM}\s*logmar)$`, "i");
const MAR = new RegExp(
  String.raw`^(?:mar\s*${NUM}\s*(?:′|'|arcmin)?|${NUM}\s*(?:′|'|arcmin)\s*(?:mar)?|${NUM}\s*mar)$`,
  "i",
);
const LETTERS = new RegExp(String.raw`^${NUM}\s*(?:letters?|etdrs)$`, "i");
const DECIMAL = new RegExp(String.raw`^(?:decimal\s*${NUM}|${NUM}\s*decimal)$`, "i");
const BARE = new RegExp(String.raw`^${NUM}$`);
const CATEGORY_TEXT: Record<string, LowVisionCategory> = {
  cf: "CF",
  "counting fingers": "CF",
  "count fingers": "CF",
  fc: "CF",
  hm: "HM",
  "hand movements": "HM",
  "hand movement": "HM",
  "hand motion": "HM",
  lp: "LP",
  pl: "LP",
  "light perception": "LP",
  "perception of light": "LP",
  nlp: "NLP",
  npl: "NLP",
  "no light perception": "NLP",
  "no perception of light": "NLP",
};
const CATEGORY = /^([a-z ]+?)(?:\s*(?:at|@)?\s*(\d+(?:\.\d+)?)\s*(cm|m|ft|feet))?$/i;
const DISTANCE = String.raw`(?:at|@)\s*(\d+(?:\.\d+)?)\s*(cm|m)`;
const NEAR_N = new RegExp(String.raw`^N\s*(\d+(?:\.\d+)?)(?:\s*${DISTANCE})?$`, "i");
const NEAR_M = new RegExp(String.raw`^(\d+(?:\.\d+)?)\s*M(?:\s*${DISTANCE})?$`, "i");

/** The one rule for a number without its notation, shared by text and numbers. */
export function bareNumberMessage(value: string): string {
  return `${value} has no notation: a bare number could be decimal acuity or logMAR, so it is read as neither; write "${value} decimal" or "${value} logMAR" (as a number: acuity(${value}, "decimal"))`;
}

/** What an acuity text may look like, for error messages. */
export const ACUITY_EXPECTED =
  'an acuity such as "6/9", "20/40", "4/5 m", "6/9 -2", "0.3 logMAR", "1.0 decimal", "2 arcmin" (MAR), "85 letters", "CF", "HM", "LP", "NLP", "N8 at 40 cm" or "1.0 M at 40 cm"';

function firstDefined(m: RegExpExecArray): number {
  for (let i = 1; i < m.length; i++) if (m[i] !== undefined) return Number(m[i]);
  return NaN;
}

/**
 * Read an acuity from text. A fraction without a unit is in feet when its numerator is 10
 * or more, otherwise in metres (the decimal value is the same either way). A number needs
 * its notation ("0.8 decimal", "0.1 logMAR"): a bare number is refused, as it is when given
 * as a number. The low-vision categories (CF, HM, LP, NLP, or in words; a distance after
 * CF is allowed) take their logMAR substitution; near acuity is N or M print size at a
 * stated distance ("N8 at 40 cm", "1.0 M at 40 cm").
 * Sources: ico-1984, iso-8596, ferris-1982, schulze-bonsel-2006, sloan-habel-1956.
 *
 * @example
 * ```ts
 * import { parseAcuity } from "./acuity.ts";
 * parseAcuity("20/200").logMAR; // 1
 * parseAcuity("0.3 logMAR").logMAR; // 0.3
 * parseAcuity("6/9 -2").letters; // -2
 * parseAcuity("HM").category; // "HM"
 * parseAcuity("N8 at 40 cm").logMAR.toFixed(2); // "0.40"
 * ```
 * @throws {LentilParseError} for text that is no acuity; {@linkcode LentilRangeError} for
 * one out of range.
 */
export function parseAcuity(text: string): Acuity {
  const s = text.trim();
  let m = FRACTION.exec(s);
  if (m) {
    const num = Number(m[1]);
    const den = Number(m[2]);
    const unitText = (m[3] ?? "").toLowerCase();
    const unit = unitText ? (unitText.startsWith("f") ? "ft" : "m") : num >= 10 ? "ft" : "m";
    const letters = m[5] === undefined ? 0 : (m[4] === "+" ? 1 : -1) * Number(m[5]);
    if (num <= 0 || den <= 0) {
      throw new LentilParseError(text, "both distances of a Snellen fraction must be positive");
    }
    return acuityFromSnellen(num, den, unit, letters);
  }
  if ((m = LOGMAR.exec(s))) return acuityFromLogMAR(firstDefined(m));
  if ((m = MAR.exec(s))) return acuityFromMAR(firstDefined(m));
  if ((m = LETTERS.exec(s))) return acuityFromLetterScore(firstDefined(m));
  if (BARE.test(s)) throw new LentilParseError(text, bareNumberMessage(s));
  if ((m = NEAR_N.exec(s)) || (m = NEAR_M.exec(s))) {
    if (m[2] === undefined) {
      throw new LentilParseError(
        text,
        `a near acuity needs its test distance: write "${s} at 40 cm"`,
      );
    }
    const d = Number(m[2]) / (m[3].toLowerCase() === "cm" ? 100 : 1);
    return /^n/i.test(s) ? acuityFromN(Number(m[1]), d) : acuityFromM(Number(m[1]), d);
  }
  const c = CATEGORY.exec(s);
  const category = c ? CATEGORY_TEXT[c[1].trim().toLowerCase().replace(/\s+/g, " ")] : undefined;
  if (category) return acuityFromCategory(category);
  if ((m = DECIMAL.exec(s))) {
    const v = firstDefined(m);
    if (v <= 0) {
      throw new LentilParseError(
        text,
        'a bare number is decimal acuity and must be positive; write "-0.1 logMAR" for logMAR',
      );
    }
    return acuityFromDecimal(v);
  }
  throw new LentilParseError(text, ACUITY_EXPECTED);
}
