import assert from "node:assert/strict";
import { eigs } from "mathjs";
import { blurStrength, fromPowerVector, toPowerVector } from "../lib/power_vector.ts";
import {
  checkPowerMatrix,
  fromPowerMatrix,
  principalPowers,
  toPowerMatrix,
} from "../lib/power_matrix.ts";
import {
  meridianPower,
  sphericalEquivalent,
  toMinusCylinder,
  toPlusCylinder,
  transpose,
} from "../lib/transpose.ts";
import { LentilInputError } from "../lib/errors.ts";
import { near, randomRx, sameLens } from "./_rx_helpers.ts";
import { seeded } from "../lib/seeded.ts";

const RAD = Math.PI / 180;

Deno.test("transpose: S/C×α ↔ (S+C)/−C×(α±90)", () => {
  // common practice, no source
  assert.deepEqual(transpose({ sphere: -2.25, cylinder: -0.75, axis: 170 }), {
    sphere: -3,
    cylinder: 0.75,
    axis: 80,
  });
  assert.deepEqual(transpose({ sphere: 1, cylinder: 2, axis: 90 }), {
    sphere: 3,
    cylinder: -2,
    axis: 180,
  });
  assert.deepEqual(toPlusCylinder({ sphere: 0, cylinder: -0.5, axis: 90 }), {
    sphere: -0.5,
    cylinder: 0.5,
    axis: 180,
  });
  assert.equal(toMinusCylinder({ sphere: -3, cylinder: 0.75, axis: 80 }).cylinder, -0.75);
  // the new axis is α + 90 or α − 90, whichever lies in 1–180 (TABO; ISO 13666, from memory)
  for (const [a, b] of [[10, 100], [90, 180], [91, 1], [180, 90], [100, 10]]) {
    assert.equal(transpose({ sphere: -1, cylinder: -1, axis: a }).axis, b, `axis ${a}`);
  }
});

Deno.test("property: transposing twice is the identity; transposition keeps the lens", () => {
  const next = seeded(11);
  for (let i = 0; i < 1000; i++) {
    const rx = randomRx(next);
    const twice = transpose(transpose(rx));
    near(twice.sphere, rx.sphere);
    near(twice.cylinder, rx.cylinder);
    assert.equal(twice.axis, rx.axis);
    sameLens(transpose(rx), rx);
  }
});

// Thibos LN, Wheeler W, Horner D. Optom Vis Sci 1997;74:367–375: M = S + C/2,
// J0 = −(C/2)·cos 2α, J45 = −(C/2)·sin 2α, B = √(M² + J0² + J45²).
function thibos(s: number, c: number, a: number) {
  return {
    m: s + c / 2,
    j0: -(c / 2) * Math.cos(2 * a * RAD),
    j45: -(c / 2) * Math.sin(2 * a * RAD),
  };
}

Deno.test("power vectors: the Thibos 1997 definitions at axes 0, 45, 90, 135, 180", () => {
  // Thibos et al. 1997, eq. for M, J0, J45 (a −1.00 D cylinder alone)
  const expected: Record<number, [number, number]> = {
    0: [0.5, 0],
    45: [0, 0.5],
    90: [-0.5, 0],
    135: [0, -0.5],
    180: [0.5, 0],
  };
  for (const [axis, [j0, j45]] of Object.entries(expected)) {
    const v = toPowerVector({ sphere: 0, cylinder: -1, axis: Number(axis) });
    near(v.m, -0.5, 1e-12, `M at ${axis}`);
    near(v.j0, j0, 1e-12, `J0 at ${axis}`);
    near(v.j45, j45, 1e-12, `J45 at ${axis}`);
  }
  // Thibos et al. 1997: a plus-cylinder and a minus-cylinder form of one lens share a vector
  const a = toPowerVector({ sphere: -2.25, cylinder: -0.75, axis: 170 });
  const b = toPowerVector({ sphere: -3, cylinder: 0.75, axis: 80 });
  near(a.m, b.m);
  near(a.j0, b.j0);
  near(a.j45, b.j45);
  near(sphericalEquivalent({ sphere: -2.25, cylinder: -0.75, axis: 170 }), -2.625);
});

Deno.test("power vectors: grid round trip against the definitions", () => {
  // Thibos et al. 1997 definitions, recomputed here; inverse gives minus-cylinder form
  for (let s = -10; s <= 10; s += 2.5) {
    for (let c = -6; c <= 6; c += 1.5) {
      for (let a = 1; a <= 180; a += 7) {
        const v = toPowerVector({ sphere: s, cylinder: c, axis: a });
        const t = thibos(s, c, a);
        near(v.m, t.m, 1e-12);
        near(v.j0, t.j0, 1e-12);
        near(v.j45, t.j45, 1e-12);
        near(blurStrength(v), Math.hypot(t.m, t.j0, t.j45), 1e-12);
        const back = fromPowerVector(v);
        assert.ok(back.cylinder <= 0);
        sameLens(back, { sphere: s, cylinder: c, axis: a });
      }
    }
  }
});

Deno.test("power matrix: Long 1976 entries and decomposition back", () => {
  // Long 1976: F = [[S + C sin²α, −C sinα cosα], [−C sinα cosα, S + C cos²α]]
  const f = toPowerMatrix({ sphere: -2, cylinder: -1, axis: 30 });
  near(f[0][0], -2 - Math.sin(30 * RAD) ** 2);
  near(f[0][1], Math.sin(30 * RAD) * Math.cos(30 * RAD));
  near(f[1][1], -2 - Math.cos(30 * RAD) ** 2);
  const p = principalPowers(f);
  near(p.power1, -2);
  near(p.meridian1, 30);
  near(p.power2, -3);
  near(p.meridian2, 120);
  const rx = fromPowerMatrix(f);
  near(rx.sphere, -2);
  near(rx.cylinder, -1);
  near(rx.axis, 30);
  assert.throws(() => checkPowerMatrix([[1, 0.5], [0.2, 1]]), LentilInputError);
  assert.throws(() => checkPowerMatrix([[1, 0], [0, NaN]]), /finite/);
});

Deno.test("power matrix: principal powers and meridians agree with mathjs eigs", () => {
  // reference library: mathjs eigs on the symmetric 2×2 matrix
  const next = seeded(7);
  for (let i = 0; i < 300; i++) {
    const rx = randomRx(next);
    const f = toPowerMatrix(rx);
    const ours = principalPowers(f);
    const ref = eigs([[f[0][0], f[0][1]], [f[1][0], f[1][1]]]);
    const values = (ref.values as number[]).slice().sort((a, b) => b - a);
    near(ours.power1, values[0], 1e-9, "power1");
    near(ours.power2, values[1], 1e-9, "power2");
    if (values[0] - values[1] > 1e-6) {
      const top = ref.eigenvectors.find((e) => Math.abs((e.value as number) - values[0]) < 1e-6)!;
      const [x, y] = top.vector as number[];
      const angle = ((Math.atan2(y, x) / RAD) % 180 + 180) % 180 || 180;
      const diff = Math.abs(angle - ours.meridian1) % 180;
      assert.ok(Math.min(diff, 180 - diff) < 1e-6, `meridian ${ours.meridian1} vs ${angle}`);
    }
  }
});

Deno.test("meridian power: the sine-squared law and the power matrix agree", () => {
  // common textbook result F(θ) = S + C·sin²(θ − α); checked against uᵀFu (Long 1976)
  near(meridianPower({ sphere: -2, cylinder: -1, axis: 180 }, 90), -3);
  near(meridianPower({ sphere: -2, cylinder: -1, axis: 180 }, 180), -2);
  near(meridianPower({ sphere: -2, cylinder: -1, axis: 180 }, 45), -2.5);
  const next = seeded(5);
  for (let i = 0; i < 200; i++) {
    const rx = randomRx(next);
    const theta = next() * 180;
    const f = toPowerMatrix(rx);
    const u = [Math.cos(theta * RAD), Math.sin(theta * RAD)];
    const quad = u[0] * (f[0][0] * u[0] + f[0][1] * u[1]) +
      u[1] * (f[1][0] * u[0] + f[1][1] * u[1]);
    near(meridianPower(rx, theta), quad, 1e-9);
  }
});
