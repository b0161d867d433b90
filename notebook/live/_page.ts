/**
 * The live page's shell and style. The page asks nothing of the network but its own origin:
 * its script and style come from the server, under a strict content security policy.
 *
 * @module
 */

import { EXPORT_CSS } from "../export/style.ts";
import { esc } from "./_markup.ts";

/**
 * The page shell: a bar with the file's state and commands, and the notebook below. Its
 * script and style are addressed relative to the page, whose address holds the session's key.
 *
 * @example
 * ```ts
 * import { pageHtml } from "./_page.ts";
 * pageHtml("Case <1>").includes("Case &lt;1&gt;"); // true
 * ```
 */
export function pageHtml(title: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<link rel="icon" href="data:,">
<title>${esc(title)} · Lentil, editing</title>
<link rel="stylesheet" href="style.css" id="lentil-style">
<script type="module" src="client/main.js" id="lentil-script"></script>
</head>
<body>
<header class="live-bar">
  <strong id="lentil-title">${esc(title)}</strong>
  <span id="lentil-file" class="file"></span>
  <span id="lentil-status" class="status" role="status" aria-live="polite">loading…</span>
  <span class="commands">
    <button type="button" id="lentil-undo" title="Step back (Ctrl+Z)">Undo</button>
    <button type="button" id="lentil-redo" title="Step forward (Ctrl+Shift+Z)">Redo</button>
    <button type="button" id="lentil-save" title="Write the file (Ctrl+S)">Save</button>
    <button type="button" id="lentil-end" title="Stop serving this notebook; what is not saved is not written">End session</button>
  </span>
</header>
<div id="lentil-banner" class="live-banner" role="alert" hidden></div>
<main id="lentil-main" class="lx-notebook"></main>
<div id="lentil-footer" class="live-footer"></div>
</body>
</html>
`;
}

/** Additions for editing, on top of the export's stylesheet. */
const LIVE_CSS = `
body { max-width: 60rem; padding-top: 0; }
.live-bar { position: sticky; top: 0; display: flex; gap: 1em; align-items: center; z-index: 2;
  padding: .5em .8em; background: var(--band); border-bottom: 1px solid var(--rule); }
.live-bar .file { color: var(--muted); font-family: ui-monospace, monospace; }
.live-bar .status { color: var(--muted); }
.live-bar .status.dirty { color: var(--warn); }
.live-bar .commands { margin-left: auto; display: flex; gap: .4em; }
.live-banner { margin: .5em 0; padding: .6em 1em; border: 1px solid var(--warn);
  background: var(--warn-bg); display: flex; gap: 1em; align-items: center; }
.live-banner[hidden] { display: none; }
input.live-expr, .live-new-cell input { font: inherit; font-family: ui-monospace, monospace;
  width: 100%; border: 1px solid var(--rule); padding: .15em .3em; background: var(--paper); }
tr.lx-input input.live-expr { background: var(--band); }
tr.lx-has-error input.live-expr { border-color: var(--bad); }
tr.live-carried .live-error { color: var(--warn); }
.live-error { font-size: .88em; }
.live-error:empty { display: none; }
.live-tools { white-space: nowrap; width: 1%; }
.live-tools button, .live-remove { border: none; background: none; color: var(--muted);
  cursor: pointer; }
.live-new-cell { margin: .3em 0 0; }
table.live-grid td { padding: 0; }
table.live-grid td.live-computed { padding: .2rem .9rem; color: var(--muted); background: var(--band); }
table.live-grid th.live-computed { color: var(--muted); }
table.live-grid input { font: inherit; border: none; padding: .2rem .9rem; width: 7.5em;
  font-variant-numeric: tabular-nums; background: transparent; }
table.live-grid input:focus { outline: 2px solid var(--accent); background: var(--paper); }
table.live-grid tr.live-bad td { background: var(--bad-bg); }
table.live-grid td.live-tools { border: none; }
.live-pager { margin: .3rem 0; color: var(--muted); font-size: .88rem; }
.live-locked { color: var(--warn); font-size: .88rem; }
td.lx-value .live-below { max-width: min(40rem, 62vw); font-weight: 400; }
td.lx-value .live-below:empty { display: none; }
`;

/** The page's style: the export's stylesheet, so the page reads as the export does, and the editing additions. */
export const STYLE_CSS: string = EXPORT_CSS + LIVE_CSS;
