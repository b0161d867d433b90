/**
 * The reader of a formula block (```` ```lentil ````): one cell a line, `name = expression`
 * or `table.column = expression`, then optionally `# note`.
 *
 * @module
 */

import type { CalcBlock, CellDef } from "./parse.ts";
import type { Fenced } from "./_fence.ts";
import { isBlankOrComment, isLiteral, noteStart, type ReadContext } from "./_text.ts";

const CELL_LINE = /^(\s*)([A-Za-z_][A-Za-z0-9_]*)(?:\.([A-Za-z_][A-Za-z0-9_]*))?\s*=(?!=)/;

/**
 * Read a formula block's cells; a line that is not `name = expression` is reported and
 * skipped, and every name is claimed.
 *
 * @example
 * ```ts
 * import { readFormulaBlock } from "./_formula_block.ts";
 * import { splitLines } from "./_text.ts";
 * const lines = splitLines("~~~lentil\nvd = 12 mm  # measured\n~~~\n");
 * const ctx = { file: "f", diag: () => {}, claim: () => {} };
 * const fenced = { fence: lines[0], body: lines.slice(1, 2), span: { start: 0, end: 9, line: 1 }, rest: "", restCol: 10 };
 * readFormulaBlock(fenced, ctx).cells[0].note; // "measured"
 * ```
 */
export function readFormulaBlock(block: Fenced, ctx: ReadContext): CalcBlock {
  if (block.rest) {
    ctx.diag(
      block.fence.no,
      block.restCol,
      `unexpected text after lentil: "${block.rest}" (a table block opens with \`lentil table NAME\`, a plot with \`lentil plot NAME\`)`,
    );
  }
  const cells: CellDef[] = [];
  for (const bl of block.body) {
    if (isBlankOrComment(bl.text)) continue;
    const cell = readCell(bl.text, bl.start, bl.no, ctx);
    if (cell) cells.push(cell);
  }
  return { kind: "calc", cells, span: block.span };
}

/** One `name = expression  # note` line, or undefined (reported) when it is not one. */
function readCell(t: string, start: number, no: number, ctx: ReadContext): CellDef | undefined {
  const m = CELL_LINE.exec(t);
  if (!m) {
    ctx.diag(
      no,
      t.length - t.trimStart().length + 1,
      "expected `name = expression` (a note may follow after #)",
    );
    return undefined;
  }
  const nameCol = m[1].length + 1;
  const afterEq = m[0].length;
  const hash = noteStart(t.slice(afterEq));
  const exprRaw = hash === -1 ? t.slice(afterEq) : t.slice(afterEq, afterEq + hash);
  const lead = exprRaw.length - exprRaw.trimStart().length;
  const expression = exprRaw.trim();
  const note = hash === -1 ? undefined : t.slice(afterEq + hash + 1).trim() || undefined;
  const table = m[3] ? m[2] : undefined;
  const name = m[3] ?? m[2];
  const exprStart = start + afterEq + lead;
  if (!expression) ctx.diag(no, afterEq + 1, `cell "${name}" has no expression after =`);
  ctx.claim(table ? `${table}.${name}` : name, no, nameCol);
  return {
    name,
    table,
    expression,
    note,
    line: no,
    col: nameCol,
    exprCol: afterEq + lead + 1,
    span: { start, end: start + t.length, line: no },
    exprSpan: { start: exprStart, end: exprStart + expression.length, line: no },
    input: !table && isLiteral(expression),
  };
}
