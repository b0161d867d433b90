import assert from "node:assert/strict";
import { findEndpoint, trialLogMAR, type TrialRow } from "../lib/endpoint.ts";
import { fitThroughFocus, powerRange } from "../lib/through_focus.ts";
import { LentilInputError, LentilParseError, LentilRangeError } from "../lib/errors.ts";
import { getLanguage } from "../cells/language.ts";
import { Column, makeTable } from "../cells/table.ts";

const close = (a: number | undefined, b: number, tol = 1e-9, what = "") =>
  assert.ok(a !== undefined && Math.abs(a - b) <= tol, `${what} ${a} ≠ ${b}`);
const codes = (r: { warnings: readonly { code: string }[] }) => r.warnings.map((w) => w.code);

/** Known by design: blur rises 0.4 logMAR per D on the plus side of −0.25 D, flat on the minus side. */
const accommodating: TrialRow[] = powerRange(1, -1.5, 0.25).map((p) => ({
  power: p,
  logMAR: Math.max(0, p + 0.25) * 0.4,
}));

/** Known by design: a symmetric peak at +0.50 D, 0.3 logMAR per D either side. */
const peaked: TrialRow[] = powerRange(2, -1, 0.25).map((p) => ({
  power: p,
  logMAR: Math.abs(p - 0.5) * 0.3,
}));

function shuffle<T>(xs: readonly T[], seed = 7): T[] {
  const out = [...xs];
  let s = seed;
  for (let i = out.length - 1; i > 0; i--) {
    s = (s * 16807) % 2147483647;
    const j = s % (i + 1);
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

Deno.test("active accommodation: the endpoint is the plus end of a flat minus plateau", () => {
  // most plus for best acuity, plus end of the plateau: common practice, no source
  const r = findEndpoint(accommodating);
  close(r.endpoint, -0.25);
  assert.deepEqual(r.plateau, { from: -1.5, to: -0.25, width: 1.25, powers: 6, openMinus: true });
  assert.deepEqual(codes(r), ["minus-plateau", "plateau-open"]);
  assert.equal(r.fit?.model, "hinge");
  close(r.fit?.bestFocus, -0.25, 1e-6);
  close(r.fit?.slope, 0.4, 1e-6);
  close(r.fit?.rms, 0, 1e-9);
  // depth of focus: the open plateau plus the tolerance reach on the plus side
  close(r.fit?.depthOfFocus.to, -0.25 + 0.02 / 0.4, 1e-6);
  assert.equal(r.fit?.depthOpen, true);
});

Deno.test("no accommodation: a peaked table gives the peak and a closed plateau", () => {
  // most plus for best acuity: common practice, no source; tables known by design
  const r = findEndpoint(peaked);
  close(r.endpoint, 0.5);
  assert.equal(r.plateau.width, 0);
  assert.equal(r.plateau.openMinus, false);
  assert.deepEqual(codes(r), []);
  assert.equal(r.fit?.model, "peak");
  close(r.fit?.bestFocus, 0.5, 1e-6);
  close(r.fit?.flatWidth, 0, 1e-6);
  close(r.fit?.depthOfFocus.width, 2 * 0.02 / 0.3, 1e-6);
  // the fitted curve is exposed for plotting, spanning the powers tried
  const curve = r.fit!.curve;
  close(curve[0].power, -1);
  close(curve[curve.length - 1].power, 2);
  assert.ok(curve.length >= 50);
});

Deno.test("shuffled rows and repeated powers give the same answer", () => {
  // common practice, no source: the order of the rows carries no meaning
  const repeated = [...accommodating, accommodating[3], accommodating[7]];
  for (
    const rows of [shuffle(accommodating), shuffle(repeated, 11), [...accommodating].reverse()]
  ) {
    const r = findEndpoint(rows);
    close(r.endpoint, -0.25);
    close(r.plateau.from, -1.5);
    close(r.fit?.bestFocus, -0.25, 1e-6);
  }
  const r = findEndpoint(shuffle(peaked, 3));
  close(r.endpoint, 0.5);
  close(r.fit?.bestFocus, 0.5, 1e-6);
  assert.ok(findEndpoint(repeated).notes.some((n) => /repeated with the same reading/.test(n)));
});

Deno.test("tolerance: one letter by default", () => {
  // Bailey & Lovie 1976: one letter is 0.02 logMAR on five-letter 0.1-step lines
  const rows = [
    { power: 0.5, logMAR: 0.2 },
    { power: 0.25, logMAR: 0.02 },
    { power: 0, logMAR: 0 },
    { power: -0.25, logMAR: 0 },
    { power: -0.5, logMAR: 0.1 },
  ];
  close(findEndpoint(rows).endpoint, 0.25); // one letter worse still counts as best
  close(findEndpoint(rows, { tolerance: 0 }).endpoint, 0);
  close(findEndpoint(rows, { tolerance: 0 }).plateau.from, -0.25);
});

Deno.test("warnings: a table that stops at the plus side, a gap, a plateau too long for the age", () => {
  // common practice, no source; expected accommodation: Hofstetter 1950
  const plusEdge = findEndpoint([
    { power: 0, logMAR: 0 },
    { power: -0.25, logMAR: 0 },
    { power: -0.5, logMAR: 0.1 },
  ]);
  assert.deepEqual(codes(plusEdge), ["plus-edge"]);
  assert.match(plusEdge.warnings[0].message, /no lens more plus than 0\.00 D/);
  const gap = findEndpoint([
    { power: 0.5, logMAR: 0.3 },
    { power: 0.25, logMAR: 0 },
    { power: 0, logMAR: 0.1 },
    { power: -0.25, logMAR: 0 },
    { power: -0.5, logMAR: 0.2 },
  ]);
  assert.ok(codes(gap).includes("gap"));
  // Hofstetter 1950: at 62 the maximum is 0.2 D; a 1.25 D plateau is more than that explains
  assert.ok(codes(findEndpoint(accommodating, { age: 62 })).includes("long-plateau"));
  assert.ok(!codes(findEndpoint(accommodating, { age: 20 })).includes("long-plateau"));
});

Deno.test("bad trial tables: no rows, conflicting repeats, values out of range", () => {
  assert.throws(
    () => findEndpoint([]),
    (e) => e instanceof LentilInputError && /no rows/.test(e.message),
  );
  const conflicting = [
    { power: 0.25, logMAR: 0.1 },
    { power: 0, logMAR: 0 },
    { power: 0.25, logMAR: 0.2 },
  ];
  assert.throws(
    () => findEndpoint(conflicting),
    (e) =>
      e instanceof LentilInputError && /\+0\.25 D \(rows 1, 3\)/.test(e.message) &&
      /0\.10, 0\.20/.test(e.message),
  );
  const averaged = findEndpoint(conflicting, { duplicates: "mean" });
  close(averaged.trials[0].logMAR, 0.15, 1e-12);
  assert.ok(averaged.notes.some((n) => /averaged to 0\.150/.test(n)));
  assert.throws(
    () => findEndpoint([{ power: 0, logMAR: 0 }, { power: NaN, logMAR: 0 }]),
    (e) => e instanceof LentilRangeError && /row 2/.test(e.message),
  );
  assert.throws(() => findEndpoint([{ power: 0, logMAR: 7 }]), LentilRangeError);
  // fewer than three powers: an endpoint but no fit
  const two = findEndpoint([{ power: 0.25, logMAR: 0.1 }, { power: 0, logMAR: 0 }]);
  assert.equal(two.fit, null);
});

Deno.test("trial acuity as logMAR, Snellen text or letters read per line", () => {
  // ICO 1984 (Snellen to logMAR); Bailey & Lovie 1976 (0.02 per letter)
  assert.equal(trialLogMAR(0.1, 1), 0.1);
  close(trialLogMAR("6/6", 1), 0, 1e-12);
  close(trialLogMAR("20/40", 1), Math.log10(2), 1e-12);
  // eleven full lines of the 1.0 to −0.3 chart reach 0.0, three more letters −0.06
  close(trialLogMAR("5 5 5 5 5 5 5 5 5 5 5 3", 1), -0.06, 1e-9);
  close(trialLogMAR("lines 5,5,5", 2), 0.8, 1e-9);
  assert.throws(
    () => trialLogMAR("6/x", 4),
    (e) => e instanceof LentilParseError && /^row 4: cannot read "6\/x"/.test(e.message),
  );
});

Deno.test("a fit with noise stays near the design", () => {
  const noise = [0.01, -0.01, 0.005, -0.005, 0, 0.01, -0.01, 0.005, 0, -0.005, 0.01];
  const rows = powerRange(1, -1.5, 0.25).map((p, i) => ({
    power: p,
    logMAR: Math.max(0, p - 0.25) * 0.5 + noise[i],
  }));
  const fit = fitThroughFocus(rows, "hinge");
  close(fit.bestFocus, 0.25, 0.1);
  close(fit.slope, 0.5, 0.1);
  assert.ok(fit.rms < 0.01);
  assert.equal(fit.residuals.length, rows.length);
});

Deno.test("the endpoint formula reads a table with text acuities", () => {
  const lang = getLanguage();
  const va = ["6/12", "6/7.5", "6/6", "6/6", "6/6", "6/6"];
  const trials = makeTable("trials", [
    new Column("lens", "quantity", "D", new Float64Array([0.75, 0.5, 0.25, 0, -0.25, -0.5])),
    new Column("va", "text", "", va),
  ]);
  const run = (expr: string) =>
    lang.compile(lang.parse(expr)).evaluate({ ...lang.constants, trials });
  const d = lang.describe(run("endpoint(trials)"));
  assert.match(d.display, /^endpoint \+0\.25 D/);
  assert.match(d.display, /plateau \+0\.25 D to -0\.50 D/);
  const json = d.value as { caution: boolean; endpoint: number; fit: { curve: unknown[] } };
  assert.equal(json.caution, true);
  assert.equal(json.endpoint, 0.25);
  assert.ok(json.fit.curve.length > 10);
  assert.equal(lang.catalogue.formulas.get("endpoint")?.caution, true);
  const curve = lang.describe(run("endpointCurve(endpoint(trials))"));
  assert.match(curve.display, /endpointCurve: \d+ rows, 2 columns/);
  assert.throws(() => run('endpoint(trials, "lens", "nope")'), /no column "nope"/);
  assert.throws(
    () => run('endpoint(trials, "lens", "va", {repeats: "sometimes"})'),
    /option repeats: "sometimes" is not one of "report", "mean"/,
  );
});
