/**
 * `lentil sql FILE`: write a notebook's table work as standard SQL (a view per set of
 * computed columns, one query per statistic), to run where the data already lives.
 *
 * @module
 */

import { dirname } from "node:path";
import type { Command } from "../command.ts";
import { getLanguage } from "../../../cells/language.ts";
import { parseNotebook } from "../../format/parse.ts";
import { readNotebookBytes } from "../../load.ts";
import { decodeNotebookLenient } from "../../format/read.ts";
import { planTableWork } from "../../sql/work.ts";
import { sqlNumber, writeSql } from "../../sql/statements.ts";
import { DuckTableError, tableInputs } from "../../duck/table.ts";
import { SqlNameError } from "../../sql/_names.ts";

/** The `sql` command. */
export const sqlCommand: Command = {
  name: "sql",
  summary: "write the notebook's table work as standard SQL (views and one query per statistic)",
  usage: "FILE [--table NAME] [--source NAME] [--out FILE.sql]",
  help: "Writes the computed columns of a table read from a file as SQL views (one per set of\n" +
    "columns that read only the table and earlier sets) and each statistics cell (countOf,\n" +
    "meanOf, sdOf, meanRx, vectorStats, agreement) as one aggregate query returning the totals\n" +
    "Lentil's numbers follow from. The SQL targets PostgreSQL, engines that speak its dialect,\n" +
    "and DuckDB. The source is a table or view named like the notebook's table (or --source),\n" +
    "with the file's columns; the header of the SQL lists them.\n" +
    "Exit status: 0 when written, 1 when some of the table work is outside SQL, 2 when it\n" +
    "could not start.",
  options: {
    table: { type: "string", value: "NAME", doc: "the table (when there are several from files)" },
    source: { type: "string", value: "NAME", doc: "the source table or view in the database" },
    out: { type: "string", value: "FILE", doc: "write the SQL to this file instead of stdout" },
  },
  positionals: [1, 1],
  async run([file], options, io) {
    let text: string;
    try {
      text = decodeNotebookLenient(await readNotebookBytes(file), file).text;
    } catch (e) {
      io.err(`lentil sql: ${(e as Error).message}`);
      return 2;
    }
    const doc = parseNotebook(text, file);
    const tables = doc.tables.filter((t) => t.options.file);
    const name = options.table as string | undefined;
    const block = name
      ? tables.find((t) => t.name === name)
      : tables.length === 1
      ? tables[0]
      : undefined;
    if (!block) {
      io.err(
        `lentil sql: ${
          name
            ? `no table "${name}" read from a file`
            : tables.length
            ? "choose a table with --table"
            : "no table read from a file"
        } in ${file} (tables from files: ${tables.map((t) => t.name).join(", ") || "none"})`,
      );
      return 2;
    }
    const lang = getLanguage();
    try {
      const inputs = await tableInputs(block, file, dirname(file), lang);
      const work = planTableWork(doc, block, inputs, lang, sqlNumber);
      if (typeof work === "string") {
        io.err(`lentil sql: ${work}`);
        return 1;
      }
      const sql = writeSql(work, { notebook: file, source: options.source as string | undefined });
      if (options.out) await Deno.writeTextFile(options.out as string, sql.text);
      else io.out(sql.text);
      return 0;
    } catch (e) {
      if (e instanceof DuckTableError) {
        const p = e.problem;
        io.err(`${p.file}:${p.line}:${p.col}: ${p.message}`);
        return 2;
      }
      if (e instanceof SqlNameError) {
        io.err(`lentil sql: ${e.message}`);
        return 2;
      }
      throw e;
    }
  },
};
