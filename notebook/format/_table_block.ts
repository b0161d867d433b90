/**
 * The reader of a table block (```` ```lentil table NAME ````): option lines (`file:`,
 * `bad rows:`, `subject:` and `eye:` naming the person and eye columns of a both-eyes study), a header `name [unit] | name [type] | name`, then one row a line.
 *
 * @module
 */

import type { ColumnDef, OptionDef, RowDef, TableBlock } from "./parse.ts";
import type { Fenced } from "./_fence.ts";
import { isBlankOrComment, type Line, optionValue, type ReadContext, splitRow } from "./_text.ts";

/** The option keys a table block knows. */
export const TABLE_OPTION_KEYS = ["file", "bad rows", "subject", "eye", "engine"] as const;

/**
 * Read a table block: its name (claimed), options, header and rows; a row with another
 * number of fields than the header is reported and kept.
 *
 * @example
 * ```ts
 * import { readTableBlock } from "./_table_block.ts";
 * import { splitLines } from "./_text.ts";
 * const lines = splitLines("~~~lentil table t\nx [mm] | y\n1 | 2\n~~~\n");
 * const ctx = { file: "f", diag: () => {}, claim: () => {} };
 * const fenced = { fence: lines[0], body: lines.slice(1, 3), span: { start: 0, end: 9, line: 1 }, rest: "t", restCol: 17 };
 * readTableBlock(fenced, ctx).columns[0].spec; // "mm"
 * ```
 */
export function readTableBlock(block: Fenced, ctx: ReadContext): TableBlock {
  const { fence, rest, restCol } = block;
  const nm = /^([A-Za-z_][A-Za-z0-9_]*)\s*$/.exec(rest);
  const name = nm ? nm[1] : "";
  if (!nm) {
    ctx.diag(
      fence.no,
      restCol,
      rest
        ? `table name "${rest}" must be a single word of letters, digits or _`
        : "a table block needs a name: ```lentil table NAME",
    );
  } else ctx.claim(name, fence.no, restCol);
  const options: Record<string, OptionDef> = {};
  let columns: ColumnDef[] = [];
  const rows: RowDef[] = [];
  let headerLine = 0;
  for (const bl of block.body) {
    if (isBlankOrComment(bl.text)) continue;
    if (!headerLine) {
      if (readOption(bl, options, ctx)) continue;
      headerLine = bl.no;
      columns = readHeader(bl, ctx);
      continue;
    }
    rows.push(readRow(bl, columns.length, ctx));
  }
  if (!options.file && !headerLine && name) {
    ctx.diag(fence.no, 1, `table ${name} has neither a header line nor a \`file:\` option`);
  }
  if (options.file && rows.length) {
    ctx.diag(
      rows[0].line,
      1,
      `table ${name} reads its rows from ${options.file.value}; inline rows are not allowed as well`,
    );
  }
  return {
    kind: "table",
    name,
    line: fence.no,
    col: restCol,
    options,
    columns,
    headerLine,
    rows,
    span: block.span,
  };
}

/** An option line before the header; false when the line is the header instead. */
function readOption(bl: Line, options: Record<string, OptionDef>, ctx: ReadContext): boolean {
  const t = bl.text;
  const om = /^\s*([a-z][a-z ]*[a-z]):\s*(.*)$/i.exec(t);
  if (!om || t.includes("|") || /\[/.test(om[1])) return false;
  const key = om[1].toLowerCase();
  if (!(TABLE_OPTION_KEYS as readonly string[]).includes(key)) {
    ctx.diag(bl.no, 1, `unknown table option "${om[1]}" (known: ${TABLE_OPTION_KEYS.join(", ")})`);
  }
  options[key] = { value: optionValue(om[2]), line: bl.no, col: t.indexOf(om[2]) + 1 };
  return true;
}

/** Most fields a table line may have; a longer line is reported and cut, at once. */
export const MAX_TABLE_FIELDS = 1000;

/** The fields of a table line, at most {@linkcode MAX_TABLE_FIELDS} (the rest reported). */
function boundedRow(bl: Line, ctx: ReadContext): { cells: string[]; cols: number[] } {
  let bars = 0;
  let cut = -1;
  for (let i = bl.text.indexOf("|"); i !== -1; i = bl.text.indexOf("|", i + 1)) {
    if (bl.text[i - 1] === "\\") continue;
    if (++bars === MAX_TABLE_FIELDS) cut = i;
  }
  if (cut === -1) return splitRow(bl.text);
  ctx.diag(
    bl.no,
    cut + 1,
    `a table line has ${
      bars + 1
    } fields; at most ${MAX_TABLE_FIELDS} are read (keep wide data in a CSV file)`,
  );
  return splitRow(bl.text.slice(0, cut));
}

/** The header line's columns, each `name` or `name [unit or type]`. */
function readHeader(bl: Line, ctx: ReadContext): ColumnDef[] {
  const columns: ColumnDef[] = [];
  const { cells: hs, cols } = boundedRow(bl, ctx);
  const names = new Set<string>();
  hs.forEach((h, k) => {
    const hm = /^([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[([^\]]*)\])?$/.exec(h);
    if (!hm) {
      ctx.diag(bl.no, cols[k], `column header "${h}" should be \`name\` or \`name [unit]\``);
      columns.push({ name: h || `column${k + 1}`, spec: "", col: cols[k] });
      return;
    }
    if (names.has(hm[1])) ctx.diag(bl.no, cols[k], `duplicate column "${hm[1]}"`);
    names.add(hm[1]);
    columns.push({ name: hm[1], spec: (hm[2] ?? "").trim(), col: cols[k] });
  });
  return columns;
}

/** A data row; a field count other than the header's is reported. */
function readRow(bl: Line, width: number, ctx: ReadContext): RowDef {
  const t = bl.text;
  const { cells, cols } = boundedRow(bl, ctx);
  if (cells.length !== width && cells.length < MAX_TABLE_FIELDS) {
    const fields = `${cells.length} field${cells.length === 1 ? "" : "s"}`;
    ctx.diag(bl.no, 1, `row has ${fields}, the header has ${width}`);
  }
  return {
    cells,
    cols,
    line: bl.no,
    span: { start: bl.start, end: bl.start + t.length, line: bl.no },
  };
}
