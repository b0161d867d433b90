// How results read: one declaration (headline, parts, check lines, table rows) rendered by
// every surface — the terminal, JSON, the exported page and the live page's views — and the
// display rules per kind of measure. Precision rules are the trade's usual writing (common
// practice, no source); the check table's columns are those of issue 11.
import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import { renderReportText } from "../notebook/cli/commands/run.ts";
import { renderNotebookBody, renderNotebookHtml } from "../notebook/export/html.ts";
import { buildPageView } from "../notebook/live/_views.ts";
import { loadNotebook } from "../notebook/load.ts";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";
import { getLanguage } from "../cells/language.ts";
import { present } from "../cells/present.ts";
import { asTyped, formatMeasure, formatQuantity, numberInMessage } from "../cells/display.ts";
import { listValueTypes } from "../cells/types.ts";

const lang = getLanguage();
const run = (expr: string) => lang.compile(lang.parse(expr)).evaluate({ ...lang.constants });
const nb = (body: string) => Notebook.fromText("```lentil\n" + body + "\n```\n", "t.lentil.md");
const CODE_WORD = /[a-z][A-Z]/;

Deno.test("display rules: each kind of measure by its own rule", () => {
  // logMAR two decimals, letters whole, decimal acuity two decimals (common practice)
  assert.equal(formatMeasure(0.1996, "logMAR"), "0.20 logMAR");
  assert.equal(formatMeasure(75.02, "letters"), "75 letters");
  assert.equal(formatMeasure(0.6309, "decimal"), "0.63");
  // arcmin one decimal, µm whole and written µm, axes whole degrees
  assert.equal(formatQuantity(36.14, "arcmin"), "36.1 arcmin");
  assert.equal(formatQuantity(12.4, "um"), "12 µm");
  assert.equal(formatQuantity(0.3976, "deg"), "0°");
  assert.equal(formatQuantity(175.4, "deg"), "175°");
  // covariances carry D²
  assert.equal(formatMeasure(-0.0001548, "covariance"), "-0.0001548 D²");
  // a number in a message is never a raw float
  assert.equal(numberInMessage(38.73592452822642, "mm"), "38.74 mm");
  assert.equal(numberInMessage(2.5, "um"), "3 µm");
  // inputs exactly as typed
  assert.equal(asTyped("12 mm"), "12 mm");
  assert.equal(asTyped("1.5 prism"), "1.5 Δ");
  assert.equal(asTyped("3 um"), "3 µm");
});

Deno.test("a cell that is one call of a formula shows its declared kind of measure", () => {
  const r = buildReport(nb('a = toLogMAR("6/9")\nb = letterScore("6/9")\nc = toDecimal("6/9")'));
  const shown = Object.fromEntries(r.cells.map((c) => [c.id, c.display]));
  // 6/9: logMAR = log10(9/6) = 0.176 (ICO 1984); letter score 85 − 50·0.176 = 76.2 (Bailey–Lovie)
  assert.equal(shown.a, "0.18 logMAR");
  assert.equal(shown.b, "76 letters");
  assert.equal(shown.c, "0.67");
  // The JSON value is the number itself, unchanged.
  assert.ok(Math.abs((r.cells[0].value as number) - Math.log10(1.5)) < 1e-12);
});

Deno.test("inputs show as typed in the report", () => {
  const r = buildReport(nb("vd = 12 mm\np = 1.5 prism"));
  assert.deepEqual(r.cells.map((c) => c.display), ["12 mm", "1.5 Δ"]);
});

Deno.test("no output shows um, and every record type labels its parts in words", () => {
  const r = buildReport(nb("d = 25 um + 0 um\ne = retinalBlur(4 mm, 1 D)"));
  for (const c of r.cells) assert.ok(!/\bum\b/.test(c.display), c.display);
  const exprs = [
    'lensThickness(rx("-4.00 / -1.00 x 180"), 1.6, 60 mm, 1.5 mm)',
    'contactLensPower(rx("-6.00 / -1.50 x 180"), 12 mm)',
    'powerVector(rx("-2.25 / -0.75 x 170"))',
    'principalPowers(rx("-2.00 / -1.00 x 30"))',
    'prismComponents(readPrism("R 2 base 30"))',
    'verticalImbalance(rx("+3.00 DS"), rx("+1.00 / -1.00 x 180"), 10 mm)',
    'decentrationFor(rx("+4.00 DS"), readPrism("1 BI"), "R")',
    "tentativeAdd(55 years, 40 cm)",
    "amplitudeByAge(40 years)",
    "pinholeBlur(1.2 mm, 2 D, 5 mm)",
    'compareBlur(blurDisc(3 mm, 0.5 D), "6/6")',
  ];
  for (const e of exprs) {
    const p = present(run(e));
    assert.ok(p.headline, `${e} has a headline`);
    assert.ok(p.parts?.length, `${e} has parts`);
    for (const part of p.parts!) {
      assert.ok(!CODE_WORD.test(part.label), `${e}: label "${part.label}" is a code word`);
      assert.match(part.key, /^[A-Za-z_]\w*$/, `${e}: key ${part.key}`);
      assert.ok(!/\bum\b/.test(part.display));
    }
  }
  // The part keys are the record's field names, so a later cell reads them.
  const t = present(run('lensThickness(rx("-4.00 / -1.00 x 180"), 1.6, 60 mm, 1.5 mm)'));
  assert.deepEqual(t.parts!.map((p) => p.key), ["centre", "edgeThin", "edgeThick"]);
  assert.deepEqual(t.parts!.map((p) => p.label), [
    "centre thickness",
    "thinnest edge",
    "thickest edge",
  ]);
  // Every registered type with parts also has a headline of its own.
  for (const type of listValueTypes()) {
    if (type.parts) assert.ok(type.headline, `${type.name} declares a headline`);
  }
});

Deno.test("a check reads as lines with the verdict in words and deviation = measured − ordered", () => {
  const p = present(run('checkTolerance("-2.25 -0.75 x 170", "-2.25 -0.75 x 178")'));
  assert.match(p.headline, /FAIL/);
  const axis = p.checks!.find((c) => c.quantity.includes("axis"))!;
  assert.equal(axis.ordered, "170°");
  assert.equal(axis.measured, "178°");
  assert.equal(axis.deviation, "+8°");
  assert.equal(axis.verdict, "fail");
  assert.ok(axis.clause, "the clause is named");
});

Deno.test("terminal: headline on the cell's line, parts aligned below, no line past the width", () => {
  const report = buildReport(nb(
    'cl = contactLensPower(rx("-6.00 / -1.50 x 180"), 12 mm)\n' +
      'v = checkPairTolerance("-2.00 DS", "-2.00 DS", "-2.00 DS 0.2 BD", "-2.00 DS 0.2 BU")\n' +
      'byIndex = thicknessByIndex(rx("-6.00 DS"), 60 mm, 1.5 mm)',
  ));
  for (const width of [60, 100]) {
    const text = renderReportText(report, "T", width);
    const lines = text.split("\n");
    const cells = lines.slice(0, lines.indexOf("Sources"));
    for (const l of cells) assert.ok([...l].length <= width, `${width}: ${l}`);
    assert.match(text, /^cl += -5\.50 \/ -1\.50 × 180 {2}\[/m);
    if (width === 100) {
      // Parts indented under the value, labels padded so the values align.
      assert.match(text, /^ {10}to order \(rounded to the step\) {2}-5\.50 \/ -1\.50 × 180$/m);
      assert.match(text, /^ {10}exact, at the cornea {12}-5\.60 \/ -1\.28 × 180$/m);
    }
    assert.ok(text.includes("FAIL"));
    // A table from a formula shows its rows and its counts in words.
    assert.match(text, /refractive index +centre thickness \[mm\]/);
    assert.match(text, /6 rows, 4 columns/);
    assert.ok(!text.includes("rows ×"));
    // The cautions once, at the end.
    assert.equal(text.split("\nCautions\n").length, 2);
  }
});

Deno.test("JSON: values unchanged, plus headline, parts with key, label, display, checks, rows", async () => {
  const io = captureIo();
  const code = await runCli(
    ["eval", 'contactLensPower(rx("-6.00 / -1.50 x 180"), 12 mm)', "--json"],
    io,
  );
  assert.equal(code, 0);
  const j = JSON.parse(io.stdout());
  assert.deepEqual(j.value.rounded, { sphere: -5.5, cylinder: -1.5, axis: 180 });
  assert.equal(j.headline, "-5.50 / -1.50 × 180");
  assert.deepEqual(j.parts[0], {
    key: "rounded",
    label: "to order (rounded to the step)",
    display: "-5.50 / -1.50 × 180",
    value: { sphere: -5.5, cylinder: -1.5, axis: 180 },
    unit: "",
  });
  const io2 = captureIo();
  await runCli(["eval", 'thicknessByIndex(rx("-6.00 DS"), 60 mm, 1.5 mm)', "--json"], io2);
  const t = JSON.parse(io2.stdout());
  assert.equal(t.table.rowCount, 6);
  assert.equal(t.table.rows.length, 6);
  assert.deepEqual(t.table.columns.map((c: { name: string }) => c.name), [
    "index",
    "centre",
    "edgeThin",
    "edgeThick",
  ]);
  assert.equal(t.table.footer, "6 rows, 4 columns");
  const io3 = captureIo();
  await runCli(["eval", 'checkTolerance("-2.25 -0.75 x 170", "-2.25 -0.75 x 178")', "--json"], io3);
  const c = JSON.parse(io3.stdout());
  assert.ok(c.checks.some((l: { verdict: string }) => l.verdict === "fail"));
});

Deno.test("page: headline beside the cell, parts as a table, a check as a real table", () => {
  const { html } = renderNotebookBody(nb(
    'cl = contactLensPower(rx("-6.00 / -1.50 x 180"), 12 mm)\n' +
      'v = checkTolerance("-2.25 -0.75 x 170", "-2.25 -0.75 x 178")\n' +
      'byIndex = thicknessByIndex(rx("-6.00 DS"), 60 mm, 1.5 mm)',
  ));
  assert.match(html, /<td class="lx-value"><span class="lx-headline">-5\.50 \/ -1\.50 × 180/);
  assert.match(
    html,
    /<tr data-part="atCornea"><th scope="row">exact, at the cornea<\/th><td>-5\.60 \/ -1\.28 × 180<\/td><\/tr>/,
  );
  const heads = [...html.matchAll(/<table class="lx-check">.*?<thead><tr>(.*?)<\/tr>/g)][0][1];
  assert.deepEqual(
    [...heads.matchAll(/<th[^>]*>(.*?)<\/th>/g)].map((m) => m[1]),
    ["quantity", "ordered", "measured", "deviation", "tolerance", "verdict"],
  );
  // The verdict is coloured and worded; the clause is named.
  assert.match(html, /<td class="lx-verdict lx-fail"><strong>FAIL<\/strong>/);
  assert.match(html, /<span class="lx-clause">ANSI Z80\.1-2015/);
  // The table from a formula is drawn as table blocks are, in a keyboard-focusable scroller.
  assert.match(
    html,
    /<div class="lx-scroll" tabindex="0" role="region" aria-label="table result byIndex"><table class="lx-data-table"/,
  );
  assert.ok(html.includes("6 rows, 4 columns"));
  assert.equal((html.match(/class="lx-cautions"/g) ?? []).length, 1);
});

Deno.test("live views: the same markup as the page, and the table footer in words", () => {
  const book = Notebook.fromText(
    "```lentil table trials\nlens [D] | va [logMAR]\n+1.00 | 0.00\n+0.75 | 0.02\n```\n" +
      '```lentil\ntrials.shift = lens - 0.25 D\ncl = contactLensPower(rx("-6.00 / -1.50 x 180"), 12 mm)\n```\n',
    "l.lentil.md",
  );
  const view = buildPageView(
    book,
    book.doc,
    "l.lentil.md",
    { prose: () => "", plot: () => "" },
    () => undefined,
  );
  const cl = view.cells.cl;
  assert.equal(cl.headline, "-5.50 / -1.50 × 180");
  assert.ok(cl.html.includes('class="lx-headline"'));
  assert.ok(cl.html.includes('href="#cautions"'));
  assert.ok(cl.below.includes('<table class="lx-parts">'));
  assert.ok(view.cautionsHtml.includes('id="cautions"'));
  assert.equal(view.tables.trials.footer, "2 rows, 3 columns (2 entered, 1 computed)");
});

Deno.test("starters: one cautions section, no rows × footer, every record cell with headline and parts", async () => {
  for (const name of ["dispense-check", "clinical-case", "refraction-study"]) {
    const path = decodeURIComponent(
      new URL(`../seeds/${name}.lentil.md`, import.meta.url).pathname,
    );
    const r = await loadNotebook(path);
    assert.ok(r.ok);
    const html = await renderNotebookHtml(r.notebook);
    const cautions = (html.match(/<section class="lx-cautions"/g) ?? []).length;
    const report = buildReport(r.notebook);
    assert.equal(cautions, report.cautions.length ? 1 : 0, name);
    assert.ok(!html.includes("rows ×"), name);
    assert.ok(!html.includes("<aside"), name);
    for (const c of report.cells) {
      if (c.error || c.kind !== "cell") continue;
      const v = r.notebook.value(c.id);
      const isRecord = v !== null && typeof v === "object" && !Array.isArray(v) &&
        !lang.quantityParts(v) && !c.table;
      if (!isRecord || !(c.parts || c.checks)) continue;
      assert.ok(c.headline, `${name}: ${c.id} has a headline`);
      const row = new RegExp(
        `data-below="${c.id}"><td colspan="3">(<table class="lx-parts">|<div class="lx-scroll")`,
      );
      assert.match(html, row, `${name}: ${c.id} has its parts table`);
      for (const p of c.parts ?? []) {
        assert.ok(!CODE_WORD.test(p.label), `${name}: ${c.id} label ${p.label}`);
      }
    }
  }
});
