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
  registry.set(type.name, type as ValueType);
  return type;
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
