import assert from "node:assert/strict";
import * as ss from "simple-statistics";
import { jStat } from "./_jstat.ts";
import { Notebook } from "../notebook/engine/engine.ts";

const TABLE = [
  "~~~lentil table visits",
  "subject | eye | sph [D] | sphB [D]",
  "a | R | +0.00 | -0.25",
  "a | L | +0.25 | +0.25",
  "b | R | -1.00 | -1.25",
  "b | L | -2.00 | -2.00",
  "c | R | -3.00 | -3.25",
  "c | L | -3.00 | -2.75",
  "d | R | -1.00 | -1.25",
  "d | L | -1.50 | -1.25",
  "~~~",
].join("\n");

function run(calc: string[]): Notebook {
  return Notebook.fromText(TABLE + "\n\n~~~lentil\n" + calc.join("\n") + "\n~~~\n", "s.lentil.md");
}
const close = (a: number, b: number, tol: number, what: string) =>
  assert.ok(Math.abs(a - b) <= tol, `${what}: ${a} vs ${b}`);

Deno.test("meanCI: one eye per person is an ordinary t interval (against jstat)", () => {
  // Murdoch et al. 1998 (one eye per person); t quantile checked against jstat
  const nb = run(['r = meanCI(visits.sph, {eyes: "right"})']);
  const r = nb.value("r") as Record<string, unknown>;
  const right = [0, -1, -3, -1];
  const half = jStat.studentt.inv(0.975, 3) * ss.sampleStandardDeviation(right) / 2;
  close(nb.language.toNumberIn(r.from, "D"), ss.mean(right) - half, 1e-9, "from");
  close(nb.language.toNumberIn(r.to, "D"), ss.mean(right) + half, 1e-9, "to");
  assert.match(String(r.eyes), /one eye per person, the right eye: 4 eyes of 4 persons/);
  assert.match(String(r.eyes), /detected by name/);
});

Deno.test("a statistic on eyes as if independent carries a warning with the fix", () => {
  // Murdoch et al. 1998; Armstrong 2013
  const nb = run(['r = meanCI(visits.sph, {eyes: "as independent"})']);
  const shown = nb.language.describe(nb.value("r")).display;
  assert.match(shown, /warning: 4 persons give both eyes.*too narrow; write \{eyes: "by person"\}/);
});

Deno.test("the default counts persons: robust interval, Hotelling ellipse over persons", () => {
  // Liang & Zeger 1986 (robust variance); Hotelling 1931
  const nb = run([
    "mc = meanCI(visits.sph)",
    "fe = fellowEyes(visits.sph)",
    "ag = agreement(visits.sph, visits.sphB)",
  ]);
  const m = nb.value("mc") as Record<string, unknown>;
  assert.equal(m.subjects, 4);
  assert.ok((m.designEffect as number) > 1);
  const f = nb.value("fe") as Record<string, unknown>;
  assert.equal(f.pairs, 4);
  const a = nb.value("ag") as Record<string, unknown>;
  assert.equal(a.subjects, 4);
  assert.match(String(a.eyes), /limits over repeated pairs/);
});

Deno.test("bad input: a clear message at the cell, never NaN", () => {
  // common practice, no source
  const nb = run([
    "x1 = meanCI([1])",
    "x2 = meanCI(visits.sph, {eye: visits.eye})",
    'x3 = meanCI(visits.sph, {eyes: "both"})',
    "x4 = meanCI(visits.sph, {colour: 1})",
    "x5 = fellowEyes([1, 2, 3])",
    'x6 = agreement(visits.sph, visits.sphB, {eyes: "person mean"})',
    'x7 = meanCI([1, 2], {eyes: "right"})',
    "x8 = ellipse95([-1 D, -2 D], [-0.5 D, -0.25 D], [90 deg, 180 deg])",
  ]);
  const msg = (n: string) => nb.result(n)?.error?.message ?? "";
  assert.match(msg("x1"), /at least 2 values, got 1/);
  assert.match(msg("x2"), /both settings subject and eye/);
  assert.match(msg("x3"), /"both" is not one of "by person", "right"/);
  assert.match(msg("x4"), /no option "colour"; the options are eyes, subject, eye, seed/);
  assert.match(msg("x5"), /needs the persons behind the rows/);
  assert.match(msg("x6"), /too narrow/);
  assert.match(msg("x7"), /needs the persons behind the rows/);
  assert.match(msg("x8"), /at least 3/);
  for (const n of ["x1", "x2", "x3", "x4", "x5", "x6", "x7", "x8"]) {
    assert.doesNotMatch(msg(n), /NaN/);
  }
});

Deno.test("one eye only gives no fellow-eye correlation, said in words", () => {
  // common practice, no source
  const nb = Notebook.fromText(
    [
      "~~~lentil table t",
      "subject | eye | x",
      "a | R | 1",
      "b | R | 2",
      "c | R | 4",
      "~~~",
      "~~~lentil",
      "f = fellowEyes(t.x, {subject: t.subject, eye: t.eye})",
      "~~~",
      "",
    ].join("\n"),
    "one.lentil.md",
  );
  assert.match(nb.result("f")?.error?.message ?? "", /both eyes, got 0/);
});

Deno.test("streaming refuses the statistics that count persons, with the reason", async () => {
  // Murdoch et al. 1998: fellow eyes are not independent; a one-pass stream cannot pair them
  const { streamNotebook } = await import("../notebook/table/stream.ts");
  const dir = await Deno.makeTempDir();
  try {
    const rows = ["subject,eye,sph [D],cyl [D],axis [deg]"];
    for (let i = 0; i < 20; i++) {
      rows.push(`S${i},R,-1.00,-0.50,${10 + i}`, `S${i},L,-1.25,-0.50,${170 - i}`);
    }
    await Deno.writeTextFile(`${dir}/eyes.csv`, rows.join("\n") + "\n");
    await Deno.writeTextFile(
      `${dir}/s.lentil.md`,
      [
        "~~~lentil table eyes",
        "file: eyes.csv",
        "~~~",
        "",
        "~~~lentil",
        "ell = ellipse95(eyes.sph, eyes.cyl, eyes.axis)",
        "n = countOf(eyes.sph)",
        "~~~",
        "",
      ].join("\n"),
    );
    const r = await streamNotebook(`${dir}/s.lentil.md`, { out: `${dir}/out.csv` });
    const ell = r.cells.find((c) => c.name === "ell")!;
    assert.match(ell.unavailable ?? "", /counts persons .*subject and eye.*use run/);
    assert.equal(r.cells.find((c) => c.name === "n")!.value, 40);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
