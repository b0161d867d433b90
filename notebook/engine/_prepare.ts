/**
 * Preparing a cell or computed column for evaluation: its dependencies, its compiled
 * formula (or the problem that stops it, at its position), and the sources and cautions of
 * the formulas and constants it calls.
 *
 * @module
 */

import type { MathNode } from "mathjs";
import { plainMathMessage } from "../../cells/language.ts";
import { analyse, isStackOverflow, type TableShape } from "./_analyse.ts";
import { type EngineState, type NodeDef, sortSources } from "./_state.ts";

/**
 * Analyse a cell or computed column: its dependencies, its compiled formula or the problem
 * that stops it, and the sources and cautions of the formulas it calls.
 */
export function analyseNode(
  s: EngineState,
  n: NodeDef,
  shapes: Map<string, TableShape>,
  cells: Set<string>,
): void {
  n.exprError = undefined;
  if (!n.cell || n.defError) return;
  const cell = n.cell;
  const a = analyse(cell.expression, {
    lang: s.lang,
    cells,
    tables: shapes,
    rowTable: n.table,
  });
  // A table that could not be read has no columns to see: its computed columns show the
  // table's error (as a dependency), not "unknown name" for every column they use.
  const table = n.table ? s.nodes.get(n.table) : undefined;
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
      file: s.doc.file,
      line: cell.line,
      col: cell.exprCol + a.problem.offset,
    };
  } else if (a.node) {
    try {
      n.compiled = s.lang.compile(a.node as MathNode);
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
        file: s.doc.file,
        line: cell.line,
        col: cell.exprCol,
      };
    }
  }
  // A formula that narrows its citations from its value (`cites`) is cited at evaluation;
  // its whole list stands when the node is not evaluated in a cell (a computed column).
  const srcs: string[] = [];
  const narrowing: string[] = [];
  let caution = false;
  for (const f of a.formulas) {
    const spec = s.lang.catalogue.formulas.get(f)!;
    (spec.cites ? narrowing : srcs).push(...spec.sources);
    caution ||= !!spec.caution;
  }
  for (const c of a.constants) srcs.push(s.lang.catalogue.constants.get(c)!.source);
  n.ownSources = sortSources(srcs);
  n.narrowingSources = narrowing.length ? sortSources(narrowing) : undefined;
  n.ownCaution = caution;
}
