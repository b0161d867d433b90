/**
 * The reactive cell engine: a parsed notebook becomes a dependency graph of cells, tables
 * and computed columns, evaluated in topological order. Changing one cell recomputes only
 * what is downstream of it (`update` returns that set). Cycles are reported with their
 * path and every member's line; an error in one cell becomes an error value carried to its
 * dependents with the original cause and position, and unrelated cells still evaluate.
 * Every result lists, transitively, the sources of the formulas and constants it used.
 *
 * @example
 * ```ts
 * import { Notebook } from "./engine.ts";
 * const nb = Notebook.fromText("~~~lentil\nF = -10 D\ncl = vertexPower(F, 12 mm)\n~~~\n", "a.lentil.md");
 * nb.result("cl")?.sources; // ["vertex-formula"]
 * nb.update("F", "+10 D"); // ["F", "cl"]
 * ```
 *
 * @module
 */

import { getLanguage, type Language } from "../../cells/language.ts";
import { DEFAULT_DISPLAY, type DisplayOptions } from "../../cells/types.ts";
import type { Diagnostic } from "../format/diagnostic.ts";
import { isLiteral, type NotebookDoc, parseNotebook } from "../format/parse.ts";
import type { ColumnDef } from "../format/parse.ts";
import { DependencyGraph } from "./graph.ts";
import { defineNodes, tableShapes } from "./_define.ts";
import { evaluateNode } from "./_evaluate.ts";
import { analyseNode } from "./_prepare.ts";
import { cellNames, type EngineState, nodeSignature, ownsName } from "./_state.ts";
import {
  type BuiltTable,
  readCsvTableStreamed,
  type TableHost,
  type TableProblem,
} from "./_tables.ts";

/** Why a node has no value. */
export type ErrorKind =
  | "syntax"
  | "name"
  | "duplicate"
  | "cycle"
  | "data"
  | "unit"
  | "range"
  | "argument"
  | "evaluation"
  | "dependency";

/** An error value: the message, where it arose, and for a dependency error the root cause. */
export interface CellError {
  /** Kind of error. */
  readonly kind: ErrorKind;
  /** What is wrong, for the user. */
  readonly message: string;
  /** File of the position. */
  readonly file: string;
  /** 1-based line. */
  readonly line: number;
  /** 1-based column. */
  readonly col: number;
  /** For `dependency`: the node where the error began, and its own error. */
  readonly cause?: { readonly id: string; readonly error: CellError };
}

/** One evaluated node as consumers see it. */
export interface CellResult {
  /** Node id: a cell name, a table name, or `table.column`. */
  readonly id: string;
  /** The name as written (column name for a computed column). */
  readonly name: string;
  /** What kind of node. */
  readonly kind: "cell" | "table" | "column";
  /** For a computed column, its table. */
  readonly table?: string;
  /** The value, absent on error. */
  readonly value?: unknown;
  /** The error, if any. */
  readonly error?: CellError;
  /** Source ids used, transitively, in registry order. */
  readonly sources: readonly string[];
  /** True when the result could be used to make or fit a lens. */
  readonly caution: boolean;
  /** 1-based line and column of the definition. */
  readonly line: number;
  /** 1-based column of the definition. */
  readonly col: number;
  /** The expression as written (cells and columns). */
  readonly expression?: string;
  /** The note after `#`, if any. */
  readonly note?: string;
  /** True for an input: a cell whose expression is a literal. */
  readonly input: boolean;
  /** Node ids this one reads. */
  readonly deps: readonly string[];
}

/** Options for building a notebook. */
export interface NotebookOptions {
  /** Reads CSV files beside the notebook (default: none, so `file:` tables fail). */
  readonly host?: TableHost;
  /**
   * Language instance (default: the shared one).
   * @ignore
   */
  readonly language?: Language;
  /**
   * CSV tables already read (by {@linkcode Notebook.load}), by table name.
   * @ignore
   */
  readonly tables?: ReadonlyMap<string, PreparedTable>;
  /**
   * Lines whose bytes are not UTF-8 (from `decodeNotebookLenient`): reported, and a cell or
   * table on such a line is an error rather than a value read from replaced characters.
   */
  readonly encoding?: readonly Diagnostic[];
  /**
   * Values computed outside the engine (by a database reading a large table), by node id:
   * those cells and computed columns take the value given instead of being evaluated.
   * @ignore
   */
  readonly given?: ReadonlyMap<string, unknown>;
  /**
   * Cells found to exceed the evaluation budget (by id, with the expression that did and
   * the reason): such a cell is an error and is not evaluated while its expression stays.
   */
  readonly overBudget?: ReadonlyMap<
    string,
    { readonly expression: string; readonly message: string }
  >;
  /** Called before each node is evaluated (a watchdog learns which cell is computing). */
  readonly onEvaluate?: (id: string, expression: string | undefined) => void;
}

/**
 * A CSV table read before the notebook is built.
 * @ignore
 */
export interface PreparedTable {
  /** Header columns. */
  readonly columns: readonly ColumnDef[];
  /** The converted table, when the file could be read. */
  readonly built?: BuiltTable;
  /** Why the file could not be read. */
  readonly problem?: TableProblem;
}

/** A notebook ready to evaluate and to change reactively. */
export class Notebook {
  /** The parsed document. */
  readonly doc: NotebookDoc;
  /** Display options from the front matter. */
  readonly display: DisplayOptions;
  readonly #s: EngineState;

  /**
   * Parse and prepare a notebook from text, and evaluate it.
   *
   * @example
   * ```ts
   * import { Notebook } from "./engine.ts";
   * Notebook.fromText("~~~lentil\nx = 2 mm\n~~~\n", "x.lentil.md").result("x")?.value !== undefined; // true
   * ```
   */
  static fromText(text: string, file: string, options: NotebookOptions = {}): Notebook {
    const nb = new Notebook(parseNotebook(text, file), options);
    nb.evaluateAll();
    return nb;
  }

  /**
   * Parse a notebook, stream its CSV tables through csv-parse (through `host.open`, never
   * holding a file as text), and evaluate it.
   *
   * @example
   * ```ts ignore
   * const nb = await Notebook.load(text, "study.lentil.md", { host });
   * ```
   */
  static async load(text: string, file: string, options: NotebookOptions = {}): Promise<Notebook> {
    const doc = parseNotebook(text, file);
    const lang = options.language ?? getLanguage();
    const tables = new Map<string, PreparedTable>(options.tables ?? []);
    const host = options.host;
    if (host?.open) {
      const seen = new Set<string>();
      for (const block of doc.tables) {
        if (seen.has(block.name) || !block.options.file || tables.has(block.name)) continue;
        seen.add(block.name);
        tables.set(block.name, await readCsvTableStreamed(block, file, host, lang));
      }
    }
    const nb = new Notebook(doc, { ...options, tables });
    nb.evaluateAll();
    return nb;
  }

  /**
   * The notebook for a new version of `previous`'s document, re-evaluating only what
   * changed: nodes that are new, whose definition changed (expression, table data, options,
   * computed columns) or that carry an error whose position moved, and everything that
   * depends on them. Every other node keeps its value. Returns the new notebook and the ids
   * recomputed, in evaluation order.
   *
   * @example
   * ```ts
   * import { Notebook } from "./engine.ts";
   * import { parseNotebook } from "../format/parse.ts";
   * const a = Notebook.fromText("~~~lentil\nx = 1\ny = x + 1\nz = 5\n~~~\n", "r.lentil.md");
   * const doc = parseNotebook("~~~lentil\nx = 2\ny = x + 1\nz = 5\n~~~\n", "r.lentil.md");
   * Notebook.reconcile(a, doc).recomputed; // ["x", "y"]
   * ```
   */
  static reconcile(
    previous: Notebook,
    doc: NotebookDoc,
    options: NotebookOptions = {},
  ): { notebook: Notebook; recomputed: string[] } {
    const next = new Notebook(doc, options);
    const changed: string[] = [];
    const [p, s] = [previous.#s, next.#s];
    for (const [id, n] of s.nodes) {
      const old = p.nodes.get(id);
      const state = p.state.get(id);
      if (
        !old || !state ||
        nodeSignature(p, old, !!state.error) !== nodeSignature(s, n, !!state.error)
      ) {
        changed.push(id);
        continue;
      }
      s.state.set(id, state);
      n.columnPath = old.columnPath;
      if (n.kind !== "column" && ownsName(n) && !state.error) s.scope.set(n.name, state.value);
    }
    const recomputed = s.graph.downstream(changed);
    for (const id of recomputed) evaluateNode(s, id);
    return { notebook: next, recomputed };
  }

  /** Prepare a parsed notebook; call {@linkcode evaluateAll} to evaluate. */
  constructor(doc: NotebookDoc, options: NotebookOptions = {}) {
    this.doc = doc;
    this.display = {
      ...DEFAULT_DISPLAY,
      ...(doc.front.powerStep ? { powerStep: doc.front.powerStep } : {}),
    };
    const lang = options.language ?? getLanguage();
    this.#s = {
      doc,
      lang,
      display: this.display,
      host: options.host ?? {
        readText: () => {
          throw new Error("no folder to read table files from");
        },
      },
      preloaded: options.tables,
      given: options.given,
      encoding: new Map((options.encoding ?? []).map((d) => [d.line, d])),
      overBudget: options.overBudget,
      onEvaluate: options.onEvaluate,
      nodes: new Map(),
      state: new Map(),
      scope: new Map(Object.entries(lang.constants)),
      staticDiagnostics: [...(options.encoding ?? [])],
      graph: new DependencyGraph(new Map()),
      cycleOf: new Map(),
    };
    defineNodes(this.#s);
    this.#analyseAll();
  }

  /**
   * The language the notebook evaluates in.
   * @ignore
   */
  get language(): Language {
    return this.#s.lang;
  }

  #analyseAll(): void {
    const s = this.#s;
    const shapes = tableShapes(s);
    const cells = cellNames(s);
    for (const n of s.nodes.values()) analyseNode(s, n, shapes, cells);
    this.#rebuildGraph();
  }

  #rebuildGraph(): void {
    const s = this.#s;
    const deps = new Map<string, string[]>();
    for (const n of s.nodes.values()) deps.set(n.id, [...(n.analysis?.deps ?? [])]);
    s.graph = new DependencyGraph(deps);
    s.cycleOf = new Map();
    for (const cyc of s.graph.cycles) for (const id of cyc) s.cycleOf.set(id, cyc);
  }

  /** Evaluate every node; returns the ids evaluated, in order. */
  evaluateAll(): string[] {
    const order = this.#s.graph.order;
    for (const id of order) evaluateNode(this.#s, id);
    return [...order];
  }

  /**
   * Change the expression of a cell (or computed column) and recompute what depends on it.
   * Returns the ids recomputed, in evaluation order.
   *
   * @example
   * ```ts
   * import { Notebook } from "./engine.ts";
   * const nb = Notebook.fromText("~~~lentil\na = 1\nb = a + 1\nc = 5\n~~~\n", "x.lentil.md");
   * nb.update("a", "2"); // ["a", "b"]
   * ```
   * @throws {Error} when no cell has that id.
   */
  update(id: string, expression: string): string[] {
    const s = this.#s;
    const n = s.nodes.get(id);
    if (!n?.cell) throw new Error(`no cell named "${id}" to change`);
    const before = [...(n.analysis?.deps ?? [])].sort().join("\n");
    n.cell = { ...n.cell, expression, input: !n.table && isLiteral(expression) };
    analyseNode(s, n, tableShapes(s), cellNames(s));
    const after = [...(n.analysis?.deps ?? [])].sort().join("\n");
    const wasCycle = s.cycleOf.has(id);
    if (before !== after || wasCycle) this.#rebuildGraph();
    const touched = new Set([id, ...(wasCycle ? s.cycleOf.keys() : [])]);
    const dirty = s.graph.downstream(touched);
    for (const d of dirty) evaluateNode(s, d);
    return dirty;
  }

  /**
   * How a computed column was last evaluated: `"compiled"` (a loop over column arrays) or
   * `"row-wise"` (through the formula language), with the reason it did not compile.
   *
   * @example
   * ```ts
   * import { Notebook } from "./engine.ts";
   * const nb = Notebook.fromText("~~~lentil table t\nx [D]\n1\n~~~\n~~~lentil\nt.y = x * 2\n~~~\n", "a.lentil.md");
   * nb.columnPath("t.y")?.path; // "compiled"
   * ```
   */
  columnPath(id: string): { path: "compiled" | "row-wise"; reason?: string } | undefined {
    return this.#s.nodes.get(id)?.columnPath;
  }

  /**
   * Whether any cell calls a formula whose result could be used to make or fit a lens,
   * known from the formulas alone, before (or without) evaluation.
   */
  get callsCautionFormulas(): boolean {
    return [...this.#s.nodes.values()].some((n) => n.ownCaution);
  }

  /** The result of one node by id, or undefined. */
  result(id: string): CellResult | undefined {
    const n = this.#s.nodes.get(id);
    if (!n) return undefined;
    const s = this.#s.state.get(id) ?? { sources: [], caution: false };
    return {
      id,
      name: n.name,
      kind: n.kind,
      table: n.table,
      value: s.error ? undefined : s.value,
      error: s.error,
      sources: s.sources,
      caution: s.caution,
      line: n.cell?.line ?? n.block!.line,
      col: n.cell?.col ?? n.block!.col,
      expression: n.cell?.expression,
      note: n.cell?.note,
      input: n.cell?.input ?? false,
      deps: [...(n.analysis?.deps ?? [])],
    };
  }

  /** Every node's result, in document order (tables at their block). */
  results(): CellResult[] {
    return [...this.#s.nodes.values()]
      .sort((a, b) => (a.cell?.line ?? a.block!.line) - (b.cell?.line ?? b.block!.line))
      .map((n) => this.result(n.id)!);
  }

  /** The current value of a node (undefined on error). */
  value(id: string): unknown {
    const s = this.#s.state.get(id);
    return s?.error ? undefined : s?.value;
  }

  /**
   * Every problem: parse diagnostics, table data problems, and each error that began in a
   * node (errors only carried from a dependency are not repeated).
   */
  diagnostics(): Diagnostic[] {
    const out: Diagnostic[] = [];
    const seen = new Set<string>();
    const push = (d: Diagnostic) => {
      const key = `${d.file}:${d.line}:${d.col}:${d.message}`;
      if (seen.has(key)) return;
      seen.add(key);
      out.push(d);
    };
    for (const d of this.doc.diagnostics) push(d);
    for (const d of this.#s.staticDiagnostics) push(d);
    for (const r of this.results()) {
      const e = r.error;
      if (!e || e.kind === "dependency") continue;
      if (e.kind === "duplicate") continue; // the parser reported it
      if (e.kind === "data" && r.kind === "table") continue; // reported row by row
      push({ file: e.file, line: e.line, col: e.col, message: e.message, severity: "error" });
    }
    return out.sort((
      a,
      b,
    ) => (a.file === b.file ? a.line - b.line || a.col - b.col : a.file < b.file ? -1 : 1));
  }

  /**
   * The dependency graph (for tests and tools).
   * @ignore
   */
  get graph(): DependencyGraph {
    return this.#s.graph;
  }
}
