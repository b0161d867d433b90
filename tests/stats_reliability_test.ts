import assert from "node:assert/strict";
import * as ss from "simple-statistics";
import { jStat } from "./_jstat.ts";
import { intraclassForms, repeatability } from "../lib/reliability.ts";
import { Notebook } from "../notebook/engine/engine.ts";

const close = (a: number, b: number, tol: number, what: string) =>
  assert.ok(Math.abs(a - b) <= tol, `${what}: ${a} vs ${b}`);

// Shrout & Fleiss 1979: their example of 6 targets rated by 4 judges, as printed.
const SF = [
  [9, 2, 5, 8],
  [6, 1, 3, 2],
  [8, 4, 6, 8],
  [7, 1, 2, 6],
  [10, 5, 6, 9],
  [6, 2, 4, 7],
];

Deno.test("Shrout & Fleiss 1979 example: the six intraclass correlations", () => {
  // Shrout & Fleiss 1979, the values printed for the example: ICC(1,1) .17, ICC(2,1) .29, ICC(3,1) .71,
  // ICC(1,4) .44, ICC(2,4) .62, ICC(3,4) .91
  const f = Object.fromEntries(intraclassForms(SF).map((x) => [x.form, x]));
  const want: Record<string, number> = {
    "ICC(1,1)": 0.17,
    "ICC(2,1)": 0.29,
    "ICC(3,1)": 0.71,
    "ICC(1,k)": 0.44,
    "ICC(2,k)": 0.62,
    "ICC(3,k)": 0.91,
  };
  for (const [form, v] of Object.entries(want)) close(f[form].value, v, 0.005, form);
  // McGraw & Wong 1996 names
  assert.equal(f["ICC(2,1)"].description, "two-way random, absolute agreement, single measure");
  assert.equal(f["ICC(3,k)"].description, "two-way mixed, consistency, average of 4 measures");
  for (const x of Object.values(f)) assert.ok(x.lower < x.value && x.value < x.upper, x.form);
});

Deno.test("confidence interval of ICC(3,1) from the F quantiles (jstat)", () => {
  // Shrout & Fleiss 1979: F0 = BMS/EMS, FL = F0/F(n − 1, (n − 1)(k − 1)); F from jstat
  const n = 6, k = 4;
  const grand = ss.mean(SF.flat());
  const rows = SF.map((r) => ss.mean(r));
  const cols = [0, 1, 2, 3].map((j) => ss.mean(SF.map((r) => r[j])));
  const sst = SF.flat().reduce((s, x) => s + (x - grand) ** 2, 0);
  const ssr = k * rows.reduce((s, m) => s + (m - grand) ** 2, 0);
  const ssc = n * cols.reduce((s, m) => s + (m - grand) ** 2, 0);
  const bms = ssr / (n - 1);
  const ems = (sst - ssr - ssc) / ((n - 1) * (k - 1));
  const fl = bms / ems / jStat.centralF.inv(0.975, n - 1, (n - 1) * (k - 1));
  const f3 = intraclassForms(SF).find((x) => x.form === "ICC(3,1)")!;
  close(f3.lower, (fl - 1) / (fl + k - 1), 1e-7, "lower");
});

Deno.test("repeatability: Sw, 2.77·Sw and ICC(1,1) of repeated measures", () => {
  // Bland & Altman 1996 (measurement error): Sw² is the mean of the within-subject
  // variances; with two measurements each, Sw² = Σd²/2n. Coefficient 1.96·√2·Sw ≈ 2.77·Sw.
  const x = [1, 1.2, 2, 2.3, 3, 2.8, 0.5, 0.4];
  const s = ["a", "a", "b", "b", "c", "c", "d", "d"];
  const r = repeatability(x, s);
  const d = [0.2, 0.3, 0.2, 0.1];
  close(r.sw, Math.sqrt(d.reduce((t, v) => t + v * v, 0) / (2 * 4)), 1e-12, "Sw");
  close(r.repeatability / r.sw, 2.77, 0.002, "2.77");
  // ICC(1,1) the same from the one-way table as from intraclassForms (Shrout & Fleiss 1979)
  const table = [[1, 1.2], [2, 2.3], [3, 2.8], [0.5, 0.4]];
  close(r.icc, intraclassForms(table)[0].value, 1e-12, "ICC(1,1)");
});

Deno.test("bad repeated-measures input: clear messages", () => {
  // common practice, no source
  assert.throws(() => repeatability([1, 2], ["a", "a"]), /at least two subjects, got 1/);
  assert.throws(
    () => repeatability([1, 2, 3], ["a", "a", "b"]),
    /unequal repeats: subject a has 2/,
  );
  assert.throws(() => repeatability([1, 2], ["a", "b"]), /measured once/);
  assert.throws(() => intraclassForms([[1, 2]]), /at least two subjects/);
  assert.throws(() => intraclassForms([[1, 2], [3]]), /every subject needs one measurement/);
});

Deno.test("reliability and rxRepeatability in a notebook: long table, named forms", () => {
  // Shrout & Fleiss 1979 example as one row per rating; McGraw & Wong 1996 names
  const rows = SF.flatMap((r, t) => r.map((x, j) => `t${t + 1} | J${j + 1} | ${x}`));
  const text = [
    "~~~lentil table sf",
    "target | judge | score",
    ...rows,
    "~~~",
    "~~~lentil",
    "rel = reliability(sf.score, sf.target, sf.judge)",
    'again = rxRepeatability(["a", "a", "b", "b"], ["-1.00 DS", "-1.25 DS", "-2.00 / -0.50 x 90", "-2.00 / -0.75 x 90"])',
    'uneven = repeatability([1, 2, 3], ["a", "a", "b"])',
    "~~~",
    "",
  ].join("\n");
  const nb = Notebook.fromText(text, "rel.lentil.md");
  const rel = nb.value("rel") as Record<string, number>;
  close(rel.icc21, 0.29, 0.005, "ICC(2,1)");
  close(rel.icc3k, 0.91, 0.005, "ICC(3,4)");
  assert.match(
    nb.language.describe(rel).display,
    /^ICC\(1,1\) 0\.17, ICC\(2,1\) 0\.29, .*ICC\(3,4\) 0\.91/,
  );
  const again = nb.value("again") as Record<string, Record<string, unknown>>;
  assert.equal(again.M.subjects, 2);
  assert.match(nb.result("uneven")?.error?.message ?? "", /unequal repeats/);
});
