/**
 * Private: a result as page markup, from the report's headline, parts, check lines and
 * table rows (the same declaration every surface renders): the headline beside the cell,
 * the parts as a compact table under it, a check as a table quantity | ordered | measured |
 * deviation | tolerance | verdict with the verdict coloured and worded and the rule of the
 * standard named, a table result by the same renderer as table blocks. The exported page and
 * the live page both use these. Every piece of text passes through `escapeHtml`.
 *
 * @example
 * ```ts
 * import { partsTable } from "./_results.ts";
 * partsTable([{ key: "n", label: "eyes", display: "12", value: 12, unit: "" }]).includes("eyes"); // true
 * ```
 *
 * @module
 */

import type { CheckLine } from "../../cells/types.ts";
import { columnHeading, type PartView, type TableShown } from "../../cells/present.ts";
import { anchorId, escapeHtml } from "./_escape.ts";
import { stringify } from "csv-stringify/sync";

/** What the page needs of a result to render it. */
export interface HtmlResult {
  /** Node id. */
  readonly id: string;
  /** One-line display. */
  readonly display: string;
  /** The line read first. */
  readonly headline: string;
  /** Footnote numbers. */
  readonly notes: readonly number[];
  /** The cautions apply. */
  readonly caution: boolean;
  /** Labelled parts. */
  readonly parts?: readonly PartView[];
  /** Check lines. */
  readonly checks?: readonly CheckLine[];
  /** A table's first rows. */
  readonly table?: TableShown;
}

/** The id of the page's one cautions section. */
export const CAUTIONS_ID = "cautions";

/** Footnote links to the numbered sources. */
export function footnotesHtml(notes: readonly number[]): string {
  if (!notes.length) return "";
  const links = notes.map((n) => `<a href="#src-${n}">${n}</a>`).join(",");
  return `<sup class="lx-fn">${links}</sup>`;
}

/** The id of a result's caution marker, which the cautions section links back to. */
export function cautionMarkId(cellId: string): string {
  return anchorId("caution-at", cellId);
}

/** The marker at a result the cautions apply to: a link to the one cautions section. */
export function cautionMark(cellId: string): string {
  return `<a class="lx-flag" id="${cautionMarkId(cellId)}" href="#${CAUTIONS_ID}" ` +
    `title="The cautions apply to this result" aria-label="cautions apply, see Cautions">` +
    `&#9888;</a>`;
}

/** Whether a result has anything to show under its headline. */
export function hasBelow(r: HtmlResult): boolean {
  return !!(r.parts?.length || r.checks?.length || r.table);
}

/** The value beside the cell: the headline (or display), footnotes, the caution marker. */
export function headlineHtml(r: HtmlResult): string {
  const text = hasBelow(r) ? r.headline : r.display;
  const verdict = r.checks?.length
    ? r.checks.some((c) => c.verdict === "fail") ? " lx-fail" : " lx-pass"
    : "";
  const head = text ? `<span class="lx-headline${verdict}">${escapeHtml(text)}</span>` : "";
  return `${head}${footnotesHtml(r.notes)}${r.caution ? cautionMark(r.id) : ""}`;
}

/** Everything under the headline: the parts table, the check table, the table's rows. */
export function belowHtml(r: HtmlResult): string {
  return [
    r.parts?.length ? partsTable(r.parts) : "",
    r.checks?.length ? checkTable(r.checks, r.id) : "",
    r.table ? dataTableHtml(r.table, `result ${r.id}`) + tableCsvLink(r.table, r.id) : "",
  ].join("");
}

/**
 * A link that saves a result table as CSV, the text as shown (a supplement table reads the
 * same in the file as on the page); only when every row is shown.
 *
 * @example
 * ```ts
 * import { tableCsvLink } from "./_results.ts";
 * const t = { name: "t", columns: [{ name: "n", unit: "", numeric: false, computed: false }],
 *   rows: [["12"]], rowCount: 1, excluded: 0, footer: "" };
 * tableCsvLink(t, "summary").includes('download="summary.csv"'); // true
 * ```
 */
export function tableCsvLink(t: TableShown, id: string): string {
  if (t.rows.length !== t.rowCount) return "";
  const header = t.columns.map(columnHeading);
  const csv = stringify([header, ...t.rows]);
  const file = `${id}.csv`;
  return `<p class="lx-table-foot"><a download="${escapeHtml(file)}" ` +
    `href="data:text/csv;charset=utf-8,${escapeHtml(encodeURIComponent(csv))}">` +
    `Save ${escapeHtml(file)} (CSV)</a></p>`;
}

/** Parts as a compact two-column table: label in words, display. */
export function partsTable(parts: readonly PartView[]): string {
  const rows = parts.map((p) =>
    `<tr data-part="${escapeHtml(p.key)}"><th scope="row">${escapeHtml(p.label)}</th>` +
    `<td>${escapeHtml(p.display)}</td></tr>`
  ).join("");
  return `<table class="lx-parts"><tbody>${rows}</tbody></table>`;
}

/** Verdict in words, with its class for colour (never colour alone). */
function verdictCell(c: CheckLine): string {
  const cls = c.verdict === "fail" ? "lx-fail" : c.verdict === "pass" ? "lx-pass" : "lx-unchecked";
  const word = c.verdict === "fail" ? "FAIL" : c.verdict;
  const remark = c.remark ? `<span class="lx-remark">${escapeHtml(c.remark)}</span>` : "";
  return `<td class="lx-verdict ${cls}"><strong>${escapeHtml(word)}</strong>${remark}</td>`;
}

/**
 * A check as a real table: quantity | ordered | measured | deviation | tolerance | verdict,
 * the rule of the standard under each quantity.
 */
export function checkTable(checks: readonly CheckLine[], label: string): string {
  const head = ["quantity", "ordered", "measured", "deviation", "tolerance"]
    .map((h, i) => `<th scope="col"${i ? ' class="lx-num"' : ""}>${escapeHtml(h)}</th>`).join(
      "",
    ) + `<th scope="col">verdict</th>`;
  const rows = checks.map((c) =>
    `<tr class="${c.verdict === "fail" ? "lx-row-fail" : ""}">` +
    `<th scope="row">${escapeHtml(c.quantity)}${
      c.clause ? `<span class="lx-clause">${escapeHtml(c.clause)}</span>` : ""
    }</th>` +
    [c.ordered, c.measured, c.deviation, c.tolerance].map((v) =>
      `<td class="lx-num">${escapeHtml(v)}</td>`
    ).join("") + verdictCell(c) + `</tr>`
  ).join("");
  return scroller(
    `<table class="lx-check"><caption>deviation = measured − ordered</caption>` +
      `<thead><tr>${head}</tr></thead><tbody>${rows}</tbody></table>`,
    `check ${label}`,
  );
}

/**
 * A wide-table scroller: focusable by keyboard, a named region, so a table wider than the
 * page scrolls on screen (and prints whole).
 */
export function scroller(inner: string, label: string): string {
  return `<div class="lx-scroll" tabindex="0" role="region" aria-label="${
    escapeHtml(label)
  }">${inner}</div>`;
}

/**
 * A table's shown rows (header with units, computed columns marked), in its scroller, with
 * its footer in words: table blocks and table results alike.
 */
export function dataTableHtml(t: TableShown, label: string): string {
  const th = t.columns.map((c) => {
    const cls = [c.numeric ? "lx-num" : "", c.computed ? "lx-computed" : ""].filter(Boolean)
      .join(" ");
    // A heading in words names the column's identifier for later cells in its tooltip.
    const named = c.label ? ` title="${escapeHtml(`column ${c.name}`)}"` : "";
    return `<th scope="col"${cls ? ` class="${cls}"` : ""}${named}>${
      escapeHtml(columnHeading(c))
    }</th>`;
  }).join("");
  const body = t.rows.map((r) =>
    "<tr>" + r.map((v, i) => {
      const c = t.columns[i];
      const cls = [c.numeric ? "lx-num" : "", c.computed ? "lx-computed" : ""].filter(Boolean)
        .join(" ");
      return `<td${cls ? ` class="${cls}"` : ""}>${escapeHtml(v)}</td>`;
    }).join("") + "</tr>"
  ).join("\n");
  return scroller(
    `<table class="lx-data-table" data-rows="${t.rowCount}"><thead><tr>${th}</tr></thead>` +
      `<tbody>\n${body}\n</tbody></table>`,
    `table ${label}`,
  ) + (t.footer ? `<p class="lx-table-foot">${escapeHtml(t.footer)}</p>` : "");
}

/**
 * The page's one cautions section, with a link back to each result it applies to.
 *
 * @example
 * ```ts
 * import { cautionsSection } from "./_results.ts";
 * cautionsSection(["Verify on a focimeter."], ["cl"]).includes('href="#caution-at-cl"'); // true
 * ```
 */
export function cautionsSection(
  cautions: readonly string[],
  cellIds: readonly string[],
): string {
  if (!cautions.length) return "";
  const items = cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join("");
  const back = cellIds.length
    ? `<p class="lx-cautions-at">They apply to ${
      cellIds.map((id) => `<a href="#${cautionMarkId(id)}">${escapeHtml(id)}</a>`).join(", ")
    }.</p>`
    : "";
  return `<section class="lx-cautions" id="${CAUTIONS_ID}" role="note" aria-labelledby="${CAUTIONS_ID}-title">` +
    `<h2 id="${CAUTIONS_ID}-title">Cautions</h2><ul>${items}</ul>${back}</section>`;
}
