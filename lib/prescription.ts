/**
 * The prescription record and its parser. A prescription is a spherocylinder with, when
 * ordered, a near addition, a prism and the eye it is for. The parser reads the notations
 * practitioners write:
 *
 * - `-2.25 / -0.75 x 170`, `-2.25 -0.75 x 170`, `-2.25 -0.75 170`, `−2.25/−0.75×170`,
 *   `-2.25 -0.75 @ 170`, `-2.25 DS / -0.75 DC x 170`;
 * - `+1.00 DS`, `-3.00 sph`, `pl`, `plano`, `plano / -0.50 x 90`;
 * - an eye in front (`R`, `L`, `OD`, `OS`, optionally with `:`);
 * - an add: `add +2.00`;
 * - prism with its base: `1.5 BU`, `2 BI`, `2 Δ base out`, or 360-degree notation
 *   `2 base 30` / `2 B30` (which needs the eye, to tell in from out).
 *
 * Powers take up to three decimals, the precision instruments write (eighth-dioptre steps
 * such as `-3.375 / -0.125 x 90`); the axis is whole degrees 0–180 (0 is read as 180).
 * A decimal comma (`-2,00 / -0,50 x 90`), as written in much of Europe, is read when the text
 * uses no decimal point; text that mixes the two is refused with a message saying so.
 * Sources: common-practice, iso-13666-axis.
 *
 * @example
 * ```ts
 * import { parsePrescription } from "./prescription.ts";
 * parsePrescription("-2.25 -0.75 x 170 add +2.00"); // { sphere: -2.25, cylinder: -0.75, axis: 170, add: 2 }
 * ```
 *
 * @module
 */

import { LentilParseError } from "./errors.ts";
import { compoundPrism, type Eye, parseEye, type Prism, resolvePrism } from "./prism.ts";
import type { SpheroCylinder } from "./spherocylinder.ts";

/** A spectacle or contact-lens prescription. */
export interface Prescription extends SpheroCylinder {
  /** Near addition, D (positive), when ordered. */
  readonly add?: number;
  /** Prism, when ordered. */
  readonly prism?: Prism;
  /** The eye, when written. */
  readonly eye?: Eye;
}

/** Accepted sphere range, D. */
export const SPHERE_RANGE = [-40, 40] as const;
/** Accepted cylinder range, D. */
export const CYLINDER_RANGE = [-20, 20] as const;
/** Accepted add range, D. */
export const ADD_RANGE = [0.25, 6] as const;
/** Accepted prism amount per component, Δ. */
export const PRISM_RANGE = [0, 30] as const;

interface Token {
  readonly kind: "number" | "word" | "symbol";
  readonly text: string;
  readonly offset: number;
  readonly value: number;
}

const TOKEN = /\s+|([+-]?(?:\d+(?:\.\d*)?|\.\d+))|([A-Za-z]+)|(\/|×|@|°|Δ|∆|:|,)|(.)/gu;

function tokenise(input: string, raw: string): Token[] {
  const out: Token[] = [];
  TOKEN.lastIndex = 0;
  for (let m = TOKEN.exec(input); m; m = TOKEN.exec(input)) {
    if (m[1] !== undefined) {
      out.push({ kind: "number", text: m[1], offset: m.index, value: Number(m[1]) });
    } else if (m[2] !== undefined) {
      out.push({ kind: "word", text: m[2].toLowerCase(), offset: m.index, value: NaN });
    } else if (m[3] !== undefined) {
      if (m[3] !== ",") out.push({ kind: "symbol", text: m[3], offset: m.index, value: NaN });
    } else if (m[4] !== undefined) {
      throw new LentilParseError(raw, `unexpected character "${m[4]}"`, m.index);
    }
  }
  return out;
}

const BASE_WORDS: Record<string, [number, number]> = {
  bu: [0, 1],
  bd: [0, -1],
  bi: [1, 0],
  bo: [-1, 0],
  up: [0, 1],
  down: [0, -1],
  in: [1, 0],
  out: [-1, 0],
};
const PRISM_UNITS = new Set(["Δ", "∆", "pd", "prism", "p"]);
/** Base words that may follow "base" (`base up`, `base in`); BU/BI/… stand alone. */
const AFTER_BASE = new Set(["up", "down", "in", "out"]);

class Reader {
  i = 0;
  constructor(readonly raw: string, readonly tokens: Token[]) {}
  peek(k = 0): Token | undefined {
    return this.tokens[this.i + k];
  }
  next(): Token | undefined {
    return this.tokens[this.i++];
  }
  isWord(t: Token | undefined, ...words: string[]): boolean {
    return t !== undefined && t.kind !== "number" && words.includes(t.text);
  }
  fail(expected: string, at?: Token): never {
    throw new LentilParseError(this.raw, expected, at?.offset ?? this.raw.length);
  }
  where(t: Token | undefined): string {
    return t ? `"${t.text}"` : "the end";
  }
}

function power(r: Reader, t: Token, what: string, range: readonly [number, number]): number {
  const v = t.value;
  if (!Number.isFinite(v)) r.fail(`${what} must be a finite number`, t);
  if (v < range[0] || v > range[1]) {
    r.fail(`${what} ${t.text} D is outside the accepted range ${range[0]}–${range[1]} D`, t);
  }
  if (Math.abs(v * 1000 - Math.round(v * 1000)) > 1e-6) {
    r.fail(
      `${what} ${t.text} is finer than instruments write: at most three decimals (0.001 D, as in -3.375)`,
      t,
    );
  }
  return v + 0;
}

function axisValue(r: Reader, t: Token | undefined): number {
  if (!t || t.kind !== "number") r.fail("expected the axis: whole degrees 0–180 after x", t);
  if (!/^\d+$/.test(t.text)) r.fail(`axis ${t.text}: expected whole degrees 0–180, unsigned`, t);
  const a = Number(t.text);
  if (a > 180) r.fail(`axis ${a} is outside the accepted range 0–180° (0 is written 180)`, t);
  if (r.peek()?.text === "°") r.next();
  return a === 0 ? 180 : a;
}

function isPrismNext(r: Reader): boolean {
  const a = r.peek(1);
  return a !== undefined && (PRISM_UNITS.has(a.text) || a.text in BASE_WORDS ||
    r.isWord(a, "b", "base"));
}

function readPrismPart(r: Reader, eye: Eye | undefined): Prism {
  const t = r.next()!;
  const amount = t.value;
  if (amount < PRISM_RANGE[0] || amount > PRISM_RANGE[1]) {
    r.fail(
      `prism ${t.text} Δ is outside the accepted range ${PRISM_RANGE[0]}–${PRISM_RANGE[1]} Δ`,
      t,
    );
  }
  if (r.peek() && PRISM_UNITS.has(r.peek()!.text)) r.next();
  let b = r.next();
  if (r.isWord(b, "b", "base")) {
    const after = r.peek();
    if (after?.kind === "word" && AFTER_BASE.has(after.text)) {
      b = r.next();
    } else if (after?.kind === "number") {
      r.next();
      const base = after.value;
      if (!(base >= 0 && base <= 360)) {
        r.fail(`prism base ${after.text}° is outside the accepted range 0–360°`, after);
      }
      if (r.peek()?.text === "°") r.next();
      const vertical = Math.abs(Math.cos(base * Math.PI / 180)) < 1e-12;
      if (!eye && !vertical) {
        r.fail(
          `prism base ${after.text}° in 360-degree notation needs the eye (start with R or L) to tell base in from base out`,
          after,
        );
      }
      return resolvePrism(amount, base, eye ?? "R");
    } else {
      r.fail("expected the base direction after 'base': up, down, in, out or 0–360°", after);
    }
  }
  if (!b || !(b.text in BASE_WORDS)) {
    r.fail(
      `expected the prism base after ${t.text}: BU, BD, BI, BO or base 0–360° (got ${r.where(b)})`,
      b,
    );
  }
  const [h, v] = BASE_WORDS[b.text];
  return { horizontal: h * amount + 0, vertical: v * amount + 0 };
}

/** A comma between two digits: a decimal comma, or a separator written without a space. */
const DIGIT_COMMA = /(\d),(\d)/g;
/** A decimal point between digits, or before the digits of a power (".5"). */
const DECIMAL_POINT = /\d\.\d|(^|[^\d])\.\d/;

/**
 * Read decimal commas as decimal points where that is unambiguous: the text has commas
 * between digits and no decimal point anywhere. Text with both is refused: "-2.00,0.50" could
 * be a separator or a mark. Source: common-practice.
 */
function decimalCommas(raw: string, text: string): string {
  DIGIT_COMMA.lastIndex = 0;
  const comma = DIGIT_COMMA.exec(text);
  if (!comma) return text;
  if (DECIMAL_POINT.test(text)) {
    throw new LentilParseError(
      raw,
      `this text has both decimal points and a comma between digits ("${
        comma[0]
      }"): write one decimal mark throughout (-2,00 / -0,50 x 90 or -2.00 / -0.50 x 90), and a space after a comma that separates`,
      comma.index + 1,
    );
  }
  return text.replace(DIGIT_COMMA, "$1.$2");
}

/**
 * Parse a prescription as practitioners write it (see the module docs for the notations).
 * Sources: common-practice, iso-13666-axis.
 *
 * @example
 * ```ts
 * import { parsePrescription } from "./prescription.ts";
 * parsePrescription("plano / -0.50 x 90"); // { sphere: 0, cylinder: -0.5, axis: 90 }
 * parsePrescription("R: +1.00 DS 1.5 BU").prism; // { horizontal: 0, vertical: 1.5 }
 * parsePrescription("-3.375 / -0.125 x 90").sphere; // -3.375
 * parsePrescription("-2,00 / -0,50 x 90").cylinder; // -0.5
 * ```
 * @throws {LentilParseError} naming the part that was wrong and what was expected there.
 */
export function parsePrescription(text: string): Prescription {
  const normalised = decimalCommas(text, text.replace(/[−–]/g, "-"));
  const r: Reader = new Reader(text, tokenise(normalised, text));
  if (r.tokens.length === 0) r.fail("expected a prescription such as -2.25 / -0.75 x 170");

  let eye: Eye | undefined;
  const first = r.peek();
  if (first?.kind === "word" && !["pl", "plano"].includes(first.text)) {
    try {
      eye = parseEye(first.text);
    } catch {
      r.fail(
        `expected the sphere (a signed power or plano) or the eye, got "${first.text}"`,
        first,
      );
    }
    r.next();
    if (r.peek()?.text === ":") r.next();
  }

  const st = r.next();
  let sphere: number;
  if (r.isWord(st, "pl", "plano")) sphere = 0;
  else if (st?.kind === "number") sphere = power(r, st, "sphere", SPHERE_RANGE);
  else {r.fail(
      `expected the sphere: a signed power such as -2.25, or plano (got ${r.where(st)})`,
      st,
    );}
  if (r.isWord(r.peek(), "ds", "sph", "d", "s")) r.next();

  let cylinder = 0;
  let axis = 180;
  const slash = r.peek()?.text === "/";
  if (slash) r.next();
  const ct = r.peek();
  if (ct?.kind === "number" && !isPrismNext(r)) {
    r.next();
    cylinder = power(r, ct, "cylinder", CYLINDER_RANGE);
    if (r.isWord(r.peek(), "dc", "cyl", "c")) r.next();
    const sep = r.peek();
    const hasSep = sep !== undefined && (sep.text === "x" || sep.text === "×" || sep.text === "@" ||
      sep.text === "axis");
    if (hasSep) r.next();
    const at = r.peek();
    if (at?.kind === "number" && (hasSep || !isPrismNext(r))) {
      r.next();
      axis = axisValue(r, at);
    } else if (hasSep) {
      axisValue(r, at);
    } else if (cylinder !== 0) {
      r.fail(
        `cylinder ${ct.text} needs an axis: write x followed by whole degrees 1–180 (got ${
          r.where(at)
        })`,
        at,
      );
    }
  } else if (slash) {
    r.fail(
      `expected the cylinder after "/": a signed power such as -0.75 (got ${r.where(ct)})`,
      ct,
    );
  }

  let add: number | undefined;
  const prisms: Prism[] = [];
  while (r.peek()) {
    const t = r.peek()!;
    if (r.isWord(t, "add")) {
      r.next();
      const a = r.next();
      if (a?.kind !== "number") r.fail(`expected the add power after "add", e.g. add +2.00`, a);
      if (add !== undefined) r.fail("the add is written twice", a);
      add = power(r, a, "add", ADD_RANGE);
    } else if (t.kind === "number") {
      const part = readPrismPart(r, eye);
      for (
        const [key, what] of [["vertical", "vertical (up/down)"], [
          "horizontal",
          "horizontal (in/out)",
        ]] as const
      ) {
        if (part[key] !== 0 && prisms.some((p) => p[key] !== 0)) {
          r.fail(`${what} prism is given twice: write each meridian's prism once`, t);
        }
      }
      prisms.push(part);
    } else if (["x", "×", "@", "axis"].includes(t.text)) {
      r.fail(
        `an axis needs a cylinder before it: write sphere / cylinder x axis, e.g. -2.00 / -0.50 x 90`,
        t,
      );
    } else {
      r.fail(
        `unexpected ${
          r.where(t)
        }: expected an add (add +2.00), a prism with its base (1.5 BU) or the end`,
        t,
      );
    }
  }

  const out: Prescription = { sphere, cylinder, axis };
  return {
    ...out,
    ...(add !== undefined ? { add } : {}),
    ...(prisms.length ? { prism: compoundPrism(prisms) } : {}),
    ...(eye ? { eye } : {}),
  };
}

/**
 * Parse a prism alone: `1.5 BU`, `2 BI 1 BD`, `R 2 base 30`. Source: common-practice.
 *
 * @example
 * ```ts
 * import { parsePrism } from "./prescription.ts";
 * parsePrism("2 BI 1 BU"); // { prism: { horizontal: 2, vertical: 1 } }
 * ```
 * @throws {LentilParseError} naming the part that was wrong.
 */
export function parsePrism(text: string): { prism: Prism; eye?: Eye } {
  const normalised = text.replace(/[−–]/g, "-");
  const r: Reader = new Reader(text, tokenise(normalised, text));
  let eye: Eye | undefined;
  const first = r.peek();
  if (first?.kind === "word") {
    try {
      eye = parseEye(first.text);
    } catch {
      r.fail(`expected a prism amount such as 1.5 or the eye, got "${first.text}"`, first);
    }
    r.next();
    if (r.peek()?.text === ":") r.next();
  }
  const parts: Prism[] = [];
  while (r.peek()) {
    const t = r.peek()!;
    if (t.kind !== "number") r.fail(`expected a prism amount such as 1.5 (got ${r.where(t)})`, t);
    parts.push(readPrismPart(r, eye));
  }
  if (!parts.length) r.fail("expected a prism such as 1.5 BU or 2 BI");
  return { prism: compoundPrism(parts), ...(eye ? { eye } : {}) };
}
