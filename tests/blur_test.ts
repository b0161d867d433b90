import assert from "node:assert/strict";
import {
  airyDisc,
  blurDisc,
  blurredMAR,
  combinedBlur,
  compareBlur,
  failingDefocus,
  pinholeBlur,
  retinalAngle,
  retinalBlur,
  schematicEye,
} from "../lib/blur.ts";
import {
  accommodativeDemand,
  amplitudeAt,
  amplitudeByAge,
  minusAbsorbed,
  usableAccommodation,
} from "../lib/accommodation.ts";
import { powerRange, predictThroughFocus } from "../lib/through_focus.ts";
import { LentilInputError, LentilRangeError } from "../lib/errors.ts";

const ARCMIN = (180 * 60) / Math.PI;
const close = (a: number, b: number, tol: number, what = "") =>
  assert.ok(Math.abs(a - b) <= tol, `${what} ${a} ≠ ${b} (±${tol})`);

/**
 * Direct ray geometry: a point at 1/ΔF metres before an eye focused at infinity. Every ray
 * leaving the eye's principal plane at angle θ meets the retina where the parallel ray
 * through the nodal point does, so the disc subtends the angle between the two marginal
 * rays at the nodal point: 2·atan(A/2 · ΔF).
 */
function rayAngularBlur(pupilMm: number, defocus: number): number {
  const u = 1 / Math.abs(defocus); // metres
  return 2 * Math.atan(pupilMm / 2000 / u) * ARCMIN;
}

/**
 * Real ray trace through a single spherical refracting surface (the reduced eye: power F,
 * index n′, radius (n′ − 1)/F, retina at n′/F), pupil at the surface, from an axial point
 * at 1/ΔF metres. Returns the height (mm) at the retina of the ray entering at `y` mm.
 */
function traceReducedEye(y: number, defocus: number, power = 60, index = 4 / 3): number {
  const r = ((index - 1) / power) * 1000; // mm
  const retina = (index / power) * 1000; // mm
  const u = 1000 / defocus; // object distance before the vertex, mm
  const zs = r - Math.sqrt(r * r - y * y); // surface sag at height y
  // incoming unit direction from (−u, 0) to (zs, y)
  let dz = zs + u;
  let dy = y;
  const len = Math.hypot(dz, dy);
  dz /= len;
  dy /= len;
  // surface normal toward the incoming light, unit
  const nz = (zs - r) / r;
  const ny = y / r;
  const eta = 1 / index;
  const cosI = -(dz * nz + dy * ny);
  const sinT2 = eta * eta * (1 - cosI * cosI);
  const cosT = Math.sqrt(1 - sinT2);
  const tz = eta * dz + (eta * cosI - cosT) * nz;
  const ty = eta * dy + (eta * cosI - cosT) * ny;
  return y + (ty / tz) * (retina - zs);
}

Deno.test("angular blur disc: Smith's small-angle formula against ray geometry", () => {
  // Smith 1982: β (rad) = A (m) × ΔF (D)
  for (const [a, d] of [[2, 0.5], [4, 1], [6, -2], [8, 3]]) {
    close(blurDisc(a, d), (a / 1000) * Math.abs(d) * ARCMIN, 1e-9, "Smith 1982");
    // direct ray geometry differs only by the small-angle approximation
    close(blurDisc(a, d), rayAngularBlur(a, d), 1e-4 * blurDisc(a, d), "ray geometry");
  }
  close(blurDisc(4, 1), 13.75, 0.005);
});

Deno.test("retinal blur through the reduced eye against a real ray trace", () => {
  const eye = schematicEye("emsley"); // Emsley reduced eye (from memory): +60 D, n′ = 4/3
  for (const [a, d] of [[3, 1], [4, 2], [6, 0.5]]) {
    // paraxial limit of the trace: height at the retina per mm of entrance height
    const tiny = 1e-3;
    const paraxial = (Math.abs(traceReducedEye(tiny, d, eye.power, eye.index)) / tiny) * a;
    close(retinalBlur(a, d), paraxial * 1000, 1e-3 * retinalBlur(a, d), `A=${a} ΔF=${d}`);
  }
  // a real 1 mm pupil stays within 10% of the paraxial size; the spherical surface's
  // spherical aberration brings the marginal focus toward the retina, so the disc is smaller
  const real = 2 * Math.abs(traceReducedEye(0.5, 2)) * 1000;
  close(retinalBlur(1, 2), real, 0.1 * real);
  assert.ok(real < retinalBlur(1, 2));
  // the retinal disc seen from the nodal point is the angular disc
  close(retinalAngle(retinalBlur(4, 1)), blurDisc(4, 1), 1e-9);
});

Deno.test("Airy disc against 2.44·λ/A", () => {
  // Airy: angular diameter to the first dark ring 2.44·λ/A (any optics text)
  for (const [a, w] of [[1, 555], [3, 555], [6, 450], [8, 650]]) {
    close(airyDisc(a, w), ((2.44 * w * 1e-9) / (a / 1000)) * ARCMIN, 1e-9);
  }
  close(airyDisc(3), 1.55, 0.005);
});

Deno.test("combined blur, pinhole and the comparison with cones and optotypes", () => {
  // root-sum-of-squares of blur and Airy diameters: a rule of thumb, common practice, no source
  const c = combinedBlur(3, 0.5);
  close(c.combined, Math.hypot(blurDisc(3, 0.5), airyDisc(3)), 1e-12);
  close(combinedBlur(3, 0).combined, airyDisc(3), 1e-12);
  const p = pinholeBlur(1, 2, 5);
  close(p.pinhole.geometric, blurDisc(1, 2), 1e-12);
  close(p.pinhole.diffraction, airyDisc(1), 1e-12);
  assert.ok(p.ratio < 0.3);
  // a pinhole larger than the pupil changes nothing
  close(pinholeBlur(2.5, 1, 2).ratio, 1, 1e-12);
  // Curcio 1990 (from memory): 2.5 µm cone spacing is about 0.5′
  const cmp = compareBlur(5, 1);
  close(cmp.coneSpacing, 0.5, 0.02);
  assert.equal(cmp.detail, 1);
  assert.equal(cmp.letter, 5); // ISO 8596: 5′ overall at V = 1.0
  close(cmp.toLetter, 1, 1e-12);
});

Deno.test("failing defocus: the approximation and its inverse", () => {
  // Smith 1991 (from memory): MAR ≈ k·A·ΔF; the line of MAR 2′ fails at 2/(k·A)
  close(failingDefocus(0.5, 4, { baselineMAR: 0 }), 2 / (0.65 * 4), 1e-12);
  const d = failingDefocus(0.5, 4);
  close(blurredMAR(4, d, { baselineMAR: 1 }), 2, 1e-9);
  // the blur disc is then about the letter's overall size (a rough geometric check)
  const ratio = blurDisc(4, failingDefocus(0.5, 4, { baselineMAR: 0 })) / 10;
  assert.ok(ratio > 0.8 && ratio < 1.5, `blur over letter size ${ratio}`);
  assert.throws(() => failingDefocus(1, 4), LentilInputError);
});

Deno.test("bad blur inputs", () => {
  for (const pupil of [0.5, 9.5, -3, NaN]) {
    assert.throws(() => blurDisc(pupil, 1), LentilRangeError);
  }
  assert.throws(
    () => airyDisc(12),
    (e) => e instanceof LentilRangeError && /pupil diameter 12 mm .* 1–9 mm/.test(e.message),
  );
  assert.throws(() => airyDisc(3, 1000), LentilRangeError);
  assert.throws(() => pinholeBlur(5, 1, 4), LentilRangeError);
  assert.throws(() => retinalBlur(4, 1, "other"), LentilInputError);
});

Deno.test("amplitude by age against Hofstetter's three formulas", () => {
  // Hofstetter 1950: minimum 15 − 0.25·age, mean 18.5 − 0.30·age, maximum 25 − 0.40·age
  for (const age of [8, 16, 25, 35, 45, 52]) {
    const a = amplitudeByAge(age);
    close(a.minimum, 15 - 0.25 * age, 1e-12);
    close(a.mean, 18.5 - 0.3 * age, 1e-12);
    close(a.maximum, 25 - 0.4 * age, 1e-12);
    assert.equal(a.clamped, false);
  }
  const old = amplitudeByAge(70);
  assert.deepEqual([old.minimum, old.mean, old.maximum, old.clamped], [0, 0, 0, true]);
  assert.equal(amplitudeAt(40, "minimum"), 5);
  assert.throws(() => amplitudeByAge(-1), LentilRangeError);
  assert.throws(() => amplitudeByAge(130), LentilRangeError);
});

Deno.test("demand, usable accommodation and minus absorbed", () => {
  // common practice, no source: demand 1/x; keep half in reserve
  assert.equal(accommodativeDemand(0.4), 2.5);
  assert.equal(accommodativeDemand(Infinity), 0);
  assert.throws(() => accommodativeDemand(-0.4), LentilRangeError);
  assert.equal(usableAccommodation(40), 2.5);
  close(minusAbsorbed(40, { testDistance: 4, level: "minimum" }), 4.75, 1e-12);
  assert.equal(minusAbsorbed(70), 0);
});

Deno.test("through-focus prediction with and without accommodation", () => {
  // vergence bookkeeping: common practice, no source; blur to MAR: Smith 1991 (from memory)
  const powers = powerRange(1, -3, 0.25);
  const none = predictThroughFocus(powers, { rx: -1, pupil: 4, testDistance: Infinity });
  const some = predictThroughFocus(powers, {
    rx: -1,
    pupil: 4,
    amplitude: 1.5,
    testDistance: Infinity,
  });
  const at = (pts: typeof none, p: number) => pts.find((x) => Math.abs(x.power - p) < 1e-9)!;
  // without accommodation: a peak at the correction, symmetric
  close(at(none, -1).logMAR, 0, 1e-12);
  close(at(none, -0.5).logMAR, at(none, -1.5).logMAR, 1e-12);
  // with accommodation: flat from the correction to 1.5 D more minus, blur beyond
  for (const p of [-1, -1.5, -2, -2.5]) close(at(some, p).logMAR, 0, 1e-12);
  assert.ok(at(some, -3).logMAR > 0);
  close(at(some, 0).logMAR, at(none, 0).logMAR, 1e-12); // plus side: no help
  // a chart at 6 m moves the peak 0.17 D plus
  const six = predictThroughFocus([-1 + 1 / 6], { rx: -1, pupil: 4 });
  close(six[0].residual, 0, 1e-12);
});

Deno.test("results from the blur-acuity approximation say they are approximations", async () => {
  // Smith 1991 (from memory): MAR ≈ k·A·ΔF is an approximation; the cited source and every
  // formula built on it say so where the result is shown
  const { getSource } = await import("../shared/sources.ts");
  const { BLUR_FORMULAS } = await import("../cells/blur.ts");
  assert.match(getSource("smith-1991").citation, /approximation/);
  const built = BLUR_FORMULAS.filter((f) => f.sources.includes("smith-1991"));
  assert.ok(built.length >= 3);
  for (const f of built) assert.match(f.summary, /approximation/, f.name);
});
