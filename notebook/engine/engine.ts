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

import type { MathNode } from "mathjs";
import {
  getLanguage,
  type Language,
  LENTIL_UNITS,
  plainMathMessage,
  shownValue,
} from "../../cells/language.ts";
import {
  addColumn,
  type Column,
  makeTable,
  tableInfo,
  type TableValue,
} from "../../cells/table.ts";
import { DEFAULT_DISPLAY, type DisplayOptions } from "../../cells/types.ts";
import { listSources } from "../../shared/sources.ts";
import type { Diagnostic } from "../format/diagnostic.ts";
import {
  type CellDef,
  isLiteral,
  type NotebookDoc,
  parseNotebook,
  type TableBlock,
} from "../format/parse.ts";
import { analyse, type Analysis, isStackOverflow, type TableShape } from "./_analyse.ts";
import { DependencyGraph } from "./graph.ts";
import { argumentNode, argumentOffset, explainFailure } from "./_explain.ts";
import { planColumn } from "./_columns.ts";
import {
  buildTable,
  type BuiltTable,
  type RawTable,
  readCsvTableStreamed,
  readRawTable,
  type TableHost,
  type TableProblem,
} from "./_tables.ts";
import type { ColumnDef } from "../format/parse.ts";

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

interface NodeDef {
  readonly id: string;
  readonly kind: "cell" | "table" | "column";
  readonly name: string;
  readonly table?: string;
  cell?: CellDef;
  readonly block?: TableBlock;
  analysis?: Analysis;
  compiled?: { evaluate(scope: unknown): unknown };
  ownSources: readonly string[];
  ownCaution: boolean;
  /** Error in the definition itself (duplicate, reserved name, table data). */
  defError?: CellError;
  /** Error found by analysing the expression (syntax, unknown name). */
  exprError?: CellError;
  raw?: RawTable;
  built?: { columns: readonly Column[]; excluded: number; file?: string };
  /** How a computed column was last evaluated. */
  columnPath?: { path: "compiled" | "row-wise"; reason?: string };
}

interface NodeState {
  value?: unknown;
  error?: CellError;
  sources: readonly string[];
  caution: boolean;
}

/** Cycles up to this many cells are written out in full at every member. */
const CYCLE_IN_FULL = 12;

const SOURCE_ORDER = new Map(listSources().map((s, i) => [s.id, i]));

function sortSources(ids: Iterable<string>): string[] {
  return [...new Set(ids)].sort((a, b) =>
    (SOURCE_ORDER.get(a) ?? 1e9) - (SOURCE_ORDER.get(b) ?? 1e9)
  );
}

/** A notebook ready to evaluate and to change reactively. */
export class Notebook {
  /** The parsed document. */
  readonly doc: NotebookDoc;
  /** Display options from the front matter. */
  readonly display: DisplayOptions;
  readonly #lang: Language;
  readonly #host: TableHost;
  readonly #preloaded?: ReadonlyMap<string, PreparedTable>;
  readonly #given?: ReadonlyMap<string, unknown>;
  readonly #encoding: ReadonlyMap<number, Diagnostic>;
  readonly #nodes = new Map<string, NodeDef>();
  readonly #state = new Map<string, NodeState>();
  readonly #scope = new Map<string, unknown>();
  readonly #staticDiagnostics: Diagnostic[] = [];
  #graph!: DependencyGraph;
  #cycleOf = new Map<string, readonly string[]>();
  readonly #overBudget?: NotebookOptions["overBudget"];
  readonly #onEvaluate?: NotebookOptions["onEvaluate"];

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
    for (const [id, n] of next.#nodes) {
      const old = previous.#nodes.get(id);
      const state = previous.#state.get(id);
      if (
        !old || !state ||
        previous.#signature(old, !!state.error) !== next.#signature(n, !!state.error)
      ) {
        changed.push(id);
        continue;
      }
      next.#state.set(id, state);
      n.columnPath = old.columnPath;
      if (n.kind !== "column" && ownsName(n) && !state.error) next.#scope.set(n.name, state.value);
    }
    const recomputed = next.#graph.downstream(changed);
    for (const id of recomputed) next.#evaluate(id);
    return { notebook: next, recomputed };
  }

  /** What a node's value depends on besides its dependencies' values (and its place, when it shows an error). */
  #signature(n: NodeDef, withPlace: boolean): string {
    const place = withPlace
      ? [n.cell?.line, n.cell?.exprCol, n.block?.line, n.block?.col, n.raw?.file]
      : [];
    const computed = () =>
      [...this.#nodes.values()]
        .filter((m) => m.kind === "column" && m.table === n.name).map((m) => m.id).sort();
    const table = n.kind === "table"
      ? {
        options: Object.entries(n.block?.options ?? {}).map(([k, o]) => [k, o.value]),
        columns: n.raw?.columns.map((c) => [c.name, c.spec]),
        rows: n.raw?.rows.map((r) => r.cells),
        computed: computed(),
      }
      // A cell whose table result takes computed columns is re-made when they change.
      : n.kind === "cell"
      ? { computed: computed() }
      : undefined;
    return JSON.stringify([
      n.kind,
      n.cell?.expression,
      n.defError?.message,
      n.exprError?.message,
      [...(n.analysis?.deps ?? [])].sort(),
      this.#cycleOf.get(n.id),
      table,
      place,
    ]);
  }

  /** Prepare a parsed notebook; call {@linkcode evaluateAll} to evaluate. */
  constructor(doc: NotebookDoc, options: NotebookOptions = {}) {
    this.doc = doc;
    this.#lang = options.language ?? getLanguage();
    this.#preloaded = options.tables;
    this.#given = options.given;
    this.#overBudget = options.overBudget;
    this.#onEvaluate = options.onEvaluate;
    this.#encoding = new Map((options.encoding ?? []).map((d) => [d.line, d]));
    this.#staticDiagnostics.push(...(options.encoding ?? []));
    this.#host = options.host ?? {
      readText: () => {
        throw new Error("no folder to read table files from");
      },
    };
    this.display = {
      ...DEFAULT_DISPLAY,
      ...(doc.front.powerStep ? { powerStep: doc.front.powerStep } : {}),
    };
    for (const [k, v] of Object.entries(this.#lang.constants)) this.#scope.set(k, v);
    this.#define();
    this.#analyseAll();
  }

  /**
   * The language the notebook evaluates in.
   * @ignore
   */
  get language(): Language {
    return this.#lang;
  }

  #define(): void {
    const file = this.doc.file;
    const at = (kind: ErrorKind, message: string, line: number, col: number): CellError => ({
      kind,
      message,
      file,
      line,
      col,
    });
    const reservedMessage = (name: string, what: string) =>
      `"${name}" is a unit, function or constant of the language; choose another ${what}`;
    const taken = new Set<string>();
    const reserved = (name: string) =>
      LENTIL_UNITS.includes(name) || this.#lang.isFunction(name) ||
      this.#lang.catalogue.constants.has(name) || this.#lang.isBuiltinSymbol(name);
    for (const block of this.doc.tables) {
      const id = taken.has(block.name) ? `${block.name}@${block.line}` : block.name;
      taken.add(block.name);
      const node: NodeDef = {
        id,
        kind: "table",
        name: block.name,
        block,
        ownSources: [],
        ownCaution: false,
      };
      if (id !== block.name) {
        node.defError = at("duplicate", `duplicate name "${block.name}"`, block.line, block.col);
      } else if (this.#badBytes(block.line, tableEnd(block))) {
        node.defError = this.#badBytes(block.line, tableEnd(block));
      } else if (reserved(block.name)) {
        node.defError = at(
          "name",
          reservedMessage(block.name, "table name"),
          block.line,
          block.col,
        );
      }
      this.#loadTable(node);
      this.#nodes.set(id, node);
    }
    for (const cell of this.doc.cells) {
      const full = cell.table ? `${cell.table}.${cell.name}` : cell.name;
      const dup = taken.has(full);
      const id = dup ? `${full}@${cell.line}` : full;
      taken.add(full);
      const node: NodeDef = {
        id,
        kind: cell.table ? "column" : "cell",
        name: cell.name,
        table: cell.table,
        cell,
        ownSources: [],
        ownCaution: false,
      };
      if (dup) {
        node.defError = at("duplicate", `duplicate name "${full}"`, cell.line, cell.col);
      } else if (this.#badBytes(cell.line, cell.line)) {
        node.defError = this.#badBytes(cell.line, cell.line);
      } else if (!cell.table && reserved(cell.name)) {
        node.defError = at("name", reservedMessage(cell.name, "name"), cell.line, cell.col);
      } else if (
        cell.table && !this.doc.tables.some((t) => t.name === cell.table) &&
        !this.doc.cells.some((c) => !c.table && c.name === cell.table)
      ) {
        node.defError = at(
          "name",
          `no table named "${cell.table}" for computed column ${full}`,
          cell.line,
          cell.col,
        );
      }
      this.#nodes.set(id, node);
    }
  }

  /** The encoding error on the first line from `from` to `to` whose bytes are not UTF-8. */
  #badBytes(from: number, to: number): CellError | undefined {
    for (const [line, d] of this.#encoding) {
      if (line >= from && line <= to) {
        return { kind: "syntax", message: d.message, file: d.file, line: d.line, col: d.col };
      }
    }
    return undefined;
  }

  #loadTable(node: NodeDef): void {
    const block = node.block!;
    const skip = (block.options["bad rows"]?.value ?? "stop").toLowerCase();
    if (!["stop", "skip"].includes(skip)) {
      const o = block.options["bad rows"]!;
      this.#staticDiagnostics.push({
        file: this.doc.file,
        line: o.line,
        col: o.col,
        message: `bad rows: expected "stop" (the default) or "skip", got "${o.value}"`,
        severity: "error",
      });
    }
    let problems: TableProblem[] = [];
    let built: BuiltTable | undefined;
    const pre = node.id === block.name ? this.#preloaded?.get(block.name) : undefined;
    if (pre) {
      node.raw = { columns: pre.columns, rows: [], file: block.options.file!.value, headerLine: 1 };
      if (pre.problem) problems = [pre.problem];
      else built = pre.built;
    } else {
      const r = readRawTable(block, this.doc.file, this.#host);
      node.raw = r.raw;
      if (r.problem) problems = r.problems ?? [r.problem];
      else {
        built = buildTable(block.name, r.raw!, this.#lang, skip === "skip", {
          file: block.options.file?.value,
          where: { file: this.doc.file, line: block.line, col: block.col },
        });
      }
    }
    if (problems.length) {
      const problem = problems[0];
      node.defError ??= {
        kind: "data",
        message: problem.message,
        file: problem.file,
        line: problem.line,
        col: problem.col,
      };
      for (const p of problems) this.#staticDiagnostics.push({ ...p, severity: "error" });
      return;
    }
    const report = (
      p: { file: string; line: number; col: number; message: string },
      severity: "error" | "warning",
    ) => this.#staticDiagnostics.push({ ...positioned(p), severity });
    for (const p of built!.problems) report(p, built!.value ? "warning" : "error");
    for (const p of built!.notes) report(p, "warning");
    if (!built!.value) {
      const first = built!.problems[0];
      const more = built!.problems.length > 1
        ? ` (and ${built!.problems.length - 1} more problem${
          built!.problems.length === 2 ? "" : "s"
        })`
        : "";
      const row = first.row !== undefined ? `row ${first.row + 1}: ` : "";
      node.defError ??= {
        kind: "data",
        message: `table ${block.name}: ${row}${first.message}${more}`,
        file: first.file,
        line: first.line,
        col: first.col,
      };
      return;
    }
    const info = tableInfo(built!.value)!;
    node.built = { columns: info.columns, excluded: built!.excluded, file: info.file };
  }

  #shapes(): Map<string, TableShape> {
    const shapes = new Map<string, TableShape>();
    for (const n of this.#nodes.values()) {
      if (n.kind !== "table" || !ownsName(n)) continue;
      shapes.set(n.name, {
        data: new Set(n.raw?.columns.map((c) => c.name) ?? []),
        computed: new Set(),
        // A table that could not be read has no columns to check names against: a formula
        // using it depends on it, and so shows the table's own error, not "no column".
        ...(n.defError && n.defError.kind !== "duplicate" ? { open: true } : {}),
      });
    }
    // A cell with computed columns is a table a formula returns: its columns are known
    // when it is evaluated.
    for (const n of this.#nodes.values()) {
      if (n.kind !== "column" || shapes.has(n.table!)) continue;
      const cell = this.#nodes.get(n.table!);
      if (cell?.kind === "cell" && ownsName(cell)) {
        shapes.set(n.table!, { data: new Set(), computed: new Set(), open: true });
      }
    }
    for (const n of this.#nodes.values()) {
      if (n.kind === "column" && n.id === `${n.table}.${n.name}` && shapes.has(n.table!)) {
        (shapes.get(n.table!)!.computed as Set<string>).add(n.name);
      }
    }
    return shapes;
  }

  #analyseAll(): void {
    const shapes = this.#shapes();
    const cells = new Set<string>();
    for (const n of this.#nodes.values()) {
      if (n.kind === "cell" && ownsName(n)) cells.add(n.name);
    }
    for (const n of this.#nodes.values()) this.#analyseNode(n, shapes, cells);
    this.#rebuildGraph();
  }

  #analyseNode(n: NodeDef, shapes: Map<string, TableShape>, cells: Set<string>): void {
    n.exprError = undefined;
    if (!n.cell || n.defError) return;
    const cell = n.cell;
    const a = analyse(cell.expression, {
      lang: this.#lang,
      cells,
      tables: shapes,
      rowTable: n.table,
    });
    // A table that could not be read has no columns to see: its computed columns show the
    // table's error (as a dependency), not "unknown name" for every column they use.
    const table = n.table ? this.#nodes.get(n.table) : undefined;
    const tableFailed = table?.kind === "table" && !!table.defError;
    if (n.table && (shapes.has(n.table) || tableFailed)) {
      const deps = new Set(a.deps);
      deps.add(n.table);
      n.analysis = { ...a, deps };
    } else n.analysis = a;
    n.compiled = undefined;
    if (a.problem && !(tableFailed && a.problem.kind === "name")) {
      n.exprError = {
        kind: a.problem.kind,
        message: a.problem.message,
        file: this.doc.file,
        line: cell.line,
        col: cell.exprCol + a.problem.offset,
      };
    } else if (a.node) {
      try {
        n.compiled = this.#lang.compile(a.node as MathNode);
      } catch (e) {
        // A formula the language cannot prepare is this cell's error, never the notebook's.
        n.exprError = {
          kind: "syntax",
          message: isStackOverflow(e)
            ? "the formula nests too deeply to evaluate; split it into cells"
            : `cannot prepare the formula: ${
              plainMathMessage((e as Error).message).replace(
                /^Function (\w+) missing in provided namespace "math"$/,
                'function "$1" is not available in Lentil formulas',
              )
            }`,
          file: this.doc.file,
          line: cell.line,
          col: cell.exprCol,
        };
      }
    }
    const srcs: string[] = [];
    let caution = false;
    for (const f of a.formulas) {
      const spec = this.#lang.catalogue.formulas.get(f)!;
      srcs.push(...spec.sources);
      caution ||= !!spec.caution;
    }
    for (const c of a.constants) srcs.push(this.#lang.catalogue.constants.get(c)!.source);
    n.ownSources = sortSources(srcs);
    n.ownCaution = caution;
  }

  #rebuildGraph(): void {
    const deps = new Map<string, string[]>();
    for (const n of this.#nodes.values()) deps.set(n.id, [...(n.analysis?.deps ?? [])]);
    this.#graph = new DependencyGraph(deps);
    this.#cycleOf = new Map();
    for (const cyc of this.#graph.cycles) for (const id of cyc) this.#cycleOf.set(id, cyc);
  }

  /** Evaluate every node; returns the ids evaluated, in order. */
  evaluateAll(): string[] {
    const order = this.#graph.order;
    for (const id of order) this.#evaluate(id);
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
    const n = this.#nodes.get(id);
    if (!n?.cell) throw new Error(`no cell named "${id}" to change`);
    const before = [...(n.analysis?.deps ?? [])].sort().join("\n");
    n.cell = { ...n.cell, expression, input: !n.table && isLiteral(expression) };
    const cells = new Set<string>();
    for (const m of this.#nodes.values()) {
      if (m.kind === "cell" && ownsName(m)) cells.add(m.name);
    }
    this.#analyseNode(n, this.#shapes(), cells);
    const after = [...(n.analysis?.deps ?? [])].sort().join("\n");
    const wasCycle = this.#cycleOf.has(id);
    if (before !== after || wasCycle) this.#rebuildGraph();
    const touched = new Set([id, ...(wasCycle ? this.#cycleOfIds() : [])]);
    const dirty = this.#graph.downstream(touched);
    for (const d of dirty) this.#evaluate(d);
    return dirty;
  }

  #cycleOfIds(): string[] {
    return [...this.#cycleOf.keys()];
  }

  #evaluate(id: string): void {
    const n = this.#nodes.get(id)!;
    const file = this.doc.file;
    const where = n.cell
      ? { line: n.cell.line, col: n.cell.exprCol }
      : { line: n.block!.line, col: n.block!.col };
    const deps = n.analysis?.deps ?? new Set<string>();
    let sources: string[] = [...n.ownSources];
    let caution = n.ownCaution;
    for (const d of deps) {
      const s = this.#state.get(d);
      if (s) {
        sources = sources.concat(s.sources);
        caution ||= s.caution;
      }
    }
    const set = (st: Omit<NodeState, "sources" | "caution">) => {
      const state = { ...st, sources: sortSources(sources), caution };
      this.#state.set(id, state);
      if (n.kind !== "column" && ownsName(n)) {
        if (state.error) this.#scope.delete(n.name);
        else this.#scope.set(n.name, state.value);
      }
    };
    const cyc = this.#cycleOf.get(id);
    if (cyc) {
      return set({
        error: { kind: "cycle", message: this.#cycleMessage(id, cyc), file, ...where },
      });
    }
    const staticError = n.defError ?? n.exprError;
    if (staticError) return set({ error: staticError });
    for (const d of deps) {
      const s = this.#state.get(d);
      if (s?.error) {
        const root = s.error.kind === "dependency" && s.error.cause
          ? s.error.cause
          : { id: d, error: s.error };
        return set({
          error: {
            kind: "dependency",
            message:
              `depends on ${d}, which has an error: ${root.error.message} (${root.id} at ${root.error.file}:${root.error.line}:${root.error.col})`,
            file,
            ...where,
            cause: root,
          },
        });
      }
    }
    const over = this.#overBudget?.get(id);
    if (over && n.cell && over.expression === n.cell.expression) {
      return set({ error: { kind: "evaluation", message: over.message, file, ...where } });
    }
    this.#onEvaluate?.(id, n.cell?.expression);
    try {
      if (n.kind !== "table" && this.#given?.has(id)) {
        const value = this.#given.get(id);
        if (value instanceof Error) throw value;
        if (n.kind === "column") {
          addColumn(this.#scope.get(n.table!) as TableValue, value as Column);
        }
        return set({ value });
      }
      if (n.kind === "table") {
        const b = n.built!;
        const o = n.block?.options;
        set({
          value: makeTable(n.name, b.columns, {
            excluded: b.excluded,
            file: b.file,
            subject: o?.subject?.value,
            eye: o?.eye?.value,
          }),
        });
      } else if (n.kind === "column") {
        const table = this.#scope.get(n.table!) as TableValue;
        if (!tableInfo(table)) {
          return set({
            error: {
              kind: "name",
              message: `${n.table} is ${
                shownValue(table)
              }, not a table: computed columns belong to tables`,
              file,
              ...where,
            },
          });
        }
        const column = this.#evaluateColumn(n, table);
        addColumn(table, column);
        set({ value: column });
      } else {
        const value = n.compiled!.evaluate(this.#scope);
        const q = typeof value === "number" ? { value } : this.#lang.quantityParts(value);
        if ((value as { isComplex?: boolean } | null)?.isComplex) {
          return set({
            error: {
              kind: "evaluation",
              message: "the result is not a real number (the square root of a negative value?)",
              file,
              ...where,
            },
          });
        }
        if (q && !Number.isFinite(q.value)) {
          return set({
            error: {
              kind: "evaluation",
              message: `the result is ${
                Number.isNaN(q.value) ? "not a number" : "infinite"
              } (a division by zero, or a value out of range?)`,
              file,
              ...where,
            },
          });
        }
        // A table a formula returns takes the cell's name (a copy, so computed columns
        // added to it never change the table it came from).
        const info = tableInfo(value);
        if (info) {
          return set({
            value: makeTable(n.name, info.columns, { excluded: info.excluded, file: info.file }),
          });
        }
        set({ value });
      }
    } catch (e) {
      set({ error: this.#explain(e as Error, n, where) });
    }
  }

  #evaluateColumn(n: NodeDef, table: TableValue): Column {
    const info = tableInfo(table)!;
    const cols = info.columns.filter((c) => c.name !== n.name);
    const plan = planColumn(
      n.name,
      n.analysis!.node as MathNode,
      n.compiled!,
      cols,
      this.#scope,
      this.#lang,
    );
    const { column, path } = plan.run(cols, info.rowCount);
    n.columnPath = { path, reason: plan.reason };
    return column;
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
    return this.#nodes.get(id)?.columnPath;
  }

  #explain(e: Error, n: NodeDef, where: { line: number; col: number }): CellError {
    const file = this.doc.file;
    let message = plainMathMessage(e.message);
    let kind: ErrorKind = "evaluation";
    let at = where;
    const undefinedSymbol = /^(?:row \d+: )?Undefined symbol (\S+)/.exec(e.message);
    if (isStackOverflow(e)) {
      message =
        "the formula nests too deeply to evaluate (the values it builds are too deep); split it into cells";
    } else if (
      e.name === "LentilRangeError" || e instanceof RangeError ||
      /outside the accepted range/.test(message)
    ) {
      kind = "range";
    } else if (
      e.name === "FormulaArgumentError" || e.name === "LentilParseError" ||
      e.name === "LentilInputError"
    ) {
      kind = "argument";
      // Point at the argument to blame, when the call can be found in the formula.
      const blame = e as { formula?: string; argument?: number | string };
      const node = n.analysis?.node as MathNode | undefined;
      if (node && n.cell && blame.formula && blame.argument !== undefined) {
        const offset = argumentOffset(node, n.cell.expression, blame.formula, blame.argument);
        if (offset !== undefined) at = { line: n.cell.line, col: n.cell.exprCol + offset };
        // A column without a unit given where a quantity is needed: the fix is in the header.
        const arg = typeof blame.argument === "number"
          ? argumentNode(node, blame.formula, blame.argument)
          : undefined;
        const unit = / needs a unit, e\.g\. \S+ (\S+)$/.exec(message)?.[1];
        if (n.kind === "column" && arg?.type === "SymbolNode" && unit) {
          const name = (arg as unknown as { name: string }).name;
          const col = tableInfo(this.#scope.get(n.table!))?.columns.find((c) => c.name === name);
          if (col && !col.unit) {
            message += `; column ${name} of table ${n.table} has no unit: ` +
              `declare it in the header, ${name} [${unit}]`;
          }
        }
      }
    } else if (e.name === "PartError") {
      kind = "name";
    } else if (n.kind === "column" && undefinedSymbol) {
      kind = "name";
      const info = tableInfo(this.#scope.get(n.table!));
      message = `table ${n.table} has no column "${undefinedSymbol[1]}" and no cell has that name` +
        (info ? ` (columns: ${info.columns.map((c) => c.name).join(", ")})` : "");
    } else {
      // The expression library refused an operation: find which, and say it in our words.
      const node = n.analysis?.node as MathNode | undefined;
      const found = node && n.kind === "cell"
        ? explainFailure(node, this.#scope, this.#lang, this.display, n.cell?.expression ?? "")
        : undefined;
      if (found) {
        message = found.message;
        if (found.unit) kind = "unit";
        if (found.offset !== undefined && n.cell) {
          at = { line: n.cell.line, col: n.cell.exprCol + found.offset };
        }
      } else if (/Units do not match|Unexpected type of argument.*Unit/.test(e.message)) {
        kind = "unit";
        message = `units do not match in ${n.cell?.expression ?? "the formula"}`;
      }
    }
    return { kind, message, file, ...at };
  }

  /**
   * A cycle's message: the whole path with every member's line for a short cycle; for a
   * long one the path is written once, at its first member, and every other member names
   * it (so the output grows with the cycle's length, not its square).
   */
  #cycleMessage(id: string, cyc: readonly string[]): string {
    if (cyc.length <= CYCLE_IN_FULL || id === cyc[0]) {
      const path = [...cyc, cyc[0]].join(" → ");
      const lines = cyc.map((m) => `${m} at line ${this.#lineOf(m)}`).join(", ");
      return `cycle: ${path} (${lines})`;
    }
    return `cycle: ${id} is one of the ${cyc.length} cells of the cycle through ${cyc[0]} (line ${
      this.#lineOf(cyc[0])
    }), where its whole path is shown`;
  }

  #lineOf(id: string): number {
    const n = this.#nodes.get(id);
    return n?.cell?.line ?? n?.block?.line ?? 0;
  }

  /**
   * Whether any cell calls a formula whose result could be used to make or fit a lens,
   * known from the formulas alone, before (or without) evaluation.
   */
  get callsCautionFormulas(): boolean {
    return [...this.#nodes.values()].some((n) => n.ownCaution);
  }

  /** The result of one node by id, or undefined. */
  result(id: string): CellResult | undefined {
    const n = this.#nodes.get(id);
    if (!n) return undefined;
    const s = this.#state.get(id) ?? { sources: [], caution: false };
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
    return [...this.#nodes.values()]
      .sort((a, b) => (a.cell?.line ?? a.block!.line) - (b.cell?.line ?? b.block!.line))
      .map((n) => this.result(n.id)!);
  }

  /** The current value of a node (undefined on error). */
  value(id: string): unknown {
    const s = this.#state.get(id);
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
    for (const d of this.#staticDiagnostics) push(d);
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
    return this.#graph;
  }
}

/**
 * True when a cell or table node is the one that answers to its name in formulas: not a
 * duplicate, and not named like a unit, function or constant (those keep their meaning, so
 * `x = 1 mm` still reads millimetres when a cell is wrongly named `mm`).
 */
function tableEnd(block: TableBlock): number {
  let end = block.headerLine;
  for (const r of block.rows) if (r.line > end) end = r.line;
  return end;
}

/** The position and message of a table problem, without its row. */
function positioned(p: { file: string; line: number; col: number; message: string }) {
  return { file: p.file, line: p.line, col: p.col, message: p.message };
}

function ownsName(n: NodeDef): boolean {
  return n.id === n.name && n.defError?.kind !== "name";
}
