// Tables that formulas return read in words: each column keeps its identifier for later
// cells and carries a heading in words, and its numbers show with one precision, on every
// surface (terminal, page and live page, JSON).

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import { tableText } from "../notebook/cli/_result_text.ts";
import { dataTableHtml } from "../notebook/export/_results.ts";
import { showTable } from "../cells/present.ts";
import { Column, makeTable, tableInfo } from "../cells/table.ts";

const nb = Notebook.fromText(
  "~~~lentil table v1\nsubject | va [logMAR]\nA | 0.10\nB | 0.2\n~~~\n" +
    "~~~lentil table v2\nsubject | va [logMAR]\nA | 0.12\nB | 0.16\n~~~\n" +
    '~~~lentil\nthick = thicknessByIndex(rx("-6.00 / -1.00 x 90"), 60 mm, 1.5 mm)\n' +
    "thin = thick.edgeThin\ncurve = endpointCurve(endpoint(throughFocus(-1 D, 4 mm)))\n" +
    'paired = pairRows(v1, v2, "subject")\n~~~\n',
  "h.lentil.md",
);

Deno.test("thicknessByIndex: headings in words, indices to two decimals, names kept", () => {
  const report = buildReport(nb);
  const thick = report.cells.find((c) => c.id === "thick")!.table!;
  assert.deepEqual(thick.columns.map((c) => c.name), ["index", "centre", "edgeThin", "edgeThick"]);
  const text = tableText(thick, 100);
  assert.match(text[0], /^refractive index {2}centre thickness \[mm\] {2}thinnest edge \[mm\]/);
  assert.doesNotMatch(text.join("\n"), /edgeThin|edgeThick/);
  // The common indices (lib/thickness.ts COMMON_INDICES) each with two decimals.
  assert.deepEqual(thick.rows.map((r) => r[0]), ["1.50", "1.53", "1.59", "1.60", "1.67", "1.74"]);
  // The identifier still reads the column; the page names it in the heading's tooltip.
  assert.equal(nb.result("thin")!.error, undefined);
  const html = dataTableHtml(thick, "thick");
  assert.match(html, /<th scope="col" class="lx-num" title="column edgeThin">thinnest edge \[mm\]/);
});

Deno.test("endpointCurve and pairRows: headings in words, a side named by its table", () => {
  const report = buildReport(nb);
  const curve = report.cells.find((c) => c.id === "curve")!.table!;
  assert.deepEqual(curve.columns.map((c) => c.label), ["trial lens", "fitted acuity"]);
  const paired = report.cells.find((c) => c.id === "paired")!.table!;
  assert.deepEqual(paired.columns.map((c) => c.name), ["subject", "va1", "va2"]);
  assert.deepEqual(paired.columns.map((c) => c.label), [undefined, "va (v1)", "va (v2)"]);
});

Deno.test("a plain-number column shows one precision: zeros added, nothing rounded", () => {
  const t = makeTable("t", [
    new Column("n", "number", "", new Float64Array([1.5, 1.53, 2])),
    new Column("k", "number", "", new Float64Array([1, 2, 3])),
  ]);
  const shown = showTable(tableInfo(t)!);
  assert.deepEqual(shown.rows.map((r) => r[0]), ["1.50", "1.53", "2.00"]);
  assert.deepEqual(shown.rows.map((r) => r[1]), ["1", "2", "3"]);
});

Deno.test("endpoint: the best-acuity range reads from its most minus lens to its most plus", () => {
  // common practice, no source: the plateau runs from the most minus lens tried with the best
  // acuity to the endpoint, the most plus one (lib/endpoint.ts plateau.from and .to).
  const e = Notebook.fromText(
    "~~~lentil table trials\nlens [D] | va [logMAR]\n-1.75 | 0.10\n-2.00 | 0.00\n" +
      "-2.25 | 0.00\n-2.50 | 0.00\n-2.75 | 0.04\n~~~\n" +
      '~~~lentil\nbest = endpoint(trials, "lens", "va")\n~~~\n',
    "e.lentil.md",
  );
  const parts = buildReport(e).cells.find((c) => c.id === "best")!.parts!;
  const part = (key: string) => parts.find((p) => p.key === key)!;
  assert.equal(part("plateauFrom").label, "best acuity from (most minus lens)");
  assert.equal(part("plateauFrom").display, "-2.50 D");
  assert.equal(part("plateauTo").label, "best acuity to (most plus lens)");
  assert.equal(part("plateauTo").display, "-2.00 D");
});

Deno.test("a chance reads with three figures and as 1 in N", () => {
  const g = Notebook.fromText(
    '~~~lentil\nluck = guessChance("CDHKNORSVZ", 5, 3)\n~~~\n',
    "g.lentil.md",
  );
  // Binomial tail P(X ≥ 3), n = 5, p = 1/10: 0.00856 (binomial-tail, by hand: 10·0.001·0.81
  // + 5·0.0001·0.9 + 0.00001 = 0.00856).
  assert.equal(buildReport(g).cells[0].display, "0.00856 (1 in 117)");
});
