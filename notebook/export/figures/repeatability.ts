/**
 * `figure: repeatability`: each subject's SD of repeated measures against the subject's
 * mean (horizontal: the measurement column; `subject`: the subject-key column, default the
 * table's declared one), with a line at the pooled within-subject SD. An SD that grows with
 * the mean says the error is proportional and Sw alone does not describe it.
 *
 * @module
 */

import { countText } from "../../../lib/number_text.ts";
import { FIGURE } from "../_palette.ts";
import { valueText } from "../_axes.ts";
import { subjectSpreads } from "../../../lib/reliability.ts";
import type { FigureDef } from "./figure.ts";

/** The repeatability figure. */
export const repeatability: FigureDef = {
  name: "repeatability",
  summary: "each subject's SD of repeated measures against the subject's mean",
  vertical: false,
  keys: {
    subject:
      "column of the subject key (repeatability, fellow-eyes; default: the table's subject:)",
  },
  draw(input) {
    const key = input.column("subject", input.pairing?.subject);
    if (!key) return undefined;
    const c = input.horizontal;
    const keys = Array.from(key.data as ArrayLike<unknown>, (v) => (v == null ? "" : String(v)));
    let r;
    try {
      r = subjectSpreads(c.data as Float64Array, keys);
    } catch (e) {
      input.problem((e as Error).message, "subject");
      return undefined;
    }
    const unit = c.unit;
    return {
      layers: [
        {
          type: "marks",
          part: "rows",
          xs: r.spreads.map((s) => s.mean),
          ys: r.spreads.map((s) => s.sd),
          size: 4,
          opacity: 0.6,
        },
        {
          type: "rule",
          part: "within-subject-sd",
          axis: "y",
          at: r.sw,
          colour: FIGURE.limits,
          label: `within-subject SD ${valueText(r.sw, unit).replace(/^\+/, "")}`,
        },
      ],
      x: { title: `mean of each subject's measurements${unit ? ` (${unit})` : ""}` },
      y: {
        title: `SD of each subject's measurements${unit ? ` (${unit})` : ""}`,
        kind: "plain",
        include: [0],
      },
      note: `${countText(r.spreads.length)} subjects with repeated measures.`,
    };
  },
};
