// Reactive engine: graph order, recompute sets, cycles, error values, units, sources, security.
import assert from "node:assert/strict";
import { all, create } from "mathjs";
import { Notebook } from "../notebook/engine/engine.ts";
import { DependencyGraph } from "../notebook/engine/graph.ts";
import { getLanguage } from "../cells/language.ts";

const calc = (body: string) => "```lentil\n" + body + "\n```\n";

Deno.test("graph: topological order, downstream sets, cycles with their path", () => {
  const g = new DependencyGraph(
    new Map([["c", ["b"]], ["a", []], ["b", ["a"]], ["x", ["y"]], ["y", ["x"]], ["z", ["z"]]]),
  );
  assert.ok(g.rank("a") < g.rank("b") && g.rank("b") < g.rank("c"));
  assert.deepEqual(g.downstream(["b"]), ["b", "c"]);
  assert.deepEqual(g.cycles.map((c) => [...c]).sort(), [["x", "y"], ["z"]]);
});

Deno.test("changing one input recomputes only the cells downstream of it", () => {
  const nb = Notebook.fromText(
    calc("a = 1 D\nb = a + 1 D\nc = b * 2\nd = 5 mm\ne2 = d * 2\nf = c + 1 D"),
    "r.lentil.md",
  );
  assert.deepEqual(nb.update("a", "2 D"), ["a", "b", "c", "f"]);
  assert.equal(nb.language.describe(nb.value("f")).display, "+7.00 D");
  assert.deepEqual(nb.update("d", "1 mm"), ["d", "e2"]);
  assert.equal(nb.language.describe(nb.value("e2")).display, "2.00 mm");
});

Deno.test("changing a formula's dependencies rewires the graph", () => {
  const nb = Notebook.fromText(calc("a = 1\nb = 2\nc = a + 1"), "w.lentil.md");
  assert.deepEqual(nb.update("c", "b + 1"), ["c"]);
  assert.deepEqual(nb.update("a", "10"), ["a"]);
  assert.deepEqual(nb.update("b", "10"), ["b", "c"]);
  assert.equal(nb.value("c"), 11);
});

Deno.test("a cycle is reported with its path and lines; the rest evaluates", () => {
  const nb = Notebook.fromText(
    calc("a = c + 1\nb = a + 1\nc = b + 1\nd = a * 2\nok = 3"),
    "cy.lentil.md",
  );
  for (const id of ["a", "b", "c"]) {
    const e = nb.result(id)!.error!;
    assert.equal(e.kind, "cycle");
    assert.equal(e.message, "cycle: a → c → b → a (a at line 2, c at line 4, b at line 3)");
  }
  assert.equal(nb.result("d")!.error!.kind, "dependency");
  assert.equal(nb.value("ok"), 3);
  // Breaking the cycle heals it.
  nb.update("a", "1");
  assert.equal(nb.value("c"), 3);
  assert.equal(nb.value("d"), 2);
});

Deno.test("an error is carried to dependents with the original cause and position", () => {
  const nb = Notebook.fromText(
    calc("p = -2 D\nd = 3 mm\nbad = p + d\nworse = bad * 2\nworst = worse + 1 D\nfine = p * 2"),
    "e.lentil.md",
  );
  const bad = nb.result("bad")!.error!;
  assert.equal(bad.kind, "unit");
  assert.equal(
    bad.message,
    "units do not match: cannot add 3.00 mm to -2.00 D (a power and a length)",
  );
  assert.deepEqual([bad.line, bad.col], [4, 9]); // at the +
  const worst = nb.result("worst")!.error!;
  assert.equal(worst.kind, "dependency");
  assert.equal(worst.cause!.id, "bad");
  assert.equal(worst.cause!.error.line, 4);
  assert.match(worst.message, /bad at e\.lentil\.md:4:9/);
  assert.equal(nb.language.describe(nb.value("fine")).display, "-4.00 D");
  // Only the root problem is a diagnostic.
  assert.deepEqual(nb.diagnostics().map((d) => `${d.line}:${d.col}`), ["4:9"]);
});

Deno.test("bad formula, unknown name, unknown unit and out-of-range values are positioned", () => {
  const nb = Notebook.fromText(
    calc(
      'a = 2 *\nb = foo + 1\nc = 3 mn\nd = vertexPower(-4 D, 40 mm)\nev = evaluate("1")\nasg = x = 3',
    ),
    "b.lentil.md",
  );
  const msg = (id: string) => nb.result(id)!.error!;
  assert.equal(msg("a").kind, "syntax");
  assert.deepEqual([msg("b").message, msg("b").col], ['unknown name or unit "foo"', 5]);
  assert.deepEqual([msg("c").message, msg("c").col], ['unknown name or unit "mn"', 7]);
  assert.equal(msg("d").kind, "range");
  assert.match(msg("d").message, /from: 40 mm is outside the accepted range 0–25 mm/);
  assert.match(msg("ev").message, /function evaluate is not available/);
  assert.equal(msg("asg").kind, "syntax");
});

Deno.test("dangerous mathjs functions cannot be reached, even indirectly", () => {
  const lang = getLanguage();
  for (
    const expr of [
      "import({}, {override: true})",
      'createUnit("x")',
      'evaluate("1+1")',
      'parse("1")',
      'simplify("x")',
      'derivative("x^2", "x")',
      'resolve("x", {})',
      "config({})",
    ]
  ) {
    assert.throws(() => lang.compile(lang.parse(expr)).evaluate({}), /not available/, expr);
  }
  // Our own units survive: nobody redefined them.
  assert.equal(
    lang.describe(lang.compile(lang.parse("1 / (0.5 m)")).evaluate({})).display,
    "+2.00 D",
  );
});

Deno.test("unit conversions agree with mathjs as a general-purpose reference", () => {
  // Reference: a fresh mathjs instance with 1 D defined as 1/m (the SI definition of the dioptre).
  const ref = create(all, {});
  ref.createUnit("D", "1 m^-1");
  const lang = getLanguage();
  const cases: [string, string, number][] = [
    ["12 mm", "m", 0.012],
    ["2.5 cm", "mm", 25],
    ["5 arcmin", "deg", 5 / 60],
    ["3 um", "nm", 3000],
    ["2 D", "m^-1", 2],
    ["1 / (25 cm)", "D", 4],
    ["2 years", "years", 2],
  ];
  for (const [expr, unit, expected] of cases) {
    const ours = lang.toNumberIn(lang.compile(lang.parse(expr)).evaluate({}), unit);
    const theirs = ref.evaluate(expr).toNumber(unit);
    assert.ok(Math.abs(ours - theirs) < 1e-12, `${expr} → ${unit}: ${ours} vs mathjs ${theirs}`);
    assert.ok(Math.abs(ours - expected) < 1e-12, `${expr}: ${ours}`);
  }
});

Deno.test("results display in the trade's conventions", () => {
  const nb = Notebook.fromText(
    calc(
      "p = 1.25 D\nz = 0 D\nn = -0.5 D\nx = -8.928 D\na = 170 deg\nq = 1.5 prism\nh = 8.7266 mm",
    ),
    "d.lentil.md",
  );
  const show = (id: string) => nb.language.describe(nb.value(id), nb.display).display;
  assert.equal(show("p"), "+1.25 D");
  assert.equal(show("z"), "0.00 D");
  assert.equal(show("n"), "-0.50 D");
  assert.equal(show("x"), "-9.00 D (exact -8.93)");
  assert.equal(show("a"), "170°");
  assert.equal(show("q"), "1.50 Δ");
  assert.equal(show("h"), "8.73 mm");
  const fine = Notebook.fromText(
    "---\npower-step: 0.01\n---\n" + calc("x = -8.928 D"),
    "s.lentil.md",
  );
  assert.equal(fine.language.describe(fine.value("x"), fine.display).display, "-8.93 D");
});

Deno.test("sources are listed transitively, in registry order", () => {
  const nb = Notebook.fromText(
    calc("eye = reducedEyePower\ncl = vertexPower(-6 D, 12 mm)\nboth = cl + eye\nplain = 2 D"),
    "s.lentil.md",
  );
  assert.deepEqual(nb.result("eye")!.sources, ["emsley-reduced-eye"]);
  assert.deepEqual(nb.result("cl")!.sources, ["vertex-formula"]);
  assert.deepEqual(nb.result("both")!.sources, ["vertex-formula", "emsley-reduced-eye"]);
  assert.deepEqual(nb.result("plain")!.sources, []);
  assert.equal(nb.result("both")!.caution, true);
  assert.equal(nb.result("eye")!.caution, false);
});

Deno.test("a result cites the sources its values were read by, not every source a formula may cite", () => {
  const nb = Notebook.fromText(
    calc(
      'snellen = toLogMAR(acuity("6/9"))\ncf = acuity("CF")\ncfLog = toLogMAR(cf)\n' +
        'near = acuity("N8 at 40 cm")\nsloan = acuity("1.0 M at 40 cm")\n' +
        'score = acuity("85 letters")\nlp = acuity("LP")',
    ) +
      "\n```lentil table va\nread [acuity]\n6/9\nCF\n```\n```lentil\nva.lm = toLogMAR(read)\n```\n",
    "c.lentil.md",
  );
  const src = (id: string) => nb.result(id)!.sources;
  // A Snellen fraction rests on the notation sources only (ico-1984, iso-8596).
  assert.deepEqual(src("snellen"), ["ico-1984", "iso-8596"]);
  // CF takes the Freiburg substitution by default (schulze-bonsel-2006, lib/acuity.ts).
  assert.deepEqual(src("cf"), ["schulze-bonsel-2006"]);
  assert.deepEqual(src("cfLog"), ["ico-1984", "iso-8596", "schulze-bonsel-2006"]);
  // N notation: N to M (law-1951) and M to logMAR (sloan-habel-1956); M units only the latter.
  assert.deepEqual([...src("near")].sort(), ["law-1951", "sloan-habel-1956"]);
  assert.deepEqual(src("sloan"), ["sloan-habel-1956"]);
  assert.deepEqual(src("score"), ["ferris-1982"]);
  assert.deepEqual(src("lp"), ["low-vision-conventions"]);
  // The formula reference still lists every source acuity() may cite.
  const all = getLanguage().catalogue.formulas.get("acuity")!.sources;
  for (const id of ["schulze-bonsel-2006", "lange-2009", "law-1951"]) assert.ok(all.includes(id));
  // A computed column is not narrowed row by row: it cites the formulas' declared lists.
  assert.ok(src("va.lm").includes("ico-1984"));
});

Deno.test("vertex check values from the field notes (vertex-formula)", () => {
  // Field notes, vertex row: −10.00 D at 12 mm → −8.93 D at the cornea; +10.00 D → +11.36 D.
  const nb = Notebook.fromText(
    calc("minus = vertexPower(-10 D, 12 mm)\nplus = vertexPower(+10 D, 12 mm)"),
    "v.lentil.md",
  );
  assert.equal(
    (nb.value("minus") as { toNumber(u: string): number }).toNumber("D").toFixed(2),
    "-8.93",
  );
  assert.equal(
    (nb.value("plus") as { toNumber(u: string): number }).toNumber("D").toFixed(2),
    "11.36",
  );
});

Deno.test("tables: inline columns with units, computed columns, aggregates", () => {
  const nb = Notebook.fromText(
    calc("trials.shifted = lens - 0.25 D\nbest = max(trials.shifted)\nmeanVa = mean(trials.va)") +
      "\n```lentil table trials\nlens [D] | va [logMAR] | who\n+1.00 | 0.30 | a\n+0.50 | 0.10 | b\n0.00 | 0.00 | c\n```\n",
    "t.lentil.md",
  );
  assert.equal(nb.language.describe(nb.value("best")).display, "+0.75 D");
  assert.ok(Math.abs((nb.value("meanVa") as number) - 0.4 / 3) < 1e-12);
  assert.deepEqual(nb.update("trials.shifted", "lens + 1 D"), ["trials.shifted", "best"]);
  assert.equal(nb.language.describe(nb.value("best")).display, "+2.00 D");
});

Deno.test("tables: bad cells are positioned; bad rows stop by default or are skipped and counted", () => {
  const rows = "lens [D] | va\n+1.00 | 0.3\nabc | 0.1\n0.00 | 0.0\n";
  const stop = Notebook.fromText(
    "```lentil table t\n" + rows + "```\n" + calc("n = 1"),
    "b.lentil.md",
  );
  assert.equal(stop.result("t")!.error!.kind, "data");
  assert.deepEqual(stop.diagnostics().map((d) => `${d.line}:${d.col}: ${d.message}`), [
    '4:1: column lens: "abc" is not a number (in D)',
  ]);
  const skip = Notebook.fromText(
    "```lentil table t\nbad rows: skip\n" + rows + "```\n",
    "s.lentil.md",
  );
  assert.match(
    skip.language.describe(skip.value("t")).display,
    /2 rows, 2 columns; 1 unreadable row left out/,
  );
});

Deno.test("tables: unknown unit in a header and a missing CSV file are positioned", () => {
  const nb = Notebook.fromText(
    "```lentil table t\nlens [Dx] | va\n1 | 2\n```\n\n```lentil table u\nfile: nowhere.csv\n```\n",
    "h.lentil.md",
  );
  const d = nb.diagnostics();
  assert.equal(d[0].line, 2);
  assert.equal(d[0].col, 1);
  assert.match(d[0].message, /unknown unit or type \[Dx\]/);
  assert.equal(d[1].line, 7);
  assert.match(d[1].message, /cannot read table file "nowhere.csv"/);
});

Deno.test("tables: CSV rows with the wrong number of fields are positioned in the CSV", () => {
  const files: Record<string, string> = { "r.csv": "sph [D],cyl [D]\n-1.00,-0.50\n-2.00\n" };
  const nb = Notebook.fromText("```lentil table r\nfile: r.csv\n```\n", "c.lentil.md", {
    host: { readText: (p) => files[p] },
  });
  assert.deepEqual(nb.diagnostics().map((d) => `${d.file}:${d.line}:${d.col}: ${d.message}`), [
    "r.csv:3:1: row has 1 field, the header has 2",
  ]);
});

Deno.test("a unit Lentil does not use is refused at its column, so a typo is not a pressure", () => {
  const nb = Notebook.fromText(calc("p = 3 bar\nd = 20 ft\nk = 1 km"), "u.lentil.md");
  const e = nb.result("p")!.error!;
  assert.equal(e.kind, "name");
  assert.equal(e.col, 7);
  assert.match(e.message, /"bar" is not a unit Lentil uses/);
  assert.equal(nb.language.describe(nb.value("d")).display, "20 ft");
  assert.equal(nb.language.describe(nb.value("k")).display, "1 km");
});

Deno.test("reconcile: a new version re-evaluates only what changed and what depends on it", async () => {
  const { parseNotebook } = await import("../notebook/format/parse.ts");
  const text = (rows: string, extra = "") =>
    "```lentil table t\nlens [D] | va\n" + rows + "```\n\n" +
    calc("best = max(t.lens)\nother = 2 mm\nbad = other + 1 D" + extra);
  const before = Notebook.fromText(text("+1.00 | 0.1\n"), "r.lentil.md");
  // A table edit that adds a row: the table and its dependents, and the cell whose error
  // moved down a line; `other` keeps its value.
  const doc = parseNotebook(text("+1.00 | 0.1\n+2.00 | 0.2\n"), "r.lentil.md");
  const { notebook, recomputed } = Notebook.reconcile(before, doc);
  assert.deepEqual(recomputed, ["t", "best", "bad"]);
  assert.equal(notebook.language.describe(notebook.value("best")).display, "+2.00 D");
  assert.equal(notebook.result("bad")!.error!.line, 10);
  // The same results as evaluating the new version from scratch.
  const fresh = new Notebook(doc);
  fresh.evaluateAll();
  const show = (nb: Notebook) =>
    nb.results().map((r) => [r.id, r.error?.message ?? nb.language.describe(r.value).display]);
  assert.deepEqual(show(notebook), show(fresh));
});

Deno.test("reconcile: removing a computed column leaves no stale column on its table", async () => {
  const { parseNotebook } = await import("../notebook/format/parse.ts");
  const table = "```lentil table t\nx\n1\n2\n```\n\n";
  const before = Notebook.fromText(table + calc("t.y = x * 2\nn = 1"), "c.lentil.md");
  const doc = parseNotebook(table + calc("n = 1"), "c.lentil.md");
  const { notebook, recomputed } = Notebook.reconcile(before, doc);
  assert.deepEqual(recomputed, ["t"]);
  assert.match(notebook.language.describe(notebook.value("t")).display, /2 rows, 1 column/);
});

Deno.test("a cell's result unit is given with to; a unit of another kind is an error at the to", () => {
  const nb = Notebook.fromText(calc("h = 8.73 mm to cm\nbad = 12 mm to D"), "t.lentil.md");
  assert.equal(nb.language.describe(nb.value("h")).display, "0.87 cm");
  const e = nb.result("bad")!.error!;
  assert.equal(e.kind, "unit");
  assert.equal(e.message, "units do not match: 12.00 mm cannot be shown in D");
  assert.equal(e.col, 13);
});

Deno.test("rounding a quantity without a unit says which unit it needs", () => {
  const nb = Notebook.fromText(calc("r = round(-1.30 D)\nok = round(-1.30 D, D)"), "r.lentil.md");
  assert.match(
    nb.result("r")!.error!.message,
    /round of a quantity needs the unit to round in: write round\(x, D\)/,
  );
  assert.equal(nb.language.describe(nb.value("ok")).display, "-1.00 D");
});
