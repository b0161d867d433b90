/**
 * The engine's inner state, shared by its parts: each node's definition (a cell, a table or
 * a computed column, with its analysis) and its evaluated state, the scope formulas read,
 * and the cycles found.
 *
 * @module
 */

import type { Column, TableValue } from "../../cells/table.ts";
import type { Language } from "../../cells/language.ts";
import type { DisplayOptions } from "../../cells/types.ts";
import { listSources } from "../../shared/sources.ts";
import type { Diagnostic } from "../format/diagnostic.ts";
import type { CellDef, NotebookDoc, TableBlock } from "../format/parse.ts";
import type { Analysis } from "./_analyse.ts";
import type { RawTable, TableHost } from "./_tables.ts";
import type { DependencyGraph } from "./graph.ts";
import type { CellError, NotebookOptions, PreparedTable } from "./engine.ts";

/** One node's definition: what was written, and what analysis made of it. */
export interface NodeDef {
  readonly id: string;
  readonly kind: "cell" | "table" | "column";
  readonly name: string;
  readonly table?: string;
  cell?: CellDef;
  readonly block?: TableBlock;
  analysis?: Analysis;
  compiled?: { evaluate(scope: unknown): unknown };
  /** Sources of the formulas and constants it calls, known before evaluation. */
  ownSources: readonly string[];
  /**
   * Every source of the formulas it calls that narrow their citations from their values
   * (`cites`): a cell cites what its calls narrowed to, anything else cites these.
   */
  narrowingSources?: readonly string[];
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

/** One node's evaluated state. */
export interface NodeState {
  value?: unknown;
  error?: CellError;
  sources: readonly string[];
  caution: boolean;
  /** The cell's expression the value was computed from (cells only). */
  from?: string;
}

/** Everything the engine's parts read and change. */
export interface EngineState {
  readonly doc: NotebookDoc;
  readonly lang: Language;
  readonly display: DisplayOptions;
  readonly host: TableHost;
  readonly preloaded?: ReadonlyMap<string, PreparedTable>;
  readonly given?: ReadonlyMap<string, unknown>;
  readonly encoding: ReadonlyMap<number, Diagnostic>;
  readonly overBudget?: NotebookOptions["overBudget"];
  readonly onEvaluate?: NotebookOptions["onEvaluate"];
  readonly nodes: Map<string, NodeDef>;
  readonly state: Map<string, NodeState>;
  readonly scope: Map<string, unknown>;
  readonly staticDiagnostics: Diagnostic[];
  graph: DependencyGraph;
  cycleOf: Map<string, readonly string[]>;
}

const SOURCE_ORDER = new Map(listSources().map((s, i) => [s.id, i]));

/** Source ids without repeats, in registry order. */
export function sortSources(ids: Iterable<string>): string[] {
  return [...new Set(ids)].sort((a, b) =>
    (SOURCE_ORDER.get(a) ?? 1e9) - (SOURCE_ORDER.get(b) ?? 1e9)
  );
}

/**
 * True when a cell or table node is the one that answers to its name in formulas: not a
 * duplicate, and not named like a unit, function or constant (those keep their meaning, so
 * `x = 1 mm` still reads millimetres when a cell is wrongly named `mm`).
 */
export function ownsName(n: NodeDef): boolean {
  return n.id === n.name && n.defError?.kind !== "name";
}

/** The names of the cells that answer to their names. */
export function cellNames(s: EngineState): Set<string> {
  const cells = new Set<string>();
  for (const n of s.nodes.values()) if (n.kind === "cell" && ownsName(n)) cells.add(n.name);
  return cells;
}

/** The table a computed column belongs to, as it is in the scope. */
export function tableInScope(s: EngineState, n: NodeDef): TableValue {
  return s.scope.get(n.table!) as TableValue;
}

/**
 * What a node's value depends on besides its dependencies' values (and its place, when it
 * shows an error): two versions of a notebook keep a node's value when this is equal.
 */
export function nodeSignature(s: EngineState, n: NodeDef, withPlace: boolean): string {
  const place = withPlace
    ? [n.cell?.line, n.cell?.exprCol, n.block?.line, n.block?.col, n.raw?.file]
    : [];
  const computed = () =>
    [...s.nodes.values()]
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
    s.cycleOf.get(n.id),
    table,
    place,
  ]);
}
