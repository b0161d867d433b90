/**
 * The live page's script: plain DOM code, no framework, talking only to its own origin.
 * It draws the page from the server's view, sends each edit, and applies the patch that
 * comes back by touching only the cells, grids and plots that changed.
 *
 * @module
 */

/** The script, served as `/client.js`. */
export const CLIENT_JS = String.raw`"use strict";
(function () {
  var token = new URLSearchParams(location.search).get("t") || "";
  var main = document.getElementById("lentil-main");
  var footer = document.getElementById("lentil-footer");
  var banner = document.getElementById("lentil-banner");
  var statusEl = document.getElementById("lentil-status");
  var view = null;
  var status = null;
  var chain = Promise.resolve();
  var lastFooter = "";
  var noticeShown = "";

  function el(tag, cls, text) {
    var e = document.createElement(tag);
    if (cls) e.className = cls;
    if (text !== undefined && text !== null) e.textContent = text;
    return e;
  }

  function button(text, title, onClick, cls) {
    var b = el("button", cls || "", text);
    b.type = "button";
    b.title = title;
    b.addEventListener("click", onClick);
    return b;
  }

  function api(path, body) {
    var init = { method: body === undefined ? "GET" : "POST", headers: { "x-lentil-token": token },
      cache: "no-store", credentials: "omit" };
    if (body !== undefined) {
      init.headers["content-type"] = "application/json";
      init.body = JSON.stringify(body);
    }
    return fetch(path, init).then(function (res) {
      return res.json().catch(function () { return { error: res.statusText }; }).then(function (data) {
        if (!res.ok && res.status !== 409) throw new Error(data.error || res.statusText);
        return data;
      });
    });
  }

  /** Run one request after another, so edits reach the server in the order made. */
  function queue(fn) {
    chain = chain.then(fn).catch(function (e) { say("error: " + e.message, true); });
    return chain;
  }

  function say(text, bad) {
    statusEl.textContent = text;
    statusEl.classList.toggle("dirty", !!bad);
  }

  function showStatus(s) {
    status = s;
    document.getElementById("lentil-file").textContent = s.file;
    document.getElementById("lentil-undo").disabled = !s.canUndo;
    document.getElementById("lentil-redo").disabled = !s.canRedo;
    say(s.dirty ? "unsaved changes" + (s.dirtyFiles.length ? " (and " + s.dirtyFiles.join(", ") + ")" : "") : "saved", s.dirty);
  }

  // ---- cells ---------------------------------------------------------------------------

  function cellKey(id) { return "cell-" + id; }

  function errorText(err) {
    if (err.kind === "dependency") {
      return "depends on " + (err.cause || "a cell") + ", which has an error: " + err.message.replace(/^depends on [^,]*, which has an error: /, "");
    }
    return err.message + " (line " + err.line + ", column " + err.col + ")";
  }

  function renderCell(c) {
    var row = el("tr", "lx-cell");
    row.id = cellKey(c.id);
    row.dataset.cell = c.id;
    row.dataset.id = c.id;
    var input = el("input", "lx-expr live-expr");
    input.type = "text";
    input.spellcheck = false;
    input.id = "expr-" + c.id;
    input.setAttribute("aria-label", c.id + " expression");
    var name = el("label", "", c.id);
    name.htmlFor = input.id;
    input.addEventListener("keydown", function (e) {
      if (e.key === "Enter") { e.preventDefault(); commitExpr(row, input); }
      else if (e.key === "Escape") { input.value = input.dataset.committed; }
    });
    input.addEventListener("change", function () { commitExpr(row, input); });
    var remove = button("×", "remove this line", function () {
      queue(function () { return api("api/cell/delete", { id: row.dataset.id }).then(applyResult); });
    }, "live-remove");
    remove.tabIndex = -1;
    remove.setAttribute("aria-label", "remove " + c.id);
    var tdName = el("td", "lx-name"); tdName.append(name);
    var tdFormula = el("td", "lx-formula"); tdFormula.append(input, el("span", "lx-note"));
    var tdValue = el("td", "lx-value"); tdValue.append(el("output", "live-value"), el("div", "live-below"), el("div", "lx-error live-error"));
    var tdTools = el("td", "live-tools"); tdTools.append(remove);
    row.append(tdName, tdFormula, tdValue, tdTools);
    fillCell(row, c, true);
    return row;
  }

  function fillCell(row, c, fresh) {
    var input = row.querySelector("input.live-expr");
    var typing = document.activeElement === input && input.value !== input.dataset.committed;
    input.dataset.committed = c.expression;
    if (!typing) input.value = c.expression;
    row.classList.toggle("lx-input", !!c.input);
    row.classList.toggle("lx-has-error", !!c.error);
    row.classList.toggle("live-carried", !!c.error && c.error.kind === "dependency");
    var out = row.querySelector("output");
    out.replaceChildren();
    // The server renders the value as the exported page does: headline, footnotes, caution marker.
    out.innerHTML = c.error ? "" : c.html;
    row.querySelector(".live-below").innerHTML = c.error ? "" : c.below;
    row.querySelector(".lx-note").textContent = c.note || "";
    row.querySelector(".live-error").textContent = c.error ? errorText(c.error) : "";
    if (!fresh) flash(row);
  }

  function flash(node) {
    node.classList.remove("fresh");
    void node.offsetWidth;
    node.classList.add("fresh");
  }

  function commitExpr(row, input) {
    var value = input.value;
    if (value === input.dataset.committed) return;
    input.dataset.committed = value;
    queue(function () {
      return api("api/cell", { id: row.dataset.id, expression: value }).then(applyResult);
    });
  }

  function renderCalc(b) {
    var sec = el("section", "lx-calc live-calc");
    sec.dataset.block = String(b.index);
    var table = el("table", "lx-cells");
    var body = el("tbody");
    b.cells.forEach(function (id) { if (view.cells[id]) body.append(renderCell(view.cells[id])); });
    table.append(body);
    sec.append(table);
    var add = el("div", "live-new-cell");
    var input = el("input");
    input.type = "text";
    input.spellcheck = false;
    input.placeholder = "new line: name = expression";
    input.id = "new-cell-" + b.index;
    input.setAttribute("aria-label", "new cell in block " + (b.index + 1));
    var msg = el("div", "lx-error");
    input.addEventListener("keydown", function (e) {
      if (e.key !== "Enter" || !input.value.trim()) return;
      e.preventDefault();
      var line = input.value;
      queue(function () {
        return api("api/cell/new", { block: b.index, line: line }).then(function (r) {
          if (!r.ok) { msg.textContent = r.error; return; }
          msg.textContent = "";
          input.value = "";
          applyResult(r);
        });
      });
    });
    add.append(input, msg);
    sec.append(add);
    return sec;
  }

  // ---- tables --------------------------------------------------------------------------

  function tableId(name) { return "table-" + name; }

  function cloneRows(t) { return t.rows.map(function (r) { return r.slice(); }); }

  function sendRows(name, rows, focus) {
    queue(function () {
      return api("api/table", { name: name, rows: rows }).then(function (r) {
        applyResult(r);
        if (focus) focusCell(name, focus[0], focus[1]);
      });
    });
  }

  function focusCell(name, r, c) {
    var sec = document.getElementById(tableId(name));
    if (!sec) return false;
    var cell = sec.querySelector('input[data-r="' + r + '"][data-c="' + c + '"]');
    if (!cell) return false;
    cell.focus();
    cell.select();
    return true;
  }

  /** Split pasted text into rows of fields: tab-separated, else comma-separated (with quotes). */
  function splitPaste(text) {
    var lines = text.replace(/\r\n?/g, "\n").split("\n");
    while (lines.length && lines[lines.length - 1].trim() === "") lines.pop();
    var tab = text.indexOf("\t") !== -1;
    return lines.map(function (line) {
      if (tab) return line.split("\t");
      var out = [], cur = "", q = false;
      for (var i = 0; i < line.length; i++) {
        var ch = line[i];
        if (q) {
          if (ch === '"' && line[i + 1] === '"') { cur += '"'; i++; }
          else if (ch === '"') q = false;
          else cur += ch;
        } else if (ch === '"') q = true;
        else if (ch === ",") { out.push(cur); cur = ""; }
        else cur += ch;
      }
      out.push(cur);
      return out;
    });
  }

  function renderTable(t) {
    var sec = el("section", "lx-table-block live-table");
    sec.id = tableId(t.name);
    sec.dataset.table = t.name;
    var cap = el("p", "lx-table-cap");
    cap.append(el("span", "lx-table-name", "table " + t.name));
    cap.append(" · " + t.footer);
    sec.append(cap);
    if (t.error) sec.append(el("p", "lx-problem lx-error", errorText(t.error)));
    if (t.locked) sec.append(el("p", "live-locked", "read only: " + t.locked));
    var grid = el("table", "lx-data-table live-grid");
    var head = el("tr");
    t.columns.forEach(function (c) { head.append(el("th", "", c.name + (c.spec ? " [" + c.spec + "]" : ""))); });
    t.computed.forEach(function (c) { head.append(el("th", "live-computed lx-computed", c.name + (c.unit ? " [" + c.unit + "]" : ""))); });
    var thead = el("thead");
    thead.append(head);
    var body = el("tbody");
    var bad = {};
    t.problems.forEach(function (p) { (bad[p.row] = bad[p.row] || []).push(p.message); });
    t.rows.forEach(function (cells, r) {
      var tr = el("tr");
      if (bad[r]) { tr.className = "live-bad"; tr.title = bad[r].join("\n"); }
      t.columns.forEach(function (col, c) {
        var td = el("td");
        var input = el("input");
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
      t.computed.forEach(function (c) { tr.append(el("td", "live-computed lx-num", c.values[r])); });
      if (t.editable) {
        var tools = el("td", "live-tools");
        [["↑", "move row up", -1], ["↓", "move row down", 1], ["×", "remove row", 0]].forEach(function (b) {
          var btn = button(b[0], b[1], function () {
            var rows = cloneRows(view.tables[t.name]);
            if (b[2] === 0) rows.splice(r, 1);
            else {
              var to = r + b[2];
              if (to < 0 || to >= rows.length) return;
              var tmp = rows[to]; rows[to] = rows[r]; rows[r] = tmp;
            }
            sendRows(t.name, rows);
          });
          btn.tabIndex = -1;
          btn.setAttribute("aria-label", b[1] + " " + (r + 1));
          tools.append(btn);
        });
        tr.append(tools);
      }
      body.append(tr);
    });
    grid.append(thead, body);
    var scroll = el("div", "lx-scroll");
    scroll.tabIndex = 0;
    scroll.setAttribute("role", "region");
    scroll.setAttribute("aria-label", "table " + t.name);
    scroll.append(grid);
    sec.append(scroll);
    if (t.editable) {
      var add = button("+ row", "add a row at the end", function () {
        var rows = cloneRows(view.tables[t.name]);
        rows.push(t.columns.map(function () { return ""; }));
        sendRows(t.name, rows, [rows.length - 1, 0]);
      }, "live-add-row");
      sec.append(add);
      wireGrid(sec, t.name);
    }
    return sec;
  }

  /** Whether a table's new view has the same shape as what the page shows. */
  function sameShape(a, b) {
    return a && a.rows.length === b.rows.length && a.editable === b.editable &&
      JSON.stringify([a.columns, a.computed.map(function (c) { return c.name; }), a.error, a.locked, a.file]) ===
      JSON.stringify([b.columns, b.computed.map(function (c) { return c.name; }), b.error, b.locked, b.file]);
  }

  /** Update a grid in place: values, computed cells, row problems; the focused cell is left alone. */
  function updateTable(sec, t) {
    var bad = {};
    t.problems.forEach(function (p) { (bad[p.row] = bad[p.row] || []).push(p.message); });
    var trs = sec.querySelectorAll("tbody tr");
    t.rows.forEach(function (cells, r) {
      var tr = trs[r];
      tr.className = bad[r] ? "live-bad" : "";
      tr.title = bad[r] ? bad[r].join("\n") : "";
      tr.querySelectorAll("input").forEach(function (input, c) {
        var v = cells[c] === undefined ? "" : cells[c];
        if (document.activeElement !== input) input.value = v;
        input.defaultValue = v;
      });
      var comp = tr.querySelectorAll("td.live-computed");
      t.computed.forEach(function (col, k) {
        if (comp[k].textContent !== col.values[r]) { comp[k].textContent = col.values[r]; flash(comp[k]); }
      });
    });
  }

  function wireGrid(sec, name) {
    sec.addEventListener("focusout", function (e) {
      var input = e.target;
      if (input.dataset && input.dataset.pending) {
        delete input.dataset.pending;
        input.dispatchEvent(new Event("change", { bubbles: true }));
      }
    });
    sec.addEventListener("change", function (e) {
      var t = view.tables[name];
      var input = e.target;
      if (!input.dataset || input.dataset.r === undefined) return;
      var rows = cloneRows(t);
      rows[+input.dataset.r][+input.dataset.c] = input.value;
      sendRows(t.name, rows);
    });
    sec.addEventListener("paste", function (e) {
      var t = view.tables[name];
      var input = e.target;
      if (!input.dataset || input.dataset.r === undefined) return;
      var text = (e.clipboardData || window.clipboardData).getData("text");
      if (!/[\t\n,]/.test(text)) return;
      e.preventDefault();
      var block = splitPaste(text);
      var rows = cloneRows(t);
      var r0 = +input.dataset.r, c0 = +input.dataset.c;
      // Keep what was typed in the focused cell but not yet sent.
      rows[r0][c0] = input.value;
      block.forEach(function (fields, i) {
        var r = r0 + i;
        while (rows.length <= r) rows.push(t.columns.map(function () { return ""; }));
        fields.forEach(function (f, j) { if (c0 + j < t.columns.length) rows[r][c0 + j] = f.trim(); });
      });
      sendRows(t.name, rows, [r0 + block.length - 1, c0]);
    });
    sec.addEventListener("keydown", function (e) {
      var t = view.tables[name];
      var input = e.target;
      if (!input.dataset || input.dataset.r === undefined) return;
      var r = +input.dataset.r, c = +input.dataset.c, to = null;
      var atStart = input.selectionStart === 0 && input.selectionEnd === 0;
      var atEnd = input.selectionStart === input.value.length;
      if (e.key === "ArrowUp") to = [r - 1, c];
      else if (e.key === "ArrowDown") to = [r + 1, c];
      else if (e.key === "Enter") to = [e.shiftKey ? r - 1 : r + 1, c];
      else if (e.key === "ArrowLeft" && atStart) to = [r, c - 1];
      else if (e.key === "ArrowRight" && atEnd) to = [r, c + 1];
      if (!to) return;
      e.preventDefault();
      if (!focusCell(t.name, to[0], to[1]) && e.key === "Enter" && to[0] === t.rows.length) {
        queue(function () { focusCell(t.name, to[0], to[1]); });
      }
    });
  }

  // ---- page ----------------------------------------------------------------------------

  function renderBlock(b) {
    if (b.kind === "prose") { var d = el("div", "lx-prose"); d.innerHTML = b.html; return d; }
    if (b.kind === "calc") return renderCalc(b);
    if (b.kind === "table") return renderTable(view.tables[b.name]);
    var p = el("div", "live-plot");
    p.id = "plot-" + b.key;
    p.innerHTML = view.plots[b.key].html;
    return p;
  }

  function renderFooter() {
    var key = JSON.stringify([view.sources, view.cautionsHtml, view.problems]);
    if (key === lastFooter) return;
    lastFooter = key;
    footer.replaceChildren();
    if (view.problems.length) {
      var ul = el("ul", "lx-problem live-problems");
      view.problems.forEach(function (p) { ul.append(el("li", "", p)); });
      footer.append(ul);
    }
    if (view.cautionsHtml) {
      // One cautions section, rendered by the server as on the exported page.
      var cautions = el("div", "live-cautions");
      cautions.innerHTML = view.cautionsHtml;
      footer.append(cautions);
    }
    var sec = el("section", "lx-sources");
    sec.id = "sources";
    sec.append(el("h2", "", "Sources"));
    if (!view.sources.length) sec.append(el("p", "", "No result used a published method, reference value or trade convention."));
    else {
      var ol = el("ol");
      view.sources.forEach(function (s) {
        var li = el("li", "", s.citation);
        li.id = "src-" + s.n;
        li.value = s.n;
        if (s.mark) { li.append(" "); li.append(el("span", "lx-mark", s.mark)); }
        ol.append(li);
      });
      sec.append(ol);
    }
    footer.append(sec);
  }

  function renderAll() {
    var active = document.activeElement;
    var keep = active && active.id ? active.id : null;
    document.getElementById("lentil-title").textContent = view.title;
    var head = el("header", "lx-head");
    head.append(el("h1", "", view.title));
    main.replaceChildren.apply(main, [head].concat(view.blocks.map(renderBlock)));
    lastFooter = "";
    renderFooter();
    if (keep && document.getElementById(keep)) document.getElementById(keep).focus();
  }

  function applyPatch(p) {
    if (p.full) {
      view = p.full;
      renderAll();
    } else {
      p.cells.forEach(function (c) {
        view.cells[c.id] = c;
        var row = document.getElementById(cellKey(c.id));
        if (row) fillCell(row, c, false);
      });
      p.removed.forEach(function (id) {
        delete view.cells[id];
        var row = document.getElementById(cellKey(id));
        if (row) row.remove();
      });
      p.tables.forEach(function (t) {
        var old = document.getElementById(tableId(t.name));
        var before = view.tables[t.name];
        view.tables[t.name] = t;
        if (old && sameShape(before, t)) { updateTable(old, t); return; }
        var at = old && old.contains(document.activeElement) ? document.activeElement : null;
        var pos = at && at.dataset.r !== undefined ? [+at.dataset.r, +at.dataset.c] : null;
        var typed = at && at.value !== at.defaultValue ? at.value : null;
        var fresh = renderTable(t);
        if (old) old.replaceWith(fresh);
        flash(fresh);
        if (pos && focusCell(t.name, pos[0], pos[1]) && typed !== null) {
          document.activeElement.value = typed;
          document.activeElement.dataset.pending = "1";
        }
      });
      p.plots.forEach(function (pl) {
        view.plots[pl.key] = pl;
        var slot = document.getElementById("plot-" + pl.key);
        if (slot) slot.innerHTML = pl.html;
      });
      view.sources = p.sources;
      view.cautions = p.cautions;
      view.cautionsHtml = p.cautionsHtml;
      view.problems = p.problems;
      renderFooter();
    }
    showStatus(p.status);
  }

  function applyResult(r) {
    if (r.patch) applyPatch(r.patch);
    document.body.dataset.recomputed = (r.recomputed || []).join(" ");
    return r;
  }

  // ---- files ---------------------------------------------------------------------------

  function notice(files) {
    var key = files.join(",");
    if (!files.length) { banner.hidden = true; noticeShown = ""; return; }
    if (key === noticeShown && !banner.hidden) return;
    noticeShown = key;
    banner.replaceChildren();
    banner.append(el("span", "", files.join(", ") + " changed on disk since this page read " +
      (files.length > 1 ? "them" : "it") + ". Nothing was overwritten."));
    var reload = button("Reload from disk", "Show the file as it is on disk; Undo brings the page's edits back", function () {
      queue(function () {
        return api("api/reload", {}).then(function (r) { applyResult(r); notice([]); say("reloaded from disk; Undo brings your edits back"); });
      });
    });
    reload.id = "lentil-reload";
    var both = button("Keep both", "Write the page's version as a new file beside the original", function () {
      queue(function () {
        return api("api/keep-both", {}).then(function (r) {
          applyPatch(r.patch);
          notice([]);
          say("your version is saved as " + r.written.join(", ") + "; the original stays as it is on disk");
        });
      });
    });
    both.id = "lentil-keep-both";
    banner.append(reload, both);
    banner.hidden = false;
  }

  function save() {
    queue(function () {
      say("saving…");
      return api("api/save", {}).then(function (r) {
        showStatus(r.status);
        if (r.ok) { notice([]); say("saved " + r.written.join(", ")); }
        else { notice(r.conflict); say("not saved: changed on disk", true); }
      });
    });
  }

  function pollDisk() {
    if (document.hidden) return;
    api("api/disk").then(function (r) { if (r.changed.length || !banner.hidden) notice(r.changed); }).catch(function () {});
  }

  function step(which) {
    queue(function () { return api("api/" + which, {}).then(applyResult); });
  }

  document.getElementById("lentil-undo").addEventListener("click", function () { step("undo"); });
  document.getElementById("lentil-redo").addEventListener("click", function () { step("redo"); });
  document.getElementById("lentil-save").addEventListener("click", save);
  document.addEventListener("keydown", function (e) {
    if (!(e.ctrlKey || e.metaKey)) return;
    var k = e.key.toLowerCase();
    var a = document.activeElement;
    var typing = a && a.tagName === "INPUT" &&
      (a.dataset.committed !== undefined ? a.value !== a.dataset.committed : a.value !== a.defaultValue);
    if (k === "s") { e.preventDefault(); if (a && a.blur) a.blur(); save(); }
    else if ((k === "z" && e.shiftKey) || k === "y") { if (!typing) { e.preventDefault(); step("redo"); } }
    else if (k === "z") { if (!typing) { e.preventDefault(); step("undo"); } }
  });

  queue(function () {
    return api("api/state").then(function (r) {
      view = r.view;
      renderAll();
      showStatus(r.status);
      document.body.dataset.ready = "1";
      setInterval(pollDisk, 1500);
    });
  });
})();
`;
