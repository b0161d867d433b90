import assert from "node:assert/strict";
import { countText } from "../lib/number_text.ts";
import { seeded } from "../lib/seeded.ts";

// Reference: ECMA-402 number formatting as the runtime's Intl implements it for "en"
// (`toLocaleString("en")` of a whole number), which countText writes without loading it.
Deno.test("countText writes whole numbers as toLocaleString('en') does", () => {
  const g = seeded(11);
  const values = [0, 1, 12, 999, 1000, 9999, 10000, 123456, 1_000_000, -1, -1000, -1234567];
  for (let i = 0; i < 2000; i++) values.push(Math.round((g() - 0.5) * 10 ** (1 + 15 * g())) + 0);
  for (const v of values) assert.equal(countText(v), v.toLocaleString("en"), String(v));
  assert.equal(countText(2000.4), "2,000", "rounded to a whole number first");
  assert.equal(countText(Infinity), "Infinity");
  assert.equal(countText(-0.2), "0", "no minus sign on zero (the locale writes -0)");
});
