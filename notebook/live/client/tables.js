// @ts-check
/// <reference lib="dom" />
/**
 * Tables on the live page as editable grids: typing, moving with the arrow keys, pasting a
 * block of cells (tab- or comma-separated), adding, moving and removing rows. A long table is
 * shown a hundred rows at a time, with buttons for the rows before and after, so the page
 * stays quick to lay out. A patch updates a grid in place when its shape is unchanged,
 * touching only the cells whose text changed.
 *
 * @module
 */

import { button, el, flash } from "./dom.js";
import { api, errorText, live, queue } from "./state.js";

/** @typedef {import("./state.js").TableView} TableView */
/** @typedef {import("../session.ts").TableUpdate} TableUpdate */

/**
 * The id of a table's section.
 *
 * @param {string} name
 */
export function tableId(name) {
  return "table-" + name;
}

/** Rows shown at a time. */
export const PAGE_ROWS = 100;

/** @type {Map<string, number>} The first row shown, by table. */
const firstShown = new Map();

/**
 * The rows of a table shown now: from `start` up to (not including) `end`.
 *
 * @param {TableView} t
 */
function shown(t) {
  const n = t.rows.length;
  let start = firstShown.get(t.name) ?? 0;
  if (start >= n) start = Math.max(0, Math.floor((n - 1) / PAGE_ROWS) * PAGE_ROWS);
  firstShown.set(t.name, start);
  return { start, end: Math.min(n, start + PAGE_ROWS) };
}

/**
 * Show the rows of a table from `start`, drawing its section again.
 *
 * @param {string} name
 * @param {number} start
 */
function showFrom(name, start) {
  firstShown.set(name, Math.max(0, start));
  const old = document.getElementById(tableId(name));
  if (old) old.replaceWith(renderTable(live.view.tables[name]));
}

/** @param {TableView} t */
function cloneRows(t) {
  return t.rows.map((r) => r.slice());
}

/**
 * Send a table's rows, then put the focus on a cell.
 *
 * @param {string} name
 * @param {string[][]} rows
 * @param {[number, number]} [focus]
 */
function sendRows(name, rows, focus) {
  queue(() =>
    api("api/table", { name, rows }).then((r) => {
      live.apply(r);
      if (focus) focusCell(name, focus[0], focus[1]);
    })
  );
}

/**
 * Put the focus on a grid cell; false when there is none.
 *
 * @param {string} name
 * @param {number} r
 * @param {number} c
 */
function focusCell(name, r, c) {
  let sec = document.getElementById(tableId(name));
  if (!sec) return false;
  const t = live.view.tables[name];
  if (!t) return false;
  const { start, end } = shown(t);
  if (r >= 0 && r < t.rows.length && (r < start || r >= end)) {
    // A row on another page of the grid: show its page first.
    showFrom(name, Math.floor(r / PAGE_ROWS) * PAGE_ROWS);
    sec = document.getElementById(tableId(name));
    if (!sec) return false;
  }
  /** @type {HTMLInputElement | null} */
  const cell = sec.querySelector('input[data-r="' + r + '"][data-c="' + c + '"]');
  if (!cell) return false;
  cell.focus();
  cell.select();
  return true;
}

/**
 * Split pasted text into rows of fields: tab-separated, else comma-separated (with quotes).
 *
 * @param {string} text
 * @returns {string[][]}
 */
export function splitPaste(text) {
  const lines = text.replace(/\r\n?/g, "\n").split("\n");
  while (lines.length && lines[lines.length - 1].trim() === "") lines.pop();
  const tab = text.indexOf("\t") !== -1;
  return lines.map((line) => {
    if (tab) return line.split("\t");
    const out = [];
    let cur = "", q = false;
    for (let i = 0; i < line.length; i++) {
      const ch = line[i];
      if (q) {
        if (ch === '"' && line[i + 1] === '"') {
          cur += '"';
          i++;
        } else if (ch === '"') q = false;
        else cur += ch;
      } else if (ch === '"') q = true;
      else if (ch === ",") {
        out.push(cur);
        cur = "";
      } else cur += ch;
    }
    out.push(cur);
    return out;
  });
}

/**
 * Row problems by row.
 *
 * @param {TableView["problems"]} problems
 * @returns {Record<number, string[]>}
 */
function badRows(problems) {
  /** @type {Record<number, string[]>} */
  const bad = {};
  for (const p of problems) (bad[p.row] = bad[p.row] || []).push(p.message);
  return bad;
}

/**
 * A table's section: its caption, problems and grid.
 *
 * @param {TableView} t
 * @returns {HTMLElement}
 */
export function renderTable(t) {
  const sec = el("section", "lx-table-block live-table");
  sec.id = tableId(t.name);
  sec.dataset.table = t.name;
  const cap = el("p", "lx-table-cap");
  cap.append(el("span", "lx-table-name", "table " + t.name));
  cap.append(" · " + t.footer);
  sec.append(cap);
  if (t.error) sec.append(el("p", "lx-problem lx-error", errorText(t.error)));
  if (t.locked) sec.append(el("p", "live-locked", "read only: " + t.locked));
  const grid = el("table", "lx-data-table live-grid");
  const head = el("tr");
  for (const c of t.columns) {
    head.append(el("th", "", c.name + (c.spec ? " [" + c.spec + "]" : "")));
  }
  for (const c of t.computed) {
    head.append(
      el("th", "live-computed lx-computed", c.name + (c.unit ? " [" + c.unit + "]" : "")),
    );
  }
  const thead = el("thead");
  thead.append(head);
  const body = el("tbody");
  const bad = badRows(t.problems);
  const { start, end } = shown(t);
  t.rows.slice(start, end).forEach((cells, i) => {
    const r = start + i;
    const tr = el("tr");
    if (bad[r]) {
      tr.className = "live-bad";
      tr.title = bad[r].join("\n");
    }
    t.columns.forEach((col, c) => {
      const td = el("td");
      const input = el("input");
      input.type = "text";
      input.spellcheck = false;
      input.value = input.defaultValue = cells[c] === undefined ? "" : cells[c];
      input.dataset.r = String(r);
      input.dataset.c = String(c);
      input.readOnly = !t.editable;
      input.setAttribute("aria-label", t.name + " row " + (r + 1) + " " + col.name);
      td.append(input);
      tr.append(td);
    });
    for (const c of t.computed) tr.append(el("td", "live-computed lx-num", c.values[r]));
    if (t.editable) {
      const tools = el("td", "live-tools");
      /** @type {[string, string, number][]} */
      const moves = [["↑", "move row up", -1], ["↓", "move row down", 1], ["×", "remove row", 0]];
      for (const [text, title, by] of moves) {
        const btn = button(text, title, () => {
          const rows = cloneRows(live.view.tables[t.name]);
          if (by === 0) rows.splice(r, 1);
          else {
            const to = r + by;
            if (to < 0 || to >= rows.length) return;
            [rows[to], rows[r]] = [rows[r], rows[to]];
          }
          sendRows(t.name, rows);
        });
        btn.tabIndex = -1;
        btn.setAttribute("aria-label", title + " " + (r + 1));
        tools.append(btn);
      }
      tr.append(tools);
    }
    body.append(tr);
  });
  grid.append(thead, body);
  if (t.rows.length > PAGE_ROWS) {
    const pager = el("p", "live-pager");
    const fmt = (/** @type {number} */ n) => n.toLocaleString("en");
    pager.append(
      el("span", "", "rows " + fmt(start + 1) + "–" + fmt(end) + " of " + fmt(t.rows.length)),
    );
    const earlier = button("Earlier rows", "show the rows before these", () => {
      showFrom(t.name, start - PAGE_ROWS);
    }, "live-earlier");
    earlier.disabled = start === 0;
    const later = button("Later rows", "show the rows after these", () => {
      showFrom(t.name, start + PAGE_ROWS);
    }, "live-later");
    later.disabled = end >= t.rows.length;
    pager.append(" ", earlier, " ", later);
    sec.append(pager);
  }
  const scroll = el("div", "lx-scroll");
  scroll.tabIndex = 0;
  scroll.setAttribute("role", "region");
  scroll.setAttribute("aria-label", "table " + t.name);
  scroll.append(grid);
  sec.append(scroll);
  if (t.editable) {
    const add = button("+ row", "add a row at the end", () => {
      const rows = cloneRows(live.view.tables[t.name]);
      rows.push(t.columns.map(() => ""));
      sendRows(t.name, rows, [rows.length - 1, 0]);
    }, "live-add-row");
    sec.append(add);
    wireGrid(sec, t.name);
  }
  return sec;
}

/**
 * Whether a table's new view has the same shape as what the page shows.
 *
 * @param {TableView | undefined} a
 * @param {TableView} b
 */
function sameShape(a, b) {
  const shape = (/** @type {TableView} */ t) =>
    JSON.stringify([
      t.columns,
      t.computed.map((c) => c.name),
      t.error,
      t.locked,
      t.file,
      t.rows.length,
      t.editable,
    ]);
  return !!a && shape(a) === shape(b);
}

/**
 * Update a grid in place: values, computed cells, row problems; the focused cell is left
 * alone, and only cells whose text changed are touched.
 *
 * @param {HTMLElement} sec
 * @param {TableView} t
 * @param {boolean} rowsChanged whether the data rows may differ (else only computed columns)
 * @param {ReadonlySet<string>} [columns] the computed columns that changed (default all)
 */
function updateTable(sec, t, rowsChanged, columns) {
  const bad = badRows(t.problems);
  const trs = sec.querySelectorAll("tbody tr");
  const { start, end } = shown(t);
  const which = t.computed.map((c, k) => (!columns || columns.has(c.name) ? k : -1))
    .filter((k) => k >= 0);
  /** @type {HTMLElement[]} */
  const changed = [];
  t.rows.slice(start, end).forEach((cells, i) => {
    const r = start + i;
    const tr = /** @type {HTMLTableRowElement} */ (trs[i]);
    if (!tr) return;
    const cls = bad[r] ? "live-bad" : "";
    if (tr.className !== cls) tr.className = cls;
    const title = bad[r] ? bad[r].join("\n") : "";
    if (tr.title !== title) tr.title = title;
    if (rowsChanged) {
      tr.querySelectorAll("input").forEach((input, c) => {
        const v = cells[c] === undefined ? "" : cells[c];
        if (input.defaultValue === v && input.value === v) return;
        if (document.activeElement !== input) input.value = v;
        input.defaultValue = v;
      });
    }
    if (!which.length) return;
    const comp = tr.querySelectorAll("td.live-computed");
    for (const k of which) {
      const td = /** @type {HTMLElement} */ (comp[k]);
      const v = t.computed[k].values[r];
      if (td.textContent !== v) {
        td.textContent = v;
        changed.push(td);
      }
    }
  });
  // A few changed cells are highlighted; many at once, the table's caption instead.
  if (changed.length <= 60) changed.forEach(flash);
  else flash(/** @type {HTMLElement} */ (sec.querySelector(".lx-table-cap") ?? sec));
}

/**
 * Apply one table of a patch: a whole view, or an update of its computed columns and
 * problems only.
 *
 * @param {TableView | TableUpdate} t
 */
export function applyTable(t) {
  const old = document.getElementById(tableId(t.name));
  const before = live.view.tables[t.name];
  if ("update" in t) {
    if (!before) return;
    const computed = before.computed.map((c) => t.computed.find((n) => n.name === c.name) ?? c);
    const merged = { ...before, computed, problems: t.problems };
    live.view.tables[t.name] = merged;
    if (old) updateTable(old, merged, false, new Set(t.computed.map((c) => c.name)));
    return;
  }
  live.view.tables[t.name] = t;
  if (old && sameShape(before, t)) {
    updateTable(old, t, true);
    return;
  }
  const at = old && old.contains(document.activeElement)
    ? /** @type {HTMLInputElement} */ (document.activeElement)
    : null;
  const pos = at && at.dataset.r !== undefined ? [+at.dataset.r, +(at.dataset.c ?? 0)] : null;
  const typed = at && at.value !== at.defaultValue ? at.value : null;
  const fresh = renderTable(t);
  if (old) old.replaceWith(fresh);
  flash(fresh);
  if (pos && focusCell(t.name, pos[0], pos[1]) && typed !== null) {
    const focused = /** @type {HTMLInputElement} */ (document.activeElement);
    focused.value = typed;
    focused.dataset.pending = "1";
  }
}

/**
 * Editing in a grid: a changed cell sends the rows, a paste fills a block, arrows move.
 *
 * @param {HTMLElement} sec
 * @param {string} name
 */
function wireGrid(sec, name) {
  /** @param {Event} e */
  const cellOf = (e) => {
    const input = /** @type {HTMLInputElement} */ (e.target);
    return input.dataset && input.dataset.r !== undefined ? input : null;
  };
  sec.addEventListener("focusout", (e) => {
    const input = cellOf(e);
    if (input && input.dataset.pending) {
      delete input.dataset.pending;
      input.dispatchEvent(new Event("change", { bubbles: true }));
    }
  });
  sec.addEventListener("change", (e) => {
    const input = cellOf(e);
    if (!input) return;
    const t = live.view.tables[name];
    const rows = cloneRows(t);
    rows[+(input.dataset.r ?? 0)][+(input.dataset.c ?? 0)] = input.value;
    sendRows(t.name, rows);
  });
  sec.addEventListener("paste", (e) => {
    const input = cellOf(e);
    if (!input || !e.clipboardData) return;
    const t = live.view.tables[name];
    const text = e.clipboardData.getData("text");
    if (!/[\t\n,]/.test(text)) return;
    e.preventDefault();
    const block = splitPaste(text);
    const rows = cloneRows(t);
    const r0 = +(input.dataset.r ?? 0), c0 = +(input.dataset.c ?? 0);
    // Keep what was typed in the focused cell but not yet sent.
    rows[r0][c0] = input.value;
    block.forEach((fields, i) => {
      const r = r0 + i;
      while (rows.length <= r) rows.push(t.columns.map(() => ""));
      fields.forEach((f, j) => {
        if (c0 + j < t.columns.length) rows[r][c0 + j] = f.trim();
      });
    });
    sendRows(t.name, rows, [r0 + block.length - 1, c0]);
  });
  sec.addEventListener("keydown", (e) => {
    const input = cellOf(e);
    if (!input) return;
    const t = live.view.tables[name];
    const r = +(input.dataset.r ?? 0), c = +(input.dataset.c ?? 0);
    /** @type {[number, number] | null} */
    let to = null;
    const atStart = input.selectionStart === 0 && input.selectionEnd === 0;
    const atEnd = input.selectionStart === input.value.length;
    if (e.key === "ArrowUp") to = [r - 1, c];
    else if (e.key === "ArrowDown") to = [r + 1, c];
    else if (e.key === "Enter") to = [e.shiftKey ? r - 1 : r + 1, c];
    else if (e.key === "ArrowLeft" && atStart) to = [r, c - 1];
    else if (e.key === "ArrowRight" && atEnd) to = [r, c + 1];
    if (!to) return;
    e.preventDefault();
    const [tr, tc] = to;
    if (!focusCell(t.name, tr, tc) && e.key === "Enter" && tr === t.rows.length) {
      queue(() => focusCell(t.name, tr, tc));
    }
  });
}
