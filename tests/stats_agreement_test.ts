import assert from "node:assert/strict";
import * as ss from "simple-statistics";
import { jStat } from "./_jstat.ts";
import {
  agreementIntervals,
  limitsOfAgreement,
  proportionalBias,
  repeatedAgreement,
  vectorDifferenceLength,
} from "../lib/agreement.ts";

const close = (a: number, b: number, tol: number, what: string) =>
  assert.ok(Math.abs(a - b) <= tol, `${what}: ${a} vs ${b}`);

// Bland & Altman 1986, Table 1: peak expiratory flow rate (l/min), first reading with the
// Wright meter and with the mini Wright meter, 17 subjects.
const WRIGHT = [
  494,
  395,
  516,
  434,
  476,
  557,
  413,
  442,
  650,
  433,
  417,
  656,
  267,
  478,
  178,
  423,
  427,
];
const MINI = [512, 430, 520, 428, 500, 600, 364, 380, 658, 445, 432, 626, 260, 477, 259, 350, 451];

Deno.test("Bland & Altman 1986 peak-flow data: bias, SD, limits and their confidence intervals", () => {
  // Bland & Altman 1986 (Lancet 1:307): mean difference −2.1 l/min, SD 38.8; limits
  // (mean ± 2 SD in the paper) −79.7 to 75.5; 95% CI of the bias −22.0 to 17.8; of the
  // lower limit −114.3 to −45.1 and of the upper 40.9 to 110.1 (standard error √(3s²/n)).
  const a = limitsOfAgreement(WRIGHT, MINI);
  assert.equal(a.n, 17);
  close(a.bias, -2.1, 0.05, "bias");
  close(a.sd, 38.8, 0.05, "sd");
  // the paper works from the rounded −2.1 and 38.8
  close(a.bias - 2 * a.sd, -79.7, 0.1, "lower (2 SD)");
  close(a.bias + 2 * a.sd, 75.5, 0.1, "upper (2 SD)");
  const ci = agreementIntervals({ n: 17, bias: -2.1, sd: 38.8 }, 0.95, 2);
  close(ci.bias.lower, -22.0, 0.05, "bias CI low");
  close(ci.bias.upper, 17.8, 0.05, "bias CI high");
  close(ci.lowerApprox.lower, -114.3, 0.05, "lower CI low");
  close(ci.lowerApprox.upper, -45.1, 0.05, "lower CI high");
  close(ci.upperApprox.lower, 40.9, 0.05, "upper CI low");
  close(ci.upperApprox.upper, 110.1, 0.05, "upper CI high");
});

Deno.test("exact intervals of the limits: non-central t quantiles (Carkeet 2015) against jstat", () => {
  // Carkeet 2015: each limit alone, d̄ + s·t′(ν = n − 1, δ = 1.96√n)/√n; quantiles
  // checked against jstat's non-central t by inverting its cumulative probability.
  const a = limitsOfAgreement(WRIGHT, MINI);
  const ci = agreementIntervals(a);
  const n = 17;
  const k = (ci.upperExact.upper - a.bias) / a.sd * Math.sqrt(n);
  close(jStat.noncentralt.cdf(k, n - 1, 1.96 * Math.sqrt(n)), 0.975, 1e-6, "upper quantile");
  const k0 = (ci.upperExact.lower - a.bias) / a.sd * Math.sqrt(n);
  close(jStat.noncentralt.cdf(k0, n - 1, 1.96 * Math.sqrt(n)), 0.025, 1e-6, "lower quantile");
  // symmetric about the bias for the two limits; wider above than below each limit
  close(a.bias - ci.lowerExact.upper, ci.upperExact.lower - a.bias, 1e-9, "mirror");
  assert.ok(ci.upperExact.upper - a.upper > a.upper - ci.upperExact.lower);
  // the exact interval approaches the approximate one as n grows (Carkeet 2015)
  const big = agreementIntervals({ n: 2000, bias: 0, sd: 1 });
  close(big.upperExact.lower, big.upperApprox.lower, 0.01, "large n, lower");
  close(big.upperExact.upper, big.upperApprox.upper, 0.01, "large n, upper");
});

Deno.test("proportional bias: regression of the difference on the mean, against simple-statistics", () => {
  // Bland & Altman 1999 (regression of the difference on the mean); slope and intercept
  // checked against simple-statistics' linearRegression, the p-value against jstat's t.
  const mean = WRIGHT.map((w, i) => (w + MINI[i]) / 2);
  const diff = WRIGHT.map((w, i) => w - MINI[i]);
  const line = ss.linearRegression(mean.map((m, i) => [m, diff[i]]));
  const r = proportionalBias(WRIGHT, MINI);
  close(r.slope, line.m, 1e-12, "slope");
  close(r.intercept, line.b, 1e-9, "intercept");
  const p = 2 * (1 - jStat.studentt.cdf(Math.abs(r.t), 15));
  close(r.p, p, 1e-7, "p");
  assert.ok(r.slopeCI.lower < r.slope && r.slope < r.slopeCI.upper);
  assert.throws(() => proportionalBias([1, 2], [1, 2]), /3 pairs/);
});

Deno.test("limits over repeated pairs: balanced design gives (MSB + (m − 1)·MSW)/m", () => {
  // Bland & Altman 1999 section 5.2: with m pairs per subject the divisor is m.
  const d = [1, 1.4, -0.5, -0.1, 0.3, 0.5, 0.0, 0.6];
  const s = ["a", "a", "b", "b", "c", "c", "d", "d"];
  const r = repeatedAgreement(d, s);
  const means = [1.2, -0.3, 0.4, 0.3];
  const grand = ss.mean(d);
  const msb = 2 * means.reduce((t, m) => t + (m - grand) ** 2, 0) / 3;
  const msw = [[1, 1.4], [-0.5, -0.1], [0.3, 0.5], [0, 0.6]]
    .reduce((t, [x, y]) => t + ((x - y) ** 2) / 2, 0) / 4;
  close(r.sd ** 2, (msb + msw) / 2, 1e-12, "variance of a difference");
  close(r.bias, grand, 1e-12, "bias");
  assert.equal(r.subjects, 4);
  assert.throws(() => repeatedAgreement([1, 2], ["a", "a"]), /at least two subjects/);
  assert.throws(() => repeatedAgreement([1, 2], ["a", "b"]), /one pair/);
});

Deno.test("the dioptric length of the power-vector difference", () => {
  // Thibos et al. 1997: the length of a power vector; Hyndman & Fan 1996 (95th percentile)
  const r = vectorDifferenceLength([0.3, 0, 0.6, 0], [0.4, 0, 0, 0.1], [0, 0.5, 0.8, 0]);
  close(r.mean, (0.5 + 0.5 + 1 + 0.1) / 4, 1e-12, "mean length");
  close(r.upper95, ss.quantileSorted([0.1, 0.5, 0.5, 1], 0.95), 0.04, "95th percentile");
  assert.ok(r.upper95 <= 1 && r.upper95 > 0.9);
});
