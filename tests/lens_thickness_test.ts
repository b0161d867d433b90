import assert from "node:assert/strict";
import {
  COMMON_INDICES,
  frameDiameter,
  lensThickness,
  surfaceRadius,
  surfaceSag,
  thicknessByIndex,
  trueLensPower,
} from "../lib/thickness.ts";
import { LentilInputError, LentilRangeError } from "../lib/errors.ts";
import { near } from "./_rx_helpers.ts";

/** Sag by the sag formula (Jalie, The Principles of Ophthalmic Lenses; from memory). */
const sag = (r: number, y: number) => r - Math.sqrt(r * r - y * y);

Deno.test("sag and surface radius", () => {
  // sag formula s = r − √(r² − y²) (Jalie, from memory): r = 100 mm, y = 30 mm → 4.606 mm
  near(surfaceSag(100, 30), 100 - Math.sqrt(9100));
  assert.equal(surfaceSag(100, 30).toFixed(3), "4.606");
  // r = (n − 1)/F: +5.00 D in n = 1.5 → 100 mm (Jalie, from memory)
  near(surfaceRadius(5, 1.5), 100);
  assert.equal(surfaceRadius(0, 1.5), Infinity);
  assert.throws(() => surfaceSag(20, 30), LentilInputError);
});

Deno.test("thickness: minus lens thin at the centre, plus lens thin at the edge", () => {
  // Jalie (from memory): centre − edge = s(F1) + s(F2); the thinnest point is held at the minimum
  const y = 30;
  const minus = lensThickness({ sphere: -4, cylinder: 0, axis: 180 }, {
    index: 1.5,
    diameter: 60,
    minThickness: 2,
    frontCurve: 4,
  });
  near(minus.centre, 2);
  near(minus.edgeThick, 2 + sag(500 / 8, y) - sag(500 / 4, y));
  const plus = lensThickness({ sphere: 4, cylinder: 0, axis: 180 }, {
    index: 1.5,
    diameter: 60,
    minThickness: 1,
    frontCurve: 6,
  });
  near(plus.edgeThin, 1);
  near(plus.centre, 1 + sag(500 / 6, y) - sag(500 / 2, y));
  // a toric lens: the thick edge lies in the meridian of the most minus power
  const toric = lensThickness({ sphere: -2, cylinder: -2, axis: 180 }, {
    index: 1.6,
    diameter: 60,
    minThickness: 1.5,
  });
  near(toric.centre, 1.5);
  assert.ok(toric.edgeThick > toric.edgeThin);
  near(toric.backCurves[0], -6);
  near(toric.backCurves[1], -8);
});

Deno.test("thickness: the front curve moves the difference between the two sags", () => {
  // Jalie (from memory): a plano-concave −4.00 D lens has its whole power on the back, so the
  // edge is the minimum plus the sag of that one surface; a plano-convex +4.00 D lens likewise
  // at the centre. Any other front curve gives a meniscus whose two sags differ by more.
  const y = 30;
  const rx = { sphere: -4, cylinder: 0, axis: 180 };
  const flat = lensThickness(rx, { index: 1.5, diameter: 60, minThickness: 2, frontCurve: 0 });
  near(flat.edgeThick, 2 + sag(500 / 4, y));
  const steep = lensThickness(rx, { index: 1.5, diameter: 60, minThickness: 2, frontCurve: 8 });
  near(steep.edgeThick, 2 + sag(500 / 12, y) - sag(500 / 8, y));
  assert.ok(steep.edgeThick > flat.edgeThick);
  const plus = { sphere: 4, cylinder: 0, axis: 180 };
  const convex = lensThickness(plus, { index: 1.5, diameter: 60, minThickness: 1, frontCurve: 4 });
  near(convex.centre, 1 + sag(500 / 4, y));
  near(convex.backCurves[0], 0);
});

Deno.test("thickness: higher index, thinner minus lens", () => {
  // r = (n − 1)/F (Jalie, from memory): a higher index flattens both surfaces, so the same
  // −6.00 D lens has a thinner edge
  const rows = thicknessByIndex({ sphere: -6, cylinder: 0, axis: 180 }, {
    diameter: 60,
    minThickness: 1.5,
  });
  assert.deepEqual(rows.map((r) => r.index), [...COMMON_INDICES]);
  for (let i = 1; i < rows.length; i++) assert.ok(rows[i].edgeThick < rows[i - 1].edgeThick);
});

Deno.test("thickness: values outside the accepted ranges are refused, naming them", () => {
  const rx = { sphere: -4, cylinder: 0, axis: 180 };
  assert.throws(
    () => lensThickness(rx, { index: 2.1, diameter: 60, minThickness: 1 }),
    (e) =>
      e instanceof LentilRangeError &&
      /refractive index 2.1 is outside the accepted range 1.4–1.9/.test(e.message),
  );
  assert.throws(
    () => lensThickness(rx, { index: 1.5, diameter: 120, minThickness: 1 }),
    /lens diameter 120 mm is outside the accepted range 10–90 mm/,
  );
  assert.throws(
    () => lensThickness(rx, { index: 1.5, diameter: 60, minThickness: -1 }),
    LentilRangeError,
  );
  // a surface steeper than the lens is wide
  assert.throws(
    () =>
      lensThickness({ sphere: -20, cylinder: 0, axis: 180 }, {
        index: 1.5,
        diameter: 80,
        minThickness: 1,
      }),
    LentilInputError,
  );
});

Deno.test("frame diameter: farthest box corner", () => {
  // boxing (common practice, no source): 2·√((A/2 + dec)² + (B/2)²) + margin
  near(frameDiameter(50, 40, 3, 0), 2 * Math.hypot(28, 20));
  near(frameDiameter(50, 40, -3), 2 * Math.hypot(28, 20) + 2);
  assert.throws(() => frameDiameter(50, 40, 20), /decentration 20 mm/);
});

Deno.test("lens measure: true power for another index", () => {
  // lens-measure correction (common practice, no source): F_true = F_read × (n − 1)/(n_tool − 1)
  near(trueLensPower(6, 1.5), 6 * 0.5 / 0.53);
  near(trueLensPower(-4, 1.67), -4 * 0.67 / 0.53);
  near(trueLensPower(4, 1.53), 4);
  near(trueLensPower(5, 1.6, 1.5), 6);
  assert.throws(() => trueLensPower(4, 1.2), /1.4–1.9/);
});
