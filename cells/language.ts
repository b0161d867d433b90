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
import { formulaMath, markExact, quantity, quantityParts, toNumberIn } from "./quantity.ts";

export { LENTIL_UNITS } from "./quantity.ts";
export { FormulaArgumentError } from "./_arguments.ts";

/** An expression that does not parse; `offset` is zero-based within the expression. */
export class ExpressionSyntaxError extends SyntaxError {
  /** @param message the reason; @param offset where in the expression. */
  constructor(message: string, readonly offset: number) {
    super(message);
    this.name = "ExpressionSyntaxError";
  }
}

/**
 * mathjs's argument errors in words a user can act on: which function, which argument,
 * what it got, and for rounding a quantity, the unit it needs. Other messages pass through.
 *
 * @example
 * ```ts
 * import { plainMathMessage } from "./language.ts";
 * plainMathMessage("Too few arguments in function round (expected: Unit or number, index: 1)");
 * // "round of a quantity needs the unit to round in: write round(x, D) (or round(x, 2, D) for two decimals)"
 * ```
 */
export function plainMathMessage(message: string): string {
  const few =
    /^(.*?)Too few arguments in function (\w+) \(expected: ([^,]*(?:, [^,]*)*?), index: (\d+)\)/
      .exec(message);
  if (few) {
    const [, pre, fn, expected, index] = few;
    if (["round", "floor", "ceil", "fix"].includes(fn) && index === "1") {
      return `${pre}${fn} of a quantity needs the unit to round in: write ${fn}(x, D) ` +
        `(or ${fn}(x, 2, D) for two decimals)`;
    }
    return `${pre}${fn} needs more arguments (argument ${Number(index) + 1} should be ${
      expected.split(" or ").slice(0, 3).join(" or ")
    })`;
  }
  const type =
    /^(.*?)Unexpected type of argument in function (\w+) \(expected: (.*?), actual: (.*?), index: (\d+)\)/
      .exec(message);
  if (type) {
    const [, pre, fn, expected, actual, index] = type;
    return `${pre}${fn}: argument ${Number(index) + 1} is ${
      actual.replace(/^identifier/, "a name")
    }, ` +
      `expected ${expected.split(" or ").slice(0, 3).join(" or ")}`;
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
    compile: (node) => node.compile() as { evaluate(scope: unknown): unknown },
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
