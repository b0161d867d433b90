/**
 * Choosing the engine of each `file:` table and preparing what the notebook engine needs from
 * DuckDB. A table is worked in DuckDB when its block says `engine: duckdb`, or (by default,
 * `engine: auto`) when its file is Parquet or a CSV of at least {@linkcode LARGE_CSV_BYTES};
 * `engine: in-process` keeps it in Lentil. A table whose use by the notebook is outside SQL
 * falls back to the in-process path (a CSV) with the same results.
 *
 * @module
 */

import { dirname, join } from "node:path";
import { getLanguage, type Language } from "../../cells/language.ts";
import { HeldColumn, makeTable } from "../../cells/table.ts";
import type { NotebookDoc, TableBlock } from "../format/parse.ts";
import type { PreparedTable } from "../engine/engine.ts";
import type { TableProblem } from "../engine/_tables.ts";
import { checkedTableFile, type TableFilePolicy } from "../engine/_table_file.ts";
import { finishStatistic } from "../sql/work.ts";
import { openDuck } from "./_open.ts";
import type { ProgressListener } from "../progress.ts";
import { DuckTableError, isParquet, workTableInDuck } from "./table.ts";

/** CSV files of at least this size are worked in DuckDB by default (16 MB). */
export const LARGE_CSV_BYTES = 16 * 1024 * 1024;

/** What the notebook engine takes from DuckDB. */
export interface DuckPrepared {
  /** Tables, with columns whose rows stay in DuckDB. */
  readonly tables: Map<string, PreparedTable>;
  /** Values of computed columns and statistics cells, by node id. */
  readonly given: Map<string, unknown>;
  /** Tables worked in DuckDB, and why others were not. */
  readonly engines: { table: string; engine: "duckdb" | "in-process"; reason?: string }[];
}

/** The engine a table block asks for ("auto" when it does not say). */
export function engineOption(block: TableBlock): "auto" | "duckdb" | "in-process" | string {
  return (block.options.engine?.value ?? "auto").toLowerCase();
}

/** The tables of a notebook that go to DuckDB. */
export async function duckTables(doc: NotebookDoc, path: string): Promise<TableBlock[]> {
  const dir = dirname(path);
  const out: TableBlock[] = [];
  for (const b of doc.tables) {
    if (!b.options.file) continue;
    const e = engineOption(b);
    if (e === "in-process") continue;
    if (e === "duckdb" || isParquet(b.options.file.value)) out.push(b);
    else if (e === "auto") {
      try {
        const st = await Deno.stat(join(dir, b.options.file.value));
        if (st.isFile && st.size >= LARGE_CSV_BYTES) out.push(b);
      } catch {
        // the in-process reader reports a missing file
      }
    }
  }
  return out;
}

/**
 * Work the notebook's large tables in DuckDB (loaded only when some table needs it).
 *
 * @example
 * ```ts ignore
 * const p = await prepareInDuck(doc, "study.lentil.md");
 * const nb = await Notebook.load(text, "study.lentil.md", { tables: p.tables, given: p.given });
 * ```
 */
export async function prepareInDuck(
  doc: NotebookDoc,
  path: string,
  blocks: readonly TableBlock[],
  policy: TableFilePolicy = {},
  lang: Language = getLanguage(),
  onProgress?: ProgressListener,
): Promise<DuckPrepared> {
  const tables = new Map<string, PreparedTable>();
  const given = new Map<string, unknown>();
  const engines: DuckPrepared["engines"] = [];
  if (!blocks.length) return { tables, given, engines };
  const folder = dirname(path);
  const db = await openDuck(folder);
  try {
    for (const block of blocks) {
      let r;
      try {
        // The same rule as the in-process reader: regular files in the notebook's folder tree.
        checkedTableFile(folder, block.options.file!.value, policy);
      } catch (e) {
        const o = block.options.file!;
        const why = e instanceof Deno.errors.NotFound ? "no such file" : (e as Error).message;
        tables.set(block.name, {
          columns: [],
          problem: {
            file: path,
            line: o.line,
            col: o.col,
            message: `cannot read table file "${o.value}": ${why}`,
          },
        });
        engines.push({ table: block.name, engine: "duckdb", reason: why });
        continue;
      }
      try {
        r = await workTableInDuck(db, doc, block, path, folder, lang, onProgress);
      } catch (e) {
        if (!(e instanceof DuckTableError)) throw e;
        if (e.fallback && !isParquet(block.options.file!.value)) {
          engines.push({ table: block.name, engine: "in-process", reason: e.message });
          continue;
        }
        tables.set(block.name, { columns: [], problem: e.problem });
        engines.push({ table: block.name, engine: "duckdb", reason: e.message });
        continue;
      }
      engines.push({ table: block.name, engine: "duckdb" });
      const skip = (block.options["bad rows"]?.value ?? "stop").toLowerCase() === "skip";
      const columns = r.kinds.map(({ name, kind }, i) => ({
        name,
        spec: kind.type === "quantity"
          ? kind.unit
          : kind.type === "number"
          ? (kind.unit || "number")
          : kind.type === "value"
          ? kind.name
          : "text",
        col: i + 1,
      }));
      const where = { file: path, line: block.line, col: block.col };
      const notes: TableProblem[] = r.notes.map((message) => ({ ...where, message }));
      if (r.excluded && !skip) {
        const first = r.problems[0] ?? {
          file: block.options.file!.value,
          line: 1,
          col: 1,
          message: `${r.excluded} bad rows`,
        };
        tables.set(block.name, { columns, problem: first });
        continue;
      }
      const held = r.kinds.map(({ name, kind }) =>
        new HeldColumn(
          name,
          kind.type === "value" ? kind.name : kind.type === "infer" ? "text" : kind.type,
          kind.type === "quantity" || kind.type === "number" ? kind.unit : "",
          r.rowsKept,
        )
      );
      tables.set(block.name, {
        columns,
        built: {
          value: makeTable(block.name, held, {
            excluded: r.excluded,
            file: block.options.file!.value,
          }),
          problems: [...r.problems],
          notes,
          excluded: r.excluded,
        },
      });
      for (const c of r.work.columns) {
        given.set(
          `${block.name}.${c.name}`,
          new HeldColumn(c.name, c.unit ? "quantity" : "number", c.unit, r.rowsKept),
        );
      }
      for (const st of r.work.statistics) {
        try {
          given.set(st.cell, finishStatistic(st.fn, r.moments.get(st.cell)!, st.unit, lang));
        } catch (e) {
          given.set(st.cell, e); // the engine reports it at the cell
        }
      }
    }
  } finally {
    db.close();
  }
  return { tables, given, engines };
}
