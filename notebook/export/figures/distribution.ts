/**
 * `figure: distribution`: how many rows fall in each of `classes` equal classes of the
 * horizontal column, every row counted (none thinned). Without `classes`, about the square
 * root of the number of rows, from 5 to 30 (common practice, no source).
 *
 * @module
 */

import type { FigureDef } from "./figure.ts";

/** The distribution figure. */
export const distribution: FigureDef = {
  name: "distribution",
  summary: "how many rows fall in each class of the horizontal column",
  vertical: false,
  keys: {
    classes: "number of equal classes the horizontal column is counted in (distribution)",
  },
  draw(input) {
    const xs: number[] = [];
    for (let i = 0; i < input.allXs.length; i++) {
      const v = input.allXs[i];
      if (Number.isFinite(v)) xs.push(v);
    }
    let n = Math.min(30, Math.max(5, Math.round(Math.sqrt(xs.length))));
    const given = input.option("classes");
    if (given !== undefined) {
      n = Number(given);
      if (!Number.isInteger(n) || n < 1 || n > 500) {
        input.problem("classes: expected a whole number from 1 to 500", "classes");
        return undefined;
      }
    }
    let lo = Infinity, hi = -Infinity;
    for (const v of xs) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (!xs.length) [lo, hi] = [0, 1];
    if (lo === hi) [lo, hi] = [lo - 0.5, hi + 0.5];
    const width = (hi - lo) / n;
    const counts = new Array<number>(n).fill(0);
    for (const v of xs) counts[Math.min(n - 1, Math.floor((v - lo) / width))]++;
    const bars = counts.map((y, k) => ({ x0: lo + k * width, x1: lo + (k + 1) * width, y }));
    return {
      layers: [{ type: "bars", part: "classes", bars }],
      y: { kind: "count", include: [0], flush: true },
      height: 320,
    };
  },
};
