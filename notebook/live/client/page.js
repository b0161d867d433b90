// @ts-check
/// <reference lib="dom" />
/**
 * The whole live page: drawing it from the server's view, and applying a patch by touching
 * only the cells, grids and plots that changed. A plot's figure is replaced only when the
 * server sent it again, which it does only when the plot's data changed.
 *
 * @module
 */

import { byId, el } from "./dom.js";
import { cellKey, fillCell, renderCalc } from "./cells.js";
import { applyTable, renderTable } from "./tables.js";
import { live } from "./state.js";

/** @typedef {import("./state.js").Patch} Patch */
/** @typedef {import("./state.js").EditResult} EditResult */
/** @typedef {import("./state.js").SessionStatus} SessionStatus */
/** @typedef {import("../_views.ts").BlockView} BlockView */

let lastFooter = "";

/**
 * Show the session's status in the bar.
 *
 * @param {SessionStatus} s
 */
export function showStatus(s) {
  byId("lentil-file").textContent = s.file;
  /** @type {HTMLButtonElement} */ (byId("lentil-undo")).disabled = !s.canUndo;
  /** @type {HTMLButtonElement} */ (byId("lentil-redo")).disabled = !s.canRedo;
  const status = byId("lentil-status");
  status.textContent = s.dirty
    ? "unsaved changes" + (s.dirtyFiles.length ? " (and " + s.dirtyFiles.join(", ") + ")" : "")
    : "saved";
  status.classList.toggle("dirty", s.dirty);
}

/**
 * One block of the page.
 *
 * @param {BlockView} b
 * @returns {HTMLElement}
 */
function renderBlock(b) {
  if (b.kind === "prose") {
    const d = el("div", "lx-prose");
    d.innerHTML = b.html;
    return d;
  }
  if (b.kind === "calc") return renderCalc(b);
  if (b.kind === "table") return renderTable(live.view.tables[b.name]);
  const p = el("div", "live-plot");
  p.id = "plot-" + b.key;
  p.innerHTML = live.view.plots[b.key].html;
  return p;
}

/** The problems, cautions and sources below the notebook, redrawn only when they change. */
function renderFooter() {
  const view = live.view;
  const key = JSON.stringify([view.sources, view.cautionsHtml, view.problems]);
  if (key === lastFooter) return;
  lastFooter = key;
  const footer = byId("lentil-footer");
  footer.replaceChildren();
  if (view.problems.length) {
    const ul = el("ul", "lx-problem live-problems");
    for (const p of view.problems) ul.append(el("li", "", p));
    footer.append(ul);
  }
  if (view.cautionsHtml) {
    // One cautions section, rendered by the server as on the exported page.
    const cautions = el("div", "live-cautions");
    cautions.innerHTML = view.cautionsHtml;
    footer.append(cautions);
  }
  const sec = el("section", "lx-sources");
  sec.id = "sources";
  sec.append(el("h2", "", "Sources"));
  if (!view.sources.length) {
    sec.append(
      el("p", "", "No result used a published method, reference value or trade convention."),
    );
  } else {
    const ol = el("ol");
    for (const s of view.sources) {
      const li = el("li", "", s.citation);
      li.id = "src-" + s.n;
      li.value = s.n;
      if (s.mark) li.append(" ", el("span", "lx-mark", s.mark));
      ol.append(li);
    }
    sec.append(ol);
  }
  footer.append(sec);
}

/** Draw the whole page from the view, keeping the focus where it was. */
export function renderAll() {
  const view = live.view;
  const active = document.activeElement;
  const keep = active && active.id ? active.id : null;
  byId("lentil-title").textContent = view.title;
  const head = el("header", "lx-head");
  head.append(el("h1", "", view.title));
  byId("lentil-main").replaceChildren(head, ...view.blocks.map(renderBlock));
  lastFooter = "";
  renderFooter();
  const again = keep ? document.getElementById(keep) : null;
  if (again) again.focus();
}

/**
 * Apply a patch: the whole page when its blocks changed, else only what it names.
 *
 * @param {Patch} p
 */
export function applyPatch(p) {
  if (p.full) {
    live.view = /** @type {typeof live.view} */ (p.full);
    renderAll();
  } else {
    const view = live.view;
    for (const c of p.cells) {
      view.cells[c.id] = c;
      const row = document.getElementById(cellKey(c.id));
      if (row) fillCell(row, c, false);
    }
    for (const id of p.removed) {
      delete view.cells[id];
      document.getElementById(cellKey(id))?.remove();
    }
    for (const t of p.tables) applyTable(t);
    for (const pl of p.plots) {
      view.plots[pl.key] = pl;
      const slot = document.getElementById("plot-" + pl.key);
      if (slot) slot.innerHTML = pl.html;
    }
    // The parts below the notebook come only when they changed.
    if (p.sources) view.sources = p.sources;
    if (p.cautions) view.cautions = p.cautions;
    if (p.cautionsHtml !== undefined) view.cautionsHtml = p.cautionsHtml;
    if (p.problems) view.problems = p.problems;
    if (p.sources || p.cautions || p.cautionsHtml !== undefined || p.problems) renderFooter();
  }
  showStatus(p.status);
}

/**
 * Apply an edit's result, and say on the body which nodes were recomputed.
 *
 * @param {EditResult} r
 * @returns {EditResult}
 */
export function applyResult(r) {
  if (r.patch) applyPatch(r.patch);
  document.body.dataset.recomputed = (r.recomputed || []).join(" ");
  return r;
}
