import assert from "node:assert/strict";
import {
  blankSize,
  COMMON_INDICES,
  frameDiameter,
  frameEdges,
  lensThickness,
  steepnessLimits,
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

Deno.test("minimum blank: ED + 2 × decentration + 2 mm (common practice, no source)", () => {
  assert.equal(blankSize(57, 5), 69);
  assert.equal(blankSize(57, -5, 0), 67);
  assert.throws(() => blankSize(57, 20), LentilRangeError);
  // a 54 × 40 box with the centre 5 mm in: the box-corner fallback says 77.5 mm, too large
  // for a −10.00 D lens on a +4.00 D front in 1.50 (the back is −14.00 D, radius 35.7 mm)
  const lens = { sphere: -10, cylinder: 0, axis: 180 };
  const options = { index: 1.5, minThickness: 1.5, frontCurve: 4 };
  near(frameDiameter(54, 40, 5), 2 * Math.hypot(32, 20) + 2);
  assert.throws(() => lensThickness(lens, { ...options, diameter: frameDiameter(54, 40, 5) }));
  // the frame's ED (57 mm, invented) gives a 69 mm blank, which the lens reaches
  const t = lensThickness(lens, { ...options, diameter: blankSize(57, 5) });
  near(t.centre, 1.5);
  near(t.edgeThick, 1.5 + sag(500 / 14, 34.5) - sag(500 / 4, 34.5));
});

Deno.test("a lens too steep for its size: the diameter or front curve that would work", () => {
  const lens = { sphere: -10, cylinder: 0, axis: 180 };
  let message = "";
  try {
    lensThickness(lens, { index: 1.5, diameter: 77.5, minThickness: 1.5, frontCurve: 4 });
  } catch (e) {
    assert.ok(e instanceof LentilInputError);
    message = e.message;
  }
  // every surface's semi-diameter at most its radius 1000·(n − 1)/|F| (Jalie, from memory):
  // the −14.00 D back reaches 2 · 500/14 = 71.4 mm; at 77.5 mm a front up to +2.90 D fits
  assert.match(message, /diameter of 71\.00 mm or less/);
  assert.match(message, /flatter front curve of \+2\.75 D/);
  assert.doesNotMatch(message, /\d\.\d{3,}/, "numbers by the display rules, not raw floats");
  const limits = steepnessLimits([-10], 4, 1.5, 77.5);
  near(limits.largestDiameter, 1000 / 14);
  near(limits.frontCurves![1], 500 / 38.75 - 10);
  // the suggestion works
  assert.ok(lensThickness(lens, { index: 1.5, diameter: 71, minThickness: 1.5, frontCurve: 4 }));
  assert.ok(
    lensThickness(lens, { index: 1.5, diameter: 77.5, minThickness: 1.5, frontCurve: 2.75 }),
  );
  assert.doesNotMatch(
    (() => {
      try {
        surfaceSag(35.714285714, 38.75);
      } catch (e) {
        return (e as Error).message;
      }
      return "";
    })(),
    /\d\.\d{3,}/,
  );
});

Deno.test("edge thickness where the frame is: four edges and the thickest with its meridian", () => {
  // −4.00 / −2.00 × 90 in 1.60 on a +4.00 D front, box 54 × 40, centre 3 mm in: the
  // horizontal meridian is −6.00 D, the vertical −4.00 D (F(θ) = S + C·sin²(θ − axis),
  // common textbook result); each edge is the minimum + back sag − front sag at its distance
  // (Jalie, from memory)
  const e = frameEdges({ sphere: -4, cylinder: -2, axis: 90 }, {
    index: 1.6,
    boxA: 54,
    boxB: 40,
    decentration: 3,
    minThickness: 1.5,
  });
  const edge = (y: number, f: number) => 1.5 + sag(600 / Math.abs(f - 4), y) - sag(600 / 4, y);
  near(e.centre, 1.5);
  const by = (name: string) => e.edges.find((x) => x.edge === name)!;
  near(by("nasal").thickness, edge(24, -6));
  near(by("temporal").thickness, edge(30, -6));
  near(by("upper").thickness, edge(20, -4));
  near(by("lower").thickness, edge(20, -4));
  assert.equal(e.thickest.edge, "temporal");
  assert.equal(e.thickest.meridian, 180);
  near(by("temporal").power, -6);
  // a plus lens: the thinnest of the four edges is held at the minimum
  const plus = frameEdges({ sphere: 3, cylinder: 0, axis: 180 }, {
    index: 1.5,
    boxA: 50,
    boxB: 36,
    decentration: 2,
    verticalDecentration: -1,
    minThickness: 1,
    frontCurve: 7,
  });
  near(plus.thinnest.thickness, 1);
  assert.equal(plus.thinnest.edge, "temporal");
  near(plus.centre, 1 + sag(500 / 7, 27) - sag(500 / 4, 27));
  near(plus.edges.find((x) => x.edge === "lower")!.distance, 17);
});

Deno.test("frameEdges in the notebook: labelled parts a later cell reads", async () => {
  const { getLanguage } = await import("../cells/language.ts");
  const { present } = await import("../cells/present.ts");
  const lang = getLanguage();
  const run = (e: string) => lang.compile(lang.parse(e)).evaluate({ ...lang.constants });
  const call = 'frameEdges(rx("-4.00 / -2.00 x 90"), 1.6, 54 mm, 40 mm, 3 mm, 1.5 mm)';
  const shown = present(run(call));
  assert.match(
    shown.headline!,
    /^thickest edge 6\.51 mm, temporal edge \(horizontal meridian, 180°\)/,
  );
  assert.deepEqual(shown.parts!.map((p) => p.label).slice(0, 5), [
    "centre thickness",
    "nasal edge",
    "temporal edge",
    "upper edge",
    "lower edge",
  ]);
  assert.equal(lang.describe(run(`${call}.temporal`)).display, "6.51 mm");
  assert.equal(lang.describe(run(`${call}.thickestMeridian`)).display, "180°");
  assert.equal(lang.catalogue.formulas.get("frameEdges")?.caution, true);
  assert.equal(lang.catalogue.formulas.get("blankSize")?.caution, true);
});
