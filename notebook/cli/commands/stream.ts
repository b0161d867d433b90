/**
 * `lentil stream FILE [--out RESULTS.csv]`: run a notebook over a large CSV table in one
 * pass and bounded memory, write the table with its computed columns to a new CSV, and
 * print the aggregates and the count of bad rows.
 *
 * @module
 */

import type { Command } from "../command.ts";
import { cliProgress } from "./_open.ts";

/** Progress of a streaming run: rows so far (the part of the file is not known here). */
function streamProgress(file: string, io: Parameters<Command["run"]>[2]) {
  const p = cliProgress(io);
  let last = 0;
  return {
    onChunk: (rows: number) => p({ table: "streamed", file, rows: last = rows }),
    done: () => p({ table: "streamed", file, rows: last, done: true }),
  };
}

/** The `stream` command. */
export const streamCommand: Command = {
  name: "stream",
  summary: "run a notebook over a large CSV table in one pass; write the computed table",
  usage: "FILE [--out RESULTS.csv] [--table NAME] [--overwrite] [--json] [--quiet]",
  help: "Reads the notebook's CSV table (or the one named by --table) in chunks, computes its\n" +
    "columns with compiled formulas, feeds the statistics cells (countOf, meanOf, sdOf, summary,\n" +
    "meanRx, vectorStats, ellipse95, spread95, agreement, rxAgreement) and, with --out, writes\n" +
    "the table and its computed columns to a new CSV. Medians and quantiles need every value\n" +
    "and are not computed here; run the notebook for those. The input is never written over.\n" +
    "Memory holds one chunk of rows, never the file. V8 collects lazily, so resident memory\n" +
    "can rise well above what is alive; `deno task stream FILE …` runs this command with the\n" +
    "V8 heap capped (--max-old-space-size=128), which holds it flat at about 230 MB for any\n" +
    "file size.\n" +
    "Exit status: 0 when the whole file was read, 1 when a bad row or a broken file stopped\n" +
    "the run, 2 when it could not start.",
  options: {
    out: {
      type: "string",
      value: "FILE",
      doc: "write the computed table to this new CSV file (Parquet when it ends in .parquet)",
    },
    table: { type: "string", value: "NAME", doc: "the table to stream (when there are several)" },
    overwrite: { type: "boolean", doc: "replace the output file if it exists" },
    json: { type: "boolean", doc: "print the outcome as JSON (no progress lines)" },
    quiet: { type: "boolean", doc: "no progress lines on stderr" },
    "follow-links": {
      type: "boolean",
      doc: "let file: tables follow symbolic links (to regular files only)",
    },
  },
  positionals: [1, 1],
  async run([file], options, io) {
    const { streamNotebook, StreamSetupError } = await import("../../table/stream.ts");
    let r;
    const progress = options.quiet || options.json ? undefined : streamProgress(file, io);
    try {
      r = await streamNotebook(file, {
        out: options.out as string | undefined,
        table: options.table as string | undefined,
        overwrite: !!options.overwrite,
        followLinks: !!options["follow-links"],
        onChunk: progress?.onChunk,
      });
      progress?.done();
    } catch (e) {
      if (e instanceof StreamSetupError || e instanceof Deno.errors.NotFound) {
        io.err(`lentil stream: ${(e as Error).message}`);
        return 2;
      }
      throw e;
    }
    if (options.json) {
      io.out(JSON.stringify(
        {
          ...r,
          cells: r.cells.map((c) => ({
            name: c.name,
            display: c.display,
            unavailable: c.unavailable,
          })),
        },
        null,
        2,
      ));
      return r.ok ? 0 : 1;
    }
    io.out(`table ${r.table} from ${r.input}${r.output ? ` → ${r.output}` : ""}`);
    io.out(
      `rows read ${r.rowsRead}, kept ${r.rowsKept}, bad rows excluded ${r.excluded}` +
        (r.stopped ? " (stopped)" : ""),
    );
    for (const c of r.columns) {
      io.out(
        `  column ${c.name}${c.unit ? ` [${c.unit}]` : ""}: ${c.path}${
          c.reason ? ` (${c.reason})` : ""
        }`,
      );
    }
    for (const c of r.cells) {
      io.out(c.display !== undefined ? `${c.name} = ${c.display}` : `${c.name} ! ${c.unavailable}`);
    }
    for (const n of r.notes) io.out(`note: ${n.message}`);
    if (r.cautions.length) {
      io.out("Cautions");
      for (const c of r.cautions) io.out(`  - ${c}`);
    }
    const shown = r.problems.slice(0, 20);
    for (const p of shown) {
      const where = p.line ? `${p.file}:${p.line}:${p.col}: ` : "";
      const row = p.row !== undefined ? `row ${p.row + 1}: ` : "";
      io.err(`${where}${row}${p.message}`);
    }
    if (r.problems.length > shown.length) {
      io.err(`… and ${r.problems.length - shown.length} more problems`);
    }
    if (r.stopped) io.err(`stopped: ${r.stopped}`);
    return r.ok ? 0 : 1;
  },
};
