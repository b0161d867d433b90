import assert from "node:assert/strict";
import { combineLenses, lensDifference, overRefraction } from "../lib/combine.ts";
import { fromPowerVector, toPowerVector } from "../lib/power_vector.ts";
import type { SpheroCylinder } from "../lib/spherocylinder.ts";
import { near, randomRx, sameLens } from "./_rx_helpers.ts";
import { seeded } from "../lib/seeded.ts";

const RAD = Math.PI / 180;

/** The power-vector path (Thibos et al. 1997: vectors of thin lenses in contact add). */
function sumByVectors(a: SpheroCylinder, b: SpheroCylinder): SpheroCylinder {
  const va = toPowerVector(a);
  const vb = toPowerVector(b);
  return fromPowerVector({ m: va.m + vb.m, j0: va.j0 + vb.j0, j45: va.j45 + vb.j45 });
}

/**
 * The classical obliquely-crossed-cylinder result (Thompson SP, Proc Phys Soc London
 * 1899;17:81): cylinders C1 × α1 and C2 × α2, θ = α2 − α1, give
 * C = √(C1² + C2² + 2·C1·C2·cos 2θ), S = (C1 + C2 − C)/2 and the resultant axis at
 * α1 + φ with tan 2φ = C2·sin 2θ / (C1 + C2·cos 2θ).
 */
function thompson(c1: number, a1: number, c2: number, a2: number): SpheroCylinder {
  const t = (a2 - a1) * RAD;
  const c = Math.sqrt(c1 * c1 + c2 * c2 + 2 * c1 * c2 * Math.cos(2 * t));
  const phi = 0.5 * Math.atan2(c2 * Math.sin(2 * t), c1 + c2 * Math.cos(2 * t)) / RAD;
  return { sphere: (c1 + c2 - c) / 2, cylinder: c, axis: a1 + phi };
}

Deno.test("crossed cylinders: matrix sum = power-vector sum = Thompson's formula", () => {
  const next = seeded(21);
  for (let i = 0; i < 500; i++) {
    const c1 = Math.round((next() * 8 - 4) * 4) / 4;
    const c2 = Math.round((next() * 8 - 4) * 4) / 4;
    const a1 = 1 + Math.floor(next() * 180);
    const a2 = 1 + Math.floor(next() * 180);
    const a = { sphere: 0, cylinder: c1, axis: a1 };
    const b = { sphere: 0, cylinder: c2, axis: a2 };
    const byMatrix = combineLenses(a, b);
    sameLens(byMatrix, sumByVectors(a, b));
    sameLens(byMatrix, thompson(c1, a1, c2, a2));
  }
});

Deno.test("crossed cylinders: worked examples", () => {
  // Textbook result (any visual optics text; Thompson 1899): equal cylinders crossed at
  // right angles make a sphere: +1.00 DC × 90 with +1.00 DC × 180 = +1.00 DS.
  sameLens(
    combineLenses({ sphere: 0, cylinder: 1, axis: 90 }, { sphere: 0, cylinder: 1, axis: 180 }),
    { sphere: 1, cylinder: 0, axis: 180 },
  );
  // Stokes' variable astigmatic lens (Stokes 1849, described by Thompson 1899; from memory):
  // +C × 0 and −C × θ give a pure cross-cylinder, cylinder 2·C·sin θ, spherical equivalent 0.
  for (const theta of [10, 30, 45, 60, 90]) {
    const r = combineLenses(
      { sphere: 0, cylinder: 1.5, axis: 180 },
      { sphere: 0, cylinder: -1.5, axis: theta },
    );
    near(Math.abs(r.cylinder), 2 * 1.5 * Math.sin(theta * RAD), 1e-9, `θ ${theta}`);
    near(r.sphere + r.cylinder / 2, 0, 1e-9);
  }
  // Obliquely crossed example worked by hand with Thompson's formula (1899):
  // +1.00 DC × 30 with +2.00 DC × 90: θ = 60°, C = √(1 + 4 + 4·cos 120°) = √3 = 1.732,
  // S = (3 − 1.732)/2 = +0.634, tan 2φ = 2·sin 120° / (1 + 2·cos 120°) → 2φ = 90°, φ = 45°,
  // so +0.634 / +1.732 × 75.
  const r = combineLenses({ sphere: 0, cylinder: 1, axis: 30 }, {
    sphere: 0,
    cylinder: 2,
    axis: 90,
  });
  sameLens(r, { sphere: (3 - Math.sqrt(3)) / 2, cylinder: Math.sqrt(3), axis: 75 });
  near(r.sphere, (3 - Math.sqrt(3)) / 2 + Math.sqrt(3), 1e-9, "minus-cylinder form sphere");
  near(r.axis, 165, 1e-9);
});

Deno.test("property: sum then difference returns the original", () => {
  const next = seeded(9);
  for (let i = 0; i < 500; i++) {
    const a = randomRx(next);
    const b = randomRx(next);
    sameLens(lensDifference(combineLenses(a, b), b), a, 1e-9);
    // over-refraction: current + over = target
    sameLens(combineLenses(a, overRefraction(a, b)), b, 1e-9);
  }
});

Deno.test("over-refraction: a spherical over-refraction on a spherocylinder", () => {
  // common practice, no source: −0.50 DS over −2.00 / −0.75 × 180 gives −2.50 / −0.75 × 180
  const over = overRefraction(
    { sphere: -2, cylinder: -0.75, axis: 180 },
    { sphere: -2.5, cylinder: -0.75, axis: 180 },
  );
  near(over.sphere, -0.5);
  near(over.cylinder, 0);
  assert.ok(Number.isFinite(over.axis));
});
