/**
 * Markup of the page's parts: a formula block's cells, a table block, a plot figure, the
 * one cautions section, the sources list. Every piece of user text passes through `escapeHtml`.
 *
 * @module
 */

import { countText } from "../../lib/number_text.ts";
import { stringify } from "csv-stringify/sync";
import type { Notebook } from "../engine/engine.ts";
import type { CalcBlock, TableBlock } from "../format/parse.ts";
import type { Report, ReportCell } from "../report.ts";
import { type TableInfo, tableInfo } from "../../cells/table.ts";
import { showTable, tableCellText } from "../../cells/present.ts";
import { belowHtml, cautionsSection, dataTableHtml, hasBelow, headlineHtml } from "./_results.ts";
import { anchorId, escapeHtml } from "./_escape.ts";
import type { RenderedPlot } from "./plot.ts";

/**
 * An expression as a readable formula: × for *, a true minus sign, ≤ and ≥; text inside
 * quotes is left as written.
 */
export function readableFormula(expression: string): string {
  let out = "";
  let quote = "";
  for (let i = 0; i < expression.length; i++) {
    const c = expression[i];
    if (quote) {
      out += c;
      if (c === "\\" && i + 1 < expression.length) out += expression[++i];
      else if (c === quote) quote = "";
      continue;
    }
    if (c === '"' || c === "'") {
      quote = c;
      out += c;
    } else if (c === "*") out += "×";
    else if (c === "-") out += "−";
    else if ((c === "<" || c === ">") && expression[i + 1] === "=") {
      out += c === "<" ? "≤" : "≥";
      i++;
    } else out += c;
  }
  return out;
}

function cellRow(c: ReportCell): string {
  const classes = ["lx-cell", c.input ? "lx-input" : "", c.error ? "lx-has-error" : ""]
    .filter(Boolean).join(" ");
  const value = c.error
    ? `<span class="lx-error">${escapeHtml(c.display)}</span>`
    : headlineHtml(c);
  const expr = c.input || !c.expression ? "" : escapeHtml(readableFormula(c.expression));
  const below = !c.error && hasBelow(c)
    ? `<tr class="lx-below" data-below="${escapeHtml(c.id)}"><td colspan="3">${
      belowHtml(c)
    }</td></tr>`
    : "";
  return `<tr class="${classes}" id="${anchorId("cell", c.id)}" data-cell="${escapeHtml(c.id)}">` +
    `<td class="lx-name">${escapeHtml(c.id)}</td>` +
    `<td class="lx-formula"><span class="lx-expr">${expr}</span>` +
    `${c.note ? `<span class="lx-note">${escapeHtml(c.note)}</span>` : ""}</td>` +
    `<td class="lx-value">${value}</td></tr>${below}`;
}

/**
 * A formula block: one row a cell (name, formula, headline with footnotes and the caution
 * marker, note), the parts, check or table rows of a result in a row under it. The cautions
 * are in one section of the page, which each marker links to.
 */
export function calcSection(
  block: CalcBlock,
  byLine: ReadonlyMap<number, ReportCell>,
): string {
  const cells = block.cells.map((d) => byLine.get(d.line)).filter((c): c is ReportCell => !!c);
  if (!cells.length) return "";
  const rows = cells.map(cellRow).join("\n");
  return `<section class="lx-calc" data-line="${block.span.line}">` +
    `<table class="lx-cells lx-laid"><colgroup><col class="lx-col-name">` +
    `<col class="lx-col-formula"><col class="lx-col-value"></colgroup>` +
    `<tbody>\n${rows}\n</tbody></table></section>`;
}

/** The page's one cautions section, linking back to each result it applies to. */
export function cautionsPart(report: Report): string {
  return cautionsSection(
    report.cautions,
    report.cells.filter((c) => c.caution && !c.error).map((c) => c.id),
  );
}

/** CSV text of a whole table, numbers as stored. */
function tableCsv(nb: Notebook, info: TableInfo): string {
  const header = info.columns.map((c) => (c.unit ? `${c.name} [${c.unit}]` : c.name));
  const rows: string[][] = [];
  for (let i = 0; i < info.rowCount; i++) {
    rows.push(info.columns.map((c) => {
      const v = c.data[i];
      if (c.numeric) return Number.isNaN(v as number) ? "" : String(v);
      return v === null || v === undefined ? "" : tableCellText(c, i, nb.display);
    }));
  }
  return stringify([header, ...rows]);
}

/** Options for tables. */
export interface TableOptions {
  /** Rows shown before the table is cut (default 25). */
  readonly maxRows: number;
  /** Embed the full data as CSV. */
  readonly embedData: boolean;
}

/** A table block: header with units, the first rows, the row count, optionally the CSV. */
export function tableSection(
  nb: Notebook,
  block: TableBlock,
  cell: ReportCell | undefined,
  options: TableOptions,
): string {
  const id = anchorId("table", block.name || `line-${block.line}`);
  const name = `<span class="lx-table-name">table ${escapeHtml(block.name)}</span>`;
  const r = cell ? nb.result(cell.id) : undefined;
  const info = r && !r.error ? tableInfo(r.value) : undefined;
  if (!info) {
    const msg = cell?.error?.message ?? "the table could not be read";
    return `<section class="lx-table-block" id="${id}"><p class="lx-table-cap">${name}</p>` +
      `<p class="lx-problem lx-error">${escapeHtml(msg)}</p></section>`;
  }
  const shown = showTable(info, nb.display, options.maxRows);
  let data = "";
  if (options.embedData) {
    const csv = tableCsv(nb, info);
    const file = `${block.name || "table"}.csv`;
    data =
      `<details class="lx-data"><summary>Full data as CSV (${
        countText(info.rowCount)
      } rows)</summary>` +
      `<p><a download="${escapeHtml(file)}" href="data:text/csv;charset=utf-8,${
        escapeHtml(encodeURIComponent(csv))
      }">Save ${escapeHtml(file)}</a></p>` +
      `<pre class="lx-csv">${escapeHtml(csv)}</pre></details>`;
  }
  return `<section class="lx-table-block" id="${id}" data-rows="${info.rowCount}">` +
    `<p class="lx-table-cap">${name}</p>${
      dataTableHtml(shown, block.name || `at line ${block.line}`)
    }${data}</section>`;
}

/** A plot as a figure, or its problems in place of it. */
export function plotFigure(p: RenderedPlot): string {
  const id = anchorId("plot", p.name);
  const title = p.heading ? `<div class="lx-plot-title">${escapeHtml(p.heading)}</div>` : "";
  if (!p.svg) {
    const msgs = p.problems.map((d) => `<p>${escapeHtml(d.message)} (line ${d.line})</p>`).join(
      "",
    );
    return `<figure class="lx-plot lx-problem" id="${id}">${title}${msgs}</figure>`;
  }
  const cap = p.caption ? `<figcaption>${escapeHtml(p.caption)}</figcaption>` : "";
  return `<figure class="lx-plot" id="${id}" data-plot="${
    escapeHtml(p.name)
  }">${title}${p.svg}${cap}</figure>`;
}

/** The numbered sources with their trust marks. */
export function sourcesSection(report: Report): string {
  if (!report.sources.length) {
    return `<section class="lx-sources" id="sources"><h2>Sources</h2>` +
      `<p>No result used a published method, reference value or trade convention.</p></section>`;
  }
  const items = report.sources.map((s) =>
    `<li id="src-${s.n}" value="${s.n}" data-source="${escapeHtml(s.id)}">${
      escapeHtml(s.citation)
    }${s.mark ? ` <span class="lx-mark">${escapeHtml(s.mark)}</span>` : ""}</li>`
  ).join("\n");
  return `<section class="lx-sources" id="sources"><h2>Sources</h2><ol>\n${items}\n</ol></section>`;
}
