/**
 * `figure: agreement`: a difference plot, horizontal the mean of two methods and vertical
 * their difference (columns the notebook computes); `limits` (a cell) draws the bias and the
 * limits of agreement, each labelled in words with its value, else a line at zero.
 *
 * @module
 */

import { FIGURE } from "../_palette.ts";
import type { Layer } from "../_chart.ts";
import { valueText } from "../_axes.ts";
import { limitsOf } from "../_plot_values.ts";
import type { FigureDef } from "./figure.ts";

/** The agreement figure. */
export const agreement: FigureDef = {
  name: "agreement",
  summary: "differences of two methods against their mean",
  vertical: true,
  keys: { limits: "cell holding the bias and limits of agreement (agreement)" },
  draw(input) {
    const layers: Layer[] = [input.rowMarks("rows", { size: 4, opacity: 0.6 })];
    const unit = input.vertical?.unit;
    const v = input.cell("limits");
    if (v === undefined) {
      layers.push({ type: "rule", part: "zero-difference", axis: "y", at: 0, colour: FIGURE.axis });
      return { layers };
    }
    const limits = limitsOf(v);
    if (!limits) {
      input.problem("limits: the cell holds no limits", "limits");
      return { layers };
    }
    if (limits.bias !== undefined) {
      layers.push({
        type: "rule",
        part: "bias",
        axis: "y",
        at: limits.bias,
        colour: FIGURE.limits,
        label: `bias ${valueText(limits.bias, unit)}`,
      });
    }
    for (const [at, word] of [[limits.lower, "lower"], [limits.upper, "upper"]] as const) {
      layers.push({
        type: "rule",
        part: `${word}-limit`,
        axis: "y",
        at,
        colour: FIGURE.limits,
        dash: "7 4",
        label: `${word} limit of agreement ${valueText(at, unit)}`,
      });
    }
    return { layers };
  },
};
