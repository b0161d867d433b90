/**
 * Text edits over source spans: every change the live page makes is "replace the text of a
 * span", so whatever the user did not touch stays byte-for-byte as it was.
 *
 * @module
 */

import type { CalcBlock, NotebookDoc, RowDef, Span, TableBlock } from "../format/parse.ts";

/** A replacement of `[start, end)` by `text`. */
export interface TextEdit {
  /** Offset of the first replaced character. */
  readonly start: number;
  /** Offset after the last replaced character. */
  readonly end: number;
  /** The new text. */
  readonly text: string;
}

/**
 * Apply one edit.
 *
 * @example
 * ```ts
 * import { applyEdit } from "./_splice.ts";
 * applyEdit("x = 1 D # note", { start: 4, end: 7, text: "2.50 D" }); // "x = 2.50 D # note"
 * ```
 */
export function applyEdit(text: string, edit: TextEdit): string {
  return text.slice(0, edit.start) + edit.text + text.slice(edit.end);
}

/**
 * The line ending the text uses: CRLF when its first line ends so, else LF.
 *
 * @example
 * ```ts
 * import { lineEnding } from "./_splice.ts";
 * lineEnding("a\r\nb\r\n"); // "\r\n"
 * ```
 */
export function lineEnding(text: string): string {
  const nl = text.indexOf("\n");
  return nl > 0 && text[nl - 1] === "\r" ? "\r\n" : "\n";
}

/**
 * The ending of the line that `end` closes (`end` is the offset just after the line's text,
 * before its ending): "\r\n", "\n", or "" for the last line of a text without one.
 *
 * @example
 * ```ts
 * import { endingAfter } from "./_splice.ts";
 * endingAfter("a\nb\r\nc", 3); // "\r\n"
 * ```
 */
export function endingAfter(text: string, end: number): string {
  if (text.startsWith("\r\n", end)) return "\r\n";
  if (text[end] === "\n") return "\n";
  return "";
}

/**
 * The ending of the line just before offset `at` (a line start), or of the first line that
 * has one when there is none before: what a line inserted at `at` takes from its neighbour.
 */
function endingBefore(text: string, at: number): string {
  if (at >= 2 && text.startsWith("\r\n", at - 2)) return "\r\n";
  if (at >= 1 && text[at - 1] === "\n") return "\n";
  return lineEnding(text);
}

/** Span of a 1-based line, without its line ending. */
function lineSpan(text: string, no: number): Span {
  let start = 0;
  for (let i = 1; i < no; i++) {
    const nl = text.indexOf("\n", start);
    if (nl === -1) return { start: text.length, end: text.length, line: no };
    start = nl + 1;
  }
  let end = text.indexOf("\n", start);
  if (end === -1) end = text.length;
  if (end > start && text[end - 1] === "\r") end--;
  return { start, end, line: no };
}

/**
 * Replace the expression of a cell, keeping its name, spacing and note.
 *
 * @example
 * ```ts
 * import { parseNotebook } from "../format/parse.ts";
 * import { expressionEdit, applyEdit } from "./_splice.ts";
 * const F = "`".repeat(3);
 * const text = F + "lentil\nP = -4 D   # trial\n" + F + "\n";
 * const cell = parseNotebook(text, "a").cells[0];
 * applyEdit(text, expressionEdit(cell.exprSpan, "-4.50 D")); // F + "lentil\nP = -4.50 D   # trial\n" + F + "\n"
 * ```
 */
export function expressionEdit(exprSpan: Span, expression: string): TextEdit {
  return { start: exprSpan.start, end: exprSpan.end, text: expression };
}

/**
 * Append a line at the end of a calc block (before its closing fence).
 *
 * @example
 * ```ts
 * import { parseNotebook, type CalcBlock } from "../format/parse.ts";
 * import { appendLineEdit, applyEdit } from "./_splice.ts";
 * const F = "`".repeat(3);
 * const text = F + "lentil\nx = 1\n" + F + "\n";
 * const block = parseNotebook(text, "a").blocks[0] as CalcBlock;
 * applyEdit(text, appendLineEdit(text, block, "y = x + 1")); // F + "lentil\nx = 1\ny = x + 1\n" + F + "\n"
 * ```
 */
export function appendLineEdit(text: string, block: CalcBlock, line: string): TextEdit {
  const blockText = text.slice(block.span.start, block.span.end);
  const lastNl = blockText.lastIndexOf("\n");
  if (lastNl === -1) {
    // An unclosed one-line block: add after the fence line, ended like the line before it.
    const eol = endingBefore(text, block.span.start);
    return { start: block.span.end, end: block.span.end, text: eol + line };
  }
  const at = block.span.start + lastNl + 1; // start of the closing fence line
  // The new line ends as the line before it does (the block's own ending, in a mixed file).
  return { start: at, end: at, text: line + endingBefore(text, at) };
}

/** Escape a table cell for a `|`-separated row. */
function escapeCell(cell: string): string {
  return cell.replace(/\|/g, "\\|");
}

/** Widths of header segments, so generated rows line up under the header where it pads. */
function headerWidths(headerText: string): number[] {
  const segs: string[] = [];
  let cur = "";
  for (let i = 0; i < headerText.length; i++) {
    if (headerText[i] === "\\" && headerText[i + 1] === "|") {
      cur += "\\|";
      i++;
    } else if (headerText[i] === "|") {
      segs.push(cur);
      cur = "";
    } else cur += headerText[i];
  }
  segs.push(cur);
  return segs.map((s, i) => Math.max(0, s.length - (i > 0 ? 1 : 0) - 1));
}

/**
 * Format one table row as a `|`-separated line, padded to the header's layout.
 *
 * @example
 * ```ts
 * import { formatRow } from "./_splice.ts";
 * formatRow(["+1.00", "0.30"], "lens [D] | va [logMAR]"); // "+1.00    | 0.30"
 * ```
 */
export function formatRow(cells: readonly string[], headerText: string): string {
  const widths = headerWidths(headerText);
  const indent = /^\s*/.exec(headerText)![0];
  return indent + cells.map((c, i) => {
    const e = escapeCell(c.trim());
    return i < cells.length - 1 ? e.padEnd(widths[i] ?? 0) : e;
  }).join(" | ");
}

/**
 * The edit that gives an inline table exactly `rows`. Rows whose cells are unchanged keep
 * their original line text (wherever they move to); comment and blank lines between rows
 * stay with the row that followed them; new or changed rows are formatted under the header.
 *
 * @example
 * ```ts
 * import { parseNotebook } from "../format/parse.ts";
 * import { applyEdit, tableRowsEdit } from "./_splice.ts";
 * const F = "`".repeat(3);
 * const text = F + "lentil table t\nx | y\n1 | 2\n" + F + "\n";
 * const tb = parseNotebook(text, "a").tables[0];
 * applyEdit(text, tableRowsEdit(text, tb, [["1", "2"], ["3", "4"]])); // F + "lentil table t\nx | y\n1 | 2\n3 | 4\n" + F + "\n"
 * ```
 * @throws {Error} when the table has no header line (its rows live in a CSV file).
 */
export function tableRowsEdit(
  text: string,
  block: TableBlock,
  rows: readonly (readonly string[])[],
): TextEdit {
  if (!block.headerLine) throw new Error(`table ${block.name} has no header line to edit under`);
  const header = lineSpan(text, block.headerLine);
  // Each kept line keeps its own ending; a new line takes its neighbour's (the header's
  // when it comes first), so a file mixing LF and CRLF keeps every untouched line's bytes.
  const headerEol = endingAfter(text, header.end) || lineEnding(text);
  const headerText = text.slice(header.start, header.end);
  const old: readonly RowDef[] = block.rows;
  // Comment and blank lines between two rows belong to the row after them ("line EOL"...).
  const extra = old.map((r, i) => {
    if (i === 0) return "";
    const gap = text.slice(old[i - 1].span.end, r.span.start);
    return gap.slice(gap.indexOf("\n") + 1);
  });
  const key = (cells: readonly string[]) => JSON.stringify(cells.map((c) => c.trim()));
  const oldKeys = old.map((r) => key(r.cells));
  const used = new Set<number>();
  const source = rows.map((cells) => {
    const k = key(cells);
    const at = oldKeys.findIndex((ok, i) => ok === k && !used.has(i));
    if (at !== -1) used.add(at);
    return at;
  });
  // A changed row takes the place (and the comment lines) of the old row at its index.
  const replaces = rows.map((_, j) => source[j] === -1 && j < old.length && !used.has(j) ? j : -1);
  for (const i of replaces) if (i !== -1) used.add(i);
  // Lines of a dropped row go to the next kept row in the old order, or to the end.
  const lead = new Map<number, string>();
  let pending = "";
  old.forEach((_, i) => {
    pending += extra[i];
    if (used.has(i)) {
      lead.set(i, pending);
      pending = "";
    }
  });
  let eol = headerEol;
  const lines = rows.map((cells, j) => {
    const at = source[j];
    const anchor = at === -1 ? replaces[j] : at;
    const line = at === -1
      ? formatRow(cells, headerText)
      : text.slice(old[at].span.start, old[at].span.end);
    const own = anchor === -1 ? "" : endingAfter(text, old[anchor].span.end);
    if (own) eol = own;
    return { text: (anchor === -1 ? "" : lead.get(anchor) ?? "") + line, eol: own || eol };
  });
  if (old.length === 0) {
    const body = lines.map((l) => headerEol + l.text).join("");
    return { start: header.end, end: header.end, text: body };
  }
  const start = old[0].span.start;
  const last = old[old.length - 1].span.end;
  // The edit covers the last old row's ending too, so a moved row takes its ending along.
  const lastEol = endingAfter(text, last);
  const end = last + lastEol.length;
  let body = lines.map((l) => l.text + l.eol).join("") + pending;
  if (!lastEol && body) {
    // The table's last line ended the file without a line ending: so does the new last line.
    body = body.replace(/\r?\n$/, "");
  }
  if (!lines.length && !pending) {
    // Remove the rows together with the line ending before the first one.
    let from = start - 1;
    if (from > 0 && text[from - 1] === "\r") from--;
    return { start: from, end: last, text: "" };
  }
  return { start, end, text: body };
}

/**
 * The calc block a new cell is appended to by index among calc blocks, or undefined.
 *
 * @example
 * ```ts
 * import { parseNotebook } from "../format/parse.ts";
 * import { calcBlock } from "./_splice.ts";
 * const F = "`".repeat(3);
 * calcBlock(parseNotebook(F + "lentil\nx = 1\n" + F + "\n", "a"), 0)?.cells.length; // 1
 * ```
 */
export function calcBlock(doc: NotebookDoc, index: number): CalcBlock | undefined {
  return doc.blocks.filter((b): b is CalcBlock => b.kind === "calc")[index];
}

/**
 * Replace the value of a block option (`file: trials.csv`).
 *
 * @example
 * ```ts
 * import { parseNotebook } from "../format/parse.ts";
 * import { applyEdit, optionValueEdit } from "./_splice.ts";
 * const F = "`".repeat(3);
 * const text = F + "lentil table t\nfile: a.csv\n" + F + "\n";
 * const opt = parseNotebook(text, "n").tables[0].options.file;
 * applyEdit(text, optionValueEdit(text, opt, "b.csv")); // F + "lentil table t\nfile: b.csv\n" + F + "\n"
 * ```
 */
export function optionValueEdit(
  text: string,
  option: { readonly value: string; readonly line: number; readonly col: number },
  value: string,
): TextEdit {
  const start = lineSpan(text, option.line).start + option.col - 1;
  return { start, end: start + option.value.length, text: value };
}
