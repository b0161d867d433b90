/**
 * The expression library's functions a notebook may call, by group. The formula language
 * is built from these (and their dependencies) only; every other function of the library
 * (symbolic algebra, random numbers, bit operations, set and combinatorics functions,
 * matrix builders such as `zeros`) is left out and a formula naming one is refused.
 * Catalogue formulas come on top of these.
 *
 * @example
 * ```ts
 * import { NOTEBOOK_FUNCTIONS } from "./functions.ts";
 * NOTEBOOK_FUNCTIONS.rounding.includes("round"); // true
 * ```
 *
 * @module
 */

/** Functions by group, as a reader looks for them. */
export const NOTEBOOK_FUNCTIONS = {
  /** `+ - * / ^ %`, element-wise `.* ./ .^`, and the usual powers and roots. */
  arithmetic: [
    "add",
    "subtract",
    "multiply",
    "divide",
    "unaryMinus",
    "unaryPlus",
    "pow",
    "mod",
    "dotMultiply",
    "dotDivide",
    "dotPow",
    "abs",
    "sign",
    "sqrt",
    "cbrt",
    "square",
    "cube",
    "hypot",
    "exp",
    "log",
    "log10",
    "log2",
  ],
  /** Rounding (of a quantity: give the unit, `round(x, D)`). */
  rounding: ["round", "floor", "ceil", "fix"],
  /** `== != < <= > >=`, `and or not xor`. */
  comparison: [
    "equal",
    "unequal",
    "smaller",
    "smallerEq",
    "larger",
    "largerEq",
    "and",
    "or",
    "not",
    "xor",
  ],
  /** Angles in `deg` or `rad`. */
  trigonometry: ["sin", "cos", "tan", "asin", "acos", "atan", "atan2", "cot", "sec", "csc"],
  /** Units: `x to mm`, `number(x, "mm")`, `unit("12 mm")`. */
  units: ["to", "number", "unit"],
  /** Summaries of a list or a column. */
  summaries: ["min", "max", "sum", "prod", "mean", "median", "std", "variance"],
  /** Small lists and matrices: `[1, 2, 3]`, `a[2]`, `1:5` (ranges up to 100,000 values). */
  matrices: [
    "matrix",
    "size",
    "subset",
    "index",
    "range",
    "dot",
    "cross",
    "det",
    "inv",
  ],
} as const satisfies Record<string, readonly string[]>;

/** Built-in constants of the language. */
export const NOTEBOOK_CONSTANTS: readonly string[] = ["pi", "e", "tau", "Infinity", "NaN"];

/** The most values a range (`1:5`, `range(0, 1, 0.1)`) may hold. */
export const MAX_RANGE_LENGTH = 100_000;

/** Every function name of {@linkcode NOTEBOOK_FUNCTIONS}. */
export const NOTEBOOK_FUNCTION_NAMES: ReadonlySet<string> = new Set(
  Object.values(NOTEBOOK_FUNCTIONS).flat(),
);

/** Parts of the library the language itself needs besides the functions above. */
export const NOTEBOOK_INTERNALS: readonly string[] = ["parse", "createUnit", "typed"];
