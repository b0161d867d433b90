/**
 * `lentil export FILE [-o OUT.html]`: write the notebook as one self-contained HTML page
 * (prose, results with sources, tables, plots, cautions, a footer with the file's SHA-256).
 *
 * @module
 */

import type { Command } from "../command.ts";
import { NotebookFileError, notebookFromBytes, readNotebookBytes } from "../../load.ts";
import { formatDiagnostic } from "../../format/diagnostic.ts";

/**
 * The output path for a notebook: `case.lentil.md` → `case.html` beside it.
 *
 * @example
 * ```ts
 * import { defaultOutput } from "./export.ts";
 * defaultOutput("seeds/case.lentil.md"); // "seeds/case.html"
 * ```
 */
export function defaultOutput(file: string): string {
  return file.replace(/(\.lentil)?\.md$/i, "") + ".html";
}

/** The `export` command. */
export const exportCommand: Command = {
  name: "export",
  summary: "write a notebook as one self-contained HTML page with plots and sources",
  usage: "FILE [-o OUT.html] [--data] [--rows N]",
  help: "Evaluates FILE and writes a single HTML page that opens anywhere without a network:\n" +
    "prose, every result with its unit and numbered sources, tables, plots as inline SVG,\n" +
    "the cautions, and a footer with the notebook's title, the evaluation time, Lentil's\n" +
    "version and the SHA-256 of FILE. Default output: FILE with .html in place of .lentil.md.\n" +
    "Exit status: 0 when written and every cell and plot is sound, 1 when written with\n" +
    "problems (listed on stderr) or not written, 2 for a usage error.",
  options: {
    out: { type: "string", short: "o", value: "OUT.html", doc: "where to write the page" },
    data: { type: "boolean", doc: "embed each table's full data as CSV" },
    rows: { type: "string", value: "N", doc: "rows of a table shown before it is cut (25)" },
    "follow-links": {
      type: "boolean",
      doc: "let file: tables follow symbolic links (to regular files only)",
    },
  },
  positionals: [1, 1],
  async run([file], options, io) {
    const rows = options.rows === undefined ? undefined : Number(options.rows);
    if (rows !== undefined && (!Number.isInteger(rows) || rows < 1)) {
      io.err(`--rows: expected a whole number of rows, got "${options.rows}"`);
      return 2;
    }
    let bytes: Uint8Array;
    try {
      bytes = await readNotebookBytes(file);
    } catch (e) {
      if (e instanceof NotebookFileError) {
        io.err(e.message);
        return 1;
      }
      throw e;
    }
    const loaded = await notebookFromBytes(bytes, file, {
      followLinks: !!options["follow-links"],
    });
    if (!loaded.ok) {
      io.err(formatDiagnostic(loaded.diagnostic));
      return 1;
    }
    const nb = loaded.notebook;
    const { renderNotebookPage } = await import("../../export/html.ts");
    const page = await renderNotebookPage(nb, {
      bytes,
      embedData: options.data === true,
      maxRows: rows,
    });
    const out = typeof options.out === "string" ? options.out : defaultOutput(file);
    try {
      await Deno.writeTextFile(out, page.html);
    } catch (e) {
      io.err(`${out}: cannot be written (${(e as Error).message})`);
      return 1;
    }
    const problems = [...nb.diagnostics().filter((d) => d.severity === "error"), ...page.problems];
    for (const d of problems) io.err(formatDiagnostic(d));
    const kb = (new TextEncoder().encode(page.html).length / 1024).toFixed(1);
    io.out(`wrote ${out} (${kb} KB, sha256 ${page.sha256.slice(0, 12)}…)`);
    return problems.length ? 1 : 0;
  },
};
