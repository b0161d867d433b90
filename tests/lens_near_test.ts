import assert from "node:assert/strict";
import { nearDemand, tentativeAdd } from "../lib/near.ts";
import { LentilRangeError } from "../lib/errors.ts";
import { near } from "./_rx_helpers.ts";

Deno.test("near demand: 1 / distance", () => {
  // common practice: a target at 40 cm asks 2.50 D, at 33⅓ cm 3.00 D
  near(nearDemand(40), 2.5);
  near(nearDemand(100 / 3), 3);
  assert.throws(() => nearDemand(5), LentilRangeError);
  assert.throws(
    () => nearDemand(250),
    /working distance 250 cm is outside the accepted range 10–200 cm/,
  );
});

Deno.test("tentative add: demand less the usable amplitude, rounded up", () => {
  // Hofstetter 1950 minimum amplitude 15 − 0.25·age; half kept in reserve (common practice)
  const a = tentativeAdd(50, 40);
  near(a.amplitude, 2.5);
  near(a.usable, 1.25);
  near(a.exact, 1.25);
  assert.equal(a.add, 1.25);
  // age 55: amplitude 1.25, usable 0.625, needed 1.875 → +2.00 (rounded up)
  const b = tentativeAdd(55, 40);
  near(b.exact, 1.875);
  assert.equal(b.add, 2);
  // a third in reserve, mean amplitude (18.5 − 0.30·age): age 45 → 5.00 D, usable 3.33
  const c = tentativeAdd(45, 40, 1 / 3, "mean");
  near(c.amplitude, 5);
  assert.equal(c.add, 0);
  // past the zero of the line the amplitude is held at 0 and the add is the whole demand
  assert.equal(tentativeAdd(75, 40).add, 2.5);
  assert.throws(() => tentativeAdd(120, 40), LentilRangeError);
  assert.throws(() => tentativeAdd(50, 40, 1.5), /reserve fraction/);
});
