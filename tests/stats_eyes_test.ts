import assert from "node:assert/strict";
import * as ss from "simple-statistics";
import { seeded } from "../lib/seeded.ts";
import {
  clusteredMean,
  eyePairing,
  fellowEyeCorrelation,
  oneEyeRows,
  personMeans,
} from "../lib/eyes.ts";

const close = (a: number, b: number, tol: number, what: string) =>
  assert.ok(Math.abs(a - b) <= tol, `${what}: ${a} vs ${b}`);

/** G persons, both eyes, value = person effect + eye noise with fellow-eye correlation ρ. */
function bothEyes(G: number, rho: number, seed: number) {
  const g = seeded(seed);
  const normal = () => Math.sqrt(-2 * Math.log(1 - g())) * Math.cos(2 * Math.PI * g());
  const subject: string[] = [];
  const eye: string[] = [];
  const value: number[] = [];
  for (let i = 0; i < G; i++) {
    const person = Math.sqrt(rho) * normal();
    for (const side of ["R", "L"]) {
      subject.push(`S${i}`);
      eye.push(side);
      value.push(-1 + person + Math.sqrt(1 - rho) * normal());
    }
  }
  return { subject, eye, value };
}

Deno.test("cluster-robust variance of the mean exceeds the naive one by the design effect 1 + ρ", () => {
  // Ying et al. 2017 (design effect for pairs of eyes, 1 + ρ); Liang & Zeger 1986 (the
  // robust variance). Generated set with a known fellow-eye correlation ρ.
  for (const rho of [0, 0.5, 0.8]) {
    const d = bothEyes(20000, rho, 5);
    const p = eyePairing(d.subject, d.eye);
    const m = clusteredMean(p, d.value);
    close(m.designEffect, 1 + rho, 0.04, `design effect at ρ = ${rho}`);
    close(m.robustSE / m.naiveSE, Math.sqrt(1 + rho), 0.02, `SE ratio at ρ = ${rho}`);
    close(fellowEyeCorrelation(p, d.value).r, rho, 0.02, `fellow-eye r at ρ = ${rho}`);
  }
});

Deno.test("the robust variance of a balanced set equals that of the persons' means", () => {
  // Liang & Zeger 1986 with the factor G/(G − 1): for two eyes each it is s²(person means)/G
  const d = bothEyes(40, 0.6, 9);
  const p = eyePairing(d.subject, d.eye);
  const m = clusteredMean(p, d.value);
  const [means] = personMeans(p, [d.value]);
  close(m.robustSE ** 2, ss.sampleVariance([...means]) / 40, 1e-12, "equal to person means");
  close(m.mean, ss.mean([...means]), 1e-12, "mean");
  // a t interval with persons − 1 = 39 d.f. (checked against simple-statistics' SD)
  assert.ok(m.ci.lower < m.mean && m.mean < m.ci.upper);
});

Deno.test("one eye per person: right, left or a seeded random choice", () => {
  // Murdoch, Morris & Cousens 1998: one eye per person
  const p = eyePairing(["a", "a", "b", "c", "c"], ["R", "L", "L", "OD", "OS"]);
  assert.deepEqual(oneEyeRows(p, "right"), [0, 3]);
  assert.deepEqual(oneEyeRows(p, "left"), [1, 2, 4]);
  const r1 = oneEyeRows(p, "random", 3);
  assert.deepEqual(r1, oneEyeRows(p, "random", 3));
  assert.equal(r1.length, 3);
  assert.equal(p.bothEyes, 2);
  assert.equal(p.oneEye, 1);
});

Deno.test("bad pairing input: a clear message, never a NaN", () => {
  // common practice, no source
  assert.throws(() => eyePairing(["a", "a"], ["R", "R"]), /right eye twice/);
  assert.throws(() => eyePairing(["a"], ["X"]), /not an eye/);
  assert.throws(() => clusteredMean(eyePairing(["a", "a"], ["R", "L"]), [1, 2]), /two subjects/);
  assert.throws(
    () => fellowEyeCorrelation(eyePairing(["a", "b"], ["R", "L"]), [1, 2]),
    /both eyes/,
  );
});
