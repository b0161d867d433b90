/**
 * Defining the engine's nodes from a parsed notebook: one node a table, cell and computed
 * column, with the errors of the definition itself (a duplicate or reserved name, bytes that
 * are not UTF-8, a table that cannot be read), and the columns each table offers.
 *
 * @module
 */

import { LENTIL_UNITS } from "../../cells/language.ts";
import { tableInfo } from "../../cells/table.ts";
import type { TableBlock } from "../format/parse.ts";
import type { TableShape } from "./_analyse.ts";
import { buildTable, type BuiltTable, readRawTable, type TableProblem } from "./_tables.ts";
import { type EngineState, type NodeDef, ownsName } from "./_state.ts";
import type { CellError, ErrorKind } from "./engine.ts";

/** Define every node of the notebook (tables first, then cells and computed columns). */
export function defineNodes(s: EngineState): void {
  const file = s.doc.file;
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
    LENTIL_UNITS.includes(name) || s.lang.isFunction(name) ||
    s.lang.catalogue.constants.has(name) || s.lang.isBuiltinSymbol(name);
  for (const block of s.doc.tables) {
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
    } else if (badBytes(s, block.line, tableEnd(block))) {
      node.defError = badBytes(s, block.line, tableEnd(block));
    } else if (reserved(block.name)) {
      node.defError = at(
        "name",
        reservedMessage(block.name, "table name"),
        block.line,
        block.col,
      );
    }
    loadTableNode(s, node);
    s.nodes.set(id, node);
  }
  for (const cell of s.doc.cells) {
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
    } else if (badBytes(s, cell.line, cell.line)) {
      node.defError = badBytes(s, cell.line, cell.line);
    } else if (!cell.table && reserved(cell.name)) {
      node.defError = at("name", reservedMessage(cell.name, "name"), cell.line, cell.col);
    } else if (
      cell.table && !s.doc.tables.some((t) => t.name === cell.table) &&
      !s.doc.cells.some((c) => !c.table && c.name === cell.table)
    ) {
      node.defError = at(
        "name",
        `no table named "${cell.table}" for computed column ${full}`,
        cell.line,
        cell.col,
      );
    }
    s.nodes.set(id, node);
  }
}

/** The encoding error on the first line from `from` to `to` whose bytes are not UTF-8. */
function badBytes(s: EngineState, from: number, to: number): CellError | undefined {
  for (const [line, d] of s.encoding) {
    if (line >= from && line <= to) {
      return { kind: "syntax", message: d.message, file: d.file, line: d.line, col: d.col };
    }
  }
  return undefined;
}

/** Read a table node's rows (inline or from its file) and convert them, reporting problems. */
function loadTableNode(s: EngineState, node: NodeDef): void {
  const block = node.block!;
  const skip = (block.options["bad rows"]?.value ?? "stop").toLowerCase();
  if (!["stop", "skip"].includes(skip)) {
    const o = block.options["bad rows"]!;
    s.staticDiagnostics.push({
      file: s.doc.file,
      line: o.line,
      col: o.col,
      message: `bad rows: expected "stop" (the default) or "skip", got "${o.value}"`,
      severity: "error",
    });
  }
  let problems: TableProblem[] = [];
  let built: BuiltTable | undefined;
  const pre = node.id === block.name ? s.preloaded?.get(block.name) : undefined;
  if (pre) {
    node.raw = { columns: pre.columns, rows: [], file: block.options.file!.value, headerLine: 1 };
    if (pre.problem) problems = [pre.problem];
    else built = pre.built;
  } else {
    const r = readRawTable(block, s.doc.file, s.host);
    node.raw = r.raw;
    if (r.problem) problems = r.problems ?? [r.problem];
    else {
      built = buildTable(block.name, r.raw!, s.lang, skip === "skip", {
        file: block.options.file?.value,
        where: { file: s.doc.file, line: block.line, col: block.col },
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
    for (const p of problems) s.staticDiagnostics.push({ ...p, severity: "error" });
    return;
  }
  const report = (
    p: { file: string; line: number; col: number; message: string },
    severity: "error" | "warning",
  ) => s.staticDiagnostics.push({ ...positioned(p), severity });
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

/** The columns each table offers to formulas: its data columns and its computed ones. */
export function tableShapes(s: EngineState): Map<string, TableShape> {
  const shapes = new Map<string, TableShape>();
  for (const n of s.nodes.values()) {
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
  for (const n of s.nodes.values()) {
    if (n.kind !== "column" || shapes.has(n.table!)) continue;
    const cell = s.nodes.get(n.table!);
    if (cell?.kind === "cell" && ownsName(cell)) {
      shapes.set(n.table!, { data: new Set(), computed: new Set(), open: true });
    }
  }
  for (const n of s.nodes.values()) {
    if (n.kind === "column" && n.id === `${n.table}.${n.name}` && shapes.has(n.table!)) {
      (shapes.get(n.table!)!.computed as Set<string>).add(n.name);
    }
  }
  return shapes;
}

/** The last line of a table block's header and rows. */
function tableEnd(block: TableBlock): number {
  let end = block.headerLine;
  for (const r of block.rows) if (r.line > end) end = r.line;
  return end;
}

/** The position and message of a table problem, without its row. */
function positioned(p: { file: string; line: number; col: number; message: string }) {
  return { file: p.file, line: p.line, col: p.col, message: p.message };
}
