/**
 * How a notebook call reaches a catalogue formula: each argument is checked and converted
 * as its parameter declares (a quantity into the declared unit, text against its choices, a
 * value type read from text), the named options in a trailing record are matched by name,
 * and every refusal says, in the notebook's words, what was wrong and how to write it.
 *
 * @module
 */

import type { FormulaSpec, OptionSpec, ParamSpec } from "./catalogue.ts";
import { noteCitations } from "./_citations.ts";
import { Column, isTable } from "./table.ts";
import { DEFAULT_DISPLAY, getValueType, keepWhole, typeOfValue } from "./types.ts";
import { formatNumber, formatQuantity } from "./display.ts";
import { columnToArray, quantityParts, toNumberIn } from "./quantity.ts";

/** A formula call whose arguments do not fit its declaration. */
export class FormulaArgumentError extends TypeError {
  /**
   * @param formula formula name; @param message what was wrong; @param argument which
   * argument (its index from 0) or which option (its name), when one is to blame.
   */
  constructor(
    readonly formula: string,
    message: string,
    readonly argument?: number | string,
  ) {
    super(`${formula}: ${message}`);
    this.name = "FormulaArgumentError";
  }
}

/** What kind of measure a unit is, in words, for messages. */
const MEASURE_OF_UNIT: Readonly<Record<string, string>> = {
  D: "a power",
  mm: "a length",
  cm: "a length",
  m: "a distance",
  um: "a length",
  nm: "a wavelength",
  ft: "a distance",
  deg: "an angle",
  arcmin: "an angle",
  arcsec: "an angle",
  rad: "an angle",
  prism: "a prism amount",
  years: "an age",
};

/**
 * The measure a unit stands for, in words ("a length"), or "a quantity".
 *
 * @example
 * ```ts
 * import { measureOfUnit } from "./_arguments.ts";
 * measureOfUnit("mm"); // "a length"
 * ```
 */
export function measureOfUnit(unit: string): string {
  return MEASURE_OF_UNIT[unit] ?? "a quantity";
}

/**
 * Whether `x` is a record written in a formula (`{step: 0.125 D}`) or returned as a plain
 * record: a plain object that is neither a table nor a value of a registered type.
 *
 * @example
 * ```ts
 * import { isPlainRecord } from "./_arguments.ts";
 * isPlainRecord({ step: 1 }); // true
 * isPlainRecord([1]); // false
 * ```
 */
export function isPlainRecord(x: unknown): x is Record<string, unknown> {
  if (x === null || typeof x !== "object" || Array.isArray(x)) return false;
  const proto = Object.getPrototypeOf(x);
  return (proto === Object.prototype || proto === null) && !isTable(x) && !typeOfValue(x);
}

/**
 * A value as a message shows it: quantities by the display rules for their unit, text in
 * quotes, records and tables by what they are.
 *
 * @example
 * ```ts
 * import { shownValue } from "./_arguments.ts";
 * import { quantity } from "./quantity.ts";
 * shownValue(quantity(38.73592452822642, "mm")); // "38.74 mm"
 * ```
 */
export function shownValue(x: unknown): string {
  if (x === null || x === undefined) return "nothing";
  if (typeof x === "string") return `text "${x}"`;
  if (typeof x === "number") return `the number ${formatNumber(x)}`;
  if (typeof x === "boolean") return x ? "true" : "false";
  if (x instanceof Column) return `column ${x.name}`;
  if (isTable(x)) return "a table";
  const q = quantityParts(x);
  if (q) return q.unit ? formatQuantity(q.value, q.unit) : `the number ${formatNumber(q.value)}`;
  const t = typeOfValue(x);
  if (t) {
    const shown = t.headline?.(x, DEFAULT_DISPLAY) ?? t.display(x, DEFAULT_DISPLAY);
    return shown.length <= 48 ? shown : `this ${t.name} result`;
  }
  if (Array.isArray(x) || (x as { isMatrix?: boolean }).isMatrix) return "a list";
  if (isPlainRecord(x)) return "a record";
  if (typeof x === "function") return "a function";
  return "a value of another kind";
}

/** The closest of `names` to `word` by edit distance, when it is close enough to suggest. */
function nearest(word: string, names: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  for (const n of names) {
    const d = editDistance(word.toLowerCase(), n.toLowerCase());
    if (d < bestD) [best, bestD] = [n, d];
  }
  return bestD <= Math.max(1, Math.floor(word.length / 3)) ? best : undefined;
}

function editDistance(a: string, b: string): number {
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length];
}

const quoted = (words: readonly string[]) => words.map((w) => `"${w}"`).join(", ");

/** An example of an option record for a formula's messages: its first option at its default. */
function optionExample(options: readonly OptionSpec[]): string {
  const o = options.find((o) => o.default !== undefined) ?? options[0];
  const v = o.default === undefined
    ? (o.type === "quantity" ? `1 ${o.unit}` : "…")
    : typeof o.default === "string"
    ? `"${o.default}"`
    : `${o.default}${o.type === "quantity" ? ` ${o.unit}` : ""}`;
  return `{${o.name}: ${v}}`;
}

/**
 * Check and convert one argument as `p` declares it; `label` names it in messages
 * ("from", "option step").
 */
function convertArg(
  spec: FormulaSpec,
  p: ParamSpec,
  x: unknown,
  at: number | string,
  label = p.name,
): unknown {
  const fail = (why: string) =>
    new FormulaArgumentError(spec.name, `${label}: ${why}${hintFor(p, x)}`, at);
  if (isPlainRecord(x) && p.type !== "any") {
    throw fail(
      spec.options?.length
        ? `a record of options goes last, after the arguments (options: ${
          spec.options.map((o) => o.name).join(", ")
        })`
        : `expected ${expectedOf(p)}, got a record (${spec.name} takes no named options)`,
    );
  }
  switch (p.type) {
    case "quantity":
    case "number":
    case "integer": {
      if (p.type === "quantity" && typeof x === "number") {
        throw new FormulaArgumentError(
          spec.name,
          `${label} (${p.doc}) needs a unit, e.g. ${formatNumber(x, 6)} ${p.unit}`,
          at,
        );
      }
      let n: number;
      try {
        n = toNumberIn(x, p.type === "quantity" ? p.unit! : "");
      } catch {
        throw fail(`expected ${expectedOf(p)}, got ${shownValue(x)}`);
      }
      if (!Number.isFinite(n)) throw fail(`must be a finite number (got ${formatNumber(n)})`);
      if (p.type === "integer" && !Number.isInteger(n)) {
        throw fail(`must be a whole number (got ${formatNumber(n)})`);
      }
      if (p.range && (n < p.range[0] || n > p.range[1])) {
        const u = p.unit ? ` ${p.unit}` : "";
        throw fail(
          `${formatNumber(n)}${u} is outside the accepted range ${p.range[0]}–${p.range[1]}${u}`,
        );
      }
      return n;
    }
    case "text":
      if (typeof x !== "string") throw fail(`expected text in quotes, got ${shownValue(x)}`);
      if (p.choices && !p.choices.includes(x)) {
        throw fail(`"${x}" is not one of ${quoted(p.choices)}`);
      }
      return x;
    case "boolean":
      if (typeof x !== "boolean") throw fail(`expected true or false, got ${shownValue(x)}`);
      return x;
    case "list":
      if ((x as { isMatrix?: boolean } | null)?.isMatrix) {
        // The values themselves (toArray would copy each, and values of our own types
        // cannot be copied by the library).
        return (x as { valueOf(): unknown[] }).valueOf();
      }
      if (x instanceof Column) return columnToArray(x);
      if (Array.isArray(x)) return x;
      throw fail(`expected a list [..] or a column, got ${shownValue(x)}`);
    case "column":
      if (x instanceof Column) return x;
      throw fail(`expected a table column (table.column), got ${shownValue(x)}`);
    case "table":
      if (isTable(x)) return x;
      throw fail(`expected a table, got ${shownValue(x)}`);
    case "any":
      return x;
    default: {
      const t = getValueType(p.type);
      if (!t) throw fail(`unknown parameter type ${p.type}`);
      if (t.is(x)) return x;
      if (typeof x === "string" && t.fromText) {
        try {
          return t.fromText(x);
        } catch (e) {
          throw fail((e as Error).message);
        }
      }
      throw fail(`expected ${t.summary}, got ${shownValue(x)}`);
    }
  }
}

/**
 * The parameter's declared hint for an argument of another kind ("; a prescription moves
 * with vertexRx(rx, from, to)"), or "". Text matches a kind whose reading of it succeeds.
 */
function hintFor(p: ParamSpec, x: unknown): string {
  if (!p.hints) return "";
  const kind = typeOfValue(x)?.name ?? (quantityParts(x) ? "quantity" : undefined);
  if (kind) return p.hints[kind] ? `; ${p.hints[kind]}` : "";
  if (typeof x !== "string") return "";
  for (const [name, hint] of Object.entries(p.hints)) {
    const t = getValueType(name);
    try {
      if (t?.fromText) {
        t.fromText(x);
        return `; ${hint}`;
      }
    } catch {
      // not text of that kind
    }
  }
  return "";
}

/** What a parameter expects, in words. */
function expectedOf(p: ParamSpec): string {
  switch (p.type) {
    case "quantity":
      return `${measureOfUnit(p.unit!)} in ${p.unit} (e.g. 1 ${p.unit})`;
    case "number":
      return "a number";
    case "integer":
      return "a whole number";
    case "text":
      return p.choices ? `one of ${quoted(p.choices)}` : "text in quotes";
    case "boolean":
      return "true or false";
    case "table":
      return "a table";
    case "column":
      return "a table column";
    case "list":
      return "a list or a column";
    default:
      return getValueType(p.type)?.summary ?? p.type;
  }
}

/** Read the named options of a call: each known, converted, defaults filled in, in order. */
function convertOptions(spec: FormulaSpec, given: Record<string, unknown> | undefined): unknown[] {
  const options = spec.options ?? [];
  const names = options.map((o) => o.name);
  for (const key of Object.keys(given ?? {})) {
    if (names.includes(key)) continue;
    const near = nearest(key, names);
    throw new FormulaArgumentError(
      spec.name,
      `no option "${key}"${near ? ` (did you mean ${near}?)` : ""}; the options are ${
        names.join(", ")
      }`,
      key,
    );
  }
  return options.map((o) => {
    const x = given?.[o.name];
    if (x === undefined) return o.default;
    return convertArg(spec, { ...o, optional: true }, x, o.name, `option ${o.name}`);
  });
}

/** Mark a result of a registered type, and those one level inside a record, as {@linkcode keepWhole}. */
function keepValuesWhole(out: unknown): unknown {
  if (out === null || typeof out !== "object") return out;
  if (typeOfValue(out)) keepWhole(out);
  if (isPlainRecord(out) || typeOfValue(out)) {
    const proto = Object.getPrototypeOf(out);
    if (proto === Object.prototype || proto === null) {
      for (const v of Object.values(out)) if (typeOfValue(v)) keepWhole(v);
    }
  }
  return out;
}

/**
 * The function a notebook calls for a formula: checks and converts the arguments and the
 * named options, calls `spec.fn`, and prefixes its errors with the formula's name. `wrap`
 * turns a number result into the declared quantity.
 *
 * @example
 * ```ts
 * import { bindFormula } from "./_arguments.ts";
 * import { defineFormula } from "./catalogue.ts";
 * import { quantity } from "./quantity.ts";
 * const half = bindFormula(defineFormula({
 *   name: "halfStep", group: "example", summary: "Half a step.",
 *   params: [],
 *   options: [{ name: "step", type: "quantity", unit: "D", default: 0.25, doc: "the step" }],
 *   returns: { type: "number", doc: "half of it" }, sources: ["common-practice"],
 *   example: "halfStep({step: 0.5 D})", fn: (s) => (s as number) / 2,
 * }), (x) => x);
 * half({ step: quantity(0.5, "D") }); // 0.25
 * ```
 */
export function bindFormula(
  spec: FormulaSpec,
  wrap: (out: unknown) => unknown,
): (...args: unknown[]) => unknown {
  const n = spec.params.length;
  const hasOptions = !!spec.options?.length;
  const wrapped = (...args: unknown[]) => {
    let given: Record<string, unknown> | undefined;
    if (hasOptions && args.length > 0 && isPlainRecord(args[args.length - 1])) {
      given = args[args.length - 1] as Record<string, unknown>;
      args = args.slice(0, -1);
    }
    if (args.length > n && !spec.variadic) {
      const takes = `takes at most ${n} argument${n === 1 ? "" : "s"}`;
      throw new FormulaArgumentError(
        spec.name,
        hasOptions
          ? `${takes} before its options, got ${args.length}; give settings by name in a ` +
            `record at the end, e.g. ${spec.name}(…, ${optionExample(spec.options!)}) ` +
            `(options: ${spec.options!.map((o) => o.name).join(", ")})`
          : `${takes}, got ${args.length}`,
        n,
      );
    }
    const converted: unknown[] = [];
    for (let i = 0; i < Math.max(n, args.length); i++) {
      const p = spec.params[Math.min(i, n - 1)];
      const x = args[i];
      if (x === undefined) {
        if (!p.optional) {
          throw new FormulaArgumentError(spec.name, `missing argument ${p.name} (${p.doc})`);
        }
        converted.push(p.default);
      } else converted.push(convertArg(spec, p, x, i));
    }
    if (hasOptions) converted.push(...convertOptions(spec, given));
    let out: unknown;
    try {
      out = spec.fn(...converted);
    } catch (e) {
      if (e instanceof FormulaArgumentError) throw e;
      const err = e as Error;
      const wrappedErr = new Error(`${spec.name}: ${err.message}`);
      wrappedErr.name = err.name;
      throw wrappedErr;
    }
    if (spec.cites) noteCitations(spec, out);
    return wrap(keepValuesWhole(out));
  };
  Object.defineProperty(wrapped, "name", { value: spec.name });
  return wrapped;
}
