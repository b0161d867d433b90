/**
 * Turning table blocks into table values: column kinds from the header (`name [unit]`,
 * `name [type]`), numbers and values read cell by cell with positioned problems, and
 * tables read from a CSV file beside the notebook, either all at once or streamed through
 * csv-parse record by record into typed column arrays.
 *
 * Header convention, inline and in a CSV file alike: `name [unit]` for a quantity
 * (`sph [D]`, `axis [deg]`, `vd [mm]`), `name [number]` or `[logMAR]`, `[letters]`,
 * `[decimal]` for plain numbers, `name [text]`, or a value type (`rx [rx]`). A column of a
 * notebook table block overrides the CSV header's bracket by name. A refraction column
 * (sph, cyl, axis, add) must say its unit; other columns without a bracket are read as
 * numbers when their first rows are all numbers, else as text.
 *
 * Every row that cannot be read is reported with its position and reason. With
 * `bad rows: skip` such rows are excluded and counted; otherwise (the default) the table
 * fails. Sphere, cylinder and axis values outside their ranges are bad rows; a cylinder
 * column that mixes signs is accepted and the rows in the other form are transposed to the
 * form of the first cylinder met (the same lens), with a note saying so.
 *
 * @module
 */

import { countText } from "../../lib/number_text.ts";
import { parse as parseCsv } from "csv-parse/sync";
import { Column, makeTable, type TableValue } from "../../cells/table.ts";
import { getValueType, listValueTypes } from "../../cells/types.ts";
import type { Language } from "../../cells/language.ts";
import { CYLINDER_RANGE, SPHERE_RANGE } from "../../lib/prescription.ts";
import { transpose } from "../../lib/transpose.ts";
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
  | {
    readonly type: "number";
    readonly unit: string;
    /** Read as numbers because the first rows all were (no bracket in the header). */
    readonly inferred?: boolean;
  }
  | { readonly type: "text" }
  | { readonly type: "infer" }
  | { readonly type: "value"; readonly name: string };

/** Reads a file beside the notebook. */
export interface TableHost {
  /** Read a text file, path relative to the notebook; throws when it cannot. */
  readText(path: string): string;
  /** Open a file for streaming, path relative to the notebook (for `Notebook.load`). */
  open?(path: string): AsyncIterable<Uint8Array>;
}

/** Table data before conversion: header and rows of text with positions. */
export interface RawTable {
  /** Column declarations (header). */
  readonly columns: readonly ColumnDef[];
  /** Rows of text. */
  readonly rows: readonly {
    cells: readonly string[];
    line: number;
    cols: readonly number[];
    /** Why the CSV reader could not read this record (skipped with `bad rows: skip`). */
    bad?: string;
  }[];
  /** File that positions refer to. */
  readonly file: string;
  /** 1-based line of the header in that file. */
  readonly headerLine: number;
}

/** A table read and converted, or the problems that stopped it. */
export interface BuiltTable {
  /** The value, absent when the table failed. */
  readonly value?: TableValue;
  /** Every problem, rows' and header's. */
  readonly problems: TableProblem[];
  /** Notes that change nothing silently: normalised rows, excluded rows. */
  readonly notes: TableProblem[];
  /** Rows excluded (with `bad rows: skip`). */
  readonly excluded: number;
}

/**
 * Refraction columns that must carry a unit, by lower-case name, with the unit expected
 * and the accepted range in that unit. Source: common-practice (ranges as the prescription
 * parser accepts them).
 */
export const REFRACTION_COLUMNS: Readonly<
  Record<
    string,
    { unit: string; range: readonly [number, number]; role: "sph" | "cyl" | "axis" | "add" }
  >
> = {
  sph: { unit: "D", range: SPHERE_RANGE, role: "sph" },
  sphere: { unit: "D", range: SPHERE_RANGE, role: "sph" },
  cyl: { unit: "D", range: CYLINDER_RANGE, role: "cyl" },
  cylinder: { unit: "D", range: CYLINDER_RANGE, role: "cyl" },
  axis: { unit: "deg", range: [0, 180], role: "axis" },
  add: { unit: "D", range: [0, 6], role: "add" },
};

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
 * Whether reading `text` as a number would change what it says: a leading zero before a
 * digit (`08123`, `012`: identifiers such as subject numbers or postal codes) or more
 * significant digits than a double keeps (a record number of 17 digits).
 *
 * @example
 * ```ts
 * import { numberWouldChange } from "./_tables.ts";
 * [numberWouldChange("08123"), numberWouldChange("0.5"), numberWouldChange("-1.25")]; // [true, false, false]
 * ```
 */
export function numberWouldChange(text: string): boolean {
  if (/^[+-]?0\d/.test(text)) return true;
  const digits = text.replace(/e.*$/i, "").replace(/[^0-9]/g, "").replace(/^0+/, "");
  return digits.replace(/0+$/, "").length > 15;
}

/** A growable Float64Array. */
class NumberBuffer {
  data = new Float64Array(1024);
  length = 0;
  push(x: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = x;
  }
  take(): Float64Array {
    const out = this.data.slice(0, this.length);
    this.length = 0;
    return out;
  }
}

/** Header problems and the resolved kinds of a table's columns. */
function resolveKinds(
  columns: readonly ColumnDef[],
  sample: readonly (readonly string[])[],
  lang: Language,
  file: string,
  headerLine: number,
): { kinds: ColumnKind[]; problems: TableProblem[] } {
  const problems: TableProblem[] = [];
  const at = (c: ColumnDef, message: string) =>
    problems.push({ file, line: headerLine, col: c.col, message: `column ${c.name}: ${message}` });
  const seen = new Set<string>();
  const kinds = columns.map((c, ci): ColumnKind => {
    if (seen.has(c.name)) at(c, "appears twice in the header");
    seen.add(c.name);
    const k = columnKind(c.spec, lang);
    if (typeof k === "string") {
      at(c, k);
      return { type: "text" };
    }
    const rule = REFRACTION_COLUMNS[c.name.toLowerCase()];
    if (rule && k.type === "infer") {
      at(
        c,
        `a refraction column needs its unit: write ${c.name} [${rule.unit}] in the header, or declare it in the table block`,
      );
      return { type: "text" };
    }
    if (k.type !== "infer") return k;
    // A value a number would change (a leading zero, more digits than a number holds) is
    // an identifier: the column keeps its text, so `08123` and `012` stay as written.
    const numeric = sample.every((r) => {
      const t = r[ci] ?? "";
      return readNumber(t) !== undefined && !numberWouldChange(t);
    });
    return numeric ? { type: "number", unit: "", inferred: true } : { type: "text" };
  });
  return { kinds, problems };
}

/**
 * Converts rows of text into typed columns, one row at a time: checks each cell, applies
 * the refraction ranges and the cylinder-form rule, and keeps problems and notes. Columns
 * can be taken in chunks (streaming) or all at the end.
 */
export class TableBuilder {
  /** Problems found so far. */
  readonly problems: TableProblem[] = [];
  /** Rows seen so far (good and bad). */
  rowsSeen = 0;
  /** Bad rows so far. */
  badRows = 0;
  /** Rows transposed to the table's cylinder form. */
  transposed = 0;
  readonly #transposedRows: number[] = [];
  readonly #badRowNumbers: number[] = [];
  readonly #nums: (NumberBuffer | undefined)[];
  readonly #vals: (unknown[] | undefined)[];
  readonly #parsed: unknown[];
  readonly #sph: number;
  readonly #cyl: number;
  readonly #axis: number;
  #cylSign = 0;
  #cylSignRow = 0;

  /**
   * @param columns header; @param kinds resolved kinds (no "infer"); @param file where
   * positions point; @param keepProblems cap on problems kept (all are counted).
   */
  constructor(
    readonly columns: readonly ColumnDef[],
    readonly kinds: readonly ColumnKind[],
    readonly file: string,
    readonly keepProblems = 1000,
  ) {
    this.#nums = kinds.map((k) =>
      k.type === "quantity" || k.type === "number" ? new NumberBuffer() : undefined
    );
    this.#vals = kinds.map((k) => (k.type === "quantity" || k.type === "number" ? undefined : []));
    this.#parsed = new Array(kinds.length);
    const role = (r: string) =>
      columns.findIndex((c, i) =>
        REFRACTION_COLUMNS[c.name.toLowerCase()]?.role === r && kinds[i].type === "quantity"
      );
    this.#sph = role("sph");
    this.#cyl = role("cyl");
    this.#axis = role("axis");
  }

  #problem(p: TableProblem): void {
    if (this.problems.length < this.keepProblems) this.problems.push(p);
  }

  /** Count a record the CSV reader could not read as a bad row, with why. */
  addBad(line: number, message: string): void {
    const ri = this.rowsSeen++;
    this.#problem({ file: this.file, line, col: 1, row: ri, message });
    this.badRows++;
    if (this.#badRowNumbers.length < 20) this.#badRowNumbers.push(ri + 1);
  }

  /** Add one row of text; returns false when the row is bad. */
  add(cells: readonly string[], line: number, cols?: readonly number[]): boolean {
    const ri = this.rowsSeen++;
    const n = this.columns.length;
    let bad = false;
    if (cells.length !== n) {
      this.#problem({
        file: this.file,
        line,
        col: 1,
        row: ri,
        message: `row has ${cells.length} field${
          cells.length === 1 ? "" : "s"
        }, the header has ${n}`,
      });
      bad = true;
    } else {
      for (let ci = 0; ci < n; ci++) {
        const k = this.kinds[ci];
        const text = cells[ci];
        const col = this.columns[ci];
        const at = (message: string) => {
          this.#problem({ file: this.file, line, col: cols?.[ci] ?? ci + 1, row: ri, message });
          bad = true;
        };
        if (k.type === "quantity" || k.type === "number") {
          const x = readNumber(text);
          if (x === undefined) {
            at(
              `column ${col.name}: ${shortValue(text)} is not a number${
                k.unit ? ` (in ${k.unit})` : ""
              }`,
            );
            this.#parsed[ci] = NaN;
            continue;
          }
          if (k.type === "number" && k.inferred && numberWouldChange(text)) {
            // Met after the rows the column's kind was read from: never silently changed.
            at(
              `column ${col.name}: "${text}" would lose its digits as a number; declare the column as ${col.name} [text] to keep identifiers as written`,
            );
            this.#parsed[ci] = NaN;
            continue;
          }
          const rule = REFRACTION_COLUMNS[col.name.toLowerCase()];
          if (rule && k.type === "quantity" && k.unit === rule.unit && !Number.isNaN(x)) {
            if (x < rule.range[0] || x > rule.range[1]) {
              at(
                `column ${col.name}: ${text} ${k.unit} is outside the accepted range ${
                  rule.range[0]
                } to ${rule.range[1]} ${k.unit}`,
              );
            }
          }
          this.#parsed[ci] = x;
        } else if (k.type === "value") {
          const t = getValueType(k.name)!;
          try {
            this.#parsed[ci] = text === "" ? null : t.fromText ? t.fromText(text) : text;
          } catch (e) {
            at(`column ${col.name}: ${(e as Error).message}`);
          }
        } else this.#parsed[ci] = text;
      }
    }
    if (bad) {
      this.badRows++;
      if (this.#badRowNumbers.length < 20) this.#badRowNumbers.push(ri + 1);
      return false;
    }
    this.#normaliseCylinder(ri);
    for (let ci = 0; ci < n; ci++) {
      const b = this.#nums[ci];
      if (b) b.push(this.#parsed[ci] as number);
      else this.#vals[ci]!.push(this.#parsed[ci]);
    }
    return true;
  }

  #normaliseCylinder(ri: number): void {
    if (this.#cyl < 0) return;
    const c = this.#parsed[this.#cyl] as number;
    if (!(c !== 0 && Number.isFinite(c))) return;
    const sign = Math.sign(c);
    if (this.#cylSign === 0) {
      this.#cylSign = sign;
      this.#cylSignRow = ri + 1;
      return;
    }
    if (sign === this.#cylSign || this.#sph < 0 || this.#axis < 0) return;
    const t = transpose({
      sphere: this.#parsed[this.#sph] as number,
      cylinder: c,
      axis: this.#parsed[this.#axis] as number,
    });
    this.#parsed[this.#sph] = t.sphere;
    this.#parsed[this.#cyl] = t.cylinder;
    this.#parsed[this.#axis] = t.axis;
    this.transposed++;
    if (this.#transposedRows.length < 10) this.#transposedRows.push(ri + 1);
  }

  /** Rows held and not yet taken. */
  get pending(): number {
    const b = this.#nums.find((x) => x);
    return b ? b.length : (this.#vals.find((x) => x)?.length ?? 0);
  }

  /** Take the good rows held so far as columns (and start a new chunk). */
  take(): Column[] {
    return this.columns.map((c, ci) => {
      const k = this.kinds[ci];
      const b = this.#nums[ci];
      if (b) {
        const data = b.take();
        return k.type === "quantity"
          ? new Column(c.name, "quantity", k.unit, data)
          : new Column(c.name, "number", (k as { unit: string }).unit, data);
      }
      const vals = this.#vals[ci]!;
      this.#vals[ci] = [];
      return new Column(c.name, k.type === "value" ? k.name : "text", "", vals);
    });
  }

  /** Notes on what was accepted and changed, positioned at `where`. */
  notes(
    tableName: string,
    where: { file: string; line: number; col: number },
    withBadRows = true,
  ): TableProblem[] {
    const out: TableProblem[] = [];
    if (this.transposed) {
      const cyl = this.columns[this.#cyl].name;
      const form = this.#cylSign < 0 ? "minus" : "plus";
      const other = this.#cylSign < 0 ? "plus" : "minus";
      const rows = this.#transposedRows.join(", ") + (this.transposed > 10 ? ", …" : "");
      out.push({
        ...where,
        message:
          `table ${tableName}: column ${cyl} mixes cylinder signs; ${this.transposed} row${
            this.transposed === 1 ? "" : "s"
          } in ${other}-cylinder form (row ${rows}) ${
            this.transposed === 1 ? "was" : "were"
          } transposed to ${form}-cylinder form, ` +
          `the form of row ${this.#cylSignRow} (the same lenses)`,
      });
    }
    if (this.badRows && withBadRows) {
      const rows = this.#badRowNumbers.join(", ") + (this.badRows > 20 ? ", …" : "");
      out.push({
        ...where,
        message: `table ${tableName}: ${this.badRows} bad row${
          this.badRows === 1 ? "" : "s"
        } (row ${rows}) of ${this.rowsSeen}`,
      });
    }
    return out;
  }
}

/** How many row numbers a collapsed problem lists. */
const ROWS_LISTED = 5;

/**
 * Row problems of one kind (the same message, column included, but for the cell's text and numbers)
 * collapsed into one, at the first row's position, with the count and the first rows:
 * a file with a thousand bad cells reads as one line per kind of problem.
 *
 * @example
 * ```ts
 * import { collapseRowProblems } from "./_tables.ts";
 * const p = (row: number) => ({ file: "a.csv", line: row + 2, col: 1, row, message: `column va: "x${row}" is not a number` });
 * collapseRowProblems([p(0), p(1), p(2)])[0].message; // 'column va: "x0" is not a number (3 rows with this problem, the first rows 1, 2, 3)'
 * ```
 */
export function collapseRowProblems(problems: readonly TableProblem[]): TableProblem[] {
  // Messages name their column, so the kind is the message with the cell's own text blanked.
  const kindOf = (p: TableProblem) =>
    p.message.replace(/"[^"]*"/g, '""').replace(/[-+]?\d+(?:\.\d+)?/g, "#");
  const groups = new Map<string, TableProblem[]>();
  const out: (TableProblem | string)[] = [];
  for (const p of problems) {
    if (p.row === undefined) {
      out.push(p);
      continue;
    }
    const k = kindOf(p);
    const g = groups.get(k);
    if (g) g.push(p);
    else {
      groups.set(k, [p]);
      out.push(k);
    }
  }
  return out.map((x) => {
    if (typeof x !== "string") return x;
    const g = groups.get(x)!;
    if (g.length === 1) return g[0];
    const rows = g.slice(0, ROWS_LISTED).map((p) => p.row! + 1).join(", ");
    return {
      ...g[0],
      message: `${g[0].message} (${g.length} rows with this problem, the first rows ${rows})`,
    };
  });
}

function finish(
  name: string,
  builder: TableBuilder,
  headerProblems: TableProblem[],
  skipBad: boolean,
  where: { file: string; line: number; col: number },
  extra: { file?: string },
): BuiltTable {
  const problems = [...headerProblems, ...collapseRowProblems(builder.problems)];
  const notes = builder.notes(name, where, skipBad);
  if (headerProblems.length || (builder.badRows && !skipBad)) {
    return { problems, notes, excluded: 0 };
  }
  const value = makeTable(name, builder.take(), { excluded: builder.badRows, file: extra.file });
  return { value, problems, notes, excluded: builder.badRows };
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
  extra: { file?: string; where?: { file: string; line: number; col: number } } = {},
): BuiltTable {
  const { kinds, problems } = resolveKinds(
    raw.columns,
    raw.rows.map((r) => r.cells),
    lang,
    raw.file,
    raw.headerLine,
  );
  const builder = new TableBuilder(raw.columns, kinds, raw.file, Infinity);
  for (const r of raw.rows) {
    if (r.bad) builder.addBad(r.line, r.bad);
    else builder.add(r.cells, r.line, r.cols);
  }
  const where = extra.where ?? { file: raw.file, line: raw.headerLine, col: 1 };
  return finish(name, builder, problems, skipBad, where, extra);
}

/** Whether a table file path is a plain path beside the notebook. */
function plainPath(path: string): boolean {
  return !(path.includes("..") || path.startsWith("/") || /^[A-Za-z]:/.test(path));
}

/**
 * Column definitions from a CSV header line: `name [spec]` cells, with the table block's
 * declared columns overriding specs by name. Declared columns missing from the file are
 * problems.
 */
export function csvColumns(
  header: readonly string[],
  block: TableBlock,
  notebookFile: string,
  path: string,
): { columns: ColumnDef[]; problems: TableProblem[] } {
  const declared = new Map(block.columns.map((c) => [c.name, c]));
  const problems: TableProblem[] = [];
  const columns: ColumnDef[] = header.map((h, i) => {
    const m = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[([^\]]*)\])?\s*$/.exec(h);
    if (!m) {
      const sep = header.length === 1 ? [";", "\t", "|"].find((c) => h.includes(c)) : undefined;
      problems.push({
        file: path,
        line: 1,
        col: i + 1,
        message: sep
          ? `the header is one field "${h.slice(0, 60)}": the file seems separated by ${
            sep === "\t" ? "tabs" : `"${sep}"`
          }, and a table file is read as comma-separated values`
          : `header cell "${h}" should be a name, optionally with [unit] (letters, digits, _)`,
      });
    }
    const name = m ? m[1] : h.trim() || `column${i + 1}`;
    const spec = declared.get(name)?.spec ?? (m?.[2] ?? "").trim();
    return { name, spec, col: i + 1 };
  });
  const names = new Set(columns.map((c) => c.name));
  for (const d of block.columns) {
    if (!names.has(d.name)) {
      problems.push({
        file: notebookFile,
        line: block.headerLine,
        col: d.col,
        message: `column ${d.name} is declared but ${path} has no such column (its header has: ${
          [...names].join(", ")
        })`,
      });
    }
  }
  return { columns, problems };
}

/** A value from a file, shortened for a message when it is long. */
function shortValue(text: string): string {
  const t = text.length > 60
    ? `${text.slice(0, 40)}…" (${countText(text.length)} characters)`
    : `${text}"`;
  return `"${t}`;
}

/**
 * The line on which the quoted field still open at the end of `text` opened, or undefined.
 *
 * @example
 * ```ts
 * import { unclosedQuoteLine } from "./_tables.ts";
 * unclosedQuoteLine('a,b\n1,2\n"3,4\n5,6\n'); // 3
 * ```
 */
export function unclosedQuoteLine(text: string): number | undefined {
  let line = 1;
  let open: number | undefined;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === "\n") line++;
    else if (c === '"') open = open === undefined ? line : undefined;
  }
  return open;
}

/**
 * A csv-parse error in words: where (a never-closed quote where it opens, when `opensAt`
 * is known), which field (counted from 1), and a long value shortened, once.
 */
function csvError(path: string, e: unknown, opensAt?: number): TableProblem {
  const err = e as Error & { lines?: number; code?: string };
  let line = err.lines ?? 1;
  let why: string;
  const opening = /field (\d+) at line (\d+), value is "([\s\S]*)"$/.exec(err.message);
  const closing = /got "([\s\S]*?)" at line (\d+)/.exec(err.message);
  if (err.code === "CSV_QUOTE_NOT_CLOSED") {
    line = opensAt ?? line;
    why = opensAt !== undefined
      ? `a quoted field is never closed: it opens on line ${opensAt} and the file ends inside quotes`
      : "a quoted field is never closed (the file ends inside quotes)";
  } else if (err.code === "INVALID_OPENING_QUOTE" && opening) {
    line = Number(opening[2]);
    why = `a quote inside field ${Number(opening[1]) + 1} of line ${line} (after ${
      shortValue(opening[3])
    }); quote the whole field and write a quote inside it twice ("")`;
  } else if (err.code === "CSV_INVALID_CLOSING_QUOTE" && closing) {
    line = Number(closing[2]);
    why = `a quoted field on line ${line} is followed by ${
      shortValue(closing[1])
    } before the next comma; quote the whole field and write a quote inside it twice ("")`;
  } else {
    why = err.message
      .replace(/^Invalid Record Length: |^Quote Not Closed: /, "")
      .replace(/field (\d+)/g, (_, n) => `field ${Number(n) + 1}`)
      .replace(/"([^"]{61,})"/g, (_, v) => shortValue(v));
  }
  return { file: path, line, col: 1, message: `CSV cannot be read: ${why}` };
}

/** csv-parse options for a table: with `bad rows: skip`, a record it cannot read is skipped. */
function csvOptions(
  skipBad: boolean,
  skipped: { line: number; message: string; code?: string }[],
  path: string,
): typeof CSV_OPTIONS {
  if (!skipBad) return CSV_OPTIONS;
  return {
    ...CSV_OPTIONS,
    skip_records_with_error: true,
    on_skip: (e: (Error & { lines?: number; code?: string }) | undefined) => {
      if (!e) return;
      const p = csvError(path, e);
      skipped.push({ line: p.line, message: p.message, code: e.code });
    },
  } as typeof CSV_OPTIONS;
}

type ParsedRecord = { record: string[]; info: { lines: number } };

/**
 * Parse a whole CSV text, skipping each record that cannot be read (`bad rows: skip`): the
 * reader starts again on the line after it, so a misplaced quote costs one row, not the
 * rest of the file. A quote never closed still fails (everything after it is inside it).
 */
function parseSkipping(
  text: string,
  path: string,
  skipped: { line: number; message: string; code?: string }[],
): ParsedRecord[] {
  const out: ParsedRecord[] = [];
  let base = 0; // lines before the part being read
  let offset = 0;
  for (let attempt = 0; attempt <= 1000; attempt++) {
    const rest = text.slice(offset);
    try {
      const part = parseCsv(rest, CSV_OPTIONS) as unknown as ParsedRecord[];
      for (const r of part) out.push({ record: r.record, info: { lines: r.info.lines + base } });
      return out;
    } catch (e) {
      const err = e as Error & { code?: string; lines?: number };
      if (err.code === "CSV_QUOTE_NOT_CLOSED" || attempt === 1000) {
        const opens = unclosedQuoteLine(rest);
        throw Object.assign(err, {
          lines: (err.lines ?? 1) + base,
          opensAt: opens === undefined ? undefined : opens + base,
        });
      }
      const p = csvError(path, err);
      const at = p.line; // within `rest`
      skipped.push({
        line: at + base,
        message: p.message.replace(/line (\d+)/g, (_, n) => `line ${Number(n) + base}`),
        code: err.code,
      });
      // The records before the bad one are read again up to it; reading restarts after it.
      try {
        const good = parseCsv(
          rest.slice(0, lineStart(rest, at)),
          CSV_OPTIONS,
        ) as unknown as ParsedRecord[];
        for (const r of good) out.push({ record: r.record, info: { lines: r.info.lines + base } });
      } catch {
        // A part before the bad record that is itself unreadable goes with it.
      }
      offset += lineStart(rest, at + 1);
      base += at;
      if (offset >= text.length) return out;
    }
  }
  return out;
}

/** Offset of the start of 1-based line `no` in `text` (its length when there is none). */
function lineStart(text: string, no: number): number {
  let at = 0;
  for (let i = 1; i < no; i++) {
    const nl = text.indexOf("\n", at);
    if (nl === -1) return text.length;
    at = nl + 1;
  }
  return at;
}

function skipsBad(block: TableBlock): boolean {
  return (block.options["bad rows"]?.value ?? "stop").toLowerCase() === "skip";
}

/** The `file:` option of a block checked, or a problem. */
function tableFile(
  block: TableBlock,
  notebookFile: string,
): { path?: string; problem?: TableProblem } {
  const fileOpt = block.options.file!;
  const path = fileOpt.value;
  if (!plainPath(path)) {
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
  return { path };
}

function unreadable(block: TableBlock, notebookFile: string, path: string, e: unknown) {
  const fileOpt = block.options.file!;
  const why = e instanceof Deno.errors.NotFound ? "no such file" : (e as Error).message;
  return {
    file: notebookFile,
    line: fileOpt.line,
    col: fileOpt.col,
    message: `cannot read table file "${path}": ${why}`,
  };
}

/** csv-parse options shared by the whole-file and the streamed readers (RFC 4180 and BOM). */
const CSV_OPTIONS = {
  info: true,
  relax_column_count: true,
  skip_empty_lines: true,
  bom: true,
  trim: true,
} as const;

/**
 * Read the raw text of a table block: inline rows, or a CSV file named by `file:`.
 * Header conventions in a CSV are the same as inline: `sph [D],cyl [D],axis [deg]`.
 * Columns declared in the block override the CSV header's specs by name.
 */
export function readRawTable(
  block: TableBlock,
  notebookFile: string,
  host: TableHost,
): { raw?: RawTable; problem?: TableProblem; problems?: TableProblem[] } {
  if (!block.options.file) {
    return {
      raw: {
        columns: block.columns.map((c) => ({ ...c })),
        rows: block.rows.map((r) => ({ cells: r.cells, line: r.line, cols: r.cols })),
        file: notebookFile,
        headerLine: block.headerLine,
      },
    };
  }
  const { path, problem } = tableFile(block, notebookFile);
  if (problem) return { problem };
  let text: string;
  try {
    text = host.readText(path!);
  } catch (e) {
    return { problem: unreadable(block, notebookFile, path!, e) };
  }
  let records: { record: string[]; info: { lines: number } }[];
  const skipped: { line: number; message: string; code?: string }[] = [];
  try {
    records = skipsBad(block)
      ? parseSkipping(text, path!, skipped)
      : parseCsv(text, CSV_OPTIONS) as unknown as ParsedRecord[];
  } catch (e) {
    const opensAt = (e as { opensAt?: number }).opensAt ?? unclosedQuoteLine(text);
    return { problem: csvError(path!, e, opensAt) };
  }
  if (!records.length) return { problem: emptyCsv(path!, text) };
  const { columns, problems } = csvColumns(records[0].record, block, notebookFile, path!);
  if (problems.length) return { problem: problems[0], problems };
  const rows: RawTable["rows"][number][] = records.slice(1).map((r) => ({
    cells: r.record,
    line: r.info.lines,
    cols: r.record.map((_, i) => i + 1),
  }));
  if (skipped.length) {
    for (const s of skipped) rows.push({ cells: [], line: s.line, cols: [], bad: s.message });
    rows.sort((a, b) => a.line - b.line);
  }
  return { raw: { columns, rows, file: path!, headerLine: 1 } };
}

/** The problem of a CSV file with no header line: empty, blank lines only, or unreadable. */
function emptyCsv(path: string, text?: string): TableProblem {
  const message = text !== undefined && text.length > 0
    ? "CSV file has only blank lines (expected a header line)"
    : "CSV file is empty (expected a header line)";
  return { file: path, line: 1, col: 1, message };
}

/** One CSV record with the line it ends on. */
export interface CsvRecord {
  /** Fields, trimmed. */
  readonly cells: string[];
  /** 1-based line where the record ends. */
  readonly line: number;
  /** Why the record could not be read (skipped with `bad rows: skip`). */
  readonly bad?: string;
}

/**
 * Stream the records of CSV bytes through csv-parse, in batches (bounded memory).
 * Throws a {@linkcode TableProblem}-shaped error object on a CSV that cannot be read.
 *
 * @example
 * ```ts ignore
 * for await (const batch of csvBatches(Deno.open("a.csv").readable, "a.csv")) console.log(batch.length);
 * ```
 */
export async function* csvBatches(
  source: AsyncIterable<Uint8Array>,
  path: string,
  batchSize = 4096,
  skipBad = false,
): AsyncGenerator<CsvRecord[]> {
  // The streaming parser (and the Node streams under it) loads only when a file streams.
  const { parse: parseCsvStream } = await import("csv-parse");
  const skipped: { line: number; message: string; code?: string }[] = [];
  const parser = parseCsvStream(csvOptions(skipBad, skipped, path));
  // Lines and quotes are followed as the bytes pass, so a quote never closed is reported
  // on the line where it opened.
  let line = 1;
  let opened: number | undefined;
  const pump = (async () => {
    try {
      for await (const chunk of source) {
        if (parser.destroyed) break;
        for (let i = 0; i < chunk.length; i++) {
          const b = chunk[i];
          if (b === 0x0a) line++;
          else if (b === 0x22) opened = opened === undefined ? line : undefined;
        }
        if (!parser.write(chunk)) {
          await new Promise<void>((r) => {
            if (parser.destroyed) return r();
            const done = () => {
              parser.off("drain", done);
              parser.off("close", done);
              r();
            };
            parser.on("drain", done);
            parser.on("close", done);
          });
        }
      }
      if (!parser.destroyed) parser.end();
    } catch (e) {
      parser.destroy(e as Error);
    }
  })();
  let batch: CsvRecord[] = [];
  try {
    for await (const r of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      while (skipped.length) {
        const s = skipped.shift()!;
        if (s.code === "CSV_QUOTE_NOT_CLOSED") {
          throw Object.assign(new Error(""), s, { lines: s.line });
        }
        batch.push({ cells: [], line: s.line, bad: s.message });
      }
      batch.push({ cells: r.record, line: r.info.lines });
      if (batch.length >= batchSize) {
        yield batch;
        batch = [];
      }
    }
    for (const s of skipped) {
      if (s.code === "CSV_QUOTE_NOT_CLOSED") {
        throw Object.assign(new Error(""), s, { lines: s.line });
      }
      batch.push({ cells: [], line: s.line, bad: s.message });
    }
  } catch (e) {
    throw new CsvReadError(csvError(path, e, opened));
  } finally {
    if (!parser.writableEnded) parser.destroy();
    await pump;
  }
  if (batch.length) yield batch;
}

/** A CSV file that cannot be read past a point (e.g. it ends inside quotes). */
export class CsvReadError extends Error {
  /** @param problem where and why. */
  constructor(readonly problem: TableProblem) {
    super(problem.message);
    this.name = "CsvReadError";
  }
}

/** What a streamed CSV table looks like before its rows: header, kinds, and a builder. */
export interface CsvTableStart {
  /** Header columns. */
  readonly columns: ColumnDef[];
  /** The builder rows go into. */
  readonly builder: TableBuilder;
  /** Header problems (the table cannot be used when there are any). */
  readonly problems: TableProblem[];
}

/**
 * Open a CSV table block for streaming: reads the header and the first batch (to infer
 * the kind of columns without a bracket), and returns the builder holding that batch and
 * an iterator over the rest.
 */
export async function openCsvTable(
  block: TableBlock,
  notebookFile: string,
  source: AsyncIterable<Uint8Array>,
  lang: Language,
  batchSize = 4096,
): Promise<
  { start: CsvTableStart; rest: AsyncIterator<CsvRecord[]>; path: string } | {
    problem: TableProblem;
  }
> {
  const path = block.options.file!.value;
  let lastBytes = 0;
  const counted = (async function* () {
    for await (const chunk of source) {
      lastBytes += chunk.length;
      yield chunk;
    }
  })();
  const it = csvBatches(counted, path, batchSize, skipsBad(block))[Symbol.asyncIterator]();
  let first: CsvRecord[] = [];
  try {
    const r = await it.next();
    if (!r.done) first = r.value;
  } catch (e) {
    if (e instanceof CsvReadError) return { problem: e.problem };
    throw e;
  }
  if (!first.length) return { problem: emptyCsv(path, lastBytes > 0 ? " " : "") };
  return { start: startFromRecords(block, notebookFile, first, lang, path), rest: it, path };
}

/** The header, kinds and builder of a CSV table from its first records (header first). */
function startFromRecords(
  block: TableBlock,
  notebookFile: string,
  first: readonly CsvRecord[],
  lang: Language,
  path: string,
): CsvTableStart {
  const header = csvColumns(first[0].cells, block, notebookFile, path);
  const rows = first.slice(1);
  const { kinds, problems } = resolveKinds(
    header.columns,
    rows.map((r) => r.cells),
    lang,
    path,
    1,
  );
  const builder = new TableBuilder(header.columns, kinds, path);
  const all = [...header.problems, ...problems];
  if (!all.length) {
    for (const r of rows) {
      if (r.bad) builder.addBad(r.line, r.bad);
      else builder.add(r.cells, r.line);
    }
  }
  return { columns: header.columns, builder, problems: all };
}

/** Bytes read at most by {@linkcode readCsvHead}. */
const HEAD_BYTES = 1024 * 1024;

/**
 * The start of a CSV table ({@linkcode openCsvTable}'s, for the same first `rows` rows) read
 * from the head of the file alone, without the streaming parser: for a caller that needs
 * only the header and the kinds. Undefined when the head cannot say for certain (a table
 * that skips bad rows, a record across the cut, fewer rows than asked in a longer file, any
 * reading problem): the caller then opens the table as a stream.
 *
 * @example
 * ```ts ignore
 * const start = readCsvHead(block, "study.lentil.md", "/data/eyes.csv", getLanguage(), 64);
 * ```
 */
export function readCsvHead(
  block: TableBlock,
  notebookFile: string,
  fullPath: string,
  lang: Language,
  rows: number,
): CsvTableStart | undefined {
  if (skipsBad(block)) return undefined;
  let head: Uint8Array;
  let whole: boolean;
  try {
    const file = Deno.openSync(fullPath, { read: true });
    try {
      const size = file.statSync().size;
      head = new Uint8Array(Math.min(size, HEAD_BYTES));
      let got = 0;
      while (got < head.length) {
        const n = file.readSync(head.subarray(got));
        if (n === null || n === 0) break;
        got += n;
      }
      head = head.subarray(0, got);
      whole = got >= size;
    } finally {
      file.close();
    }
  } catch {
    return undefined;
  }
  // Whole lines only: a record is never cut (a quoted line break across the cut fails below).
  const end = whole ? head.length : head.lastIndexOf(0x0a) + 1;
  if (end <= 0) return undefined;
  let records: { record: string[]; info: { lines: number } }[];
  try {
    const text = new TextDecoder().decode(head.subarray(0, end));
    records = parseCsv(text, { ...CSV_OPTIONS, to: rows + 1 }) as unknown as typeof records;
  } catch {
    return undefined;
  }
  if (!records.length || (records.length < rows + 1 && !whole)) return undefined;
  const first = records.map((r) => ({ cells: r.record, line: r.info.lines }));
  return startFromRecords(block, notebookFile, first, lang, block.options.file!.value);
}

/**
 * Read a CSV table block fully by streaming (for `Notebook.load`): the file is never held
 * as text, rows go straight into typed column arrays.
 */
export async function readCsvTableStreamed(
  block: TableBlock,
  notebookFile: string,
  host: TableHost,
  lang: Language,
): Promise<{ columns: ColumnDef[]; built?: BuiltTable; problem?: TableProblem }> {
  const { path, problem } = tableFile(block, notebookFile);
  if (problem) return { columns: [], problem };
  let source: AsyncIterable<Uint8Array>;
  try {
    source = host.open!(path!);
  } catch (e) {
    return { columns: [], problem: unreadable(block, notebookFile, path!, e) };
  }
  let opened;
  try {
    opened = await openCsvTable(block, notebookFile, source, lang);
  } catch (e) {
    return { columns: [], problem: unreadable(block, notebookFile, path!, e) };
  }
  if ("problem" in opened) return { columns: [], problem: opened.problem };
  const { start, rest } = opened;
  if (start.problems.length) {
    return { columns: start.columns, problem: start.problems[0] };
  }
  try {
    for (let r = await rest.next(); !r.done; r = await rest.next()) {
      for (const rec of r.value) {
        if (rec.bad) start.builder.addBad(rec.line, rec.bad);
        else start.builder.add(rec.cells, rec.line);
      }
    }
  } catch (e) {
    if (e instanceof CsvReadError) return { columns: start.columns, problem: e.problem };
    throw e;
  }
  const skip = (block.options["bad rows"]?.value ?? "stop").toLowerCase() === "skip";
  const where = { file: notebookFile, line: block.line, col: block.col };
  const built = finish(block.name, start.builder, [], skip, where, { file: path });
  return { columns: start.columns, built };
}
