/**
 * Evaluating one node from its dependencies' states: a table's rows, a computed column (one
 * value a row, compiled where it can be), or a cell's value; or the error that stops it — a
 * cycle, an error in its definition, an error carried from a dependency with its root cause,
 * a cell over its budget, or what the formula threw, in the notebook's words.
 *
 * @module
 */

import type { MathNode } from "mathjs";
import { citing, plainMathMessage, shownValue } from "../../cells/language.ts";
import {
  addColumn,
  type Column,
  makeTable,
  tableInfo,
  type TableValue,
} from "../../cells/table.ts";
import { isStackOverflow } from "./_analyse.ts";
import { planColumn } from "./_columns.ts";
import { sameValue } from "./_same.ts";
import { argumentNode, argumentOffset, explainFailure } from "./_explain.ts";
import { type EngineState, type NodeDef, type NodeState, ownsName, sortSources } from "./_state.ts";
import type { CellError, ErrorKind } from "./engine.ts";

/** Cycles up to this many cells are written out in full at every member. */
const CYCLE_IN_FULL = 12;

/** Where a node's errors point: its expression, or its table's name. */
type Where = { readonly line: number; readonly col: number };

/**
 * What evaluation gives: a value, or an error; for a cell evaluated here, the sources its
 * narrowing formulas cited.
 */
type Outcome = Omit<NodeState, "sources" | "caution"> & { cited?: ReadonlySet<string> };

/** Evaluate one node and store its state (and its name's value in the scope). */
export function evaluateNode(s: EngineState, id: string): void {
  const n = s.nodes.get(id)!;
  const where: Where = n.cell
    ? { line: n.cell.line, col: n.cell.exprCol }
    : { line: n.block!.line, col: n.block!.col };
  const deps = n.analysis?.deps ?? new Set<string>();
  let sources: string[] = [...n.ownSources];
  let caution = n.ownCaution;
  for (const d of deps) {
    const st = s.state.get(d);
    if (st) {
      sources = sources.concat(st.sources);
      caution ||= st.caution;
    }
  }
  const { cited, ...outcome } = blocked(s, n, id, where) ?? compute(s, n, id, where);
  if (n.narrowingSources) sources = sources.concat(cited ? [...cited] : n.narrowingSources);
  // A cell whose text is unchanged and whose value came out the same keeps the value it had.
  const before = s.state.get(id);
  const from = n.kind === "cell" ? n.cell?.expression : undefined;
  if (
    from !== undefined && before && before.from === from && !before.error && !outcome.error &&
    sameValue(before.value, outcome.value)
  ) outcome.value = before.value;
  const state = { ...outcome, sources: sortSources(sources), caution, from };
  s.state.set(id, state);
  if (n.kind !== "column" && ownsName(n)) {
    if (state.error) s.scope.delete(n.name);
    else s.scope.set(n.name, state.value);
  }
}

/** The error that stops a node before it is evaluated, if any. */
function blocked(s: EngineState, n: NodeDef, id: string, where: Where): Outcome | undefined {
  const file = s.doc.file;
  const cyc = s.cycleOf.get(id);
  if (cyc) return { error: { kind: "cycle", message: cycleMessage(s, id, cyc), file, ...where } };
  const staticError = n.defError ?? n.exprError;
  if (staticError) return { error: staticError };
  for (const d of n.analysis?.deps ?? []) {
    const st = s.state.get(d);
    if (!st?.error) continue;
    const root = st.error.kind === "dependency" && st.error.cause
      ? st.error.cause
      : { id: d, error: st.error };
    const at = `${root.id} at ${root.error.file}:${root.error.line}:${root.error.col}`;
    return {
      error: {
        kind: "dependency",
        message: `depends on ${d}, which has an error: ${root.error.message} (${at})`,
        file,
        ...where,
        cause: root,
      },
    };
  }
  const over = s.overBudget?.get(id);
  if (over && n.cell && over.expression === n.cell.expression) {
    return { error: { kind: "evaluation", message: over.message, file, ...where } };
  }
  return undefined;
}

/** Evaluate a node whose dependencies all have values. */
function compute(s: EngineState, n: NodeDef, id: string, where: Where): Outcome {
  const file = s.doc.file;
  s.onEvaluate?.(id, n.cell?.expression);
  try {
    if (n.kind !== "table" && s.given?.has(id)) {
      const value = s.given.get(id);
      if (value instanceof Error) throw value;
      if (n.kind === "column") {
        addColumn(s.scope.get(n.table!) as TableValue, value as Column);
      }
      return { value };
    }
    if (n.kind === "table") {
      const b = n.built!;
      const o = n.block?.options;
      return {
        value: makeTable(n.name, b.columns, {
          excluded: b.excluded,
          file: b.file,
          subject: o?.subject?.value,
          eye: o?.eye?.value,
        }),
      };
    }
    if (n.kind === "column") {
      const table = s.scope.get(n.table!) as TableValue;
      if (!tableInfo(table)) {
        const message = `${n.table} is ${
          shownValue(table)
        }, not a table: computed columns belong to tables`;
        return { error: { kind: "name", message, file, ...where } };
      }
      const column = evaluateColumn(s, n, table);
      addColumn(table, column);
      return { value: column };
    }
    if (!n.narrowingSources) return cellValue(s, n, n.compiled!.evaluate(s.scope), where);
    const { value, cited } = citing(() => n.compiled!.evaluate(s.scope));
    return { ...cellValue(s, n, value, where), cited };
  } catch (e) {
    return { error: explainError(s, e as Error, n, where) };
  }
}

/**
 * The first infinite entry of a list or matrix (plain or with a unit), or undefined: a list
 * holding one is an error like a single infinite value (an empty entry, not a number, can
 * be a list's gap and is left alone).
 */
function infiniteEntry(s: EngineState, value: unknown): number | undefined {
  const v = value as { isMatrix?: boolean; toArray?: () => unknown[] } | null;
  if (!Array.isArray(value) && !v?.isMatrix) return undefined;
  const stack: unknown[] = [Array.isArray(value) ? value : v!.toArray!()];
  while (stack.length) {
    const x = stack.pop();
    if (Array.isArray(x)) {
      for (const y of x) stack.push(y);
      continue;
    }
    const q = typeof x === "number" ? { value: x } : s.lang.quantityParts(x);
    if (q && (q.value === Infinity || q.value === -Infinity)) return q.value;
  }
  return undefined;
}

/** A cell's value as evaluated: refused when not a real, finite number; a table renamed. */
function cellValue(s: EngineState, n: NodeDef, value: unknown, where: Where): Outcome {
  const file = s.doc.file;
  const q = typeof value === "number" ? { value } : s.lang.quantityParts(value);
  if ((value as { isComplex?: boolean } | null)?.isComplex) {
    const message = "the result is not a real number (the square root of a negative value?)";
    return { error: { kind: "evaluation", message, file, ...where } };
  }
  const bad = q ? (Number.isFinite(q.value) ? undefined : q.value) : infiniteEntry(s, value);
  if (bad !== undefined) {
    const what = Number.isNaN(bad) ? "not a number" : "infinite";
    const message = `the result is ${what} (a division by zero, or a value out of range?)`;
    return { error: { kind: "evaluation", message, file, ...where } };
  }
  // A table a formula returns takes the cell's name (a copy, so computed columns added to it
  // never change the table it came from).
  const info = tableInfo(value);
  if (info) {
    return {
      value: makeTable(n.name, info.columns, { excluded: info.excluded, file: info.file }),
    };
  }
  return { value };
}

function evaluateColumn(s: EngineState, n: NodeDef, table: TableValue): Column {
  const info = tableInfo(table)!;
  const cols = info.columns.filter((c) => c.name !== n.name);
  const plan = planColumn(
    n.name,
    n.analysis!.node as MathNode,
    n.compiled!,
    cols,
    s.scope,
    s.lang,
  );
  const { column, path } = plan.run(cols, info.rowCount);
  n.columnPath = { path, reason: plan.reason };
  return column;
}

/** A thrown error as the cell's error value, in the notebook's words and at its position. */
function explainError(
  s: EngineState,
  e: Error,
  n: NodeDef,
  where: { line: number; col: number },
): CellError {
  const file = s.doc.file;
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
        const col = tableInfo(s.scope.get(n.table!))?.columns.find((c) => c.name === name);
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
    const info = tableInfo(s.scope.get(n.table!));
    message = `table ${n.table} has no column "${undefinedSymbol[1]}" and no cell has that name` +
      (info ? ` (columns: ${info.columns.map((c) => c.name).join(", ")})` : "");
  } else {
    // The expression library refused an operation: find which, and say it in our words.
    const node = n.analysis?.node as MathNode | undefined;
    const found = node && n.kind === "cell"
      ? explainFailure(node, s.scope, s.lang, s.display, n.cell?.expression ?? "")
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
function cycleMessage(s: EngineState, id: string, cyc: readonly string[]): string {
  if (cyc.length <= CYCLE_IN_FULL || id === cyc[0]) {
    const path = [...cyc, cyc[0]].join(" → ");
    const lines = cyc.map((m) => `${m} at line ${lineOf(s, m)}`).join(", ");
    return `cycle: ${path} (${lines})`;
  }
  return `cycle: ${id} is one of the ${cyc.length} cells of the cycle through ${cyc[0]} (line ${
    lineOf(s, cyc[0])
  }), where its whole path is shown`;
}

function lineOf(s: EngineState, id: string): number {
  const n = s.nodes.get(id);
  return n?.cell?.line ?? n?.block?.line ?? 0;
}
