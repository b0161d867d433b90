import assert from "node:assert/strict";
import { seeded as rng } from "../lib/seeded.ts";
import * as ss from "simple-statistics";
import { jStat } from "./_jstat.ts";
import {
  meanAndVariance,
  quantile,
  RunningMoments,
  sampleStats,
  vectorSummary,
} from "../lib/stats.ts";
import { limitsOfAgreement, vectorAgreement, vectorDifference } from "../lib/agreement.ts";
import {
  chiSquare2,
  ellipseOf,
  hotellingScale,
  insideEllipse,
  principalAxes,
} from "../lib/ellipse.ts";
import { toPowerVector } from "../lib/power_vector.ts";

const close = (a: number, b: number, tol = 1e-9, what = "") =>
  assert.ok(Math.abs(a - b) <= tol * Math.max(1, Math.abs(b)), `${what}: ${a} vs ${b}`);

const r = rng(7);
const sample = Array.from({ length: 997 }, () => -6 + 8 * r() + (r() < 0.1 ? 5 : 0));

Deno.test("mean and sample SD match simple-statistics", () => {
  // checked against simple-statistics
  const s = sampleStats(sample);
  close(s.mean, ss.mean(sample), 1e-12, "mean");
  close(s.sd, ss.sampleStandardDeviation(sample), 1e-12, "sd");
  close(s.lowest, ss.min(sample), 0, "min");
  close(s.highest, ss.max(sample), 0, "max");
  close(meanAndVariance(sample).variance, ss.sampleVariance(sample), 1e-12, "variance");
});

Deno.test("median and quantiles (definition 7) match jstat's inclusive percentile", () => {
  // checked against jstat (jStat.percentile, inclusive: linear interpolation, (n − 1)·p)
  for (const p of [0, 0.05, 0.25, 0.5, 0.75, 0.9, 0.975, 1]) {
    close(quantile(sample, p), jStat.percentile(sample, p), 1e-12, `p=${p}`);
  }
  close(sampleStats(sample).median, ss.median(sample), 1e-12, "median vs simple-statistics");
  // Hyndman & Fan 1996, definition 7 on a small set: (n − 1)p = 0.75 → 1 + 0.75·(2 − 1)
  assert.equal(quantile([4, 1, 3, 2], 0.25), 1.75);
});

Deno.test("empty cells are left out and counted", () => {
  // common practice, no source
  const s = sampleStats([1, NaN, 3]);
  assert.equal(s.n, 2);
  assert.equal(s.missing, 1);
  assert.equal(s.mean, 2);
});

Deno.test("running covariance matches simple-statistics' sample covariance", () => {
  // checked against simple-statistics
  const x = sample.slice(0, 500);
  const y = x.map((v, i) => 0.3 * v + Math.sin(i));
  const m = new RunningMoments(2);
  for (let i = 0; i < x.length; i++) m.push([x[i], y[i]]);
  close(m.covariance(0, 1), ss.sampleCovariance(x, y), 1e-12, "cov");
  close(m.sd(1), ss.sampleStandardDeviation(y), 1e-12, "sd y");
});

Deno.test("Bland–Altman limits: bias ± 1.96 SD of the differences", () => {
  // Bland & Altman 1986: limits of agreement = mean difference ± 1.96 × SD of differences.
  // Constructed pairs with differences 0.25, -0.25, 0.5, 0, 0.5: mean 0.2, SD from n − 1.
  const a = [1.0, 2.0, 3.5, 4.0, 5.5];
  const b = [0.75, 2.25, 3.0, 4.0, 5.0];
  const d = [0.25, -0.25, 0.5, 0, 0.5];
  const mean = 0.2;
  const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / 4); // 0.3260…
  const loa = limitsOfAgreement(a, b);
  close(loa.bias, mean, 1e-12, "bias");
  close(loa.sd, sd, 1e-12, "sd");
  close(loa.lower, mean - 1.96 * sd, 1e-12, "lower");
  close(loa.upper, mean + 1.96 * sd, 1e-12, "upper");
  assert.equal(loa.n, 5);
  assert.throws(() => limitsOfAgreement([1, 2], [1]), /paired data/);
});

Deno.test("vector agreement takes differences on M, J0 and J45 separately", () => {
  // Bland & Altman 1986 on each power-vector component (Thibos et al. 1997)
  const A = [{ sphere: -2, cylinder: -1, axis: 180 }, { sphere: -1, cylinder: -0.5, axis: 90 }];
  const B = [{ sphere: -2.25, cylinder: -0.75, axis: 175 }, {
    sphere: -1,
    cylinder: -0.75,
    axis: 95,
  }];
  const va = A.map(toPowerVector);
  const vb = B.map(toPowerVector);
  const agg = vectorAgreement(
    { m: va.map((v) => v.m), j0: va.map((v) => v.j0), j45: va.map((v) => v.j45) },
    { m: vb.map((v) => v.m), j0: vb.map((v) => v.j0), j45: vb.map((v) => v.j45) },
  );
  const d0 = vectorDifference(A[0], B[0]);
  const d1 = vectorDifference(A[1], B[1]);
  close(agg.m.bias, (d0.m + d1.m) / 2, 1e-12, "M bias");
  close(agg.j45.bias, (d0.j45 + d1.j45) / 2, 1e-12, "J45 bias");
});

Deno.test("averaging +1.00 × 180 and +1.00 × 90 gives a sphere, not a cylinder", () => {
  // Thibos et al. 1997: the J0 components (−0.50 and +0.50) cancel; M is +0.50 D.
  const s = vectorSummary([0, 0], [1, 1], [180, 90]);
  close(s.mean.m, 0.5, 1e-12, "M");
  close(s.mean.j0, 0, 1e-12, "J0");
  close(s.mean.j45, 0, 1e-12, "J45");
  assert.equal(s.meanRx.cylinder, 0);
  close(s.meanRx.sphere, 0.5, 1e-12, "sphere");
  // The naive column means would say +0.00 / +1.00 × 135, a cylinder that neither eye has.
});

Deno.test("mean prescription of minus-cylinder rows returns to sph/cyl/axis", () => {
  // Thibos et al. 1997: identical rows average to themselves
  const s = vectorSummary([-2.25, -2.25, -2.25], [-0.75, -0.75, -0.75], [170, 170, 170]);
  close(s.meanRx.sphere, -2.25, 1e-12, "sphere");
  close(s.meanRx.cylinder, -0.75, 1e-12, "cyl");
  close(s.meanRx.axis, 170, 1e-9, "axis");
  close(s.sd.m, 0, 1e-12, "sd M");
});

Deno.test("χ² (2 d.f.) quantile and the 95% ellipse", () => {
  // any multivariate statistics text: χ²(2) 0.95 quantile 5.991; checked against jstat
  close(chiSquare2(0.95), 5.991464547107979, 1e-12, "chi2");
  close(chiSquare2(0.95), jStat.chisquare.inv(0.95, 2), 1e-9, "chi2 vs jstat");
  const ax = principalAxes({ xx: 2, yy: 2, xy: 1 });
  close(ax.major, 3, 1e-12, "major");
  close(ax.minor, 1, 1e-12, "minor");
  close(ax.angle, 45, 1e-12, "angle");
  const e = ellipseOf(
    { x: 0.1, y: -0.05 },
    { xx: 0.04, yy: 0.01, xy: 0 },
    50,
    "mean",
    0.95,
    "chi-square",
  );
  close(e.semiMajor, Math.sqrt(5.991464547107979 * 0.04 / 50), 1e-12, "semi-major");
  assert.ok(insideEllipse(e, 0.1 + e.semiMajor * 0.99, -0.05));
  assert.ok(!insideEllipse(e, 0.1, -0.05 + e.semiMinor * 1.01));
  assert.throws(() => ellipseOf({ x: 0, y: 0 }, { xx: 1, yy: 1, xy: 2 }, 10, "mean"), /semi/);
});

Deno.test("about 95% of bivariate normal points fall in the observations ellipse", () => {
  // common practice, no source: a coverage check by simulation with a seeded generator
  const g = rng(11);
  const normal = () => Math.sqrt(-2 * Math.log(1 - g())) * Math.cos(2 * Math.PI * g());
  const m = new RunningMoments(2);
  const pts: [number, number][] = [];
  for (let i = 0; i < 20000; i++) {
    const a = normal();
    const b = normal();
    const p: [number, number] = [0.3 * a, 0.1 * a + 0.2 * b];
    pts.push(p);
    m.push(p);
  }
  const e = ellipseOf(
    { x: m.mean(0), y: m.mean(1) },
    { xx: m.variance(0), yy: m.variance(1), xy: m.covariance(0, 1) },
    m.count,
    "observations",
    0.95,
    "chi-square",
  );
  const inside = pts.filter(([x, y]) => insideEllipse(e, x, y)).length / pts.length;
  assert.ok(Math.abs(inside - 0.95) < 0.01, `coverage ${inside}`);
});

Deno.test("Hotelling's T² ellipse of a mean: scale against jstat's F quantile, χ² only when asked", () => {
  // Hotelling 1931: n(x̄ − μ)ᵀS⁻¹(x̄ − μ) ≤ 2(n − 1)/(n − 2)·F(2, n − 2); F checked against jstat
  for (const n of [3, 5, 12, 40, 2000]) {
    const c = 2 * (n - 1) / (n - 2) * jStat.centralF.inv(0.95, 2, n - 2);
    close(hotellingScale(n), c, 1e-7, `T² n=${n}`);
    const e = ellipseOf({ x: 0, y: 0 }, { xx: 0.04, yy: 0.01, xy: 0 }, n, "mean");
    close(e.semiMajor, Math.sqrt(c * 0.04 / n), 1e-7, `semi-major n=${n}`);
    assert.equal(e.method, "hotelling");
  }
  // the T² region is wider than the χ² one, and tends to it as n grows
  const small = ellipseOf({ x: 0, y: 0 }, { xx: 1, yy: 1, xy: 0 }, 8, "mean");
  const chi = ellipseOf({ x: 0, y: 0 }, { xx: 1, yy: 1, xy: 0 }, 8, "mean", 0.95, "chi-square");
  assert.ok(small.semiMajor > 1.4 * chi.semiMajor);
  close(hotellingScale(1e6), chiSquare2(0.95), 1e-4, "large n");
  assert.throws(() => hotellingScale(2), /at least 3/);
});

Deno.test("non-central t quantile at large d.f.: the normal approximation agrees with the exact mixture", async () => {
  const { noncentralTCdf, noncentralTQuantile, noncentralTQuantileLarge } = await import(
    "../lib/distributions.ts"
  );
  // Abramowitz & Stegun 26.7.10 (from memory), checked here against the exact Poisson mixture
  // (Lenth 1989) at 20,000 pairs, where the mixture is still quick: δ = 1.96·√n. The exact
  // cumulative probability at the approximate quantile is the probability asked for.
  const n = 20_000;
  const delta = 1.96 * Math.sqrt(n);
  const exactQuantile = (p: number) => {
    let [lo, hi] = [delta - 20, delta + 20];
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      if (noncentralTCdf(mid, n - 1, delta) < p) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  };
  for (const p of [0.025, 0.5, 0.975]) {
    const approx = noncentralTQuantileLarge(p, n - 1, delta);
    const exact = exactQuantile(p);
    assert.ok(Math.abs(approx - exact) / exact < 1e-4, `p ${p}: ${approx} vs ${exact}`);
  }
  // A million pairs answers at once (the mixture would sum about two million terms).
  const t0 = performance.now();
  const q = noncentralTQuantile(0.975, 999_999, 1.96 * 1000);
  assert.ok(performance.now() - t0 < 100);
  assert.ok(Math.abs(q / 1000 - 1.96) < 0.01);
});
