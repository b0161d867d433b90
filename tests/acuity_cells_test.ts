import assert from "node:assert/strict";
import { getLanguage } from "../cells/language.ts";
import { Column, makeTable } from "../cells/table.ts";
import { ACUITY_FORMULAS } from "../cells/acuity.ts";
import { BLUR_FORMULAS } from "../cells/blur.ts";
import { ENDPOINT_FORMULAS } from "../cells/endpoint.ts";

const lang = getLanguage();
const trials = makeTable("trials", [
  new Column("lens", "quantity", "D", new Float64Array([0.5, 0.25, 0, -0.25, -0.5])),
  new Column("va", "number", "", new Float64Array([0.3, 0.1, 0, 0, 0])),
]);
const run = (expr: string, scope: Record<string, unknown> = {}) =>
  lang.describe(lang.compile(lang.parse(expr)).evaluate({ ...lang.constants, trials, ...scope }));

Deno.test("every acuity, blur and endpoint example evaluates", () => {
  for (const f of [...ACUITY_FORMULAS, ...BLUR_FORMULAS, ...ENDPOINT_FORMULAS]) {
    const d = run(f.example);
    assert.ok(d.display.length > 0, f.name);
  }
});

Deno.test("acuity values display in their notation", () => {
  assert.equal(run('acuity("20/40")').display, "20/40");
  assert.equal(run('acuityAs("20/40", "metres")').display, "6/12");
  assert.equal(run('acuity(0.3, "logMAR")').display, "0.30 logMAR");
  assert.equal(run('snellenMetres("20/25", {testDistance: 4 m})').display, "4/5");
  assert.equal(run('toLogMAR("20/200")').display, "1");
  // ISO 8596: 8.73 mm at 6 m for V = 1.0
  assert.equal(run('letterHeight("6/6", 6 m)').display, "8.73 mm");
  assert.equal(run("acuityForLetter(17.45 mm, 6 m)").display, "0.5 decimal");
  const score = run("scoreChart(logMARChart(), [5, 5, 5, 5, 5, 5, 5, 5, 4, 3, 1])");
  assert.match(score.display, /^line 0\.10 logMAR -2 \+1; letter by letter 0\.14 logMAR/);
  assert.match(run("amplitudeByAge(40 years)").display, /minimum 5\.00 D, mean 6\.50 D/);
});

Deno.test("bad arguments are named", () => {
  assert.throws(
    () => run("blurDisc(12 mm, 1 D)"),
    /pupil: 12 mm is outside the accepted range 1–9 mm/,
  );
  assert.throws(() => run('letterHeight("6/6", -6 m)'), /distance: -6 m is outside/);
  assert.throws(() => run('toLogMAR("6/x")'), /cannot read "6\/x"/);
  // one rule for a number without its notation, as text or as a number (stated in the error)
  assert.throws(() => run("acuity(0.3)"), /0\.3 has no notation: a bare number could be decimal/);
  assert.throws(() => run('acuity("0.3")'), /0\.3 has no notation: a bare number could be decimal/);
  assert.throws(
    () => run('guessChanceDistinct("CDH", 5, 4)'),
    /3 letters, fewer than the 4 needed/,
  );
  assert.throws(() => run("endpoint(logMARChart())"), /name the|column/);
});
