/**
 * The exported page's stylesheet: screen and print (A4 and US Letter), system fonts only,
 * nothing fetched. Class names are those {@linkcode renderNotebookBody} writes; the colours are
 * Lentil's own, from `_palette.ts`.
 *
 * @example
 * ```ts
 * import { EXPORT_CSS } from "./style.ts";
 * EXPORT_CSS.includes("@media print"); // true
 * ```
 *
 * @module
 */

import { PAGE } from "./_palette.ts";

/** Screen and print CSS for an exported notebook. */
export const EXPORT_CSS = `
:root {
  --ink: ${PAGE.ink}; --muted: ${PAGE.muted}; --rule: ${PAGE.rule}; --paper: ${PAGE.paper};
  --band: ${PAGE.band}; --accent: ${PAGE.accent}; --warn-bg: ${PAGE.cautionBg};
  --warn: ${PAGE.caution}; --bad: ${PAGE.bad}; --bad-bg: ${PAGE.badBg}; --good: ${PAGE.good};
  --good-bg: ${PAGE.goodBg};
  color-scheme: light;
}
* { box-sizing: border-box; }
html { background: var(--paper); color: var(--ink); }
body {
  margin: 0 auto; max-width: 54rem; padding: 2rem 1.5rem 3rem;
  font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "Liberation Sans",
    Arial, sans-serif;
}
code, pre, .lx-expr, .lx-csv {
  font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, "DejaVu Sans Mono",
    "Liberation Mono", monospace;
  font-size: 0.9em;
}
h1, h2, h3 { line-height: 1.2; margin: 1.6em 0 0.5em; }
h1 { font-size: 1.8rem; }
h2 { font-size: 1.35rem; }
a { color: var(--accent); }
.lx-head { border-bottom: 2px solid var(--accent); margin-bottom: 1.5rem; padding-bottom: 0.5rem; }
.lx-head h1 { margin: 0 0 0.25rem; }
.lx-meta { color: var(--muted); margin: 0; font-size: 0.92rem; }
.lx-meta span + span::before { content: " · "; }
.lx-prose img { max-width: 100%; }
.lx-image-ref { color: var(--muted); }
.lx-calc, .lx-table-block { margin: 1rem 0; }
table { border-collapse: collapse; width: 100%; font-size: 0.92rem; }
th, td { text-align: left; padding: 0.3rem 0.5rem; border-bottom: 1px solid var(--rule);
  vertical-align: top; }
thead th { border-bottom: 2px solid var(--ink); }
.lx-cells { background: var(--band); border-radius: 4px; }
.lx-cells td.lx-name { font-weight: 600; white-space: nowrap; width: 1%; }
.lx-cells td.lx-formula { width: 45%; }
.lx-cells .lx-expr { display: block; color: var(--muted); overflow-wrap: break-word; }
.lx-cells .lx-note { display: block; color: var(--muted); font-style: italic; font-size: 0.88em; }
.lx-cells td.lx-value { font-weight: 600; overflow-wrap: break-word; }
.lx-cells tr.lx-input td.lx-value { font-weight: 400; }
.lx-error { color: var(--bad); font-weight: 600; white-space: normal; }
sup.lx-fn { font-size: 0.72em; margin-left: 0.15em; }
sup.lx-fn a { text-decoration: none; }
.lx-flag { color: var(--warn); font-weight: 700; margin-left: 0.2em; }
.lx-scroll { overflow-x: auto; max-width: 100%; }
.lx-scroll:focus-visible { outline: 2px solid var(--accent); outline-offset: 2px; }
/* A fixed layout keeps a wide table under a result inside the page: its scroller scrolls. */
table.lx-cells.lx-laid { table-layout: fixed; }
table.lx-cells.lx-laid col.lx-col-name { width: 24%; }
table.lx-cells.lx-laid col.lx-col-formula { width: 40%; }
table.lx-cells.lx-laid td.lx-name { width: auto; white-space: normal; overflow-wrap: anywhere; }
table.lx-cells.lx-laid td.lx-formula { width: auto; }
.lx-cells tr.lx-below td { padding: 0 0.5rem 0.6rem 1.5rem; }
.lx-cells tr.lx-cell:has(+ tr.lx-below) td { border-bottom: none; }
.lx-headline.lx-fail { color: var(--bad); }
table.lx-parts { width: auto; font-size: 0.88rem; margin: 0.1rem 0 0.2rem; }
table.lx-parts th, table.lx-parts td { padding: 0.1rem 0.8rem 0.1rem 0; border-bottom: none;
  font-weight: 400; }
table.lx-parts th { color: var(--muted); white-space: nowrap; }
table.lx-parts td { font-variant-numeric: tabular-nums; }
table.lx-check { width: auto; font-size: 0.88rem; margin: 0.2rem 0; }
table.lx-check th, table.lx-check td { padding: 0.15rem 0.6rem; white-space: nowrap;
  vertical-align: baseline; }
table.lx-check caption { caption-side: bottom; text-align: left; color: var(--muted);
  font-size: 0.85em; padding-top: 0.2rem; }
table.lx-check tbody th { font-weight: 400; white-space: normal; min-width: 9rem;
  max-width: 15rem; }
.lx-clause, .lx-remark { display: block; color: var(--muted); font-size: 0.85em; }
td.lx-verdict strong { font-weight: 700; }
td.lx-pass strong { color: var(--good); }
td.lx-fail strong { color: var(--bad); }
tr.lx-row-fail { background: var(--bad-bg); }
.lx-table-foot { color: var(--muted); font-size: 0.85rem; margin: 0.2rem 0 0; }
th.lx-computed, td.lx-computed { background: var(--band); }
table.lx-data-table { width: auto; min-width: 50%; }
table.lx-data-table th, table.lx-data-table td { padding: 0.2rem 0.6rem; white-space: nowrap; }
td.lx-num, th.lx-num { text-align: right; font-variant-numeric: tabular-nums; }
.lx-table-cap { color: var(--muted); font-size: 0.88rem; margin: 0.3rem 0; }
.lx-table-name { font-weight: 600; color: var(--ink); }
details.lx-data summary { cursor: pointer; color: var(--accent); }
pre.lx-csv { background: var(--band); padding: 0.5rem; overflow: auto; max-height: 24rem; }
figure.lx-plot { margin: 1.5rem 0; break-inside: avoid; page-break-inside: avoid; }
figure.lx-plot svg { max-width: 100%; height: auto; display: block; font-family: inherit; }
figure.lx-plot figcaption { color: var(--muted); font-size: 0.88rem; }
figure.lx-plot .lx-plot-title { font-weight: 600; color: var(--ink); margin-bottom: 0.3rem; }
.lx-problem { border-left: 4px solid var(--bad); padding: 0.4rem 0.8rem; background: var(--bad-bg); }
section.lx-cautions, aside.lx-cautions {
  background: var(--warn-bg); border-left: 4px solid var(--warn); padding: 0.6rem 1rem;
  margin: 1rem 0; font-size: 0.92rem; break-inside: avoid; page-break-inside: avoid;
}
section.lx-cautions h2, aside.lx-cautions h2, aside.lx-cautions p.lx-cautions-title {
  margin: 0 0 0.3rem; font-size: 1rem; color: var(--warn); font-weight: 700;
}
section.lx-cautions ul, aside.lx-cautions ul { margin: 0; padding-left: 1.2rem; }
.lx-cautions-at { margin: 0.4rem 0 0; color: var(--muted); }
a.lx-flag { text-decoration: none; }
section.lx-sources ol { padding-left: 1.6rem; }
section.lx-sources li { margin-bottom: 0.35rem; }
.lx-mark { display: inline-block; font-size: 0.78rem; padding: 0 0.4rem; margin-left: 0.3rem;
  border: 1px solid var(--warn); color: var(--warn); border-radius: 3px; }
footer.lx-foot { margin-top: 2.5rem; border-top: 1px solid var(--rule); padding-top: 0.6rem;
  color: var(--muted); font-size: 0.82rem; }
footer.lx-foot dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.1rem 1rem;
  margin: 0; }
footer.lx-foot dt { font-weight: 600; }
footer.lx-foot dd { margin: 0; overflow-wrap: anywhere; }

@page { size: auto; margin: 16mm 14mm; }
@media print {
  html, body { background: #fff; }
  body { max-width: none; padding: 0; font-size: 10.5pt; }
  a { color: inherit; text-decoration: none; }
  h1, h2, h3 { break-after: avoid; page-break-after: avoid; }
  table, tr, figure, aside { break-inside: avoid; page-break-inside: avoid; }
  thead { display: table-header-group; }
  .lx-cells { background: none; }
  details.lx-data { display: none; }
  figure.lx-plot svg { max-height: 110mm; width: auto; }
  /* Wide tables print whole: no scrolling on paper, smaller type, cells may wrap. */
  .lx-scroll { overflow: visible; }
  table.lx-data-table, table.lx-check { font-size: 7.5pt; width: 100%; table-layout: auto; }
  table.lx-data-table th, table.lx-data-table td, table.lx-check th, table.lx-check td {
    white-space: normal; padding: 0.05rem 0.25rem; overflow-wrap: anywhere; }
  table.lx-data-table { break-inside: auto; page-break-inside: auto; }
  footer.lx-foot { break-inside: avoid; }
}
`;
