import assert from "node:assert/strict";
import { seeded as rng } from "../lib/seeded.ts";
import { getLanguage } from "../cells/language.ts";
import { Column } from "../cells/table.ts";
import { evaluateRowWise, planColumn } from "../notebook/engine/_columns.ts";
import { Notebook } from "../notebook/engine/engine.ts";

const lang = getLanguage();

const N = 400;
const g = rng(3);
const q = (x: number) => Math.round(x * 4) / 4;
const columns = [
  new Column("sph", "quantity", "D", Float64Array.from({ length: N }, () => q(-8 + 12 * g()))),
  new Column("cyl", "quantity", "D", Float64Array.from({ length: N }, () => q(-3 * g()))),
  new Column(
    "axis",
    "quantity",
    "deg",
    Float64Array.from({ length: N }, () => 1 + Math.floor(180 * g())),
  ),
  new Column("vd", "quantity", "mm", Float64Array.from({ length: N }, () => 10 + 4 * g())),
  new Column("va", "number", "logMAR", Float64Array.from({ length: N }, () => -0.2 + g())),
  new Column("x", "number", "", Float64Array.from({ length: N }, () => -5 + 10 * g())),
  new Column("eye", "text", "", Array.from({ length: N }, (_, i) => (i % 2 ? "R" : "L"))),
];
const scope = new Map<string, unknown>([
  ["step", lang.quantity(0.25, "D")],
  ["k", 3],
  ["gap", lang.quantity(2, "cm")],
]);

function both(expr: string) {
  const node = lang.parse(expr);
  const ev = lang.compile(node);
  const plan = planColumn("out", node, ev, columns, scope, lang);
  return {
    plan,
    rowWise: () => evaluateRowWise("out", ev, columns, N, scope, lang),
    run: () => plan.run(columns, N),
  };
}

// Formulas the compiler must take, with results equal to the row-wise path bit for bit.
const COMPILED = [
  "sph + cyl / 2",
  "-(cyl / 2) * cos(2 * axis)",
  "-(cyl / 2) * sin(2 * axis)",
  "sqrt(x^2 + va^2)",
  "sph - 0.25 D",
  "sph + step * k",
  "vd + gap",
  "gap + vd",
  "vd / 2 + 1 mm",
  "va * 2 - 0.1",
  "abs(cyl)",
  "tan(axis / 4)",
  "atan2(x, 2)",
  "exp(va)",
  "log10(abs(x) + 1)",
  "log(abs(x) + 0.5)",
  "min(x, va, 0.5)",
  "max(x, 1)",
  "round(x)",
  "floor(x * 10) / 10",
  "ceil(x)",
  "pow(abs(x), 1.5)",
  "x ^ 2",
  "pi * x",
  "sph / cyl",
  "vertexPower(sph, vd)",
  "vertexPower(sph, 12 mm, 0 mm) - sph",
  "cos(x)",
  "2 (sph + 1 D)",
  "x > 0 ? sph : cyl",
  "sph >= -0.25 D ? x : va",
  "x == va ? 1 : 0",
  "abs(x) < 1e-12 ? 0 : x",
  "axis != 90 deg ? sph : sph + cyl",
];

for (const expr of COMPILED) {
  Deno.test(`compiled column equals row-wise: ${expr}`, () => {
    // common practice, no source: both paths of the same language must agree
    const { plan, rowWise: rw, run } = both(expr);
    assert.equal(plan.compiled, true, plan.reason);
    const rowWise = rw();
    const { column, path } = run();
    assert.equal(path, "compiled");
    assert.equal(column.type, rowWise.type);
    assert.equal(column.unit, rowWise.unit);
    assert.deepEqual(
      Array.from(column.data as Float64Array),
      Array.from(rowWise.data as Float64Array),
    );
  });
}

// Formulas outside the subset: planned row-wise, same result as evaluating row-wise.
const FALLBACK = [
  "sph * cyl",
  "x > 0 ? sph : x",
  "x > 0 ? sph : 1 mm",
  "eye + 1",
  "mod(x, 2)",
  "sqrt(sph)",
  "exp(sph)",
  "sqrt((sph + cyl / 2)^2 + (cyl / 2)^2)",
];

for (const expr of FALLBACK) {
  Deno.test(`formula outside the compiled subset falls back: ${expr}`, () => {
    // common practice, no source
    const { plan, rowWise, run } = both(expr);
    assert.equal(plan.compiled, false);
    assert.ok(plan.reason && plan.reason.length > 0);
    let expected: unknown;
    try {
      expected = rowWise();
    } catch (e) {
      expected = (e as Error).message;
    }
    let got: unknown;
    try {
      got = run().column;
    } catch (e) {
      got = (e as Error).message;
    }
    assert.deepEqual(got, expected);
  });
}

Deno.test("a negative base to a fraction falls back at run time and reads as row-wise", () => {
  // mathjs gives complex results for sqrt of a negative number; the compiled loop hands over
  const { plan, run } = both("sqrt(x)");
  assert.equal(plan.compiled, true);
  const r = run();
  assert.equal(r.path, "row-wise");
  assert.equal(r.column.numeric, false);
});

Deno.test("a range error in a catalogue formula is the language's own, with the row", () => {
  // common practice, no source: vertex distance range 0–25 mm is declared by the formula
  const cols = [new Column("d", "quantity", "mm", new Float64Array([12, 30]))];
  const node = lang.parse("vertexPower(-10 D, d)");
  const plan = planColumn("p", node, lang.compile(node), cols, new Map(), lang);
  assert.equal(plan.compiled, true);
  assert.throws(() => plan.run(cols, 2), /row 2: vertexPower: from: 30 mm is outside/);
});

Deno.test("the engine compiles power-vector columns and reports the path", () => {
  // Thibos et al. 1997: M = S + C/2, J0 = −(C/2)cos 2α, J45 = −(C/2)sin 2α
  const text = [
    "~~~lentil table eyes",
    "sph [D] | cyl [D] | axis [deg] | eye [text]",
    "-2.00 | -1.00 | 180 | R",
    "+1.00 | -2.00 | 90 | L",
    "~~~",
    "~~~lentil",
    "eyes.M = sph + cyl / 2",
    "eyes.J0 = -(cyl / 2) * cos(2 * axis)",
    "eyes.J45 = -(cyl / 2) * sin(2 * axis)",
    "eyes.tag = eye",
    "~~~",
    "",
  ].join("\n");
  const nb = Notebook.fromText(text, "v.lentil.md");
  assert.equal(nb.columnPath("eyes.M")?.path, "compiled");
  // A text column passed through is compiled too: its values are read as they are.
  assert.equal(nb.columnPath("eyes.tag")?.path, "compiled");
  const m = nb.value("eyes.M") as Column;
  assert.deepEqual(Array.from(m.data as Float64Array), [-2.5, 0]);
  assert.equal(m.unit, "D");
  const j0 = nb.value("eyes.J0") as Column;
  assert.ok(Math.abs((j0.data as Float64Array)[0] - 0.5) < 1e-12);
  assert.ok(Math.abs((j0.data as Float64Array)[1] - -1) < 1e-12);
});

// Text and typed-record columns: checked once at plan time, rows evaluated on plain values;
// the same column as the row-wise path, and the same error at the same row.
const ACUITY_TEXT = [
  "6/6",
  "6/9",
  "20/40",
  "0.3 logMAR",
  "1.0 decimal",
  "85 letters",
  "6/12",
  "20/20",
];
const PRISM_TEXT = ["1.5 BU", "2 BI", "R 2 base 30", "0.5 BD", "3 BO"];
const RX_TEXT = ["-2.25 / -0.75 x 170", "+1.00 DS", "-4.00 / -1.25 x 90", "plano / -0.50 x 45"];
const typed = (() => {
  const pick = <T>(xs: readonly T[], i: number) => xs[(i * 7 + 3) % xs.length];
  const prism = lang.compile(lang.parse("readPrism(t)"));
  const rx = lang.compile(lang.parse("rx(t)"));
  const of = (ev: { evaluate(s: unknown): unknown }, t: string) => ev.evaluate(new Map([["t", t]]));
  const acuities = Array.from({ length: N }, (_, i) => pick(ACUITY_TEXT, i));
  return [
    ...columns,
    new Column("va", "text", "", acuities),
    new Column(
      "p",
      "prism",
      "",
      Array.from({ length: N }, (_, i) => of(prism, pick(PRISM_TEXT, i))),
    ),
    new Column("rxs", "rx", "", Array.from({ length: N }, (_, i) => of(rx, pick(RX_TEXT, i)))),
    new Column("rxt", "text", "", Array.from({ length: N }, (_, i) => pick(RX_TEXT, i))),
  ].filter((c, i, all) => all.findIndex((d) => d.name === c.name) === i || c.type === "text");
})();
const typedColumns = typed.filter((c) => !(c.name === "va" && c.type === "number"));

function sameAsRowWise(expr: string, cols: readonly Column[], rows = N) {
  const node = lang.parse(expr);
  const ev = lang.compile(node);
  const plan = planColumn("out", node, ev, cols, scope, lang);
  let expected: unknown;
  try {
    expected = evaluateRowWise("out", ev, cols, rows, scope, lang);
  } catch (e) {
    expected = (e as Error).message;
  }
  let got: unknown;
  let path = "";
  try {
    const r = plan.run(cols, rows);
    got = r.column;
    path = r.path;
  } catch (e) {
    got = (e as Error).message;
  }
  return { plan, expected, got, path };
}

const TYPED = [
  "toLogMAR(acuity(va))",
  "toDecimal(va)",
  "toLogMAR(acuity(va)) + 0.1",
  'acuityAs(va, "decimal")',
  "eye",
  'sph > 0 D ? eye : "no"',
  'toLogMAR(acuity(va)) > 0.1 ? "reduced" : "good"',
  "prismComponents(p)",
  "prismComponents(p, eye)",
  "sphericalEquivalent(rxs)",
  "sphericalEquivalent(rxs) + sph",
  "sphericalEquivalent(rx(rxt))",
  "transpose(rxs)",
  "vertexRx(rxs, vd)",
  "vertexRx(rxs, 12 mm)",
  "powerVector(rxt)",
  "meridianPower(rxs, axis)",
];

for (const expr of TYPED) {
  Deno.test(`typed column equals row-wise: ${expr}`, () => {
    // common practice, no source: both paths of the same language must agree
    const { plan, expected, got, path } = sameAsRowWise(expr, typedColumns);
    assert.equal(plan.compiled, true, plan.reason);
    assert.equal(path, "compiled");
    assert.deepEqual(got, expected);
  });
}

Deno.test("a bad value in a typed column is the language's error at its row", () => {
  // common practice, no source
  const bad = [...ACUITY_TEXT, "6/x", "6/9"];
  const cols = [
    new Column("va", "text", "", bad),
    new Column("p", "text", "", [
      "1 BU",
      "2 BI",
      "1 BU",
      "40 BU",
      "1 BU",
      "1 BU",
      "x",
      "1",
      "1",
      "1",
    ]),
  ];
  for (
    const expr of ["toLogMAR(acuity(va))", "toDecimal(va) * 2", "prismComponents(readPrism(p))"]
  ) {
    const { plan, expected, got } = sameAsRowWise(expr, cols, bad.length);
    assert.equal(plan.compiled, true, plan.reason);
    assert.equal(typeof expected, "string", expr);
    assert.match(expected as string, /^row \d+: /);
    assert.equal(got, expected, expr);
  }
});

Deno.test("every computed column of the starters equals the row-wise path", async () => {
  // common practice, no source: the column plan must not change a starter's columns
  const { loadNotebook } = await import("../notebook/load.ts");
  const { tableInfo } = await import("../cells/table.ts");
  const dir = new URL("../seeds/", import.meta.url);
  let checked = 0;
  for (const e of Deno.readDirSync(dir)) {
    if (!e.name.endsWith(".lentil.md")) continue;
    const r = await loadNotebook(decodeURIComponent(new URL(e.name, dir).pathname));
    assert.ok(r.ok);
    const nb = r.notebook;
    const scope = new Map<string, unknown>();
    for (const c of nb.results()) {
      if (c.kind === "cell" && c.value !== undefined) scope.set(c.id, c.value);
    }
    for (const cell of nb.doc.cells) {
      if (!cell.table) continue;
      const info = tableInfo(nb.value(cell.table))!;
      const cols = info.columns.filter((c) => c.name !== cell.name);
      const node = lang.parse(cell.expression);
      const ev = lang.compile(node);
      const planned = planColumn(cell.name, node, ev, cols, scope, lang).run(cols, info.rowCount);
      const rowWise = evaluateRowWise(cell.name, ev, cols, info.rowCount, scope, lang);
      assert.deepEqual(planned.column, rowWise, `${e.name}: ${cell.table}.${cell.name}`);
      checked++;
    }
  }
  assert.ok(checked >= 5, `${checked} columns checked`);
});

Deno.test("formulas with options and bare numbers give the language's own results and errors", () => {
  // common practice, no source: the compiled path is never more lenient than the language
  const cols = [
    new Column("pupil", "quantity", "mm", Float64Array.from({ length: 50 }, (_, i) => 2 + i / 10)),
    new Column("defocus", "quantity", "D", Float64Array.from({ length: 50 }, (_, i) => i / 20)),
    new Column("n", "number", "", Float64Array.from({ length: 50 }, (_, i) => i / 10)),
  ];
  for (
    const expr of [
      "blurDisc(pupil, defocus)",
      "combinedBlur(pupil, defocus)",
      "combinedBlur(pupil, defocus, {wavelength: 600 nm})",
      "retinalBlur(pupil, defocus)",
      "vertexPower(n, 12 mm)",
      "vertexPower(defocus, n)",
    ]
  ) {
    const { plan, expected, got } = sameAsRowWise(expr, cols, 50);
    assert.deepEqual(got, expected, `${expr} (${plan.compiled ? "compiled" : plan.reason})`);
  }
});
