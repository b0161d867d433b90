/**
 * Value types of the formula language beyond numbers and quantities: a prescription, a
 * prism, an acuity, a fitted curve… A module in `cells/` registers each type once with how
 * it is recognised, read from text (for table columns and string arguments), displayed in
 * the trade's way and written to JSON.
 *
 * @example
 * ```ts
 * import { defineValueType, getValueType } from "./types.ts";
 * class Eye { constructor(readonly side: "R" | "L") {} }
 * defineValueType<Eye>({
 *   name: "eyeside", summary: "R or L",
 *   is: (x): x is Eye => x instanceof Eye,
 *   fromText: (s) => new Eye(s.trim().toUpperCase() === "L" ? "L" : "R"),
 *   display: (e) => e.side, json: (e) => e.side,
 * });
 * getValueType("eyeside")?.summary; // "R or L"
 * ```
 *
 * @module
 */

/** How results are displayed; set from the notebook's front matter. */
export interface DisplayOptions {
  /** Powers are shown in steps of this size (D); the exact value follows when it differs. */
  readonly powerStep: number;
}

/** The defaults: powers in 0.25 D steps. */
export const DEFAULT_DISPLAY: DisplayOptions = { powerStep: 0.25 };

/**
 * One part of a value: a named, labelled piece read under the headline (a record's field, a
 * check's line). Every part listed here is reachable from a later cell as `cell.key`.
 */
export interface ValuePart {
  /** The name a later cell uses to read it (`mpmva.endpoint`); a plain identifier. */
  readonly key: string;
  /** The label in words ("at the cornea", "limits of agreement"), never a code word. */
  readonly label: string;
  /** The part's value in the formula language: a quantity, number, text or typed value. */
  readonly value: unknown;
  /** Display text; when omitted the value displays by the rule for its own kind. */
  readonly display?: string;
}

/** The verdict of one line of a check. */
export type CheckVerdict = "pass" | "fail" | "not checked";

/**
 * One line of a check against a standard or a limit (a lens or a pair against its
 * tolerance, an imbalance against a limit): read as a table row
 * quantity | ordered | measured | deviation | tolerance | verdict.
 */
export interface CheckLine {
  /** What is checked, in words ("sphere", "vertical prism imbalance"). */
  readonly quantity: string;
  /** The ordered value as displayed ("" when the check has none). */
  readonly ordered: string;
  /** The measured value as displayed. */
  readonly measured: string;
  /** Measured − ordered, signed, as displayed (the one convention everywhere). */
  readonly deviation: string;
  /** The tolerance as displayed ("±0.13 D", "at most 0.33 Δ"). */
  readonly tolerance: string;
  /** The verdict. */
  readonly verdict: CheckVerdict;
  /** The clause of the standard or the rule that sets the tolerance. */
  readonly clause?: string;
  /** A short remark in words (how far inside or beyond the limit, which rule accepted it). */
  readonly remark?: string;
}

/** The declaration of one value type. */
export interface ValueType<T = unknown> {
  /** Name used in parameter declarations and table headers (`[rx]`). */
  readonly name: string;
  /** One line for the reference. */
  readonly summary: string;
  /** Recognise a value of this type. */
  is(x: unknown): x is T;
  /** Read a value from text; throws `LentilParseError` with what was expected. */
  fromText?(text: string): T;
  /** Display in the trade's way. */
  display(x: T, options: DisplayOptions): string;
  /** A JSON-friendly form for `--json` output and the browser. */
  json(x: T): unknown;
  /** Unit label shown beside the value, if any. */
  unit?(x: T): string;
  /**
   * The line a practitioner reads first (`PASS`, `+1.75 D`, `-4.00 / -0.75 × 175`); when
   * omitted, `display` is the headline.
   */
  headline?(x: T, options: DisplayOptions): string;
  /** The parts read under the headline, in order, each labelled in words. */
  parts?(x: T, options: DisplayOptions): readonly ValuePart[];
  /** For a check: its lines, read as a table with the verdict of each. */
  checks?(x: T, options: DisplayOptions): readonly CheckLine[];
  /**
   * The sources this value's reading rests on (an acuity read as CF: its substitution's
   * source; read as 6/9: the notation sources). A formula that gives such values narrows
   * its citations to these with `cites: sourcesOfValue`.
   */
  sources?(x: T): readonly string[];
}

const registry = new Map<string, ValueType>();

/**
 * Register a value type. Registering the same name twice replaces nothing and throws.
 *
 * @example
 * ```ts
 * import { defineValueType } from "./types.ts";
 * defineValueType<string>({
 *   name: "shout", summary: "upper-case text",
 *   is: (x): x is string => typeof x === "string" && x === x.toUpperCase(),
 *   display: (s) => s, json: (s) => s,
 * }).name; // "shout"
 * ```
 * @throws {Error} when the name is taken.
 */
export function defineValueType<T>(type: ValueType<T>): ValueType<T> {
  if (registry.has(type.name)) throw new Error(`value type ${type.name} is registered twice`);
  const read = type.fromText;
  const declared: ValueType<T> = read
    ? { ...type, fromText: (text: string) => keepWhole(read.call(type, text)) }
    : type;
  registry.set(type.name, declared as ValueType);
  return declared;
}

/**
 * Let the expression library copy a list that holds `x` (a value of a registered type):
 * values are never changed in place, so the copy of one is the value itself. Without
 * this, a list such as `[rx("-1.00 DS"), rx("-2.00 DS")]` could not be shown or indexed.
 * Returns `x`.
 *
 * @example
 * ```ts
 * import { keepWhole } from "./types.ts";
 * const v = keepWhole(new Map());
 * (v as unknown as { clone(): unknown }).clone() === v; // true
 * ```
 */
export function keepWhole<T>(x: T): T {
  if (
    x !== null && typeof x === "object" && typeof (x as { clone?: unknown }).clone !== "function"
  ) {
    try {
      Object.defineProperty(x, "clone", { value: () => x, enumerable: false });
    } catch {
      // A frozen value stays as it is.
    }
  }
  return x;
}

/**
 * Look up a registered value type by name.
 *
 * @example
 * ```ts
 * import { getValueType } from "./types.ts";
 * getValueType("no-such-type"); // undefined
 * ```
 */
export function getValueType(name: string): ValueType | undefined {
  return registry.get(name);
}

/**
 * The registered type of a value, if it is of one.
 *
 * @example
 * ```ts
 * import { typeOfValue } from "./types.ts";
 * typeOfValue(3); // undefined
 * ```
 */
export function typeOfValue(x: unknown): ValueType | undefined {
  if (x === null || typeof x !== "object") return undefined;
  for (const t of registry.values()) if (t.is(x)) return t;
  return undefined;
}

/**
 * Every registered value type.
 *
 * @example
 * ```ts
 * import { listValueTypes } from "./types.ts";
 * Array.isArray(listValueTypes()); // true
 * ```
 */
export function listValueTypes(): ValueType[] {
  return [...registry.values()];
}

/**
 * The sources a value's reading rests on, as its value type declares them; `undefined` when
 * it is not of a type that declares them (a formula's `cites` then cites its whole list).
 *
 * @example
 * ```ts
 * import { sourcesOfValue } from "./types.ts";
 * sourcesOfValue(3); // undefined
 * ```
 */
export function sourcesOfValue(x: unknown): readonly string[] | undefined {
  const t = typeOfValue(x);
  return t?.sources?.(x);
}
