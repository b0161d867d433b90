import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { renderPlot } from "../notebook/export/plot.ts";
import type { PlotBlock } from "../notebook/format/parse.ts";

const TABLE = [
  "~~~lentil table t",
  "subject: person",
  "eye: side",
  "person | side | x [D] | y [D]",
  "a | R | -1.00 | -1.25",
  "a | L | -1.25 | -1.25",
  "b | R | +0.50 | +0.25",
  "b | L | +0.75 | +0.75",
  "c | R | -3.00 | -3.50",
  "c | L | -2.75 | -3.00",
  "d | R | -0.25 | -0.50",
  "d | L | -0.50 | -0.50",
  "~~~",
  "",
  "~~~lentil",
  "t.mean = (x + y) / 2",
  "t.diff = x - y",
  'limits = agreement(t.x, t.y, {eyes: "right"})',
  "~~~",
  "",
].join("\n");

function plot(lines: string[]) {
  const nb = Notebook.fromText(
    `${TABLE}\n~~~lentil plot p\n${lines.join("\n")}\n~~~\n`,
    "p.lentil.md",
  );
  const block = nb.doc.blocks.find((b) => b.kind === "plot") as PlotBlock;
  return renderPlot(block, nb);
}

Deno.test("agreement plot: bands of the limits' confidence intervals", () => {
  // Bland & Altman 1999 (approximate), Carkeet 2015 (exact): the bands are the intervals
  const p = plot([
    "figure: agreement",
    "table: t",
    "horizontal: mean",
    "vertical: diff",
    "limits: limits",
  ]);
  assert.deepEqual(p.problems, []);
  assert.match(p.svg, /data-part="lower-limit-band"/);
  assert.match(p.svg, /data-part="upper-limit-band"/);
  assert.match(p.caption ?? "", /exact, non-central t/);
  const none = plot([
    "figure: agreement",
    "table: t",
    "horizontal: mean",
    "vertical: diff",
    "limits: limits",
    "bands: none",
  ]);
  assert.doesNotMatch(none.svg, /limit-band/);
});

Deno.test("fellow-eye scatter and repeatability plot from the table's declared keys", () => {
  // Murdoch et al. 1998 (fellow eyes); Bland & Altman 1996 (within-subject SD)
  const f = plot(["figure: fellow-eyes", "table: t", "horizontal: x"]);
  assert.deepEqual(f.problems, []);
  assert.match(f.svg, /data-part="rows"/);
  assert.match(f.caption ?? "", /r = 0\.\d\d over 4 persons with both eyes/);
  assert.match(f.svg, /left eye: x \(D\)/);
  const r = plot(["figure: repeatability", "table: t", "horizontal: x"]);
  assert.deepEqual(r.problems, []);
  assert.match(r.svg, /within-subject SD 0\.\d\d D/);
  assert.match(r.svg, /SD of each subject/);
  const bad = plot(["figure: repeatability", "table: t", "horizontal: x", "subject: nobody"]);
  assert.match(bad.problems[0].message, /no column "nobody"/);
});

Deno.test("a supplement table shows on the page and saves as CSV with the same text", async () => {
  // common practice, no source: a paper's table, measure | n | mean ± SD | 95% CI | …
  const { renderNotebookBody } = await import("../notebook/export/html.ts");
  const { parse } = await import("csv-parse/sync");
  const nb = Notebook.fromText(
    `${TABLE}\n~~~lentil\nsupp = studyTable(t.x, t.y)\n~~~\n`,
    "s.lentil.md",
  );
  const html = renderNotebookBody(nb).html;
  const m = /download="supp\.csv" href="data:text\/csv;charset=utf-8,([^"]*)"/.exec(html);
  assert.ok(m, "a CSV link under the table");
  const rows = parse(decodeURIComponent(m[1].replaceAll("&amp;", "&"))) as string[][];
  assert.deepEqual(rows[0], [
    "measure",
    "n",
    "persons",
    "mean ± SD",
    "95% CI",
    "median",
    "range",
    "eyes",
  ]);
  assert.equal(rows[1][0], "x (D)");
  assert.equal(rows[1][2], "4");
  assert.ok(html.includes(rows[1][3]), "the same mean ± SD on the page");
});
