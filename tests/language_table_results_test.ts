// Tables that formulas return are tables: the result takes the cell's name, takes computed
// columns, and can be plotted, for pairRows, endpointCurve and thicknessByIndex.

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { tableInfo } from "../cells/table.ts";
import { parseNotebook } from "../notebook/format/parse.ts";
import { renderNotebookHtml } from "../notebook/export/html.ts";

const VISITS = "~~~lentil table v1\nsubject | eye | sph [D] | cyl [D] | axis [deg]\n" +
  "A | R | -1.00 | -0.50 | 180\nB | R | +0.50 | -0.25 | 90\nC | L | -2.00 | 0.00 | 180\n~~~\n" +
  "~~~lentil table v2\nsubject | eye | sph [D] | cyl [D] | axis [deg]\n" +
  "B | R | +0.25 | -0.25 | 90\nA | R | -1.25 | -0.50 | 180\nC | L | -2.25 | 0.00 | 180\n~~~\n";

Deno.test("a paired table takes the cell's name and computed columns", () => {
  const nb = Notebook.fromText(
    VISITS + '~~~lentil\npaired = pairRows(v1, v2, "subject", "eye")\n' +
      "paired.m1 = vectorM(sph1, cyl1)\npaired.m2 = vectorM(sph2, cyl2)\n" +
      "paired.dM = m2 - m1\npaired.avg = (m1 + m2) / 2\nbias = mean(paired.dM)\n~~~\n",
    "pair.lentil.md",
  );
  for (const id of ["paired", "paired.m1", "paired.dM", "paired.avg", "bias"]) {
    assert.equal(nb.result(id)!.error, undefined, `${id}: ${nb.result(id)!.error?.message}`);
  }
  const info = tableInfo(nb.value("paired"))!;
  assert.equal(info.name, "paired");
  assert.deepEqual(info.columns.slice(-4).map((c) => c.name), ["m1", "m2", "dM", "avg"]);
  // M = sph + cyl/2 (Thibos 1997): each eye's second visit is 0.25 D more minus.
  assert.deepEqual(Array.from(info.columns.find((c) => c.name === "dM")!.data as Float64Array), [
    -0.25,
    -0.25,
    -0.25,
  ]);
  assert.ok(Math.abs(nb.language.toNumberIn(nb.value("bias"), "D") + 0.25) < 1e-12);
  // The tables paired came from are not changed.
  assert.equal(tableInfo(nb.value("v1"))!.columns.length, 5);
});

Deno.test("a two-visit agreement plot of a paired table", async () => {
  const text = VISITS + '~~~lentil\npaired = pairRows(v1, v2, "subject", "eye")\n' +
    "paired.dM = vectorM(sph2, cyl2) - vectorM(sph1, cyl1)\n" +
    "paired.avg = (vectorM(sph1, cyl1) + vectorM(sph2, cyl2)) / 2\n~~~\n" +
    "~~~lentil plot agreement\nfigure: agreement\ntable: paired\nhorizontal: avg\nvertical: dM\n~~~\n";
  const nb = Notebook.fromText(text, "plot.lentil.md");
  const html = await renderNotebookHtml(nb);
  assert.doesNotMatch(html, /no table "paired"/);
  assert.match(html, /<svg/);
});

Deno.test("endpointCurve and thicknessByIndex results take computed columns", () => {
  const nb = Notebook.fromText(
    "~~~lentil\ncurve = endpointCurve(endpoint(throughFocus(-1 D, 4 mm)))\n" +
      "curve.letters = 85 - 50 * va\n" +
      'byIndex = thicknessByIndex(rx("-6.00 DS"), 60 mm, 1.5 mm)\n' +
      "byIndex.saved = edgeThick - edgeThin\n~~~\n",
    "t.lentil.md",
  );
  assert.equal(
    nb.result("curve.letters")!.error,
    undefined,
    nb.result("curve.letters")!.error?.message,
  );
  assert.equal(tableInfo(nb.value("curve"))!.name, "curve");
  // Letter score = 85 − 50 × logMAR (Ferris 1982).
  const c = tableInfo(nb.value("curve"))!;
  const va = c.columns.find((x) => x.name === "va")!.data as Float64Array;
  const letters = c.columns.find((x) => x.name === "letters")!.data as Float64Array;
  assert.ok(Math.abs(letters[0] - (85 - 50 * va[0])) < 1e-9);
  assert.equal(
    nb.result("byIndex.saved")!.error,
    undefined,
    nb.result("byIndex.saved")!.error?.message,
  );
});

Deno.test("a column a returned table lacks, and a computed column on a value that is not a table", () => {
  const nb = Notebook.fromText(
    VISITS + '~~~lentil\npaired = pairRows(v1, v2, "subject", "eye")\npaired.x = sphh1 + 1 D\n' +
      "k = 2 D\nk.y = 1\n~~~\n",
    "bad.lentil.md",
  );
  assert.match(
    nb.result("paired.x")!.error!.message,
    /table paired has no column "sphh1".*columns: subject, eye, sph1/,
  );
  assert.match(nb.result("k.y")!.error!.message, /k is \+2\.00 D, not a table/);
});

Deno.test("reconcile: removing a computed column of a returned table leaves no stale column", () => {
  const text = (extra: string) =>
    VISITS + '~~~lentil\npaired = pairRows(v1, v2, "subject", "eye")\n' +
    `paired.d = sph2 - sph1\n${extra}~~~\n`;
  const a = Notebook.fromText(text("paired.e = sph2 + sph1\n"), "r.lentil.md");
  assert.ok(tableInfo(a.value("paired"))!.columns.some((c) => c.name === "e"));
  const b = Notebook.reconcile(a, parseNotebook(text(""), "r.lentil.md")).notebook;
  assert.deepEqual(tableInfo(b.value("paired"))!.columns.map((c) => c.name).slice(-1), ["d"]);
});
