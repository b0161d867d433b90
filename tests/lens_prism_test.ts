import assert from "node:assert/strict";
import {
  compoundPrism,
  decentrationFor,
  polarPrism,
  prismAt,
  resolvePrism,
  verticalImbalance,
} from "../lib/prism.ts";
import { meridianPower } from "../lib/transpose.ts";
import { LentilInputError, LentilRangeError } from "../lib/errors.ts";
import { near, randomRx } from "./_rx_helpers.ts";
import { seeded } from "../lib/seeded.ts";

Deno.test("Prentice's rule: spherical lenses", () => {
  // Prentice's rule P = c(cm) × F (common textbook result): 5.00 D, a point 4 mm from the
  // optical centre → 2.00 Δ. The point is 4 mm nasal of the centre in both cases.
  const minus = prismAt({ sphere: -5, cylinder: 0, axis: 180 }, 4, 0, "R");
  near(minus.horizontal, 2); // minus lens: base away from the optical centre → base in
  const plus = prismAt({ sphere: 5, cylinder: 0, axis: 180 }, 4, 0, "L");
  near(plus.horizontal, -2); // plus lens: base toward the optical centre → base out
  // a plus lens looked through below its centre gives base up (common textbook result)
  near(prismAt({ sphere: 4, cylinder: 0, axis: 180 }, 0, -10, "R").vertical, 4);
  near(prismAt({ sphere: -4, cylinder: 0, axis: 180 }, 0, -10, "R").vertical, -4);
});

Deno.test("Prentice's rule: a cylinder along a principal meridian uses that meridian's power", () => {
  // Prentice's rule per principal meridian (common textbook result): −2.00 / −1.00 × 90 has
  // −3.00 D in the 180 meridian, so a point 5 mm in gives 1.50 Δ base in
  const p = prismAt({ sphere: -2, cylinder: -1, axis: 90 }, 5, 0, "R");
  near(p.horizontal, 1.5);
  near(p.vertical, 0);
});

Deno.test("Prentice's rule, matrix form: the component along the decentration is the meridian power", () => {
  // Long 1976: P = −F·c; its component along c is −|c|·F(θ) with F(θ) by the sine-squared law
  const next = seeded(4);
  for (let i = 0; i < 300; i++) {
    const rx = randomRx(next);
    const theta = next() * 360;
    const dist = next() * 30;
    const h = dist * Math.cos(theta * Math.PI / 180);
    const v = dist * Math.sin(theta * Math.PI / 180);
    const p = prismAt(rx, h, v, "R"); // right eye: nasal = +x of the standard frame
    const along = (p.horizontal * h + p.vertical * v) / (dist || 1);
    near(along, -(dist / 10) * meridianPower(rx, theta), 1e-9);
  }
});

Deno.test("prism: base directions per eye and 360-degree notation", () => {
  // standard frame facing the wearer (ISO 13666 axis notation, from memory): right eye base
  // in at 0°, left eye base in at 180°, base up 90°, base down 270°
  assert.deepEqual(polarPrism({ horizontal: 2, vertical: 0 }, "R"), { amount: 2, base: 0 });
  assert.deepEqual(polarPrism({ horizontal: 2, vertical: 0 }, "L"), { amount: 2, base: 180 });
  assert.deepEqual(polarPrism({ horizontal: 0, vertical: -1.5 }, "L"), { amount: 1.5, base: 270 });
  const r = resolvePrism(2, 30, "R");
  near(r.horizontal, Math.sqrt(3));
  near(r.vertical, 1);
  // 2 Δ base 120 for the right eye: cos 120° = −½, so exactly 1 Δ base out (no 0.9999…
  // in the record), sin 120° = √3/2 up (common practice, no source)
  assert.equal(resolvePrism(2, 120, "R").horizontal, -1);
  assert.equal(resolvePrism(4, 210, "L").vertical, -2);
  const l = resolvePrism(2, 30, "L");
  near(l.horizontal, -Math.sqrt(3)); // base 30° is up and out for the left eye
  // compounding 3 Δ BI with 4 Δ BU → 5 Δ (3-4-5 triangle; common practice)
  const c = compoundPrism([{ horizontal: 3, vertical: 0 }, { horizontal: 0, vertical: 4 }]);
  near(polarPrism(c, "R").amount, 5);
  near(polarPrism(c, "R").base, Math.atan2(4, 3) * 180 / Math.PI);
  assert.throws(() => resolvePrism(-1, 0, "R"), LentilRangeError);
  assert.throws(() => resolvePrism(1, 400, "R"), /0–360/);
});

Deno.test("vertical imbalance at the reading level", () => {
  // Prentice's rule (common textbook result): R +3.00 D, L +1.00 D, 10 mm below the centres
  // → 3 Δ BU and 1 Δ BU, an imbalance of 2 Δ, right eye relatively base up
  const v = verticalImbalance(
    { sphere: 3, cylinder: 0, axis: 180 },
    { sphere: 1, cylinder: 0, axis: 180 },
    10,
  );
  near(v.right.vertical, 3);
  near(v.left.vertical, 1);
  near(v.imbalance, 2);
  assert.equal(v.baseUpEye, "R");
  // the vertical meridian power decides it: +1.00 / −1.00 × 180 has plano vertically
  const w = verticalImbalance(
    { sphere: 1, cylinder: -1, axis: 180 },
    { sphere: 1, cylinder: 0, axis: 180 },
    8,
  );
  near(w.imbalance, 0.8);
  assert.equal(w.baseUpEye, "L");
  assert.throws(
    () =>
      verticalImbalance({ sphere: 1, cylinder: 0, axis: 180 }, {
        sphere: 1,
        cylinder: 0,
        axis: 180,
      }, 40),
    /reading drop 40 mm is outside the accepted range 0–30 mm/,
  );
});

Deno.test("decentration for a prescribed prism inverts Prentice's rule", () => {
  // Prentice's rule: 1 Δ BI from +4.00 D needs 2.5 mm, decentred in (toward the base)
  const d = decentrationFor(
    { sphere: 4, cylinder: 0, axis: 180 },
    { horizontal: 1, vertical: 0 },
    "R",
  );
  near(d.horizontal, 2.5);
  near(d.vertical, 0);
  // minus lens: decentre away from the base
  const m = decentrationFor(
    { sphere: -4, cylinder: 0, axis: 180 },
    { horizontal: 1, vertical: 0 },
    "L",
  );
  near(m.horizontal, -2.5);
  // round trip on random lenses: the visual point sits at −d from the moved optical centre
  const next = seeded(8);
  for (let i = 0; i < 200; i++) {
    const rx = randomRx(next);
    const det = rx.sphere * (rx.sphere + rx.cylinder);
    if (Math.abs(det) < 4) continue;
    const p = { horizontal: next() * 4 - 2, vertical: next() * 4 - 2 };
    const eye = next() < 0.5 ? "R" : "L";
    let dec;
    try {
      dec = decentrationFor(rx, p, eye);
    } catch (e) {
      assert.ok(e instanceof LentilRangeError); // more than 40 mm
      continue;
    }
    const back = prismAt(rx, -dec.horizontal, -dec.vertical, eye);
    near(back.horizontal, p.horizontal, 1e-9);
    near(back.vertical, p.vertical, 1e-9);
  }
  // a plano-cylinder cannot give prism along its axis
  assert.throws(
    () =>
      decentrationFor({ sphere: 0, cylinder: 2, axis: 180 }, { horizontal: 1, vertical: 0 }, "R"),
    LentilInputError,
  );
  // ... but can across it: plano / +2.00 × 180 has +2.00 D vertically, 1 Δ BU needs 5 mm up
  near(
    decentrationFor({ sphere: 0, cylinder: 2, axis: 180 }, { horizontal: 0, vertical: 1 }, "R")
      .vertical,
    5,
  );
  assert.throws(() => prismAt({ sphere: 1, cylinder: 0, axis: 180 }, 45, 0, "R"), /40 mm/);
});
