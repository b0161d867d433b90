/**
 * `lentil run FILE`: evaluate a notebook and print every cell with its value, unit and
 * numbered sources, then the sources and, where they apply, the cautions.
 *
 * @module
 */

import type { Command } from "../command.ts";
import { buildReport, type Report } from "../../report.ts";
import { cliProgress, openNotebook } from "./_open.ts";
import { type Diagnostic, formatDiagnostic } from "../../format/diagnostic.ts";
import type { Notebook } from "../../engine/engine.ts";
import { DEFAULT_WIDTH, errorText, resultBelow, terminalWidth, wrap } from "../_result_text.ts";

/** `lead` then `text`, wrapped to `width` with the continuation lines under the text. */
function wrapAfter(lead: string, text: string, width: number): string[] {
  const body = wrap(text, width - lead.length);
  return body.map((l, i) => (i ? " ".repeat(lead.length) : lead) + l);
}

/**
 * The problems `check` reports that no cell shows as its own error (an unterminated block, a
 * CSV row with the wrong field count, a bad option line), so `run` does not hide them.
 */
function otherProblems(nb: Notebook, report: Report): Diagnostic[] {
  const atCells = new Set(
    report.cells.flatMap((c) => c.error ? [`${c.error.file}:${c.error.line}:${c.error.col}`] : []),
  );
  return nb.diagnostics().filter((d) => !atCells.has(`${d.file}:${d.line}:${d.col}`));
}

/**
 * Plain-text rendering of a report, one line a cell.
 *
 * @example
 * ```ts
 * import { Notebook } from "../../engine/engine.ts";
 * import { buildReport } from "../../report.ts";
 * import { renderReportText } from "./run.ts";
 * const text = renderReportText(buildReport(Notebook.fromText("~~~lentil\nx = 2 mm\n~~~\n", "x")), "x");
 * text.includes("x = 2.00 mm"); // true
 * ```
 */
export function renderReportText(
  report: Report,
  title: string,
  width: number = DEFAULT_WIDTH,
): string {
  const lines: string[] = [title, ""];
  const nameWidth = Math.min(24, report.cells.reduce((w, c) => Math.max(w, c.id.length), 4));
  for (const c of report.cells) {
    const notes = c.notes.length ? `  [${c.notes.join(", ")}]` : "";
    const note = c.note ? `  # ${c.note}` : "";
    const lead = `${c.id.padEnd(nameWidth)} `;
    if (c.error) {
      lines.push(...errorText(lead, c.error, width));
      continue;
    }
    // A table block is listed in one line (its file holds the rows); a formula's table shows its rows.
    const hasBelow = !!(c.parts?.length || c.checks?.length || (c.table && c.kind !== "table"));
    const head = hasBelow ? c.headline : c.display;
    lines.push(...wrapAfter(`${lead}= `, `${head}${notes}${note}`.trim(), width));
    if (hasBelow) lines.push(...resultBelow(c, width, nameWidth + 3));
  }
  if (report.sources.length) {
    lines.push("", "Sources");
    for (const s of report.sources) {
      lines.push(`  [${s.n}] ${s.citation}${s.mark ? ` (${s.mark})` : ""}`);
    }
  }
  if (report.cautions.length) {
    lines.push("", "Cautions");
    for (const c of report.cautions) lines.push(`  - ${c}`);
  }
  return lines.join("\n");
}

/** The `run` command. */
export const runCommand: Command = {
  name: "run",
  summary: "evaluate a notebook and print every result with units and sources",
  usage: "FILE [--json] [--quiet]",
  help:
    "Evaluates FILE (a *.lentil.md notebook) and prints each cell: name, value with unit, and\n" +
    "the numbers of the sources it used, then the numbered sources and any cautions.\n" +
    "Problems no cell shows (an unterminated block, a bad CSV row) are listed at the end.\n" +
    "A large file: table (Parquet, a CSV of 16 MB or more, or engine: duckdb in its block) is\n" +
    "worked in the embedded DuckDB; a read that takes more than a second shows its progress on\n" +
    "stderr (rows, rows/s, percent, time left) unless --quiet or --json.\n" +
    "Exit status: 0 when every cell evaluated, 1 when any cell or the file has an error.",
  options: {
    json: { type: "boolean", doc: "print the results as JSON (no progress lines)" },
    quiet: { type: "boolean", doc: "no progress lines on stderr while a large table is read" },
    "follow-links": {
      type: "boolean",
      doc: "let file: tables follow symbolic links (to regular files only)",
    },
  },
  positionals: [1, 1],
  async run([file], options, io) {
    const opened = await openNotebook(file, io, {
      followLinks: !!options["follow-links"],
      database: true,
      onProgress: options.quiet || options.json ? undefined : cliProgress(io),
    });
    if (!opened) return 1;
    const report = buildReport(opened);
    const problems = otherProblems(opened, report);
    if (options.json) {
      const cells = report.cells.map((c) => ({
        name: c.id,
        kind: c.kind,
        value: c.value,
        unit: c.unit,
        display: c.display,
        headline: c.headline,
        ...(c.parts ? { parts: c.parts } : {}),
        ...(c.checks ? { checks: c.checks } : {}),
        ...(c.table ? { table: c.table } : {}),
        sources: c.sources,
        caution: c.caution,
        line: c.line,
        ...(c.error ? { error: c.error } : {}),
      }));
      io.out(
        JSON.stringify(
          { cells, sources: report.sources, cautions: report.cautions, problems },
          null,
          2,
        ),
      );
    } else {
      const front = opened.doc.front;
      const title = [front.title ?? file, front.case ? `(case ${front.case})` : ""].filter(Boolean)
        .join(" ");
      io.out(renderReportText(report, title, terminalWidth()));
      if (problems.length) {
        io.out(["", "Problems", ...problems.map((d) => `  ${formatDiagnostic(d)}`)].join("\n"));
      }
    }
    return report.cells.some((c) => c.error) || problems.some((d) => d.severity === "error")
      ? 1
      : 0;
  },
};
