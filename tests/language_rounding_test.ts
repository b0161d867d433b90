// Rounding that changes meaning: a spherical equivalent and a mean prescription are
// measures, shown exact; rounding to the power step happens only when asked, and says so.

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";

const shown = (nb: Notebook, id: string) => {
  const r = nb.result(id)!;
  assert.equal(r.error, undefined, `${id}: ${r.error?.message}`);
  return nb.language.describe(r.value, nb.display).display;
};

Deno.test("spherical equivalent and M read the same, exact", () => {
  // M = S + C/2 (Thibos et al. 1997): −2.25 + (−0.75)/2 = −2.625 D, shown −2.63 D.
  const nb = Notebook.fromText(
    '~~~lentil\nr = rx("-2.25 / -0.75 x 90")\nse = sphericalEquivalent(r)\npm = powerM(r)\n' +
      'ordered = roundPower(se)\ndown = roundPower(se, {rule: "minus"})\n~~~\n',
    "m.lentil.md",
  );
  assert.equal(shown(nb, "se"), "-2.63 D");
  assert.equal(shown(nb, "pm"), "-2.63 D");
  // Rounded on request to the 0.25 D step: nearest, halves toward plus, is −2.50 D; toward
  // minus −2.75 D (common practice, no source).
  assert.equal(shown(nb, "ordered"), "-2.50 D (rounded: 0.25 D step, nearest)");
  assert.equal(shown(nb, "down"), "-2.75 D (rounded: 0.25 D step, toward minus)");
});

Deno.test("a mean prescription is exact; rounding it is asked for and said", () => {
  // Mean of −1.00 / −0.60 × 180 and −1.00 DS by power vectors (Thibos 1997): J0 halves, so
  // the mean cylinder is −0.30 D, never the −0.50 D a rounding by meridian would show.
  const nb = Notebook.fromText(
    "~~~lentil table t\nr [rx]\n-1.00 / -0.60 x 180\n-1.00 DS\n~~~\n" +
      "~~~lentil\nmr = meanRx(t.r)\naverage = mr.rx\nordered = roundToStep(average)\n~~~\n",
    "mean.lentil.md",
  );
  assert.equal(shown(nb, "average"), "-1.00 / -0.30 × 180");
  assert.equal(shown(nb, "ordered"), "-1.00 / -0.25 × 180 (rounded: 0.25 D step, nearest)");
});
