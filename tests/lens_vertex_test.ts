import assert from "node:assert/strict";
import {
  cornealPower,
  effectivePower,
  roundPower,
  roundToStep,
  vertexSpheroCylinder,
} from "../lib/vertex.ts";
import { LentilInputError, LentilRangeError } from "../lib/errors.ts";
import { near, randomRx } from "./_rx_helpers.ts";
import { seeded } from "../lib/seeded.ts";

Deno.test("vertex: the field-notes check values", () => {
  // field notes check value (vertex-formula): −10.00 D at 12 mm → −8.93 D at the cornea
  assert.equal(effectivePower(-10, 0.012).toFixed(2), "-8.93");
  // field notes check value (vertex-formula): +10.00 D at 12 mm → +11.36 D at the cornea
  assert.equal(effectivePower(10, 0.012).toFixed(2), "11.36");
  // F' = F / (1 − d·F) is infinite when d = 1/F (vertex formula): +40.00 D moved 25 mm toward
  // the eye; the error says so in the trade's terms instead of an "accepted range" of ±∞
  assert.throws(
    () => effectivePower(40, 0.025),
    (e: Error) =>
      e instanceof LentilInputError &&
      /\+40\.00 D lens moved 25\.0 mm toward the eye/.test(e.message) &&
      !/Infinity/.test(e.message),
  );
  assert.equal(
    vertexSpheroCylinder({ sphere: -10, cylinder: 0, axis: 180 }, 12, 0).sphere
      .toFixed(2),
    "-8.93",
  );
});

Deno.test("vertex: a spherocylinder goes meridian by meridian", () => {
  // vertex-formula (Tunnacliffe), per principal meridian: −10.00 and −12.00 D at 12 mm
  const r = vertexSpheroCylinder({ sphere: -10, cylinder: -2, axis: 90 }, 12, 0);
  near(r.sphere, -10 / (1 + 0.12));
  near(r.sphere + r.cylinder, -12 / (1 + 0.144));
  assert.equal(r.axis, 90);
  // vertex-formula, d negative when the lens moves away from the eye (8 → 14 mm):
  // F' = F / (1 + 0.006·F)
  const away = vertexSpheroCylinder({ sphere: 5, cylinder: 1, axis: 30 }, 8, 14);
  near(away.sphere, 5 / (1 + 0.006 * 5));
  near(away.sphere + away.cylinder, 6 / (1 + 0.006 * 6));
});

Deno.test("property: vertex there and back is the identity", () => {
  const next = seeded(17);
  for (let i = 0; i < 500; i++) {
    const rx = randomRx(next);
    const from = next() * 25;
    const to = next() * 25;
    const back = vertexSpheroCylinder(vertexSpheroCylinder(rx, from, to), to, from);
    near(back.sphere, rx.sphere, 1e-9);
    near(back.cylinder, rx.cylinder, 1e-9);
    assert.equal(back.axis, rx.axis);
  }
});

Deno.test("vertex: distances outside 0–25 mm are refused, naming the range", () => {
  assert.throws(
    () => vertexSpheroCylinder({ sphere: -5, cylinder: 0, axis: 180 }, 30, 0),
    (e) =>
      e instanceof LentilRangeError &&
      /30 mm is outside the accepted range 0–25 mm/.test(e.message),
  );
  assert.throws(() => vertexSpheroCylinder({ sphere: -5, cylinder: 0, axis: 180 }, 12, -1));
  assert.throws(
    () => vertexSpheroCylinder({ sphere: -5, cylinder: 0, axis: 180 }, NaN, 0),
    /finite/,
  );
});

Deno.test("contact-lens power: at the cornea, minus-cylinder form, rounded by the stated rule", () => {
  // vertex-formula: −6.00 / −1.50 × 180 at 12 mm → −5.60 and −6.86 D in the principal meridians
  const cl = cornealPower({ sphere: -6, cylinder: -1.5, axis: 180 }, 12);
  near(cl.sphere, -6 / 1.072);
  near(cl.sphere + cl.cylinder, -7.5 / 1.09);
  const r = roundToStep(cl, 0.25);
  assert.deepEqual(r, { sphere: -5.5, cylinder: -1.5, axis: 180 });
  // plus-cylinder input comes back in minus-cylinder form
  assert.ok(cornealPower({ sphere: -7.5, cylinder: 1.5, axis: 90 }, 12).cylinder < 0);
});

Deno.test("rounding: nearest with halves toward plus, or always up or down", () => {
  // common practice, no source: between two steps a contact lens goes to the less minus (more
  // plus) one; the rule is stated beside the result
  assert.equal(roundPower(-8.93, 0.25), -9);
  assert.equal(roundPower(-4.125, 0.25), -4);
  assert.equal(roundPower(4.125, 0.25), 4.25);
  assert.equal(roundPower(-4.0625, 0.125), -4);
  assert.equal(roundPower(-4.1, 0.125), -4.125);
  assert.equal(roundPower(-4.1, 0.25, "plus"), -4);
  assert.equal(roundPower(-4.1, 0.25, "minus"), -4.25);
  assert.equal(roundPower(-4.25, 0.25, "minus"), -4.25);
  assert.throws(() => roundPower(1, 0), LentilRangeError);
  // the two principal meridians are rounded, the cylinder is their difference
  assert.deepEqual(roundToStep({ sphere: -8.93, cylinder: -1.6, axis: 90.4 }, 0.25), {
    sphere: -9,
    cylinder: -1.5,
    axis: 90,
  });
  assert.deepEqual(roundToStep({ sphere: 1.1, cylinder: -0.2, axis: 0.3 }, 0.25), {
    sphere: 1,
    cylinder: 0,
    axis: 180,
  });
});
