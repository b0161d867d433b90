/**
 * Static analysis of one expression: which notebook names it reads, which catalogue
 * formulas and constants it uses (for sources and cautions), and anything that makes it
 * unusable before evaluation (syntax, unknown names, forbidden functions).
 *
 * @module
 */

import { countText } from "../../lib/number_text.ts";
import type { MathNode } from "mathjs";
import {
  DISABLED_FUNCTIONS,
  type ExpressionSyntaxError,
  type Language,
} from "../../cells/language.ts";
import { LENTIL_UNITS, USABLE_UNITS } from "../../cells/quantity.ts";

/** What a table looks like to the analyser: its data columns and computed columns. */
export interface TableShape {
  /** Data columns (declared or read from the CSV header). */
  readonly data: ReadonlySet<string>;
  /** Computed columns defined in calc blocks. */
  readonly computed: ReadonlySet<string>;
  /**
   * True for a table a formula returns (`paired = pairRows(…)`): its data columns are known
   * only once it is evaluated, so any other name is taken as one of them and checked then.
   */
  readonly open?: boolean;
}

/** The names an expression can see. */
export interface AnalysisContext {
  /** The language. */
  readonly lang: Language;
  /** Plain cells by name. */
  readonly cells: ReadonlySet<string>;
  /** Tables by name. */
  readonly tables: ReadonlyMap<string, TableShape>;
  /** For a computed column: its table, whose columns are visible by bare name. */
  readonly rowTable?: string;
}

/** A problem found before evaluation; `offset` is within the expression. */
export interface AnalysisProblem {
  /** What is wrong. */
  readonly message: string;
  /** Zero-based offset in the expression. */
  readonly offset: number;
  /** Kind of problem. */
  readonly kind: "syntax" | "name";
}

/** The result of analysing an expression. */
export interface Analysis {
  /** Parsed tree (absent on a syntax error). */
  readonly node?: MathNode;
  /** Node ids read: cell names, table names, `table.column` for computed columns. */
  readonly deps: ReadonlySet<string>;
  /** Catalogue formulas called. */
  readonly formulas: ReadonlySet<string>;
  /** Catalogue constants read. */
  readonly constants: ReadonlySet<string>;
  /** First problem, if any. */
  readonly problem?: AnalysisProblem;
}

/** Longest formula a cell may hold, in characters. */
export const MAX_FORMULA_LENGTH = 100_000;

/**
 * Deepest formula tree accepted: operators, brackets, calls, indexes and conversions nested
 * (a sum of n terms nests n deep). Far beyond what a notebook writes; well inside the stack.
 */
export const MAX_FORMULA_DEPTH = 400;

function tooDeep(limit: number): string {
  return `the formula nests too deeply to evaluate (more than ${limit} levels of operators, brackets, calls or conversions); split it into cells`;
}

/**
 * Whether `e` is the engine running out of stack.
 *
 * @example
 * ```ts
 * import { isStackOverflow } from "./_analyse.ts";
 * isStackOverflow(new RangeError("Maximum call stack size exceeded")); // true
 * ```
 */
export function isStackOverflow(e: unknown): boolean {
  return /maximum call stack/i.test((e as Error)?.message ?? "");
}

/** Depth of a formula tree, walked without recursion; stops counting past `limit`. */
function treeDepth(root: MathNode, limit: number): number {
  let max = 0;
  const stack: [MathNode, number][] = [[root, 1]];
  while (stack.length) {
    const [n, d] = stack.pop()!;
    if (d > max) max = d;
    if (max > limit) return max;
    n.forEach((child) => stack.push([child, d + 1]));
  }
  return max;
}

/** Words of the trade written after a number that are not units in formulas. */
const PLAIN_NUMBER_WORDS: ReadonlySet<string> = new Set(["logMAR", "letters"]);

function wordOffset(expression: string, word: string): number {
  const m = new RegExp(`(^|[^A-Za-z0-9_.])${word.replace(/[.$]/g, "\\$&")}(?![A-Za-z0-9_])`).exec(
    expression,
  );
  return m ? m.index + m[1].length : 0;
}

/**
 * Analyse `expression` in `ctx`.
 *
 * @example
 * ```ts ignore
 * const a = analyse("vd + 1 mm", ctx);
 * [...a.deps]; // ["vd"]
 * ```
 */
export function analyse(expression: string, ctx: AnalysisContext): Analysis {
  const read = readFormula(expression, ctx);
  if ("message" in read) {
    return {
      deps: new Set(),
      formulas: new Set(),
      constants: new Set(),
      problem: { message: read.message, offset: read.offset, kind: "syntax" },
    };
  }
  const names = new NameCollector(expression, ctx);
  read.node.traverse((n, path, parent) => names.visit(n, path, parent));
  const { deps, formulas, constants, problem } = names;
  return { node: read.node, deps, formulas, constants, problem };
}

/** The formula's tree, or why it cannot be read (too long, unreadable, too deep). */
function readFormula(
  expression: string,
  ctx: AnalysisContext,
): { node: MathNode } | { message: string; offset: number } {
  const refuse = (message: string, offset = 0) => ({ message, offset });
  if (expression.length > MAX_FORMULA_LENGTH) {
    return refuse(
      `the formula is ${countText(expression.length)} characters long; a cell holds at most ${
        countText(MAX_FORMULA_LENGTH)
      } (keep long data in a table or a CSV file)`,
    );
  }
  let node: MathNode;
  try {
    node = ctx.lang.parse(expression);
  } catch (e) {
    if (isStackOverflow(e)) return refuse(tooDeep(MAX_FORMULA_DEPTH));
    const err = e as ExpressionSyntaxError;
    return refuse(`cannot read the formula: ${err.message}`, err.offset ?? 0);
  }
  // Every later step (analysis, compiling, evaluating, showing) walks the tree by recursion:
  // a tree deeper than this is refused here, at its cell, before any of them can overflow.
  const depth = treeDepth(node, MAX_FORMULA_DEPTH);
  if (depth > MAX_FORMULA_DEPTH) return refuse(tooDeep(MAX_FORMULA_DEPTH));
  return { node };
}

/** Walks a formula's tree: the names it reads, the formulas it calls, its first problem. */
class NameCollector {
  readonly deps: Set<string> = new Set();
  readonly formulas: Set<string> = new Set();
  readonly constants: Set<string> = new Set();
  problem: AnalysisProblem | undefined;
  readonly #rowTable: TableShape | undefined;

  constructor(readonly expression: string, readonly ctx: AnalysisContext) {
    this.#rowTable = ctx.rowTable ? ctx.tables.get(ctx.rowTable) : undefined;
  }

  fail(message: string, word: string, kind: "syntax" | "name" = "name"): void {
    this.problem ??= { message, offset: wordOffset(this.expression, word), kind };
  }

  visit(n: MathNode, path: string, parent: MathNode | null): void {
    switch (n.type) {
      case "BlockNode":
        this.problem ??= {
          message:
            "one formula a cell: `;` separates formulas; write each as its own cell `name = expression`",
          offset: Math.max(0, this.expression.search(/[;\n]/)),
          kind: "syntax",
        };
        return;
      case "AssignmentNode":
      case "FunctionAssignmentNode":
        this.fail(
          "an assignment cannot appear inside a formula; write it as its own cell `name = expression`",
          "=",
          "syntax",
        );
        return;
      case "FunctionNode":
        return this.call(n);
      case "AccessorNode":
        return this.accessor(n);
      case "SymbolNode": {
        const name = (n as unknown as { name: string }).name;
        if (parent?.type === "FunctionNode" && path === "fn") return;
        if (
          parent?.type === "AccessorNode" && path === "object" && this.ctx.tables.has(name) &&
          (parent as unknown as { index: { isObjectProperty(): boolean } }).index.isObjectProperty()
        ) return;
        this.useName(name);
        return;
      }
    }
  }

  /** A call: one of Lentil's formulas, an allowed function, or a problem. */
  call(n: MathNode): void {
    const fnNode = (n as unknown as { fn: MathNode }).fn;
    if (fnNode.type !== "SymbolNode") return;
    const name = (fnNode as unknown as { name: string }).name;
    if (DISABLED_FUNCTIONS.includes(name)) {
      this.fail(`function ${name} is not available in Lentil formulas`, name);
    } else if (this.ctx.lang.catalogue.formulas.has(name)) this.formulas.add(name);
    else if (!this.ctx.lang.isFunction(name)) {
      this.fail(
        `unknown function "${name}": a formula calls Lentil's formulas (lentil formulas) ` +
          `and the arithmetic, rounding, comparison, trigonometry, unit, summary and ` +
          `small-matrix functions listed in the README`,
        name,
      );
    }
  }

  /** `table.column`: the column's dependency, or a problem naming the columns there are. */
  accessor(n: MathNode): void {
    const obj = (n as unknown as { object: MathNode }).object;
    const index =
      (n as unknown as { index: { dimensions: MathNode[]; isObjectProperty(): boolean } })
        .index;
    if (obj.type !== "SymbolNode" || !index.isObjectProperty()) return;
    const t = (obj as unknown as { name: string }).name;
    const shape = this.ctx.tables.get(t);
    if (!shape) return;
    const prop = (index.dimensions[0] as unknown as { value: string }).value;
    if (shape.computed.has(prop)) this.deps.add(`${t}.${prop}`);
    else if (shape.data.has(prop) || shape.open) this.deps.add(t);
    else {
      this.fail(
        `table ${t} has no column "${prop}" (columns: ${
          [...shape.data, ...shape.computed].join(", ") || "none"
        })`,
        `${t}.${prop}`,
      );
    }
  }

  useTable(t: string): void {
    this.deps.add(t);
    for (const c of this.ctx.tables.get(t)!.computed) this.deps.add(`${t}.${c}`);
  }

  /** A bare name: a column of the row's table, a table, a cell, a constant, a unit, or none. */
  useName(name: string): void {
    const { ctx, deps } = this;
    const rowTable = this.#rowTable;
    if (rowTable && ctx.rowTable) {
      if (rowTable.computed.has(name)) return void deps.add(`${ctx.rowTable}.${name}`);
      if (rowTable.data.has(name)) return void deps.add(ctx.rowTable);
    }
    if (ctx.tables.has(name)) return this.useTable(name);
    if (ctx.cells.has(name)) return void deps.add(name);
    if (ctx.lang.catalogue.constants.has(name)) return void this.constants.add(name);
    if (ctx.lang.isBuiltinSymbol(name)) return;
    if (ctx.lang.isUnit(name)) {
      if (USABLE_UNITS.has(name)) return;
      if (rowTable?.open) return void deps.add(ctx.rowTable!);
      return this.fail(
        `"${name}" is not a unit Lentil uses (units: ${LENTIL_UNITS.join(", ")}, ft, inch); ` +
          "if it is a name, define it as a cell",
        name,
      );
    }
    if (rowTable?.open) return void deps.add(ctx.rowTable!);
    if (PLAIN_NUMBER_WORDS.has(name)) {
      return this.fail(
        `"${name}" is not a unit: ${name} values are plain numbers in formulas ` +
          `(write 0.02, not 0.02 ${name}; text such as "0.3 ${name}" is read by acuity)`,
        name,
      );
    }
    this.fail(`unknown name or unit "${name}"`, name);
  }
}
