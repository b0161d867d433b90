import assert from "node:assert/strict";
import {
  addTolerance,
  axisTolerance,
  checkLens,
  checkPair,
  cylinderTolerance,
  sphereTolerance,
  TOLERANCE_STANDARD,
} from "../lib/tolerance.ts";
import { LentilInputError } from "../lib/errors.ts";
import { near } from "./_rx_helpers.ts";

// All tolerance values: ANSI Z80.1-2015, as given in the field notes (values as published in
// summaries of the standard).

Deno.test("ANSI Z80.1-2015 sphere: ±0.13 D up to ±6.50 D, ±2% above", () => {
  assert.equal(sphereTolerance(0), 0.13);
  assert.equal(sphereTolerance(6.5), 0.13);
  assert.equal(sphereTolerance(-6.5), 0.13);
  near(sphereTolerance(6.51), 0.1302);
  near(sphereTolerance(-8), 0.16);
});

Deno.test("ANSI Z80.1-2015 cylinder: ±0.13 (≤ 2.00), ±0.15 (> 2.00 to 4.50), ±4% (> 4.50)", () => {
  assert.equal(cylinderTolerance(0), 0.13);
  assert.equal(cylinderTolerance(-2), 0.13);
  assert.equal(cylinderTolerance(-2.01), 0.15);
  assert.equal(cylinderTolerance(4.5), 0.15);
  near(cylinderTolerance(-4.51), 0.1804);
  near(cylinderTolerance(6), 0.24);
});

Deno.test("ANSI Z80.1-2015 axis: ±14°, ±7°, ±5°, ±3°, ±2° by cylinder", () => {
  const edges: [number, number][] = [
    [0.25, 14],
    [0.26, 7],
    [0.5, 7],
    [0.51, 5],
    [0.75, 5],
    [0.76, 3],
    [1.5, 3],
    [1.51, 2],
    [4, 2],
  ];
  for (const [c, t] of edges) {
    assert.equal(axisTolerance(c), t, `cylinder ${c}`);
    assert.equal(axisTolerance(-c), t, `cylinder ${-c}`);
  }
});

Deno.test("ANSI Z80.1-2015 add: ±0.12 D up to 4.00 D, ±0.18 D above", () => {
  assert.equal(addTolerance(1), 0.12);
  assert.equal(addTolerance(4), 0.12);
  assert.equal(addTolerance(4.01), 0.18);
});

Deno.test("verification: each quantity, the standard named, pass or fail and by how much", () => {
  const ordered = { sphere: -2.25, cylinder: -0.75, axis: 170, add: 2 };
  // exactly on the limits: sphere −3.00 → −3.13, cylinder −0.75 → −0.62, axis 5° off, add 0.12
  const onEdge = checkLens(ordered, { sphere: -2.51, cylinder: -0.62, axis: 175, add: 2.12 });
  assert.equal(onEdge.standard, TOLERANCE_STANDARD);
  assert.equal(onEdge.standard, "ANSI Z80.1-2015");
  assert.deepEqual(onEdge.checks.map((c) => c.quantity), [
    "sphere (meridian of highest absolute power)",
    "cylinder",
    "axis",
    "add",
  ]);
  assert.ok(onEdge.pass, JSON.stringify(onEdge.checks));
  for (const c of onEdge.checks) near(c.margin, 0, 1e-9, c.quantity);
  // just past every limit
  const past = checkLens(ordered, { sphere: -2.53, cylinder: -0.61, axis: 176, add: 2.13 });
  assert.equal(past.pass, false);
  for (const c of past.checks) {
    assert.equal(c.pass, false, c.quantity);
    assert.ok(c.margin < 0);
  }
  near(past.checks[0].margin, -0.01, 1e-9);
  near(past.checks[2].deviation, 6);
  near(past.checks[2].margin, -1);
  // axis deviation is the smallest angle across 180
  const wrap = checkLens({ sphere: -1, cylinder: -1, axis: 2 }, {
    sphere: -1,
    cylinder: -1,
    axis: 178,
  });
  near(wrap.checks[2].deviation, -4);
  // a plus-cylinder order is compared in plus-cylinder form
  const plusForm = checkLens(
    { sphere: -3, cylinder: 0.75, axis: 80 },
    { sphere: -2.25, cylinder: -0.75, axis: 170 },
  );
  assert.ok(plusForm.pass);
  near(plusForm.checks[1].ordered, 0.75);
  assert.throws(
    () => checkLens(ordered, { sphere: -2.25, cylinder: -0.75, axis: 170 }),
    LentilInputError,
  );
});

Deno.test("verification of a pair: vertical imbalance 0.33 Δ, horizontal 0.67 Δ", () => {
  const rx = { sphere: -2, cylinder: 0, axis: 180 };
  const ok = checkPair(rx, rx, { ...rx, prism: { horizontal: 0, vertical: 0.33 } }, rx);
  assert.ok(ok.pass);
  const bad = checkPair(rx, rx, { ...rx, prism: { horizontal: 0, vertical: 0.2 } }, {
    ...rx,
    prism: { horizontal: 0, vertical: -0.2 },
  });
  const v = bad.checks.find((c) => c.quantity === "vertical imbalance")!;
  near(v.deviation, 0.4);
  assert.equal(v.pass, false);
  const h = checkPair(rx, rx, { ...rx, prism: { horizontal: 0.4, vertical: 0 } }, {
    ...rx,
    prism: { horizontal: 0.27, vertical: 0 },
  }).checks.find((c) => c.quantity === "net horizontal prism")!;
  assert.ok(h.pass);
  near(h.margin, 0);
});
