/**
 * Lentil's notebook API: load a `*.lentil.md` notebook (from text or from a file), evaluate
 * it, read its results with their units and sources, and export it as one static HTML page.
 *
 * A short tour:
 *
 * ```ts
 * import assert from "node:assert/strict";
 * import { buildReport, evaluateNotebook, exportPage } from "./mod.ts";
 *
 * const text = [
 *   "~~~lentil",
 *   "vd = 12 mm",
 *   "cornea = vertexPower(-10 D, vd)   # the spectacle power at the cornea",
 *   "~~~",
 *   "",
 * ].join("\n");
 * const nb = evaluateNotebook(text, "case.lentil.md");
 *
 * // Every cell with its value, its display in the trade's conventions and its sources.
 * const report = buildReport(nb);
 * const cornea = report.cells.find((c) => c.name === "cornea")!;
 * assert.equal(cornea.error, undefined);
 * assert.equal(report.sources[0].id, "vertex-formula");
 * assert.equal(nb.diagnostics().length, 0);
 *
 * // One self-contained page, with no script in it.
 * const page = await exportPage(nb);
 * assert.ok(page.html.startsWith("<!doctype html>"));
 * assert.ok(!page.html.includes("<script"));
 * ```
 *
 * A notebook file on disk, with its CSV tables read from the notebook's folder, loads with
 * {@linkcode loadNotebook}:
 *
 * ```ts ignore
 * import { loadNotebook } from "./mod.ts";
 * const loaded = await loadNotebook("case.lentil.md");
 * if (loaded.ok) console.log(loaded.notebook.results().length);
 * ```
 *
 * @module
 */

import { Notebook, type NotebookOptions } from "./engine/engine.ts";
import type { ExportedPage, PageOptions } from "./export/html.ts";

export { Notebook } from "./engine/engine.ts";
export type { CellError, CellResult, ErrorKind, NotebookOptions } from "./engine/engine.ts";
export { loadNotebook, NotebookFileError, notebookFromBytes } from "./load.ts";
export type { LoadOptions, LoadResult } from "./load.ts";
export type { ProgressEvent, ProgressListener } from "./progress.ts";
export { buildReport } from "./report.ts";
export type { Report, ReportCell, ReportOptions, ReportSource } from "./report.ts";
export type { PartView, TableShown } from "../cells/present.ts";
export type { CheckLine, CheckVerdict, ValuePart } from "../cells/types.ts";
export { parseNotebook } from "./format/parse.ts";
export type {
  Block,
  CalcBlock,
  CellDef,
  ColumnDef,
  FrontMatter,
  NotebookDoc,
  OptionDef,
  PlotBlock,
  ProseBlock,
  RowDef,
  Span,
  TableBlock,
} from "./format/parse.ts";
export type { TableHost } from "./engine/_tables.ts";
export type { TableFilePolicy } from "./engine/_table_file.ts";
export type { DisplayOptions } from "../cells/types.ts";
export type { SourceStatus } from "../shared/sources.ts";
export { formatDiagnostic } from "./format/diagnostic.ts";
export type { Diagnostic, Severity } from "./format/diagnostic.ts";
export { VERSION } from "./version.ts";
export type { BodyOptions, ExportedPage, PageOptions, RenderedBody } from "./export/html.ts";

/**
 * Parse and evaluate a notebook from its text. Tables that read a CSV file need the file
 * system: use {@linkcode loadNotebook} for those.
 *
 * @example
 * ```ts
 * import { evaluateNotebook } from "./mod.ts";
 * const nb = evaluateNotebook("~~~lentil\nx = 2 mm\n~~~\n", "x.lentil.md");
 * nb.result("x")?.error; // undefined
 * ```
 *
 * @param text the notebook's Markdown text
 * @param file the file name used in diagnostics (`case.lentil.md`)
 * @param options engine options (display, tables already read)
 * @returns the evaluated notebook
 */
export function evaluateNotebook(
  text: string,
  file: string,
  options: NotebookOptions = {},
): Notebook {
  return Notebook.fromText(text, file, options);
}

/**
 * Export an evaluated notebook as one self-contained HTML page: prose, every formula with its
 * result and footnotes, tables, plots as inline SVG, the numbered sources, the cautions and a
 * footer with the evaluation date and the notebook's SHA-256. The page module (with its
 * plotting and Markdown libraries) loads only when this is called.
 *
 * @example
 * ```ts
 * import { evaluateNotebook, exportPage } from "./mod.ts";
 * const page = await exportPage(evaluateNotebook("Some *prose*.\n", "p.lentil.md"));
 * page.sha256.length; // 64
 * ```
 *
 * @param nb an evaluated notebook
 * @param options page options (evaluation date, bytes to hash, rows shown)
 * @returns the page's HTML, its problems and the notebook's SHA-256
 */
export async function exportPage(nb: Notebook, options: PageOptions = {}): Promise<ExportedPage> {
  const { renderNotebookPage } = await import("./export/html.ts");
  return renderNotebookPage(nb, options);
}
