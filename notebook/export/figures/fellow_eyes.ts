/**
 * `figure: fellow-eyes`: the left eye's value against the right eye's, one mark a person
 * with both eyes (horizontal: the measurement column; `subject` and `eye`: the key columns,
 * default the table's declared ones), with the line of equality and the correlation
 * between fellow eyes in the caption.
 *
 * @module
 */

import { countText } from "../../../lib/number_text.ts";
import { FIGURE } from "../_palette.ts";
import { axisKind } from "../_axes.ts";
import { eyePairing, fellowEyeCorrelation, fellowEyePairs } from "../../../lib/eyes.ts";
import type { FigureDef } from "./figure.ts";

/** The fellow-eyes figure. */
export const fellowEyes: FigureDef = {
  name: "fellow-eyes",
  summary: "the left eye against the right eye of each person",
  vertical: false,
  keys: {
    subject:
      "column of the subject key (repeatability, fellow-eyes; default: the table's subject:)",
    eye: "column of the eye, R or L (fellow-eyes; default: the table's eye:)",
  },
  draw(input) {
    const s = input.column("subject", input.pairing?.subject);
    const e = input.column("eye", input.pairing?.eye);
    if (!s || !e) return undefined;
    const text = (c: typeof s) =>
      Array.from(c.data as ArrayLike<unknown>, (v) => (v == null ? "" : String(v)));
    const c = input.horizontal;
    let pairs, r;
    try {
      const p = eyePairing(text(s), text(e));
      pairs = fellowEyePairs(p, c.data as Float64Array);
      r = fellowEyeCorrelation(p, c.data as Float64Array);
    } catch (err) {
      input.problem((err as Error).message, "eye");
      return undefined;
    }
    let lo = Infinity, hi = -Infinity;
    for (const v of [...pairs.right, ...pairs.left]) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    const unit = c.unit ? ` (${c.unit})` : "";
    return {
      layers: [
        {
          type: "line",
          part: "equality",
          points: [{ x: lo, y: lo }, { x: hi, y: hi }],
          colour: FIGURE.axis,
          dash: "4 4",
        },
        { type: "marks", part: "rows", xs: pairs.right, ys: pairs.left, size: 4, opacity: 0.6 },
      ],
      x: { title: `right eye: ${c.name}${unit}` },
      y: { title: `left eye: ${c.name}${unit}`, kind: axisKind(c.unit) },
      note: `Correlation between fellow eyes r = ${
        Number.isFinite(r.r) ? r.r.toFixed(2) : "undefined"
      } over ${countText(r.pairs)} persons with both eyes; dashed: left equal to right.`,
    };
  },
};
