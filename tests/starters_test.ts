// Each starter notebook runs clean, and its key results agree with values computed here,
// independently, from the published formulas (not copied from Lentil's output).
import assert from "node:assert/strict";
import { parse as parseCsv } from "csv-parse/sync";
import { loadNotebook } from "../notebook/load.ts";
import type { Notebook } from "../notebook/engine/engine.ts";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";

const seed = (name: string) =>
  decodeURIComponent(new URL(`../seeds/${name}`, import.meta.url).pathname);

async function open(name: string): Promise<Notebook> {
  const r = await loadNotebook(seed(name));
  assert.ok(r.ok);
  return r.notebook;
}

/** A value in a unit, through its JSON form (quantities only). */
function num(nb: Notebook, id: string, unit: string): number {
  return nb.language.toNumberIn(nb.value(id), unit);
}

function close(actual: number, expected: number, tol: number, what: string) {
  assert.ok(Math.abs(actual - expected) <= tol, `${what}: ${actual} vs ${expected} (±${tol})`);
}

const RAD = Math.PI / 180;

Deno.test("every starter passes lentil check", async () => {
  for (const e of Deno.readDirSync(new URL("../seeds/", import.meta.url))) {
    if (!e.name.endsWith(".lentil.md")) continue;
    const io = captureIo();
    const code = await runCli(["check", seed(e.name)], io);
    assert.equal(code, 0, `${e.name}:\n${io.stdout()}${io.stderr()}`);
  }
});

Deno.test("dispense check: transposition, vertex, prism, thickness and tolerance", async () => {
  const nb = await open("dispense-check.lentil.md");
  const rx = (id: string) =>
    (nb.value(id) as { rx: { sphere: number; cylinder: number; axis: number } }).rx;

  // Transposition (common practice, no source): S/C×α ↔ (S+C)/−C×(α±90).
  assert.deepEqual(rx("rightPlus"), { sphere: -5, cylinder: 0.75, axis: 85 });
  assert.deepEqual(rx("leftPlus"), { sphere: -7.5, cylinder: 1, axis: 100 });

  // Vertex (vertex-formula): each principal meridian F/(1 − dF), d = 0.012 m; the
  // spectacle meridians of the right lens are −4.25 and −5.00 D.
  const cl = nb.value("rightCL") as { atCornea: { rx: { sphere: number; cylinder: number } } };
  const v = (f: number) => f / (1 - 0.012 * f);
  close(cl.atCornea.rx.sphere, v(-4.25), 0.005, "right CL sphere at the cornea");
  close(cl.atCornea.rx.sphere + cl.atCornea.rx.cylinder, v(-5.0), 0.005, "right CL other meridian");

  // Prentice's rule with the power matrix (Long 1976): vertical prism 10 mm below the centre
  // is F22 × 1.0 cm, F22 = S + C·cos²α; the 2 mm inset adds F21 × 0.2 cm (under 0.02 Δ here).
  const f22 = (s: number, c: number, a: number) => s + c * Math.cos(a * RAD) ** 2;
  const vertical = Math.abs(f22(-6.5, -1, 10)) - Math.abs(f22(-4.25, -0.75, 175));
  const reading = nb.value("reading") as Record<string, unknown>;
  close(nb.language.toNumberIn(reading.imbalance, "prism"), vertical, 0.03, "vertical imbalance");
  assert.equal(nb.value("imbalanceTooLarge"), true);

  // Thickness (Jalie, sag formula; from memory): a minus lens keeps its minimum at the centre;
  // the edge in the most minus meridian (−7.50 D) is t + s(back) − s(front), front +4.00 D.
  const blank = num(nb, "blank", "mm");
  const y = blank / 2;
  const sag = (r: number) => r - Math.sqrt(r * r - y * y);
  const edge = (n: number) => 2 + sag(1000 * (n - 1) / 11.5) - sag(1000 * (n - 1) / 4);
  close(num(nb, "edgeStandard", "mm"), edge(1.5), 0.05, "edge at n = 1.50");
  close(num(nb, "edgeMid", "mm"), edge(1.6), 0.05, "edge at n = 1.60");
  close(num(nb, "edgeHigh", "mm"), edge(1.67), 0.05, "edge at n = 1.67");

  // ANSI Z80.1-2015: every deviation of the received pair is inside its tolerance.
  const report = nb.value("verification") as {
    report: { pass: boolean; checks: { pass: boolean }[] };
  };
  assert.equal(report.report.pass, true);
  assert.ok(report.report.checks.every((c) => c.pass));
});

Deno.test("clinical case: endpoints by design, blur disc, guessing", async () => {
  const nb = await open("clinical-case.lentil.md");
  // Most plus for the best acuity (common practice): known by construction of the tables.
  const ep = (id: string) => (nb.value(id) as { result: { endpoint: number } }).result.endpoint;
  assert.equal(ep("young"), 1.75);
  assert.equal(ep("older"), 1.25);

  // Smith 1982: β (rad) = A (m) × ΔF (D); 3 mm and 1.00 D → 0.003 rad = 10.31 arcmin.
  const blur = nb.value("pupils.blur") as { data: Float64Array };
  const pupils = [2, 3, 4, 5, 6, 7];
  pupils.forEach((p, i) =>
    close(blur.data[i], (p / 1000) * 1 * (180 / Math.PI) * 60, 1e-9, `blur at ${p} mm`)
  );

  // Binomial tail (any probability text): P(X ≥ 3), X ~ Bin(5, 1/10).
  const choose = (n: number, k: number): number => (k === 0 ? 1 : (n * choose(n - 1, k - 1)) / k);
  let tail = 0;
  for (let k = 3; k <= 5; k++) tail += choose(5, k) * 0.1 ** k * 0.9 ** (5 - k);
  close(nb.value("lineChance") as number, tail, 1e-12, "line chance");
  close(nb.value("naiveChance") as number, 0.001, 1e-15, "naive (1/10)^3");
  close(nb.value("anyOfThreeLines") as number, 1 - (1 - tail) ** 3, 1e-12, "any of three lines");
});

Deno.test("refraction study: power-vector means and Bland–Altman limits from the CSV", async () => {
  const nb = await open("refraction-study.lentil.md");
  const text = await Deno.readTextFile(seed("refraction-study.csv"));
  const rows = parseCsv(text, { columns: true }) as Record<string, string>[];
  assert.equal(rows.length, 2000);
  // Power vectors (Thibos et al. 1997) from the trade notation, parsed here by a regex.
  const pv = (s: string) => {
    const m = /^([+-]?\d+\.\d+|plano) \/ ([+-]\d+\.\d+) x (\d+)$/.exec(s) ??
      /^([+-]?\d+\.\d+|plano)(?: DS)?$/.exec(s);
    assert.ok(m, s);
    const sph = m[1] === "plano" ? 0 : Number(m[1]);
    const cyl = m[2] ? Number(m[2]) : 0;
    const axis = m[3] ? Number(m[3]) : 180;
    return {
      m: sph + cyl / 2,
      j0: -(cyl / 2) * Math.cos(2 * axis * RAD),
      j45: -(cyl / 2) * Math.sin(2 * axis * RAD),
    };
  };
  const subj = rows.map((r) => pv(r["subjective [rx]"]));
  const obj = rows.map((r) => pv(r["objective [rx]"]));
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  const sd = (xs: number[]) => {
    const mu = mean(xs);
    return Math.sqrt(xs.reduce((a, b) => a + (b - mu) ** 2, 0) / (xs.length - 1));
  };
  const meanRx = nb.value("meanSubjective") as Record<string, unknown>;
  close(nb.language.toNumberIn(meanRx.M, "D"), mean(subj.map((v) => v.m)), 1e-9, "mean M");
  close(nb.language.toNumberIn(meanRx.J0, "D"), mean(subj.map((v) => v.j0)), 1e-9, "mean J0");
  close(nb.language.toNumberIn(meanRx.J45, "D"), mean(subj.map((v) => v.j45)), 1e-9, "mean J45");

  // Bland & Altman 1999 (section 5.2): both eyes of each person are two pairs of one
  // subject, so the SD of a difference is √(σ²_between + σ²_within) from the one-way
  // analysis of variance by person; with two pairs each σ²_between = (MSB − MSW)/2, taken
  // as zero when negative (as Bland & Altman do).
  const diff = obj.map((o, i) => o.m - subj[i].m);
  const loa = (nb.value("methods") as Record<string, Record<string, unknown>>).M;
  const bias = mean(diff);
  const persons = new Map<string, number[]>();
  rows.forEach((r, i) => persons.set(r.subject, [...(persons.get(r.subject) ?? []), diff[i]]));
  const pm = [...persons.values()].map(mean);
  const msb = 2 * pm.reduce((a, m) => a + (m - bias) ** 2, 0) / (pm.length - 1);
  const msw = [...persons.values()].reduce((a, [x, y]) => a + (x - y) ** 2 / 2, 0) / pm.length;
  const sdRepeated = Math.sqrt(Math.max(0, (msb - msw) / 2) + msw);
  assert.ok(Math.abs(sdRepeated - sd(diff)) < 0.01, "close to the naive SD here");
  close(nb.language.toNumberIn(loa.bias, "D"), bias, 1e-9, "bias");
  close(nb.language.toNumberIn(loa.lower, "D"), bias - 1.96 * sdRepeated, 1e-9, "lower limit");
  close(nb.language.toNumberIn(loa.upper, "D"), bias + 1.96 * sdRepeated, 1e-9, "upper limit");
  // The confidence ellipse of the mean counts persons, not eyes (Murdoch et al. 1998).
  const ell = nb.value("meanEllipse") as Record<string, unknown>;
  assert.equal(ell.subjects, 1000);
  assert.match(String(ell.eyes), /standard errors from persons/);
  assert.match(String(ell.region), /Hotelling/);
});

Deno.test("the committed study CSV is what the seeded generator writes", async () => {
  const { studyCsv } = await import("../seeds/_study_data.ts");
  assert.equal(studyCsv(), await Deno.readTextFile(seed("refraction-study.csv")));
});
