// @ts-check
/// <reference lib="dom" />
/**
 * Calc blocks on the live page: one row per cell with its expression in an input, its value,
 * sources, caution flag and error, and a line to add a cell. A patch fills rows in place.
 *
 * @module
 */

import { button, el, find, flash } from "./dom.js";
import { api, errorText, live, queue } from "./state.js";

/** @typedef {import("./state.js").CellView} CellView */

/**
 * The id of a cell's row.
 *
 * @param {string} id
 */
export function cellKey(id) {
  return "cell-" + id;
}

/**
 * Send an edited expression, unless it is what the server has.
 *
 * @param {HTMLElement} row
 * @param {HTMLInputElement} input
 */
function commitExpr(row, input) {
  const value = input.value;
  if (value === input.dataset.committed) return;
  input.dataset.committed = value;
  queue(() => api("api/cell", { id: row.dataset.id, expression: value }).then(live.apply));
}

/**
 * A cell's row.
 *
 * @param {CellView} c
 * @returns {HTMLTableRowElement}
 */
export function renderCell(c) {
  const row = el("tr", "lx-cell");
  row.id = cellKey(c.id);
  row.dataset.cell = c.id;
  row.dataset.id = c.id;
  const input = el("input", "lx-expr live-expr");
  input.type = "text";
  input.spellcheck = false;
  input.id = "expr-" + c.id;
  input.setAttribute("aria-label", c.id + " expression");
  const name = el("label", "", c.id);
  name.htmlFor = input.id;
  input.addEventListener("keydown", (e) => {
    if (e.key === "Enter") {
      e.preventDefault();
      commitExpr(row, input);
    } else if (e.key === "Escape") input.value = input.dataset.committed ?? "";
  });
  input.addEventListener("change", () => commitExpr(row, input));
  const remove = button("×", "remove this line", () => {
    queue(() => api("api/cell/delete", { id: row.dataset.id }).then(live.apply));
  }, "live-remove");
  remove.tabIndex = -1;
  remove.setAttribute("aria-label", "remove " + c.id);
  const tdName = el("td", "lx-name");
  tdName.append(name);
  const tdFormula = el("td", "lx-formula");
  tdFormula.append(input, el("span", "lx-note"));
  const tdValue = el("td", "lx-value");
  tdValue.append(
    el("output", "live-value"),
    el("div", "live-below"),
    el("div", "lx-error live-error"),
  );
  const tdTools = el("td", "live-tools");
  tdTools.append(remove);
  row.append(tdName, tdFormula, tdValue, tdTools);
  fillCell(row, c, true);
  return row;
}

/**
 * Show a cell's view in its row; what the user is typing is left alone.
 *
 * @param {HTMLElement} row
 * @param {CellView} c
 * @param {boolean} fresh the row was just made (no highlight)
 */
export function fillCell(row, c, fresh) {
  /** @type {HTMLInputElement} */
  const input = find(row, "input.live-expr");
  const typing = document.activeElement === input && input.value !== input.dataset.committed;
  input.dataset.committed = c.expression;
  if (!typing) input.value = c.expression;
  row.classList.toggle("lx-input", !!c.input);
  row.classList.toggle("lx-has-error", !!c.error);
  row.classList.toggle("live-carried", !!c.error && c.error.kind === "dependency");
  /** @type {HTMLOutputElement} */
  const out = find(row, "output");
  // The server renders the value as the exported page does: headline, footnotes, caution marker.
  out.innerHTML = c.error ? "" : c.html;
  find(row, ".live-below").innerHTML = c.error ? "" : c.below;
  find(row, ".lx-note").textContent = c.note || "";
  find(row, ".live-error").textContent = c.error ? errorText(c.error) : "";
  if (!fresh) flash(row);
}

/**
 * A calc block: its cells and a line for a new one.
 *
 * @param {{ index: number, cells: readonly string[] }} b
 * @returns {HTMLElement}
 */
export function renderCalc(b) {
  const sec = el("section", "lx-calc live-calc");
  sec.dataset.block = String(b.index);
  const table = el("table", "lx-cells");
  const body = el("tbody");
  for (const id of b.cells) if (live.view.cells[id]) body.append(renderCell(live.view.cells[id]));
  table.append(body);
  sec.append(table);
  const add = el("div", "live-new-cell");
  const input = el("input");
  input.type = "text";
  input.spellcheck = false;
  input.placeholder = "new line: name = expression";
  input.id = "new-cell-" + b.index;
  input.setAttribute("aria-label", "new cell in block " + (b.index + 1));
  const msg = el("div", "lx-error");
  input.addEventListener("keydown", (e) => {
    if (e.key !== "Enter" || !input.value.trim()) return;
    e.preventDefault();
    const line = input.value;
    queue(() =>
      api("api/cell/new", { block: b.index, line }).then((r) => {
        if (!r.ok) {
          msg.textContent = r.error;
          return;
        }
        msg.textContent = "";
        input.value = "";
        live.apply(r);
      })
    );
  });
  add.append(input, msg);
  sec.append(add);
  return sec;
}
