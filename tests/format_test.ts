// Notebook format: front matter, blocks, cells, tables, positions, and bad input.
import assert from "node:assert/strict";
import { isLiteral, noteStart, parseNotebook } from "../notebook/format/parse.ts";
import { decodeNotebook } from "../notebook/format/read.ts";
import { formatDiagnostic } from "../notebook/format/diagnostic.ts";

const NB = `---
title: Format check
author: Test
date: 2026-11-30
case: T-001
---
Some *prose*.

\`\`\`lentil
vd = 12 mm                 # vertex distance
ref = rx("-2.00 # odd")    # a note after a string with #
trials.shift = lens + 0.25 D
\`\`\`

\`\`\`js
not = a + lentil block
\`\`\`

\`\`\`lentil table trials
lens [D] | va [logMAR] | remark
+1.00    | 0.30        | a \\| b
\`\`\`

\`\`\`lentil plot
figure: curve
table: trials
\`\`\`
`;

Deno.test("front matter fields are read and validated", () => {
  const nb = parseNotebook(NB, "f.lentil.md");
  assert.deepEqual(nb.front, {
    title: "Format check",
    author: "Test",
    date: "2026-11-30",
    case: "T-001",
  });
  assert.deepEqual(nb.diagnostics, []);
});

Deno.test("blocks come in document order and other fences stay prose", () => {
  const nb = parseNotebook(NB, "f.lentil.md");
  assert.deepEqual(nb.blocks.map((b) => b.kind), [
    "prose",
    "calc",
    "prose",
    "table",
    "prose",
    "plot",
  ]);
  const prose = nb.blocks.filter((b) => b.kind === "prose").map((b) =>
    b.kind === "prose" ? b.text : ""
  );
  assert.ok(prose[1].includes("not = a + lentil block"));
});

Deno.test("cells carry name, expression, note, positions and input flag", () => {
  const nb = parseNotebook(NB, "f.lentil.md");
  const [vd, ref, shift] = nb.cells;
  assert.equal(vd.name, "vd");
  assert.equal(vd.expression, "12 mm");
  assert.equal(vd.note, "vertex distance");
  assert.equal(vd.line, 10);
  assert.equal(vd.col, 1);
  assert.equal(vd.exprCol, 6);
  assert.equal(vd.input, true);
  assert.equal(ref.expression, 'rx("-2.00 # odd")');
  assert.equal(ref.note, "a note after a string with #");
  assert.equal(ref.input, true); // a value read from text is an input
  assert.equal(shift.table, "trials");
  assert.equal(shift.name, "shift");
  assert.equal(NB.slice(vd.exprSpan.start, vd.exprSpan.end), "12 mm");
});

Deno.test("table header specs, rows and escaped bars", () => {
  const nb = parseNotebook(NB, "f.lentil.md");
  const t = nb.tables[0];
  assert.equal(t.name, "trials");
  assert.deepEqual(t.columns.map((c) => [c.name, c.spec]), [["lens", "D"], ["va", "logMAR"], [
    "remark",
    "",
  ]]);
  assert.deepEqual(t.rows[0].cells, ["+1.00", "0.30", "a | b"]);
  assert.equal(t.rows[0].line, 21);
});

Deno.test("plot options are kept by key", () => {
  const nb = parseNotebook(NB, "f.lentil.md");
  const p = nb.blocks.find((b) => b.kind === "plot");
  assert.ok(p && p.kind === "plot");
  assert.equal(p.options.figure.value, "curve");
  assert.equal(p.options.table.value, "trials");
});

Deno.test("every byte is covered by exactly one block or the front matter", () => {
  const nb = parseNotebook(NB, "f.lentil.md");
  let at = nb.frontSpan!.end;
  let rebuilt = NB.slice(0, at);
  for (const b of nb.blocks) {
    rebuilt += NB.slice(at, b.span.end);
    at = b.span.end;
  }
  rebuilt += NB.slice(at);
  assert.equal(rebuilt, NB);
});

Deno.test("literal inputs are told from formulas", () => {
  for (const s of ["-2.25 D", "12 mm", "+0.50", "3", '"text"', "true", "[1, 2, 3]", "1e-3 m"]) {
    assert.equal(isLiteral(s), true, s);
  }
  assert.equal(isLiteral('rx("-2.25 / -0.75 x 170")'), true);
  for (const s of ["a + 1", "vertexPower(1, 2)", "2 * 3", "-x", 'f("a", 2)', 'rx("a") + 1']) {
    assert.equal(isLiteral(s), false, s);
  }
  assert.equal(noteStart("x = 1 # n"), 6);
  assert.equal(noteStart("x = '#'"), -1);
});

Deno.test("unterminated block is reported at its opening line", () => {
  const nb = parseNotebook("Intro\n\n```lentil\nx = 1\n", "u.lentil.md");
  assert.equal(nb.diagnostics.length, 1);
  assert.equal(
    formatDiagnostic(nb.diagnostics[0]),
    "u.lentil.md:3:1: lentil block opened here is never closed (add a line ```)",
  );
  // Nothing is dropped: the cell is still there.
  assert.equal(nb.cells[0].name, "x");
});

Deno.test("duplicate cell name is reported at the second definition, both kept", () => {
  const nb = parseNotebook("```lentil\nx = 1\ny = 2\nx = 3\n```\n", "d.lentil.md");
  assert.deepEqual(nb.diagnostics.map(formatDiagnostic), [
    'd.lentil.md:4:1: duplicate name "x" (first defined at line 2)',
  ]);
  assert.equal(nb.cells.length, 3);
});

Deno.test("a line that is not a cell is reported and kept in the text", () => {
  const text = "```lentil\nx = 1\nthis is not a cell\n```\n";
  const nb = parseNotebook(text, "n.lentil.md");
  assert.equal(nb.diagnostics[0].line, 3);
  assert.match(nb.diagnostics[0].message, /expected `name = expression`/);
  assert.equal(nb.text, text);
});

Deno.test("table rows with the wrong number of fields are positioned", () => {
  const nb = parseNotebook("```lentil table t\na | b\n1 | 2\n3\n```\n", "t.lentil.md");
  assert.deepEqual(nb.diagnostics.map(formatDiagnostic), [
    "t.lentil.md:4:1: row has 1 field, the header has 2",
  ]);
});

Deno.test("bad front matter values are positioned and the rest kept", () => {
  const nb = parseNotebook("---\ntitle: X\ndate: yesterday\nsize: 3\n---\n", "fm.lentil.md");
  assert.equal(nb.front.title, "X");
  const msgs = nb.diagnostics.map(formatDiagnostic);
  assert.ok(
    msgs.some((m) => m.startsWith("fm.lentil.md:3:7: front matter date: expected a date")),
    msgs.join("\n"),
  );
  assert.ok(msgs.some((m) => m.startsWith("fm.lentil.md:4:1: warning: unknown front-matter key")));
});

Deno.test("invalid UTF-8 is reported with line and column", () => {
  const bytes = new Uint8Array([...new TextEncoder().encode("# ok\nab"), 0xc3, 0x28, 0x0a]);
  const r = decodeNotebook(bytes, "bad.lentil.md");
  assert.equal(r.ok, false);
  if (!r.ok) {
    assert.equal(r.diagnostic.line, 2);
    assert.equal(r.diagnostic.col, 3);
    assert.match(r.diagnostic.message, /not valid UTF-8/);
  }
  const good = decodeNotebook(new TextEncoder().encode("é ✓ Δ"), "g");
  assert.ok(good.ok && good.text === "é ✓ Δ");
});

Deno.test("option lines may carry a note after # and white space", () => {
  const nb = parseNotebook(
    "```lentil plot\nfigure: curve   # the figure\nheading: Case #3\n```\n\n```lentil table t\nfile: a.csv  # beside the notebook\n```\n",
    "o.lentil.md",
  );
  const plot = nb.blocks.find((b) => b.kind === "plot");
  assert.ok(plot && plot.kind === "plot");
  assert.equal(plot.options.figure.value, "curve");
  assert.equal(plot.options.heading.value, "Case #3");
  assert.equal(nb.tables[0].options.file.value, "a.csv");
});

Deno.test("front matter: an impossible date and an odd power step are refused", () => {
  const nb = parseNotebook("---\ndate: 2026-02-30\npower-step: 0.3\n---\n", "f.lentil.md");
  const msgs = nb.diagnostics.map((d) => d.message);
  assert.ok(msgs.some((m) => /date: expected a real calendar date/.test(m)), msgs.join("\n"));
  assert.ok(msgs.some((m) => /power-step: expected one of the steps/.test(m)), msgs.join("\n"));
  assert.equal(parseNotebook("---\npower-step: 0.125\n---\n", "g").front.powerStep, 0.125);
});
