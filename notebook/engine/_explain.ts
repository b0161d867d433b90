/**
 * Why a formula failed, in the notebook's words. When the expression library refuses an
 * operation (`+` of a number and a power, `to` of a prescription, `sqrt` of an acuity), the
 * failing operation is found in the formula by evaluating its parts, and the message names
 * the operator as written, the values as the notebook displays them, and a way to write
 * it that works. No message names the library's own functions or types.
 *
 * @module
 */

import type { MathNode } from "mathjs";
import { type Language, measureOfUnit, partNames, shownValue } from "../../cells/language.ts";
import { Column, isTable } from "../../cells/table.ts";
import { type DisplayOptions, typeOfValue } from "../../cells/types.ts";

/** What a failing formula did wrong, and where its operator stands. */
export interface Explanation {
  /** The message for the user. */
  readonly message: string;
  /** Zero-based offset in the expression of the operator or function, when found. */
  readonly offset?: number;
  /** True when the trouble is a mismatch of units. */
  readonly unit: boolean;
}

const VERBS: Readonly<Record<string, [string, string, string]>> = {
  // fn: [verb, joining word, operator as written]
  add: ["add", "to", "+"],
  subtract: ["subtract", "from", "-"],
  multiply: ["multiply", "by", "*"],
  divide: ["divide", "by", "/"],
  dotMultiply: ["multiply", "by", ".*"],
  dotDivide: ["divide", "by", "./"],
  pow: ["raise", "to the power", "^"],
  mod: ["take", "modulo", "mod"],
};

const COMPARISONS: Readonly<Record<string, string>> = {
  equal: "==",
  unequal: "!=",
  smaller: "<",
  smallerEq: "<=",
  larger: ">",
  largerEq: ">=",
};

/** Hints for values of a registered type that arithmetic does not take, by type name. */
const TYPE_HINTS: Readonly<Record<string, string>> = {
  rx:
    "combine prescriptions with combine or overRefraction, or take a number from one with sphericalEquivalent, powerM or one of its parts",
  acuity: "take a number from it first with toLogMAR, toDecimal or letterScore",
  prism: "take its parts first (prismComponents)",
};

const SUMMARY_FUNCTIONS = new Set(["mean", "median", "std", "variance", "min", "max", "sum"]);

type Kind = "number" | "quantity" | "text" | "boolean" | "list" | "column" | "table" | "other";

function kindOf(lang: Language, x: unknown): Kind {
  if (typeof x === "number") return "number";
  if (typeof x === "string") return "text";
  if (typeof x === "boolean") return "boolean";
  if (lang.quantityParts(x)) return "quantity";
  if (x instanceof Column) return "column";
  if (isTable(x)) return "table";
  if (Array.isArray(x) || (x as { isMatrix?: boolean } | null)?.isMatrix) return "list";
  return "other";
}

/** How to get a number out of a value arithmetic does not take. */
function hintFor(x: unknown, written: string): string {
  if (typeof x === "string") return "text is not a number: write the number without quotes";
  const t = typeOfValue(x);
  if (t && TYPE_HINTS[t.name]) return TYPE_HINTS[t.name];
  const parts = partNames(x);
  if (parts.length) {
    const name = /^[A-Za-z_][A-Za-z0-9_]*$/.test(written) ? written : "result";
    return `read one of its parts, e.g. ${name}.${parts[0]} (parts: ${parts.join(", ")})`;
  }
  if (isTable(x)) return "name one of its columns (table.column)";
  if (x instanceof Column) {
    return "a column is computed row by row in a computed column (table.name = formula), " +
      "or summarised with mean, median, min or max";
  }
  return "arithmetic works on numbers and quantities";
}

/** Where `word` (an operator or function name) stands in the expression, if found. */
function offsetOf(expression: string, word: string): number | undefined {
  const i = expression.indexOf(word);
  return i >= 0 ? i : undefined;
}

/**
 * Where the operator `op` before the right operand `right` stands in `expression`
 * (zero-based), found by the operand's text; undefined when the text cannot be matched.
 */
function operatorOffset(expression: string, op: string, right: string): number | undefined {
  const squeeze = (t: string) => t.replace(/\s+/g, "");
  const target = squeeze(op + right);
  for (let i = expression.indexOf(op); i >= 0; i = expression.indexOf(op, i + 1)) {
    if (squeeze(expression.slice(i)).startsWith(target)) return i;
  }
  return undefined;
}

/**
 * Find the operation that fails in `node` and say why in the notebook's words, or
 * undefined when no single operation can be blamed.
 *
 * @example
 * ```ts ignore
 * explainFailure(lang.parse("toLogMAR(a) + 1 D"), scope, lang, display, "toLogMAR(a) + 1 D");
 * // { message: "cannot add +1.00 D to 0.3, a number without a unit: …", unit: true }
 * ```
 */
export function explainFailure(
  node: MathNode,
  scope: ReadonlyMap<string, unknown>,
  lang: Language,
  display: DisplayOptions,
  expression: string,
): Explanation | undefined {
  const explainer = new Explainer(scope, lang, display, expression);
  explainer.visit(node);
  return explainer.found;
}

type Written = { readonly values: unknown[]; readonly kinds: Kind[]; readonly written: string[] };

/**
 * Evaluates a failing formula's parts, innermost first, until the first operation whose
 * arguments evaluate and which fails itself; then says why, one method per kind of operation.
 */
class Explainer {
  found: Explanation | undefined;
  #done = false;

  constructor(
    readonly scope: ReadonlyMap<string, unknown>,
    readonly lang: Language,
    readonly display: DisplayOptions,
    readonly expression: string,
  ) {}

  evaluate(m: MathNode): { ok: true; value: unknown } | { ok: false } {
    try {
      return { ok: true, value: this.lang.compile(m).evaluate(this.scope) };
    } catch {
      return { ok: false };
    }
  }

  show(x: unknown): string {
    const k = kindOf(this.lang, x);
    if (k === "quantity" || k === "number") return this.lang.describe(x, this.display).display;
    return shownValue(x);
  }

  visit(m: MathNode): void {
    if (this.#done) return;
    m.forEach((child) => this.visit(child));
    if (this.#done) return;
    if (m.type !== "OperatorNode" && m.type !== "FunctionNode") return;
    if (m.type === "FunctionNode") {
      const fnNode = (m as unknown as { fn: MathNode }).fn;
      if (fnNode.type !== "SymbolNode") return;
      const name = (fnNode as unknown as { name: string }).name;
      if (this.lang.catalogue.formulas.has(name)) return; // formulas explain their own arguments
    }
    const args = (m as unknown as { args: MathNode[] }).args;
    const values: unknown[] = [];
    for (const a of args) {
      const r = this.evaluate(a);
      if (!r.ok) return;
      values.push(r.value);
    }
    if (this.evaluate(m).ok) return;
    this.#done = true;
    this.found = this.explainOne(m, args, values);
  }

  explainOne(m: MathNode, args: MathNode[], values: unknown[]): Explanation | undefined {
    const w: Written = {
      values,
      kinds: values.map((v) => kindOf(this.lang, v)),
      written: args.map((a) => a.toString()),
    };
    if (m.type === "FunctionNode") {
      return this.call((m as unknown as { fn: { name: string } }).fn.name, w);
    }
    const op = m as unknown as { fn: string; op: string };
    if (op.fn === "to") return this.conversion(w);
    if (COMPARISONS[op.fn]) return this.comparison(op.fn, w);
    const verb = VERBS[op.fn];
    if (op.fn === "unaryMinus" || op.fn === "unaryPlus" || !verb) {
      const x = values[0];
      return {
        message: `${op.op} cannot take ${this.show(x)}: ${hintFor(x, w.written[0])}`,
        offset: offsetOf(this.expression, op.op),
        unit: false,
      };
    }
    return this.arithmetic(op.fn, verb, w);
  }

  /** A function given an argument of a kind it does not take. */
  call(name: string, { values, kinds, written }: Written): Explanation | undefined {
    const bad = values.findIndex((v, i) =>
      !["number", "quantity", "list", "column"].includes(kinds[i]) ||
      (v instanceof Column && !v.numeric)
    );
    // Arguments of the right kinds: the library's own reason is the better one.
    if (bad < 0) return undefined;
    const x = values[bad];
    const rxColumn = x instanceof Column && x.type === "rx";
    const hint = rxColumn && SUMMARY_FUNCTIONS.has(name)
      ? `for prescriptions use meanRx(${written[bad] ?? "column"}) or vectorStats`
      : hintFor(x, written[bad]);
    return {
      message: `${name} cannot take ${
        rxColumn ? `a column of prescriptions (${(x as Column).name})` : this.show(x)
      }: ${hint}`,
      offset: offsetOf(this.expression, name),
      unit: false,
    };
  }

  /** `to` of a value that is not a quantity, or into a unit of another measure. */
  conversion({ values, kinds, written }: Written): Explanation {
    const [a] = values;
    if (kinds[0] !== "quantity") {
      return {
        message: `to gives a quantity in another unit, and ${this.show(a)} is not a quantity: ${
          hintFor(a, written[0])
        }`,
        offset: operatorOffset(this.expression, "to", written[1]),
        unit: false,
      };
    }
    return {
      message: `units do not match: ${this.show(a)} cannot be shown in ${written[1]}`,
      offset: operatorOffset(this.expression, "to", written[1]),
      unit: true,
    };
  }

  /** A comparison of values of different kinds or measures. */
  comparison(fn: string, { values, kinds, written }: Written): Explanation {
    const lang = this.lang;
    const [a, b] = values;
    return {
      message: `cannot compare ${this.show(a)} with ${this.show(b)}: ${
        kinds.every((k) => k === "quantity")
          ? `${measureOf(lang, a)} and ${measureOf(lang, b)} are different kinds of measure`
          : "compare numbers with numbers, or quantities of one kind"
      }`,
      offset: operatorOffset(this.expression, COMPARISONS[fn], written[1]),
      unit: kinds.every((k) => k === "quantity"),
    };
  }

  /** `+ - * / ^ mod` of a value that is not a number, or of a number and a quantity. */
  arithmetic(
    fn: string,
    [v, join, sign]: [string, string, string],
    { values, kinds, written }: Written,
  ): Explanation {
    const lang = this.lang;
    const show = (x: unknown) => this.show(x);
    // "add b to a", "subtract b from a", but "multiply a by b".
    const [x0, x1] = values;
    const [a, b] = fn === "add" || fn === "subtract" ? [x0, x1] : [x1, x0];
    const at = operatorOffset(this.expression, sign, written[1]);
    const other = kinds.findIndex((k) => k !== "number" && k !== "quantity");
    if (other >= 0) {
      return {
        message: `cannot ${v} ${show(b)} ${join} ${show(a)}: ${
          hintFor(values[other], written[other])
        }`,
        offset: at,
        unit: false,
      };
    }
    if (kinds[0] !== kinds[1]) {
      const plain = kinds[0] === "number" ? a : b;
      const withUnit = kinds[0] === "number" ? b : a;
      const u = lang.quantityParts(withUnit)!.unit;
      return {
        message:
          `cannot ${v} ${show(b)} ${join} ${show(a)}: ${show(plain)} is a number without a unit; ` +
          `give it one (${show(plain)} ${u}) or take the unit off the other (x / (1 ${u}))`,
        offset: at,
        unit: true,
      };
    }
    return {
      message: `units do not match: cannot ${v} ${show(b)} ${join} ${show(a)} (${
        measureOf(lang, a)
      } and ${measureOf(lang, b)})`,
      offset: at,
      unit: true,
    };
  }
}

function measureOf(lang: Language, x: unknown): string {
  const q = lang.quantityParts(x);
  return q ? measureOfUnit(q.unit) : "a number";
}

/**
 * The node of argument `index` of the first call of `formula` in `node`, if any.
 *
 * @example
 * ```ts ignore
 * argumentNode(lang.parse("vertexPower(F, d)"), "vertexPower", 1)?.toString(); // "d"
 * ```
 */
export function argumentNode(
  node: MathNode,
  formula: string,
  index: number,
): MathNode | undefined {
  return firstCallArgs(node, formula)?.[index];
}

/** The arguments of the first call of `formula` in the expression tree, if it has one. */
function firstCallArgs(node: MathNode, formula: string): MathNode[] | undefined {
  let call: MathNode[] | undefined;
  node.traverse((m) => {
    if (call || m.type !== "FunctionNode") return;
    const fn = (m as unknown as { fn: { type: string; name?: string } }).fn;
    if (fn.type === "SymbolNode" && fn.name === formula) {
      call = (m as unknown as { args: MathNode[] }).args;
    }
  });
  return call;
}

/**
 * Where argument `argument` (an index, or an option's name) of the first call of `formula`
 * stands in `expression`, zero-based; undefined when it cannot be found.
 *
 * @example
 * ```ts ignore
 * argumentOffset(lang.parse("vertexPower(-10 D, 12)"), "vertexPower(-10 D, 12)", "vertexPower", 1); // 18
 * ```
 */
export function argumentOffset(
  node: MathNode,
  expression: string,
  formula: string,
  argument: number | string,
): number | undefined {
  const call = firstCallArgs(node, formula);
  if (!call) return undefined;
  const start = expression.search(new RegExp(`\\b${formula}\\s*\\(`));
  if (start < 0) return undefined;
  if (typeof argument === "string") {
    const m = new RegExp(`[{,]\\s*["']?(${argument})["']?\\s*:`).exec(expression.slice(start));
    return m ? start + m.index + m[0].indexOf(m[1]) : undefined;
  }
  const arg = call[argument];
  if (!arg) return undefined;
  const squeeze = (t: string) => t.replace(/\s+/g, "");
  const target = squeeze(arg.toString());
  for (let i = start + formula.length; i < expression.length; i++) {
    if (/\s/.test(expression[i])) continue;
    if (
      squeeze(expression.slice(i)).startsWith(target) && /[(,]\s*$/.test(expression.slice(0, i))
    ) {
      return i;
    }
  }
  return undefined;
}
