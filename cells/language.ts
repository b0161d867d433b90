/**
 * The formula language: mathjs's expression syntax with Lentil's units (diopter `D`, prism
 * dioptre `prism`, shown as Δ), constants and formulas added, and every function that could
 * redefine the language disabled, following mathjs's security guidance. Each call to a
 * catalogue formula converts and range-checks its arguments as the formula declares.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * const v = lang.compile(lang.parse("2 D + 0.5 D")).evaluate({});
 * lang.describe(v).display; // "+2.50 D"
 * ```
 *
 * @module
 */

import type { MathNode, Unit } from "mathjs";
import type { Catalogue, FormulaSpec } from "./catalogue.ts";
import { DEFAULT_DISPLAY, type DisplayOptions } from "./types.ts";
import { type Described, describeValue } from "./present.ts";
import { CATALOGUE } from "./mod.ts";
import { bindFormula } from "./_arguments.ts";
import { NOTEBOOK_CONSTANTS, NOTEBOOK_FUNCTION_NAMES } from "./functions.ts";
import { provideInFormulas, refuseInFormulas } from "./_mathjs.ts";
import { withPartAccess } from "./_parts.ts";
import { formulaMath, markExact, quantity, quantityParts, toNumberIn } from "./quantity.ts";

export { LENTIL_UNITS } from "./quantity.ts";
export { FormulaArgumentError, measureOfUnit, shownValue } from "./_arguments.ts";
export { partNames } from "./_parts.ts";
export { citing } from "./_citations.ts";

/** An expression that does not parse; `offset` is zero-based within the expression. */
export class ExpressionSyntaxError extends SyntaxError {
  /** @param message the reason; @param offset where in the expression. */
  constructor(message: string, readonly offset: number) {
    super(message);
    this.name = "ExpressionSyntaxError";
  }
}

/** The expression library's internal function names, as the notebook writes them. */
const OPERATION_WORDS: Readonly<Record<string, string>> = {
  add: "+",
  addScalar: "+",
  subtract: "-",
  subtractScalar: "-",
  multiply: "*",
  multiplyScalar: "*",
  divide: "/",
  divideScalar: "/",
  unaryMinus: "- (negation)",
  unaryPlus: "+ (sign)",
  pow: "^",
  dotMultiply: ".*",
  dotDivide: "./",
  equal: "==",
  equalScalar: "==",
  unequal: "!=",
  smaller: "<",
  smallerEq: "<=",
  larger: ">",
  largerEq: ">=",
  compare: "a comparison",
  to: "to",
  mod: "mod",
};

/** The library's type names in the notebook's words. */
function typeWords(types: string): string {
  const words: Record<string, string> = {
    Unit: "a quantity",
    number: "a number",
    any: "a value of another kind",
    Array: "a list",
    Matrix: "a list",
    DenseMatrix: "a list",
    SparseMatrix: "a list",
    string: "text",
    boolean: "true or false",
    Object: "a record",
    identifier: "a unit name",
    Column: "a column",
    null: "nothing",
    undefined: "nothing",
    Range: "a range",
    function: "a function",
  };
  const out: string[] = [];
  for (const t of types.split(/\s*(?:\||,| or )\s*/)) {
    const w = words[t.trim()];
    if (w && !out.includes(w)) out.push(w);
  }
  return out.length ? out.join(" or ") : "a value of another kind";
}

/**
 * The expression library's refusals in words a user can act on: which operation or
 * function, which argument, what it got, and for rounding a quantity, the unit it needs.
 * The library's own function names and type names never show. (When the failing
 * operation can be found in the formula, the engine says more: `_explain.ts`.)
 *
 * @example
 * ```ts
 * import { plainMathMessage } from "./language.ts";
 * plainMathMessage("Too few arguments in function round (expected: Unit or number, index: 1)");
 * // "round of a quantity needs the unit to round in: write round(x, D) (or round(x, 2, D) for two decimals)"
 * plainMathMessage("Unexpected type of argument in function addScalar (expected: number or Complex or BigNumber, actual: Unit, index: 1)");
 * // "+ cannot take a quantity as its 2nd operand here (it takes a number); give both sides the same kind"
 * ```
 */
export function plainMathMessage(message: string): string {
  const words = (fn: string) => OPERATION_WORDS[fn] ?? fn;
  const nth = (i: number) => ["1st", "2nd", "3rd"][i] ?? `${i + 1}th`;
  const few =
    /^(.*?)Too few arguments in function (\w+) \(expected: ([^,]*(?:, [^,]*)*?), index: (\d+)\)/
      .exec(message);
  if (few) {
    const [, pre, fn, expected, index] = few;
    if (["round", "floor", "ceil", "fix"].includes(fn) && index === "1") {
      return `${pre}${fn} of a quantity needs the unit to round in: write ${fn}(x, D) ` +
        `(or ${fn}(x, 2, D) for two decimals)`;
    }
    return `${pre}${words(fn)} needs more arguments (the ${nth(Number(index))} should be ${
      typeWords(expected)
    })`;
  }
  const many = /^(.*?)Too many arguments in function (\w+) \(expected: (\d+), actual: (\d+)\)/
    .exec(message);
  if (many) {
    const [, pre, fn, expected, actual] = many;
    return `${pre}${words(fn)} takes ${expected} argument${
      expected === "1" ? "" : "s"
    }, got ${actual}`;
  }
  const type =
    /^(.*?)Unexpected type of argument in function (\w+) \(expected: (.*?), actual: (.*?), index: (\d+)\)/
      .exec(message);
  if (type) {
    const [, pre, fn, expected, actual, index] = type;
    const operator = OPERATION_WORDS[fn] !== undefined;
    return `${pre}${words(fn)} cannot take ${typeWords(actual)} as its ${nth(Number(index))} ${
      operator ? "operand" : "argument"
    } here (it takes ${typeWords(expected)}); give both sides the same kind`;
  }
  const calc = /^(.*?)Cannot calculate (\w+), unexpected type of argument.*$/.exec(message);
  if (calc) {
    return `${calc[1]}${
      calc[2]
    } cannot take these values: it works on numbers, quantities of one kind and lists of them`;
  }
  const text = /^(.*?)Cannot convert "(.*)" to a number$/.exec(message);
  if (text) return `${text[1]}text "${text[2]}" is not a number: write the number without quotes`;
  if (/Cannot compare units with different base/.test(message)) {
    return "cannot compare quantities of different kinds (a power with a length, say)";
  }
  const undef = /^(.*?)Undefined symbol (\S+)$/.exec(message);
  if (undef) return `${undef[1]}unknown name "${undef[2]}"`;
  if (/Cannot clone: unknown type of value/.test(message)) {
    return message.replace(
      /Cannot clone: unknown type of value.*$/,
      "these values cannot be put in a list here; give them as a table column",
    );
  }
  return message;
}

export type { Described } from "./present.ts";

/** Functions that user formulas may not call: they could redefine the language or evaluate text. */
export const DISABLED_FUNCTIONS: readonly string[] = [
  "import",
  "createUnit",
  "evaluate",
  "parse",
  "compile",
  "simplify",
  "simplifyConstant",
  "simplifyCore",
  "derivative",
  "resolve",
  "rationalize",
  "symbolicEqual",
  "leafCount",
  "parser",
  "reviver",
  "replacer",
  "config",
  "chain",
  "help",
];

/** The prepared language; obtain it with {@linkcode getLanguage}. */
export interface Language {
  /** The catalogue the language was built from. */
  readonly catalogue: Catalogue;
  /** Parse an expression; throws {@linkcode ExpressionSyntaxError}. */
  parse(expression: string): MathNode;
  /** Compile a parsed expression. */
  compile(node: MathNode): { evaluate(scope: unknown): unknown };
  /** Whether `name` is a function the language knows (built-in or catalogue). */
  isFunction(name: string): boolean;
  /** Whether `name` is a built-in constant or value of the language (pi, e, true, …). */
  isBuiltinSymbol(name: string): boolean;
  /** Whether `name` is a unit the language knows. */
  isUnit(name: string): boolean;
  /** Constants available to every expression, as values. */
  readonly constants: Readonly<Record<string, unknown>>;
  /** A quantity value. */
  quantity(value: number, unit: string): Unit;
  /** The number and unit of a quantity, or undefined when `x` is not a quantity. */
  quantityParts(x: unknown): { value: number; unit: string } | undefined;
  /** Read `x` as a number in `unit`; bare numbers are taken as already in it. */
  toNumberIn(x: unknown, unit: string): number;
  /** Display and serialise a value. */
  describe(x: unknown, options?: DisplayOptions): Described;
}

let cached: Language | undefined;

/**
 * The shared language instance, built once from the catalogue in `cells/mod.ts`.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * getLanguage().isUnit("D"); // true
 * ```
 */
export function getLanguage(): Language {
  return cached ??= buildLanguage(CATALOGUE);
}

/** Build the language over the shared mathjs instance; called once, by getLanguage. */
function buildLanguage(catalogue: Catalogue): Language {
  const math = formulaMath();
  const parse = math.parse;
  const unitOf = quantity;

  const bind = (spec: FormulaSpec) =>
    bindFormula(spec, (out) => {
      if (spec.returns.type === "quantity" && typeof out === "number" && spec.returns.unit) {
        const q = unitOf(out, spec.returns.unit);
        const shown = spec.returns.display;
        if (shown === "spread") return markExact(q, { unsigned: true });
        return shown === "exact" || shown === "measure" ? markExact(q) : q;
      }
      return out;
    });

  const imports: Record<string, unknown> = {};
  for (const spec of catalogue.formulas.values()) imports[spec.name] = bind(spec);
  provideInFormulas(math, imports);

  const constants: Record<string, unknown> = {};
  for (const c of catalogue.constants.values()) {
    constants[c.name] = c.unit ? unitOf(c.value, c.unit) : c.value;
  }

  refuseInFormulas(math, DISABLED_FUNCTIONS);

  const isFunction = (name: string) =>
    catalogue.formulas.has(name) ||
    (NOTEBOOK_FUNCTION_NAMES.has(name) && !DISABLED_FUNCTIONS.includes(name));

  const isBuiltinSymbol = (name: string) => NOTEBOOK_CONSTANTS.includes(name);

  const isUnit = (name: string) => {
    try {
      return math.Unit.isValuelessUnit(name);
    } catch {
      return false;
    }
  };

  // One rule for every surface: the value's display and JSON come from cells/present.ts.
  const describe = (x: unknown, options: DisplayOptions = DEFAULT_DISPLAY): Described =>
    describeValue(x, options);

  return {
    catalogue,
    parse(expression: string): MathNode {
      try {
        return parse(expression);
      } catch (e) {
        const msg = (e as Error).message;
        const m = /\(char (\d+)\)/.exec(msg);
        const offset = m ? Math.max(0, Number(m[1]) - 1) : 0;
        throw new ExpressionSyntaxError(msg.replace(/\s*\(char \d+\)/, ""), offset);
      }
    },
    compile: (node) =>
      withPartAccess(node, math as unknown as Parameters<typeof withPartAccess>[1])
        .compile() as { evaluate(scope: unknown): unknown },
    isFunction,
    isBuiltinSymbol,
    isUnit,
    constants,
    quantity: unitOf,
    quantityParts,
    toNumberIn,
    describe,
  };
}
