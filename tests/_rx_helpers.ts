/**
 * Helpers for the prescription and lens tests: random lenses for property tests (from a
 * seeded source, lib/seeded.ts) and comparisons of lenses and numbers.
 *
 * @module
 */

import assert from "node:assert/strict";
import { toPowerMatrix } from "../lib/power_matrix.ts";
import type { SpheroCylinder } from "../lib/spherocylinder.ts";

/** A random spherocylinder on the 0.25 D grid, axis 1–180. */
export function randomRx(next: () => number): SpheroCylinder {
  return {
    sphere: Math.round((next() * 30 - 15) * 4) / 4 + 0,
    cylinder: Math.round((next() * 12 - 6) * 4) / 4 + 0,
    axis: 1 + Math.floor(next() * 180),
  };
}

/** Assert two numbers agree within `eps`. */
export function near(actual: number, expected: number, eps = 1e-9, what = "value"): void {
  assert.ok(
    Math.abs(actual - expected) <= eps,
    `${what}: expected ${expected}, got ${actual} (tolerance ${eps})`,
  );
}

/** Assert two spherocylinders are the same lens (equal power matrices), whatever the form. */
export function sameLens(a: SpheroCylinder, b: SpheroCylinder, eps = 1e-9): void {
  const fa = toPowerMatrix(a);
  const fb = toPowerMatrix(b);
  for (let i = 0; i < 2; i++) {
    for (let j = 0; j < 2; j++) {
      near(fa[i][j], fb[i][j], eps, `power matrix [${i}][${j}] of ${JSON.stringify(a)}`);
    }
  }
}
