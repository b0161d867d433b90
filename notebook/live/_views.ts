/**
 * What the live page shows, as plain JSON: one view per cell, per table grid and per plot,
 * built from the evaluated notebook. The session compares views before and after an edit
 * and sends only those that differ, so the page touches only what changed.
 *
 * @module
 */

import { countText } from "../../lib/number_text.ts";
import { tableInfo } from "../../cells/table.ts";
import type { CheckLine } from "../../cells/types.ts";
import { type PartView, tableCellText, tableCounts } from "../../cells/present.ts";
import { belowHtml, hasBelow, headlineHtml } from "../export/_results.ts";
import { cautionsPart } from "../export/_sections.ts";
import type { Notebook } from "../engine/engine.ts";
import type { NotebookDoc, PlotBlock, TableBlock } from "../format/parse.ts";
import { buildReport, type ReportSource } from "../report.ts";

/** An error as the page shows it. */
export interface ErrorView {
  /** Kind of error (syntax, name, unit, dependency, …). */
  readonly kind: string;
  /** Message. */
  readonly message: string;
  /** 1-based line and column in the file. */
  readonly line: number;
  /** 1-based column. */
  readonly col: number;
  /** For an error carried from a dependency: the id of the node where it began. */
  readonly cause?: string;
}

/** One calc cell. */
export interface CellView {
  /** Node id. */
  readonly id: string;
  /** Name as written. */
  readonly name: string;
  /** For a computed column, its table. */
  readonly table?: string;
  /** Expression as written. */
  readonly expression: string;
  /** Note after `#`. */
  readonly note?: string;
  /** A literal input. */
  readonly input: boolean;
  /** Display text of the value ("" on error). */
  readonly display: string;
  /** The line read first ("" on error). */
  readonly headline: string;
  /** Labelled parts, when the value has parts. */
  readonly parts?: readonly PartView[];
  /** Check lines, when the value is a check. */
  readonly checks?: readonly CheckLine[];
  /** Markup beside the cell: headline, footnotes, caution marker (as on the exported page). */
  readonly html: string;
  /** Markup under the headline: parts table, check table, table rows ("" when none). */
  readonly below: string;
  /** Footnote numbers of its sources. */
  readonly notes: readonly number[];
  /** The cautions apply. */
  readonly caution: boolean;
  /** The error, if any. */
  readonly error?: ErrorView;
}

/** A problem with one row of a table. */
export interface RowProblem {
  /** 0-based row. */
  readonly row: number;
  /** Message. */
  readonly message: string;
}

/** A table as an editable grid. */
export interface TableView {
  /** Table name. */
  readonly name: string;
  /** CSV file the rows live in, if any. */
  readonly file?: string;
  /** Whether the page may edit the rows. */
  readonly editable: boolean;
  /** Why not, when not. */
  readonly locked?: string;
  /** Data columns: name and bracketed spec. */
  readonly columns: readonly { readonly name: string; readonly spec: string }[];
  /** Rows of cell text, as written. */
  readonly rows: readonly (readonly string[])[];
  /** Computed columns: name, unit and the display text of each row. */
  readonly computed: readonly {
    readonly name: string;
    readonly unit: string;
    readonly values: readonly string[];
  }[];
  /** The counts in words ("12 rows, 4 columns (3 from trials.csv, 1 computed)"). */
  readonly footer: string;
  /** Table-level error. */
  readonly error?: ErrorView;
  /** Row problems. */
  readonly problems: readonly RowProblem[];
}

/** A plot, as an HTML fragment. */
export interface PlotView {
  /** Key: `plot` plus its block index. */
  readonly key: string;
  /** HTML of the figure. */
  readonly html: string;
}

/** A block in page order. */
export type BlockView =
  | { readonly kind: "prose"; readonly html: string }
  | { readonly kind: "calc"; readonly index: number; readonly cells: readonly string[] }
  | { readonly kind: "table"; readonly name: string }
  | { readonly kind: "plot"; readonly key: string };

/** Everything the page shows. */
export interface PageView {
  /** Title (front matter, else the file name). */
  readonly title: string;
  /** File name. */
  readonly file: string;
  /** Blocks in order. */
  readonly blocks: readonly BlockView[];
  /** Cells by id. */
  readonly cells: Readonly<Record<string, CellView>>;
  /** Tables by name. */
  readonly tables: Readonly<Record<string, TableView>>;
  /** Plots by key. */
  readonly plots: Readonly<Record<string, PlotView>>;
  /** Numbered sources. */
  readonly sources: readonly ReportSource[];
  /** Cautions, when they apply. */
  readonly cautions: readonly string[];
  /** The one cautions section's markup, linking back to each result ("" when none). */
  readonly cautionsHtml: string;
  /** Problems found while parsing (`LINE:COL: message`). */
  readonly problems: readonly string[];
}

/** Renders prose and plots; the session passes the export's renderers in. */
export interface Renderers {
  /** Markdown prose to HTML. */
  prose(text: string): string;
  /** A plot block to HTML. */
  plot(nb: Notebook, block: PlotBlock): string;
}

/** Rows shown in a grid at most; a larger table is shown read-only in part. */
export const GRID_ROW_LIMIT = 2000;

/** The cell text of a table's rows as the source holds them. */
export interface TableText {
  /** Data columns. */
  readonly columns: readonly { readonly name: string; readonly spec: string }[];
  /** Rows, with the line each came from. */
  readonly rows: readonly { readonly cells: readonly string[]; readonly line: number }[];
}

function errorView(
  e: { kind: string; message: string; line: number; col: number } & {
    cause?: { id: string };
  },
): ErrorView {
  return {
    kind: e.kind,
    message: e.message,
    line: e.line,
    col: e.col,
    ...(e.cause ? { cause: e.cause.id } : {}),
  };
}

/**
 * Build the page view of an evaluated notebook.
 *
 * @example
 * ```ts ignore
 * const view = buildPageView(nb, doc, "case.lentil.md", renderers, () => undefined);
 * ```
 */
export function buildPageView(
  nb: Notebook,
  doc: NotebookDoc,
  file: string,
  renderers: Renderers,
  tableText: (block: TableBlock) => TableText | undefined,
): PageView {
  const report = buildReport(nb);
  const byLine = new Map<number, string>();
  const cells: Record<string, CellView> = {};
  for (const c of report.cells) {
    if (c.kind === "table") continue;
    const r = nb.result(c.id)!;
    byLine.set(c.line, c.id);
    cells[c.id] = {
      id: c.id,
      name: c.name,
      ...(r.table ? { table: r.table } : {}),
      expression: c.expression ?? "",
      ...(c.note ? { note: c.note } : {}),
      input: c.input,
      display: c.error ? "" : c.display,
      headline: c.error ? "" : c.headline,
      ...(c.parts && !c.error ? { parts: c.parts } : {}),
      ...(c.checks && !c.error ? { checks: c.checks } : {}),
      html: c.error ? "" : headlineHtml(c),
      below: c.error || !hasBelow(c) ? "" : belowHtml(c),
      notes: c.notes,
      caution: c.caution,
      ...(c.error ? { error: errorView(c.error) } : {}),
    };
  }
  const diags = nb.diagnostics();
  const tables: Record<string, TableView> = {};
  const plots: Record<string, PlotView> = {};
  const blocks: BlockView[] = [];
  let calcIndex = 0;
  doc.blocks.forEach((b, bi) => {
    if (b.kind === "prose") blocks.push({ kind: "prose", html: renderers.prose(b.text) });
    else if (b.kind === "calc") {
      const ids = b.cells.map((c) => byLine.get(c.line)).filter((x): x is string => !!x);
      blocks.push({ kind: "calc", index: calcIndex++, cells: ids });
    } else if (b.kind === "plot") {
      const key = `plot${bi}`;
      plots[key] = { key, html: renderers.plot(nb, b) };
      blocks.push({ kind: "plot", key });
    } else if (b.name && !tables[b.name]) {
      tables[b.name] = tableView(nb, b, tableText(b), diags);
      blocks.push({ kind: "table", name: b.name });
    }
  });
  return {
    title: doc.front.title ?? file,
    file,
    blocks,
    cells,
    tables,
    plots,
    sources: report.sources,
    cautions: report.cautions,
    cautionsHtml: cautionsPart(report),
    problems: doc.diagnostics.map((d) => `${d.line}:${d.col}: ${d.message}`),
  };
}

/** The display texts of computed columns, by the column object they were made from. */
const shownColumns = new WeakMap<object, { settings: string; values: string[] }>();

function tableView(
  nb: Notebook,
  block: TableBlock,
  text: TableText | undefined,
  diags: ReturnType<Notebook["diagnostics"]>,
): TableView {
  const r = nb.result(block.name);
  const file = block.options.file?.value;
  const columns = text?.columns ?? block.columns.map((c) => ({ name: c.name, spec: c.spec }));
  const rows = text?.rows ?? [];
  const lineToRow = new Map(rows.map((row, i) => [row.line, i]));
  const problems: RowProblem[] = [];
  for (const d of diags) {
    if ((file ? d.file === file : d.file === nb.doc.file) && lineToRow.has(d.line)) {
      problems.push({ row: lineToRow.get(d.line)!, message: d.message });
    }
  }
  const computed: { name: string; unit: string; values: string[] }[] = [];
  const info = r?.value ? tableInfo(r.value) : undefined;
  const dataNames = new Set(columns.map((c) => c.name));
  if (info && info.rowCount <= GRID_ROW_LIMIT) {
    const settings = JSON.stringify(nb.display);
    for (const col of info.columns) {
      if (dataNames.has(col.name)) continue;
      // A column not recomputed since the last view is the same object: its texts are kept.
      const kept = shownColumns.get(col);
      if (kept && kept.settings === settings) {
        computed.push({ name: col.name, unit: col.unit, values: kept.values });
        continue;
      }
      // Rows often repeat a value (powers in steps): each distinct number is described once.
      const seen = new Map<unknown, string>();
      const values: string[] = [];
      for (let i = 0; i < col.length; i++) {
        const v = col.data[i];
        let text = seen.get(v);
        if (text === undefined) {
          text = tableCellText(col, i, nb.display);
          if (typeof v !== "object" || v === null) seen.set(v, text);
        }
        values.push(text);
      }
      shownColumns.set(col, { settings, values });
      computed.push({ name: col.name, unit: col.unit, values });
    }
  }
  let locked: string | undefined;
  if (!text) locked = "the rows cannot be read";
  else if (rows.length > GRID_ROW_LIMIT) {
    locked = `${rows.length} rows: too many to edit here (the first ${GRID_ROW_LIMIT} are shown)`;
  } else if (!file && !block.headerLine) locked = "the table has no header line";
  return {
    name: block.name,
    ...(file ? { file } : {}),
    editable: !locked,
    ...(locked ? { locked } : {}),
    columns,
    rows: rows.slice(0, GRID_ROW_LIMIT).map((row) => row.cells),
    computed,
    footer: info ? tableCounts(info) : `${countText(rows.length)} rows`,
    ...(r?.error ? { error: errorView(r.error) } : {}),
    problems,
  };
}
