// The prescription, prism and lens formulas as the formula language sees them.
import assert from "node:assert/strict";
import { getLanguage } from "../cells/language.ts";
import { getValueType } from "../cells/types.ts";
import { RxValue } from "../cells/rx.ts";
import { tableInfo } from "../cells/table.ts";
import { present } from "../cells/present.ts";

const lang = getLanguage();
const run = (expr: string) => lang.compile(lang.parse(expr)).evaluate({ ...lang.constants });
const show = (expr: string) => lang.describe(run(expr)).display;

Deno.test("rx value type: text or value, shown in the trade's way", () => {
  const t = getValueType("rx")!;
  const v = t.fromText!("-2.25 -0.75 x 170");
  assert.ok(v instanceof RxValue);
  assert.deepEqual(t.json(v), { sphere: -2.25, cylinder: -0.75, axis: 170 });
  assert.equal(show('rx("-2.25 -0.75 x 170")'), "-2.25 / -0.75 × 170");
  assert.equal(show('rx("+1.00 DS")'), "+1.00 DS");
  assert.equal(show('rx("pl")'), "plano");
  // a string is accepted wherever an rx parameter is declared
  assert.equal(show('transpose("-2.25 -0.75 x 170")'), "-3.00 / +0.75 × 80");
  assert.equal(show('transpose(rx("-2.25 -0.75 x 170"))'), "-3.00 / +0.75 × 80");
  // off-step results show the step first and the exact value after
  assert.equal(
    show('vertexRx("-10.00 / -2.00 x 90", 12 mm, 8 mm)'),
    "-9.50 / -2.00 × 90 (exact -9.62 / -1.83 × 90)",
  );
  // vertex-formula at 12 mm: −6.00 / −1.50 × 180 → −5.60 / −1.28 × 180 at the cornea. The
  // exact figure is shown exact, so it cannot be mistaken for a rounding by another rule than
  // the one stated beside the rounded power
  const cl = present(
    run('contactLensPower("-6.00 / -1.50 x 180", 12 mm, {step: 0.25 D, rule: "minus"})'),
  );
  // The headline is the lens to order; the parts are labelled in words, keyed by field name.
  assert.equal(cl.headline, "-5.75 / -1.25 × 180");
  assert.deepEqual(cl.parts?.map((p) => [p.key, p.display]), [
    ["rounded", "-5.75 / -1.25 × 180"],
    ["atCornea", "-5.60 / -1.28 × 180"],
    [
      "rule",
      "each principal meridian power rounded down to the next step (toward minus); axis to the nearest degree, step 0.25 D",
    ],
  ]);
  assert.ok(cl.parts?.every((p) => !/[a-z][A-Z]/.test(p.label)), "labels in words");
  assert.deepEqual(lang.describe(run('rx("L: +1.00 DS add +2.50 1 BU")')).value, {
    sphere: 1,
    cylinder: 0,
    axis: 180,
    add: 2.5,
    prism: { horizontal: 0, vertical: 1 },
    eye: "L",
  });
});

Deno.test("formulas: power vectors, matrix, combining", () => {
  const pv = lang.describe(run('powerVector("-2.00 / -1.00 x 180")')).value as Record<
    string,
    number
  >;
  const expected = { M: -2.5, J0: 0.5, J45: 0, B: Math.hypot(2.5, 0.5) };
  for (const [k, v] of Object.entries(expected)) assert.ok(Math.abs(pv[k] - v) < 1e-12, k);
  assert.equal(lang.quantityParts(run('powerJ0("-2.00 / -1.00 x 90")'))!.value, -0.5);
  assert.equal(show("fromVector(-2.5 D, 0.5 D, 0 D)"), "-2.00 / -1.00 × 180");
  assert.equal(show('fromMatrix(powerMatrix("-2.00 / -1.00 x 30"))'), "-2.00 / -1.00 × 30");
  assert.equal(show('principalPowers("-2.00 / -1.00 x 30").meridian2'), "120°");
  assert.equal(
    show('combine("plano / +1.00 x 90", "plano / +1.00 x 180")'),
    "+1.00 DS",
  );
  assert.equal(
    show('difference(combine("-2 -1 x 30", "+0.5 -0.5 x 120"), "+0.5 -0.5 x 120")'),
    "-2.00 / -1.00 × 30",
  );
  assert.throws(() => run("fromMatrix([[1, 0.5], [0.2, 1]])"), /symmetric/);
});

Deno.test("formulas: bad input names the value and the accepted range", () => {
  assert.throws(
    () => run('rx("-2.25 -0.75 x 181")'),
    /axis 181 is outside the accepted range 0–180/,
  );
  assert.throws(() => run('transpose("-2.25 -0.75")'), /cylinder -0.75 needs an axis/);
  assert.throws(
    () => run('vertexRx("-5 DS", 30 mm)'),
    /30 mm is outside the accepted range 0–25 mm/,
  );
  assert.throws(
    () => run('lensThickness("-4 DS", 2.0, 60 mm, 1 mm)'),
    /outside the accepted range 1.4–1.9/,
  );
  assert.throws(() => run('prismAt("-4 -2 x 45", 5 mm, 0 mm)'), /give the eye/);
  assert.throws(() => run('prismAt("-4 DS", 50 mm, 0 mm)'), /outside the accepted range -40–40 mm/);
  assert.throws(
    () => run('roundToStep("-4.1 DS", {step: 0.25 D, rule: "up"})'),
    /option rule: "up" is not one of "nearest", "plus", "minus"/,
  );
  assert.throws(() => run("spheroCylinder(-2 D, -1 D, 181 deg)"), /0–180/);
});

Deno.test("formulas: prism, thickness table, verification, near", () => {
  assert.equal(show('prismAt("+4.00 DS", 0 mm, -10 mm, "R")'), "R: 4.00 Δ BU (4.00 Δ base 90°)");
  assert.equal(show('prismAt("+4.00 DS", 0 mm, -10 mm)'), "4.00 Δ BU");
  assert.equal(show('compoundPrism(readPrism("3 BI"), "4 BU")'), "3.00 Δ BI, 4.00 Δ BU");
  assert.equal(show('resolvePrism(2 prism, 90 deg, "L")'), "L: 2.00 Δ BU (2.00 Δ base 90°)");
  assert.equal(show('verticalImbalance("+3 DS", "+1 DS", 10 mm).imbalance'), "2.00 Δ");
  assert.equal(show('decentrationFor("+4.00 DS", "1 BI", "R").horizontal'), "2.50 mm");
  // Prentice's rule (common textbook result): a plus lens is decentred toward the base, a minus
  // lens away from it; the record says which way in words, not only by sign
  assert.equal(
    show('decentrationFor("+4.00 DS", "1 BI", "R").move'),
    "optical centre 2.50 mm in",
  );
  assert.equal(
    show('decentrationFor("-5.00 DS", "1 BI 0.5 BU", "L").move'),
    "optical centre 2.00 mm out, 1.00 mm down",
  );
  const table = run('thicknessByIndex("-6.00 DS", 60 mm, 1.5 mm)');
  assert.equal(tableInfo(table)?.rowCount, 6);
  assert.deepEqual(tableInfo(table)?.columns.map((c) => c.name), [
    "index",
    "centre",
    "edgeThin",
    "edgeThick",
  ]);
  const report = lang.describe(run('checkTolerance("-2.25 -0.75 x 170", "-2.25 -0.75 x 178")'));
  assert.match(report.display, /^ANSI Z80\.1-2015: FAIL/);
  assert.match(
    report.display,
    /axis: ordered 170°, measured 178°, deviation \+8°, tolerance ±5°: FAIL, 3° beyond the limit/,
  );
  // ANSI Z80.1-2015 values as in the field notes; wording is ours: the sphere is checked in the
  // meridian of highest absolute power (not "the highest", i.e. vertical, meridian), a
  // deviation equal to the tolerance passes "at the limit", prisms carry their base
  const edge = lang.describe(
    run('checkTolerance("-2.25 / -0.75 x 170", "-2.37 / -0.62 x 175")'),
  ).display;
  assert.match(edge, /sphere \(meridian of highest absolute power\): ordered -3\.00 D/);
  assert.match(edge, /cylinder: .*tolerance ±0\.13 D: pass, at the limit/);
  assert.match(edge, /sphere .*: pass, 0\.12 D inside the limit/);
  const prism = lang.describe(
    run('checkTolerance("R -2.00 DS 1 BD", "R -2.00 DS 0.5 BD 0.75 BO")'),
  ).display;
  assert.match(prism, /horizontal prism: ordered 0\.00 Δ, measured 0\.75 Δ BO, .*FAIL/);
  assert.match(prism, /vertical prism: ordered 1\.00 Δ BD, measured 0\.50 Δ BD, .*FAIL/);
  const pair = lang.describe(
    run('checkPairTolerance("-2.00 DS", "-2.00 DS", "-2.00 DS 0.2 BD", "-2.00 DS 0.2 BU")'),
  ).display;
  assert.match(
    pair,
    /vertical imbalance: ordered 0\.00 Δ, measured 0\.40 Δ \(L relatively base up\)/,
  );
  assert.equal(show("nearDemand(40 cm)"), "+2.50 D");
  assert.equal(show("tentativeAdd(50 years, 40 cm).add"), "+1.25 D");
});

Deno.test("cautions: results that feed making or fitting a lens declare them", () => {
  const cautioned = [
    "transpose",
    "combine",
    "overRefraction",
    "vertexRx",
    "contactLensPower",
    "roundToStep",
    "prismAt",
    "decentrationFor",
    "verticalImbalance",
    "lensThickness",
    "thicknessByIndex",
    "checkTolerance",
    "checkPairTolerance",
    "tentativeAdd",
  ];
  for (const name of cautioned) {
    assert.equal(lang.catalogue.formulas.get(name)?.caution, true, name);
  }
  for (const name of ["rx", "powerVector", "sphericalEquivalent", "meridianPower", "nearDemand"]) {
    assert.notEqual(lang.catalogue.formulas.get(name)?.caution, true, name);
  }
});
