import assert from "node:assert/strict";
import { jStat } from "./_jstat.ts";
import {
  chiSquareCdf,
  chiSquareQuantile,
  fCdf,
  fQuantile,
  incompleteBeta,
  noncentralTCdf,
  noncentralTQuantile,
  normalCdf,
  normalQuantile,
  tCdf,
  tQuantile,
} from "../lib/distributions.ts";

const close = (a: number, b: number, tol: number, what: string) =>
  assert.ok(Math.abs(a - b) <= tol * Math.max(1, Math.abs(b)), `${what}: ${a} vs ${b}`);

const PS = [0.001, 0.025, 0.05, 0.3, 0.5, 0.8, 0.95, 0.975, 0.999];

Deno.test("normal, t, F and χ² quantiles match jstat", () => {
  // checked against jstat (normal.inv, studentt.inv, centralF.inv, chisquare.inv)
  for (const p of PS) {
    close(normalQuantile(p), jStat.normal.inv(p, 0, 1), 1e-9, `z ${p}`);
    close(normalCdf(normalQuantile(p)), p, 1e-12, `Φ(z) ${p}`);
    for (const df of [1, 2, 5, 16, 30, 120, 1999]) {
      close(tQuantile(p, df), jStat.studentt.inv(p, df), 1e-7, `t ${p} ${df}`);
      close(tCdf(tQuantile(p, df), df), p, 1e-10, `t cdf ${p} ${df}`);
    }
    for (const [d1, d2] of [[2, 1], [2, 4], [2, 15], [5, 18], [2, 998]]) {
      close(fQuantile(p, d1, d2), jStat.centralF.inv(p, d1, d2), 1e-6, `F ${p} ${d1},${d2}`);
      close(fCdf(2.5, d1, d2), jStat.centralF.cdf(2.5, d1, d2), 1e-9, `F cdf ${d1},${d2}`);
    }
    for (const k of [1, 2, 3, 10, 50]) {
      close(chiSquareQuantile(p, k), jStat.chisquare.inv(p, k), 1e-6, `χ² ${p} ${k}`);
      close(chiSquareCdf(3, k), jStat.chisquare.cdf(3, k), 1e-9, `χ² cdf ${k}`);
    }
  }
  // the closed form for 2 d.f.: −2·ln(1 − p) (any statistics text)
  close(chiSquareQuantile(0.95, 2), -2 * Math.log(0.05), 1e-12, "χ² 2 d.f.");
  close(incompleteBeta(0.3, 2.5, 4), jStat.ibeta(0.3, 2.5, 4), 1e-12, "I_x");
});

Deno.test("non-central t matches jstat", () => {
  // checked against jstat (noncentralt.cdf)
  for (const [df, delta] of [[16, 8.08], [9, 6.2], [30, 10.7], [5, -2], [20, 0]]) {
    for (const t of [-3, 0, 1.5, 4, 7, 9, 12, 15]) {
      close(
        noncentralTCdf(t, df, delta),
        jStat.noncentralt.cdf(t, df, delta),
        1e-7,
        `${t} ${df} ${delta}`,
      );
    }
  }
  // a quantile inverts the cumulative probability; with δ = 0 it is Student's t
  const q = noncentralTQuantile(0.975, 16, 1.96 * Math.sqrt(17));
  close(noncentralTCdf(q, 16, 1.96 * Math.sqrt(17)), 0.975, 1e-10, "inverse");
  close(noncentralTQuantile(0.9, 12, 0), jStat.studentt.inv(0.9, 12), 1e-8, "δ = 0");
});
