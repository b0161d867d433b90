/**
 * Turning table blocks into table values: column kinds from the header (`name [unit]`,
 * `name [type]`), numbers and values read cell by cell with positioned problems, and
 * tables read from a CSV file beside the notebook.
 *
 * @module
 */

import { parse as parseCsv } from "csv-parse/sync";
import { Column, makeTable, type TableValue } from "../../cells/table.ts";
import { getValueType, listValueTypes } from "../../cells/types.ts";
import type { Language } from "../../cells/language.ts";
import type { ColumnDef, TableBlock } from "../format/parse.ts";

/** Labels accepted in a header for dimensionless numeric columns. */
export const NUMBER_LABELS: readonly string[] = ["number", "logMAR", "letters", "decimal"];

/** A problem with table data, positioned in the notebook or the CSV file. */
export interface TableProblem {
  /** File the position refers to. */
  readonly file: string;
  /** 1-based line. */
  readonly line: number;
  /** 1-based column. */
  readonly col: number;
  /** What is wrong. */
  readonly message: string;
  /** Row index (0-based, data rows) the problem belongs to, when it is a row's. */
  readonly row?: number;
}

/** How a column's text becomes values. */
export type ColumnKind =
  | { readonly type: "quantity"; readonly unit: string }
  | { readonly type: "number"; readonly unit: string }
  | { readonly type: "text" }
  | { readonly type: "infer" }
  | { readonly type: "value"; readonly name: string };

/** Reads a file beside the notebook. */
export interface TableHost {
  /** Read a text file, path relative to the notebook; throws when it cannot. */
  readText(path: string): string;
}

/** Table data before conversion: header and rows of text with positions. */
export interface RawTable {
  /** Column declarations (header). */
  readonly columns: readonly ColumnDef[];
  /** Rows of text. */
  readonly rows: readonly { cells: readonly string[]; line: number; cols: readonly number[] }[];
  /** File that positions refer to. */
  readonly file: string;
  /** 1-based line of the header in that file. */
  readonly headerLine: number;
}

/**
 * The kind of a column from its bracketed spec, or an error message.
 */
export function columnKind(spec: string, lang: Language): ColumnKind | string {
  if (spec === "") return { type: "infer" };
  if (spec === "text") return { type: "text" };
  if (NUMBER_LABELS.includes(spec)) return { type: "number", unit: spec === "number" ? "" : spec };
  if (getValueType(spec)) return { type: "value", name: spec };
  if (lang.isUnit(spec)) return { type: "quantity", unit: spec };
  const types = ["text", ...NUMBER_LABELS, ...listValueTypes().map((t) => t.name)];
  return `unknown unit or type [${spec}] (a unit such as D, mm, deg, prism, or one of: ${
    types.join(", ")
  })`;
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i;

/**
 * Read a number as the trade writes it ("+1.25", "-0.50", "pl" is not a number here).
 * Returns undefined when the text is not a number; NaN for an empty cell.
 */
export function readNumber(text: string): number | undefined {
  if (text === "") return NaN;
  return NUMBER.test(text) ? Number(text) : undefined;
}

/**
 * Convert raw table text into a table value. Rows with problems are reported; with
 * `skipBad` they are excluded and counted, otherwise the table fails with every problem.
 */
export function buildTable(
  name: string,
  raw: RawTable,
  lang: Language,
  skipBad: boolean,
  extra: { file?: string } = {},
): { value?: TableValue; problems: TableProblem[]; excluded: number } {
  const problems: TableProblem[] = [];
  const kinds: ColumnKind[] = raw.columns.map((c) => {
    const k = columnKind(c.spec, lang);
    if (typeof k === "string") {
      problems.push({
        file: raw.file,
        line: raw.headerLine,
        col: c.col,
        message: `column ${c.name}: ${k}`,
      });
      return { type: "text" };
    }
    return k;
  });
  // Inferred columns: numeric when every non-empty cell is a number.
  const resolved: ColumnKind[] = kinds.map((k, ci) => {
    if (k.type !== "infer") return k;
    const numeric = raw.rows.every((r) => readNumber(r.cells[ci] ?? "") !== undefined);
    return numeric ? { type: "number", unit: "" } : { type: "text" };
  });
  const badRows = new Set<number>();
  const values: unknown[][] = raw.columns.map(() => []);
  raw.rows.forEach((r, ri) => {
    if (r.cells.length !== raw.columns.length) {
      problems.push({
        file: raw.file,
        line: r.line,
        col: 1,
        row: ri,
        message: `row has ${r.cells.length} field${
          r.cells.length === 1 ? "" : "s"
        }, the header has ${raw.columns.length}`,
      });
      badRows.add(ri);
      return;
    }
    resolved.forEach((k, ci) => {
      const text = r.cells[ci];
      const at = (message: string) => {
        problems.push({ file: raw.file, line: r.line, col: r.cols[ci] ?? 1, row: ri, message });
        badRows.add(ri);
      };
      const col = raw.columns[ci];
      if (k.type === "quantity" || k.type === "number") {
        const n = readNumber(text);
        if (n === undefined) {
          at(`column ${col.name}: "${text}" is not a number${k.unit ? ` (in ${k.unit})` : ""}`);
        }
        values[ci][ri] = n ?? NaN;
      } else if (k.type === "value") {
        const t = getValueType(k.name)!;
        try {
          values[ci][ri] = text === "" ? null : t.fromText ? t.fromText(text) : text;
        } catch (e) {
          at(`column ${col.name}: ${(e as Error).message}`);
          values[ci][ri] = null;
        }
      } else values[ci][ri] = text;
    });
  });
  const headerProblems = problems.filter((p) => p.row === undefined);
  if (headerProblems.length || (badRows.size && !skipBad)) return { problems, excluded: 0 };
  const keep = raw.rows.map((_, i) => i).filter((i) => !badRows.has(i));
  const columns = raw.columns.map((c, ci) => {
    const k = resolved[ci];
    const vals = keep.map((i) => values[ci][i]);
    if (k.type === "quantity") {
      return new Column(c.name, "quantity", k.unit, Float64Array.from(vals as number[]));
    }
    if (k.type === "number") {
      return new Column(c.name, "number", k.unit, Float64Array.from(vals as number[]));
    }
    if (k.type === "value") return new Column(c.name, k.name, "", vals);
    return new Column(c.name, "text", "", vals);
  });
  const excluded = badRows.size;
  return { value: makeTable(name, columns, { excluded, file: extra.file }), problems, excluded };
}

/**
 * Read the raw text of a table block: inline rows, or a CSV file named by `file:`.
 * Header conventions in a CSV are the same as inline: `sph [D],cyl [D],axis [deg]`.
 * Columns declared in the block override the CSV header's specs by name.
 */
export function readRawTable(
  block: TableBlock,
  notebookFile: string,
  host: TableHost,
): { raw?: RawTable; problem?: TableProblem } {
  const fileOpt = block.options.file;
  if (!fileOpt) {
    return {
      raw: {
        columns: block.columns.map((c) => ({ ...c })),
        rows: block.rows.map((r) => ({ cells: r.cells, line: r.line, cols: r.cols })),
        file: notebookFile,
        headerLine: block.headerLine,
      },
    };
  }
  const path = fileOpt.value;
  if (path.includes("..") || path.startsWith("/") || /^[A-Za-z]:/.test(path)) {
    return {
      problem: {
        file: notebookFile,
        line: fileOpt.line,
        col: fileOpt.col,
        message:
          `table file "${path}" must be a plain path beside the notebook (no .. or absolute paths)`,
      },
    };
  }
  let text: string;
  try {
    text = host.readText(path);
  } catch (e) {
    const why = e instanceof Deno.errors.NotFound ? "no such file" : (e as Error).message;
    return {
      problem: {
        file: notebookFile,
        line: fileOpt.line,
        col: fileOpt.col,
        message: `cannot read table file "${path}": ${why}`,
      },
    };
  }
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parseCsv(text, {
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      bom: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (e) {
    const err = e as Error & { lines?: number };
    return {
      problem: {
        file: path,
        line: err.lines ?? 1,
        col: 1,
        message: `CSV cannot be read: ${
          err.message.replace(/^Invalid Record Length: |^Quote Not Closed: /, "")
        }`,
      },
    };
  }
  if (!records.length) {
    return {
      problem: {
        file: path,
        line: 1,
        col: 1,
        message: "CSV file is empty (expected a header line)",
      },
    };
  }
  const header = records[0].record;
  const declared = new Map(block.columns.map((c) => [c.name, c]));
  const columns: ColumnDef[] = header.map((h, i) => {
    const m = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[([^\]]*)\])?\s*$/.exec(h);
    const name = m ? m[1] : h.trim() || `column${i + 1}`;
    const spec = declared.get(name)?.spec ?? (m?.[2] ?? "").trim();
    return { name, spec, col: i + 1 };
  });
  const rows = records.slice(1).map((r) => ({
    cells: r.record.map((c) => c.trim()),
    line: r.info.lines,
    cols: r.record.map((_, i) => i + 1),
  }));
  return { raw: { columns, rows, file: path, headerLine: 1 } };
}
