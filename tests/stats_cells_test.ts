import assert from "node:assert/strict";
import * as ss from "simple-statistics";
import { Notebook } from "../notebook/engine/engine.ts";
import { getValueType } from "../cells/types.ts";
import { getLanguage } from "../cells/language.ts";

const lang = getLanguage();
const num = (x: unknown, unit = "D") => lang.toNumberIn(x, unit);
const close = (a: number, b: number, tol = 1e-12) =>
  assert.ok(Math.abs(a - b) <= tol, `${a} vs ${b}`);

const TABLE = [
  "~~~lentil table visits",
  "eye [text] | sph [D] | cyl [D] | axis [deg] | sphB [D] | cylB [D] | axisB [deg] | va [logMAR]",
  "R | +0.00 | +1.00 | 180 | -0.25 | +1.00 | 175 | 0.10",
  "L | +0.00 | +1.00 | 90  | +0.25 | +0.75 | 95  | 0.00",
  "R | -1.00 | -0.50 | 10  | -1.25 | -0.50 | 15  | 0.20",
  "L | -2.00 | -0.75 | 170 | -2.00 | -0.50 | 165 | -0.10",
  "~~~",
].join("\n");

function run(calc: string[]): Notebook {
  return Notebook.fromText(TABLE + "\n\n~~~lentil\n" + calc.join("\n") + "\n~~~\n", "s.lentil.md");
}

Deno.test("meanRx of +1.00 × 180 and +1.00 × 90 is a sphere of +0.50 D", () => {
  // Thibos et al. 1997: averaging through power vectors
  const nb = run(["avg = meanRx([0 D, 0 D], [1 D, 1 D], [180 deg, 90 deg])"]);
  const m = nb.value("avg") as Record<string, unknown>;
  const rx = (m.rx as { rx: { sphere: number; cylinder: number } }).rx;
  close(rx.sphere, 0.5);
  close(rx.cylinder, 0);
  close(num(m.J0), 0);
});

Deno.test("sampleStats of a column matches simple-statistics; sampleStatsBy groups by eye", () => {
  // checked against simple-statistics
  const nb = run([
    "s = sampleStats(visits.va)",
    "byEye = sampleStatsBy(visits.va, visits.eye)",
    "n = countOf(visits.va)",
    "q = quantileOf(visits.va, 0.5)",
  ]);
  const va = [0.1, 0, 0.2, -0.1];
  const s = nb.value("s") as Record<string, unknown>;
  close(s.mean as number, ss.mean(va));
  close(s.sd as number, ss.sampleStandardDeviation(va));
  close(s.median as number, ss.median(va));
  close(s.lowest as number, ss.min(va));
  close(s.highest as number, ss.max(va));
  close(s.lowerQuartile as number, ss.quantile(va, 0.25));
  close(s.upperQuartile as number, ss.quantile(va, 0.75));
  assert.equal(s.n, 4);
  assert.equal(nb.value("n"), 4);
  close(nb.value("q") as number, ss.median(va));
  const by = nb.value("byEye") as Record<string, Record<string, unknown>>;
  assert.deepEqual(Object.keys(by), ["R", "L"]);
  close(by.R.mean as number, 0.15);
  close(by.L.mean as number, -0.05);
});

Deno.test("vectorStats, ellipse95 and meanRxBy over three columns", () => {
  // Thibos et al. 1997; χ² (2 d.f.) ellipse from any multivariate statistics text
  const nb = run([
    "v = vectorStats(visits.sph, visits.cyl, visits.axis)",
    "ell = ellipse95(visits.sph, visits.cyl, visits.axis)",
    "g = meanRxBy(visits.eye, visits.sph, visits.cyl, visits.axis)",
  ]);
  const v = nb.value("v") as Record<string, unknown>;
  assert.equal(v.n, 4);
  const e = nb.value("ell") as Record<string, unknown>;
  close(num(e.centreJ0), num(v.meanJ0));
  assert.ok(num(e.semiMajor) >= num(e.semiMinor));
  const g = nb.value("g") as Record<string, Record<string, unknown>>;
  assert.equal(g.R.n, 2);
  assert.equal(nb.result("ell")?.sources.includes("chi2-ellipse"), true);
});

Deno.test("per-row vector differences compile, and rxAgreement gives limits on M, J0, J45", () => {
  // Bland & Altman 1986 on power vectors (Thibos et al. 1997)
  const nb = run([
    "visits.dM = vectorM(sph, cyl) - vectorM(sphB, cylB)",
    "visits.dJ0 = vectorJ0(cyl, axis) - vectorJ0(cylB, axisB)",
    "agree = rxAgreement(visits.sph, visits.cyl, visits.axis, visits.sphB, visits.cylB, visits.axisB)",
    "visits.zero = dM * 0",
    "agreeM = agreement(visits.dM, visits.zero)",
  ]);
  assert.equal(nb.columnPath("visits.dM")?.path, "compiled");
  const a = nb.value("agree") as Record<string, Record<string, unknown>>;
  const d = nb.value("agreeM") as Record<string, unknown>;
  assert.equal(nb.result("agreeM")?.error, undefined, nb.result("agreeM")?.error?.message);
  close(num(a.M.bias), num(d.bias));
  close(num(a.M.upper), num(d.upper));
  close(num(a.M.upper) - num(a.M.bias), 1.96 * num(a.M.sd));
});

Deno.test("a prescription column works when the rx type is registered", () => {
  // Thibos et al. 1997
  if (!getValueType("rx")) return;
  const text = [
    "~~~lentil table t",
    "rx [rx]",
    "+0.00 / +1.00 x 180",
    "+0.00 / +1.00 x 90",
    "~~~",
    "~~~lentil",
    "avg = meanRx(t.rx)",
    "~~~",
    "",
  ].join("\n");
  const nb = Notebook.fromText(text, "rx.lentil.md");
  const m = nb.value("avg") as Record<string, unknown>;
  assert.ok(m, nb.result("avg")?.error?.message);
  const rx = (m.rx as { rx: { sphere: number; cylinder: number } }).rx;
  close(rx.sphere, 0.5);
  close(rx.cylinder, 0);
});

Deno.test("statistics read as statistics: SDs unsigned, exact figures, ellipses say which region", () => {
  // Display convention: common practice, no source. A standard deviation or a semi-axis is
  // never negative and is no lens power, so it carries no sign and no power-step rounding.
  const nb = run([
    "s = sampleStats([-1.25 D, -1.5 D, -1 D, -2 D])",
    "v = vectorStats(visits.sph, visits.cyl, visits.axis)",
    "ell = ellipse95(visits.sph, visits.cyl, visits.axis)",
    "eyes = spread95(visits.sph, visits.cyl, visits.axis)",
    "agree = agreement(visits.sph, visits.sphB)",
  ]);
  const shown = (name: string) => lang.describe(nb.value(name)).display;
  // as a paper's table prints it: n, mean ± SD, range, IQR
  assert.equal(
    shown("s"),
    "n 4; mean ± SD -1.44 ± 0.43 D; median -1.38 D; range -2.00 to -1.00 D; IQR -1.63 to -1.19 D",
  );
  assert.doesNotMatch(shown("s"), /exact|\+0\.43/);
  assert.match(shown("v"), /standard deviation of M: \d\.\d\d\d? D/);
  assert.doesNotMatch(shown("v"), /standard deviation[\w ]*: [+-]|exact/);
  assert.match(shown("ell"), /^region: 95% confidence ellipse of the mean/);
  assert.match(shown("eyes"), /^region: ellipse expected to hold 95% of eyes/);
  assert.match(
    shown("ell"),
    /major semi-axis: \d\.\d\d\d? D, minor semi-axis: \d\.\d\d\d? D/,
  );
  assert.match(
    shown("agree"),
    /^bias [+-]?\d\.\d\d\d? D \(95% CI [+-]\d\.\d\d\d? to [+-]\d\.\d\d\d? D\); 95% limits of agreement -/,
  );
  // the fields are still quantities for arithmetic, and parts labelled in words
  const s = nb.value("s") as Record<string, unknown>;
  const t = getValueType("statistics")!;
  const parts = t.parts!(s, { powerStep: 0.25 });
  assert.deepEqual(parts.map((p) => p.key), [
    "n",
    "missing",
    "mean",
    "sd",
    "median",
    "lowest",
    "highest",
    "lowerQuartile",
    "upperQuartile",
  ]);
  assert.equal(parts.find((p) => p.key === "upperQuartile")!.label, "upper quartile");
  assert.equal(t.headline!(s, { powerStep: 0.25 }), "-1.44 ± 0.43 D (n 4)");
  close(num(s.sd), ss.sampleStandardDeviation([-1.25, -1.5, -1, -2]));
});

Deno.test("a standard deviation displays as a size, without a sign", () => {
  // common practice, no source: an SD is a spread, never a lens power
  const nb = Notebook.fromText(
    "~~~lentil\ns = sdOf([-1.25 D, -1.5 D, -1 D])\n~~~\n",
    "sd.lentil.md",
  );
  assert.equal(nb.language.describe(nb.value("s")).display, "0.25 D");
});
