/**
 * A `file:` table of CSV or Parquet worked inside the embedded DuckDB: the file is read and
 * checked there (the same bad-row rules as the in-process reader: numbers as the trade
 * writes them, refraction ranges, ragged rows, the cylinder form of the first cylinder met),
 * the computed columns and the statistics run as one SQL query over it, and only the
 * statistics' totals, the row counts and the first problems come back.
 *
 * @module
 */

import { extname, join } from "node:path";
import type { Language } from "../../cells/language.ts";
import type { TableBlock } from "../format/parse.ts";
import type { ColumnShape } from "../engine/_columns.ts";
import {
  type ColumnKind,
  columnKind,
  csvColumns,
  openCsvTable,
  readCsvHead,
  REFRACTION_COLUMNS,
  type TableProblem,
} from "../engine/_tables.ts";
import { quoteName } from "../sql/_names.ts";
import { sqlNumber } from "../sql/statements.ts";
import { momentsFromRow, planTableWork, statisticTotals, type TableWork } from "../sql/work.ts";
import type { NotebookDoc } from "../format/parse.ts";
import type { DuckConnection } from "./_open.ts";
import type { ProgressListener } from "../progress.ts";

/** What DuckDB gave back for a table. */
export interface DuckTableResult {
  /** The work that ran. */
  readonly work: TableWork;
  /** Data rows read (good and bad). */
  readonly rowsRead: number;
  /** Rows kept. */
  readonly rowsKept: number;
  /** Bad rows (excluded with `bad rows: skip`). */
  readonly excluded: number;
  /** The first problems (bad rows), positioned. */
  readonly problems: readonly TableProblem[];
  /** Notes: excluded rows, transposed rows. */
  readonly notes: readonly string[];
  /** Running moments of each statistic cell, by cell name. */
  readonly moments: ReadonlyMap<string, ReturnType<typeof momentsFromRow>[]>;
  /** Input columns with their kinds. */
  readonly kinds: readonly { name: string; kind: ColumnKind }[];
}

/** A table that cannot be worked in DuckDB as a whole (the notebook falls back, or fails). */
export class DuckTableError extends Error {
  /** @param problem where and why; @param fallback true when the in-process path can run it. */
  constructor(readonly problem: TableProblem, readonly fallback = false) {
    super(problem.message);
    this.name = "DuckTableError";
  }
}

/** Whether a table file is Parquet (by its extension). */
export function isParquet(path: string): boolean {
  return /^\.(parquet|parq|pq)$/i.test(extname(path));
}

const NUMERIC_TYPES =
  /^(DOUBLE|FLOAT|REAL|DECIMAL.*|TINYINT|SMALLINT|INTEGER|BIGINT|HUGEINT|UTINYINT|USMALLINT|UINTEGER|UBIGINT)$/;

/** Header columns and kinds of a CSV table, read by the in-process reader (first rows only). */
async function csvHeader(
  block: TableBlock,
  notebookFile: string,
  path: string,
  lang: Language,
): Promise<{ names: string[]; kinds: ColumnKind[] }> {
  // A few records give the header; columns without a unit or type are then inferred from as
  // many first rows as the in-process reader looks at.
  const open = async (batch?: number) => {
    const file = await Deno.open(path);
    const o = await openCsvTable(block, notebookFile, file.readable, lang, batch);
    if ("problem" in o) throw new DuckTableError(o.problem);
    await o.rest.return?.();
    return o;
  };
  // The head of the file is read directly when it can answer; the stream otherwise.
  const startOf = async (rows: number) =>
    readCsvHead(block, notebookFile, path, lang, rows) ?? (await open(rows)).start;
  let start = await startOf(64);
  if (start.columns.some((c) => c.spec === "")) start = await startOf(4096);
  if (start.problems.length) throw new DuckTableError(start.problems[0]);
  return {
    names: start.columns.map((c) => c.name),
    kinds: [...start.builder.kinds],
  };
}

/** Header columns and kinds of a Parquet table: names by the header convention, types checked. */
async function parquetHeader(
  db: DuckConnection,
  block: TableBlock,
  notebookFile: string,
  path: string,
  rel: string,
  lang: Language,
): Promise<{ names: string[]; kinds: ColumnKind[]; sources: string[] }> {
  const described = await db.rows("DESCRIBE SELECT * FROM read_parquet($1)", [path]);
  const header = described.map((d) => String(d.column_name));
  const { columns, problems } = csvColumns(header, block, notebookFile, rel);
  if (problems.length) throw new DuckTableError(problems[0]);
  const kinds = columns.map((c, i): ColumnKind => {
    const type = String(described[i].column_type);
    const numeric = NUMERIC_TYPES.test(type);
    const k = columnKind(c.spec, lang);
    if (typeof k === "string") {
      throw new DuckTableError({
        file: rel,
        line: 1,
        col: i + 1,
        message: `column ${c.name}: ${k}`,
      });
    }
    if (k.type === "infer") {
      const rule = REFRACTION_COLUMNS[c.name.toLowerCase()];
      if (rule) {
        throw new DuckTableError({
          file: rel,
          line: 1,
          col: i + 1,
          message:
            `column ${c.name}: a refraction column needs its unit: name it "${c.name} [${rule.unit}]" in the Parquet file, or declare it in the table block`,
        });
      }
      return numeric ? { type: "number", unit: "" } : { type: "text" };
    }
    if ((k.type === "quantity" || k.type === "number") && !numeric) {
      throw new DuckTableError({
        file: rel,
        line: 1,
        col: i + 1,
        message:
          `column ${c.name}: the Parquet file stores ${type} values, the notebook expects numbers${
            k.unit ? ` in ${k.unit}` : ""
          }`,
      });
    }
    if (k.type === "value") {
      throw new DuckTableError({
        file: rel,
        line: 1,
        col: i + 1,
        message: `column ${c.name}: [${k.name}] columns are read in-process`,
      }, true);
    }
    return k;
  });
  return { names: columns.map((c) => c.name), kinds, sources: header };
}

/**
 * The input columns of a `file:` table (names, types, units) from its header, by the same
 * rules as the readers: a CSV's first rows are read in-process; a Parquet file's schema is
 * read through DuckDB (loaded only then).
 *
 * @example
 * ```ts ignore
 * const inputs = await tableInputs(doc.tables[0], "study.lentil.md", ".", lang);
 * ```
 * @throws {DuckTableError} when the header cannot be read.
 */
export async function tableInputs(
  block: TableBlock,
  notebookFile: string,
  folder: string,
  lang: Language,
): Promise<ColumnShape[]> {
  const rel = block.options.file!.value;
  const path = join(folder, rel);
  let header: { names: string[]; kinds: ColumnKind[] };
  try {
    if (isParquet(rel)) {
      const { openDuck } = await import("./_open.ts");
      const db = await openDuck(folder);
      try {
        header = await parquetHeader(db, block, notebookFile, path, rel, lang);
      } finally {
        db.close();
      }
    } else header = await csvHeader(block, notebookFile, path, lang);
  } catch (e) {
    if (e instanceof DuckTableError) throw e;
    const why = e instanceof Deno.errors.NotFound ? "no such file" : (e as Error).message;
    throw new DuckTableError({
      file: notebookFile,
      line: block.options.file!.line,
      col: block.options.file!.col,
      message: `cannot read table file "${rel}": ${why}`,
    });
  }
  return shapesOf(header.names, header.kinds);
}

function shapesOf(names: readonly string[], kinds: readonly ColumnKind[]): ColumnShape[] {
  return names.map((name, i) => {
    const k = kinds[i];
    const numeric = k.type === "quantity" || k.type === "number";
    return {
      name,
      type: numeric ? k.type : k.type === "value" ? k.name : "text",
      unit: numeric ? (k as { unit: string }).unit : "",
      numeric,
    };
  });
}

/**
 * Work a table block's file in DuckDB: plan the notebook's table work, read and check the
 * file, run every statistic in one scan. Paths are bound as parameters, names are quoted, and
 * numbers are written from numbers, never copied from the notebook's text.
 *
 * @example
 * ```ts ignore
 * const db = await openDuck(".");
 * const r = await workTableInDuck(db, doc, doc.tables[0], "study.lentil.md", ".", lang);
 * ```
 * @throws {DuckTableError} when the file cannot be read, or the work is not all in SQL
 * (`fallback` true: the in-process path can run it).
 */
export async function workTableInDuck(
  db: DuckConnection,
  doc: NotebookDoc,
  block: TableBlock,
  notebookFile: string,
  folder: string,
  lang: Language,
  onProgress?: ProgressListener,
): Promise<DuckTableResult> {
  const rel = block.options.file!.value;
  const path = join(folder, rel);
  const skip = (block.options["bad rows"]?.value ?? "stop").toLowerCase() === "skip";
  const parquet = isParquet(rel);
  const header = await readHeader(db, block, notebookFile, path, lang);
  const { names, kinds } = header;
  if (kinds.some((k) => k.type === "value")) {
    throw new DuckTableError(at(rel, "a column of values (such as [rx]) is read in-process"), true);
  }
  const inputs: ColumnShape[] = shapesOf(names, kinds);
  const params: (string | number)[] = [path];
  // A finite number is written from its value, so DuckDB folds the constants of a formula
  // (about 15% of a 10M-row scan when they were parameters); others are bound.
  const value = (x: number) => {
    if (Number.isFinite(x)) return sqlNumber(x);
    params.push(x);
    return `CAST($${params.length} AS DOUBLE)`;
  };
  const work = planTableWork(doc, block, inputs, lang, value);
  if (typeof work === "string") throw new DuckTableError(at(rel, work), true);
  const read: DuckRead = { db, rel, parquet, names, kinds, params, value };
  const rows = rowQuery(read, header.sources);
  const cylinder = await cylinderForm(read, rows.rowSource);
  const scan = scanQuery(work, cylinder.ordered, rows.rowSource);
  const [row] = await run(db, scan.main, params, rel, (fraction, rows) => {
    if (!onProgress) return;
    onProgress({
      table: block.name,
      file: rel,
      rows,
      fraction: fraction >= 0 ? fraction : undefined,
    });
  });
  onProgress?.({
    table: block.name,
    file: rel,
    rows: Number(row.rows_read),
    fraction: 1,
    done: true,
  });
  const rowsGood = Number(row.rows_read);
  const { rejects, rejected } = await readRejects(read);
  const badChecked = Number(row.bad_rows);
  const excluded = badChecked + rejected;
  const problems = rejectProblems(read, rejects);
  if (badChecked) {
    problems.push(...await badRowProblems(read, rows, rejects));
    problems.sort((a, b) => a.line - b.line);
  }
  const rowsRead = rowsGood + rejected;
  const notes = tableNotes(block.name, names, cylinder, Number(row.turned), {
    excluded,
    rowsRead,
    skip,
  });
  const good = Number(row.rows_read) - badChecked;
  return {
    work,
    rowsRead,
    rowsKept: rowsRead - excluded,
    excluded,
    problems,
    notes,
    moments: momentsOf(work, scan.groupOf, row, good),
    kinds: names.map((name, i) => ({ name, kind: kinds[i] })),
  };
}

/** A problem at the top of the table file. */
function at(rel: string, message: string): TableProblem {
  return { file: rel, line: 1, col: 1, message };
}

/** The table file's header: by the in-process reader for a CSV, its schema for Parquet. */
async function readHeader(
  db: DuckConnection,
  block: TableBlock,
  notebookFile: string,
  path: string,
  lang: Language,
): Promise<{ names: string[]; kinds: ColumnKind[]; sources?: string[] }> {
  const rel = block.options.file!.value;
  try {
    return isParquet(rel)
      ? await parquetHeader(db, block, notebookFile, path, rel, lang)
      : await csvHeader(block, notebookFile, path, lang);
  } catch (e) {
    if (e instanceof DuckTableError) throw e;
    if (e instanceof Deno.errors.NotFound) {
      throw new DuckTableError(at(rel, `cannot read table file "${rel}": no such file`));
    }
    throw new DuckTableError(at(rel, `cannot read table file "${rel}": ${(e as Error).message}`));
  }
}

/**
 * DuckDB's CSV read buffer, bytes. 8 MB instead of its default holds a 10M-row scan's peak
 * memory to about half (232 → 120 MB resident, measured on the bench's generated file) and
 * scans as fast.
 */
const CSV_BUFFER_BYTES = 8 * 1024 * 1024;

/** What every query over one table file shares: its columns and the bound parameters. */
interface DuckRead {
  readonly db: DuckConnection;
  readonly rel: string;
  readonly parquet: boolean;
  readonly names: readonly string[];
  readonly kinds: readonly ColumnKind[];
  /** Parameters bound to every query (`$1` is the file's path). */
  readonly params: (string | number)[];
  /** Binds a number as a further parameter. */
  readonly value: (x: number) => string;
}

/** The file's rows as SQL, with a flag for rows Lentil refuses. */
interface RowQuery {
  /** Per numeric column: true when a cell is not finite or outside its refraction range. */
  readonly flags: string[];
  /** Per numeric column: the cell as text, for the message. */
  readonly cellText: string[];
  /** Indexes of the numeric columns. */
  readonly numericIdx: number[];
  /** The rows as read. */
  readonly rawFrom: string;
  /** The rows checked: numbers, trimmed text and `bad_row`. */
  readonly rowSource: string;
}

/**
 * The file's rows: numbers read by DuckDB's own parser (a cell it cannot read rejects the
 * row, with line and column), text trimmed, flags for cells Lentil refuses (not finite,
 * outside a refraction range).
 */
function rowQuery(read: DuckRead, sources: readonly string[] | undefined): RowQuery {
  const { names, kinds, parquet, value } = read;
  const listed = names.map((n) => `'${quoteName(n).slice(1, -1)}'`).join(", ");
  const types = names.map((n, i) =>
    `'${quoteName(n).slice(1, -1)}': '${
      kinds[i].type === "quantity" || kinds[i].type === "number" ? "DOUBLE" : "VARCHAR"
    }'`
  ).join(", ");
  const reader = parquet
    ? `(SELECT ${
      sources!.map((s, i) => `"${s.replaceAll('"', '""')}" AS ${quoteName(names[i])}`).join(
        ", ",
      )
    } FROM read_parquet($1))`
    : `read_csv($1, header = false, skip = 1, names = [${listed}], types = {${types}}, delim = ',', quote = '"', escape = '"', ignore_errors = true, store_rejects = true, null_padding = false, buffer_size = ${CSV_BUFFER_BYTES})`;
  const flags: string[] = [];
  const cellText: string[] = [];
  const vals: string[] = [];
  names.forEach((n, i) => {
    const q = quoteName(n);
    const k = kinds[i];
    if (k.type === "quantity" || k.type === "number") {
      const v = parquet ? `CAST(${q} AS DOUBLE)` : q;
      vals.push(`${v} AS ${q}`);
      const rule = REFRACTION_COLUMNS[n.toLowerCase()];
      const range = rule && k.type === "quantity" && k.unit === rule.unit
        ? ` OR ${v} < ${value(rule.range[0])} OR ${v} > ${value(rule.range[1])}`
        : "";
      flags.push(`COALESCE((NOT isfinite(${v})${range}), FALSE)`);
      cellText.push(`CAST(${v} AS VARCHAR)`);
    } else vals.push(parquet ? `CAST(${q} AS VARCHAR) AS ${q}` : `TRIM(${q}) AS ${q}`);
  });
  const numericIdx = kinds.map((k, i) => (k.type === "quantity" || k.type === "number") ? i : -1)
    .filter((i) => i >= 0);
  const rawFrom = `(SELECT * FROM ${reader}) AS raw`;
  const rowSource = `(SELECT ${vals.join(", ")}, ${
    flags.length ? flags.join(" OR ") : "false"
  } AS bad_row FROM ${rawFrom}) AS checked`;
  return { flags, cellText, numericIdx, rawFrom, rowSource };
}

/** The cylinder form rows are read in, and the columns with rows of the other form turned. */
interface CylinderForm {
  /** Sign of the first cylinder met (0: none). */
  readonly first: number;
  /** Index of the cylinder column (-1: none). */
  readonly ci: number;
  /** The columns' SQL, transposing rows of the other form (with `turned_row` when so). */
  readonly ordered: string[];
}

/** The cylinder form of the first cylinder met (rows in the other form are transposed). */
async function cylinderForm(read: DuckRead, rowSource: string): Promise<CylinderForm> {
  const { db, names, kinds, params, rel, value } = read;
  const role = (r: string) =>
    names.findIndex((n, i) =>
      REFRACTION_COLUMNS[n.toLowerCase()]?.role === r && kinds[i].type === "quantity"
    );
  const [si, ci, ai] = [role("sph"), role("cyl"), role("axis")];
  let first = 0;
  const ordered: string[] = names.map(quoteName);
  if (ci >= 0) {
    const c = quoteName(names[ci]);
    const r = await run(
      db,
      `SELECT SIGN(${c}) AS s FROM ${rowSource} WHERE NOT bad_row AND ${c} <> 0 AND NOT isinf(${c}) LIMIT 1`,
      params,
      rel,
    );
    first = r.length ? Number(r[0].s) : 0;
    if (first !== 0 && si >= 0 && ai >= 0) {
      const s = quoteName(names[si]);
      const a = quoteName(names[ai]);
      const other = `(SIGN(${c}) = ${value(-first)})`;
      ordered[si] = `CASE WHEN ${other} THEN ${s} + ${c} ELSE ${s} END AS ${s}`;
      ordered[ci] = `CASE WHEN ${other} THEN -${c} ELSE ${c} END AS ${c}`;
      const turned = `CASE WHEN ${a} + ${value(90)} >= ${value(180)} THEN ${a} - ${
        value(90)
      } ELSE ${a} + ${value(90)} END`;
      ordered[ai] = `CASE WHEN ${other} THEN (CASE WHEN ${turned} = ${value(0)} THEN ${
        value(180)
      } ELSE ${turned} END) ELSE ${a} END AS ${a}`;
      ordered.push(`${other} AS turned_row`);
    }
  }
  return { first, ci, ordered };
}

/**
 * One scan: each distinct group of variables observed together is projected once, NULL on
 * bad or incomplete rows, and summarised by aggregates that skip NULLs.
 */
function scanQuery(
  work: TableWork,
  ordered: readonly string[],
  rowSource: string,
): { main: string; groupOf: string[][] } {
  const turnedCol = ordered.some((o) => o.endsWith(" AS turned_row"));
  let from = `(SELECT ${ordered.join(", ")}, bad_row FROM ${rowSource}) AS rows0`;
  for (let s = 1; s <= work.sets; s++) {
    const cols = work.columns.filter((c) => c.set === s);
    from = `(SELECT *, ${
      cols.map((c) => `${c.sql} AS ${quoteName(c.name)}`).join(", ")
    } FROM ${from}) AS rows${s}`;
  }
  const groups = new Map<string, { prefix: string; vars: string[] }>();
  const groupOf: string[][] = [];
  work.statistics.forEach((st) => {
    const sets = st.separate ? st.variables.map((v) => [v]) : [st.variables.slice()];
    groupOf.push(sets.map((vars) => {
      const key = vars.join("\u0000");
      if (!groups.has(key)) groups.set(key, { prefix: `g${groups.size}_`, vars });
      return groups.get(key)!.prefix;
    }));
  });
  const projected: string[] = ["bad_row", ...(turnedCol ? ["turned_row"] : [])];
  const aggregates = [
    "COUNT(*) AS rows_read",
    "COUNT(*) FILTER (WHERE bad_row) AS bad_rows",
    turnedCol ? "COUNT(*) FILTER (WHERE turned_row AND NOT bad_row) AS turned" : "0 AS turned",
  ];
  for (const { prefix, vars } of groups.values()) {
    const complete = vars.length === 1
      ? "TRUE"
      : vars.map((v) => `(${v}) IS NOT NULL`).join(" AND ");
    const names = vars.map((_, k) => `${prefix}v${k}`);
    vars.forEach((v, k) =>
      projected.push(`CASE WHEN NOT bad_row AND ${complete} THEN (${v}) END AS ${names[k]}`)
    );
    aggregates.push(...statisticTotals(names, prefix));
  }
  const main = `SELECT ${aggregates.join(", ")} FROM (SELECT ${
    projected.join(", ")
  } FROM ${from}) AS observed`;
  return { main, groupOf };
}

/** A row DuckDB's CSV reader rejected. */
interface Reject {
  readonly line: number;
  readonly message: string;
  readonly column?: string;
  readonly type: string;
}

/** The rows DuckDB's CSV reader rejected (the first 1,000) and how many (none for Parquet). */
async function readRejects(read: DuckRead): Promise<{ rejects: Reject[]; rejected: number }> {
  const { db, rel } = read;
  if (read.parquet) return { rejects: [], rejected: 0 };
  const rj = await run(
    db,
    "SELECT line, error_message, error_type, column_name FROM reject_errors ORDER BY line LIMIT 1000",
    [],
    rel,
  );
  const rejects = rj.map((r) => ({
    line: Number(r.line),
    message: String(r.error_message),
    type: String(r.error_type),
    column: r.column_name === null ? undefined : String(r.column_name),
  }));
  const rejected = Number((await run(db, "SELECT COUNT(*) AS n FROM reject_errors", [], rel))[0].n);
  return { rejects, rejected };
}

/** The first 20 rejected rows as problems in Lentil's words. */
function rejectProblems(read: DuckRead, rejects: readonly Reject[]): TableProblem[] {
  const { names, kinds, rel } = read;
  const problems: TableProblem[] = [];
  for (const j of rejects.slice(0, 20)) {
    const m = /Expected Number of Columns: (\d+) Found: (\d+)/.exec(j.message);
    const ci2 = j.column ? names.indexOf(j.column) : -1;
    const cast = j.type === "CAST" && ci2 >= 0
      ? /Could not convert string ["'](.*)["'] to/s.exec(j.message)
      : null;
    const unit = ci2 >= 0 ? (kinds[ci2] as { unit?: string }).unit : "";
    problems.push({
      file: rel,
      line: j.line,
      col: ci2 >= 0 ? ci2 + 1 : 1,
      message: m
        ? `row has ${m[2]} field${m[2] === "1" ? "" : "s"}, the header has ${m[1]}`
        : cast
        ? `column ${names[ci2]}: "${cast[1].trim()}" is not a number${unit ? ` (in ${unit})` : ""}`
        : j.type === "MISSING COLUMNS"
        ? `row has fewer fields than the header has (${names.length})`
        : `the row cannot be read: ${j.message}`,
    });
  }
  return problems;
}

/** The first 20 rows with a cell Lentil refuses (not finite, outside its range), by cell. */
async function badRowProblems(
  read: DuckRead,
  { flags, cellText, numericIdx, rawFrom }: RowQuery,
  rejects: readonly Reject[],
): Promise<TableProblem[]> {
  const { db, names, kinds, params, parquet, rel } = read;
  const lineOf = (r: number) => {
    // Data row r (1-based among the rows DuckDB kept) to its file line, skipping rejected lines.
    let line = r + 1;
    for (const j of rejects) if (j.line <= line) line++;
    return line;
  };
  const flagList = numericIdx.map((_i, j) => `${flags[j]} AS f${j}, ${cellText[j]} AS t${j}`)
    .join(
      ", ",
    );
  const bad = await run(
    db,
    `SELECT * FROM (SELECT row_number() OVER () AS r, ${flagList} FROM ${rawFrom}) AS numbered WHERE ${
      numericIdx.map((_, j) => `f${j}`).join(" OR ")
    } ORDER BY r LIMIT 20`,
    params,
    rel,
  );
  const problems: TableProblem[] = [];
  for (const b of bad) {
    const r = Number(b.r);
    numericIdx.forEach((i, j) => {
      if (b[`f${j}`] !== true) return;
      const k = kinds[i] as { unit: string };
      const text = String(b[`t${j}`] ?? "");
      const x = Number(text);
      const rule = REFRACTION_COLUMNS[names[i].toLowerCase()];
      const message = rule && Number.isFinite(x)
        ? `column ${names[i]}: ${x} ${k.unit} is outside the accepted range ${rule.range[0]} to ${
          rule.range[1]
        } ${k.unit}`
        : `column ${names[i]}: "${text}" is not a number${k.unit ? ` (in ${k.unit})` : ""}`;
      problems.push({
        file: rel,
        line: parquet ? r : lineOf(r),
        col: i + 1,
        row: r - 1,
        message,
      });
    });
  }
  return problems;
}

/** Notes on the table: rows transposed to the first cylinder's form, bad rows excluded. */
function tableNotes(
  table: string,
  names: readonly string[],
  { first, ci }: CylinderForm,
  turned: number,
  { excluded, rowsRead, skip }: { excluded: number; rowsRead: number; skip: boolean },
): string[] {
  const notes: string[] = [];
  if (turned && ci >= 0) {
    const form = first < 0 ? "minus" : "plus";
    const other = first < 0 ? "plus" : "minus";
    notes.push(
      `table ${table}: column ${names[ci]} mixes cylinder signs; ${turned} row${
        turned === 1 ? "" : "s"
      } in ${other}-cylinder form ${
        turned === 1 ? "was" : "were"
      } transposed to ${form}-cylinder form, the form of the first cylinder met (the same lenses)`,
    );
  }
  if (excluded && skip) {
    notes.push(
      `table ${table}: ${excluded} bad row${excluded === 1 ? "" : "s"} of ${rowsRead} excluded`,
    );
  }
  return notes;
}

/** Each statistic's moments from the scan's one row. */
function momentsOf(
  work: TableWork,
  groupOf: readonly string[][],
  row: Record<string, unknown>,
  good: number,
): Map<string, ReturnType<typeof momentsFromRow>[]> {
  const moments = new Map<string, ReturnType<typeof momentsFromRow>[]>();
  work.statistics.forEach((st, i) =>
    moments.set(
      st.cell,
      groupOf[i].map((prefix) =>
        momentsFromRow(st.separate ? 1 : st.variables.length, {
          ...row,
          [`${prefix}missing`]: good - Number(row[`${prefix}n`]),
        }, prefix)
      ),
    )
  );
  return moments;
}

/** Run a statement; a file that cannot be read (gone, unreadable) is a positioned problem. */
async function run(
  db: DuckConnection,
  sql: string,
  params: readonly (string | number)[],
  rel: string,
  progress?: (fraction: number, rows: number) => void,
): Promise<Record<string, unknown>[]> {
  try {
    const used = [...new Set([...sql.matchAll(/\$(\d+)/g)].map((m) => Number(m[1])))].sort((a, b) =>
      a - b
    );
    const at = new Map(used.map((n, i) => [n, i + 1]));
    const renumbered = sql.replace(/\$(\d+)/g, (_, n) => `$${at.get(Number(n))}`);
    return await db.rows(renumbered, used.map((n) => params[n - 1]), progress);
  } catch (e) {
    const m = (e as Error).message;
    if (/No files found|Cannot open file|No such file/i.test(m)) {
      throw new DuckTableError({
        file: rel,
        line: 1,
        col: 1,
        message: `cannot read table file "${rel}": the file is gone or cannot be opened`,
      });
    }
    throw new DuckTableError({
      file: rel,
      line: 1,
      col: 1,
      message: `table file "${rel}" cannot be read: ${m.split("\n")[0]}`,
    });
  }
}
