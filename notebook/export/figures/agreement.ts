/**
 * `figure: agreement`: a difference plot, horizontal the mean of two methods and vertical
 * their difference (columns the notebook computes); `limits` (a cell) draws the bias and the
 * limits of agreement, each labelled in words with its value, else a line at zero. When the
 * cell holds the 95% confidence intervals of the limits (from `agreement` or `rxAgreement`),
 * each limit gets a shaded band: the exact interval by default, `bands: approximate` for
 * Bland and Altman's, `bands: none` for none.
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
  keys: {
    limits: "cell holding the bias and limits of agreement (agreement)",
    bands: "confidence bands of the limits: exact (default), approximate or none (agreement)",
  },
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
    const note = bands(input, v as Record<string, unknown>, layers);
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
    return { layers, ...(note ? { note } : {}) };
  },
};

/** Shaded bands of the limits' confidence intervals; the caption's sentence, if drawn. */
function bands(
  input: Parameters<FigureDef["draw"]>[0],
  v: Record<string, unknown>,
  layers: Layer[],
): string | undefined {
  const which = input.option("bands") ?? "exact";
  if (!["exact", "approximate", "none"].includes(which)) {
    input.problem(`bands: "${which}" is not one of exact, approximate, none`, "bands");
    return undefined;
  }
  if (which === "none" || v === null || typeof v !== "object") return undefined;
  const key = which === "exact" ? "Exact" : "";
  const get = (k: string) => (typeof v[k] === "number" ? v[k] as number : undefined);
  let lo = Infinity, hi = -Infinity;
  for (const x of input.xs) {
    if (Number.isFinite(x)) {
      lo = Math.min(lo, x);
      hi = Math.max(hi, x);
    }
  }
  if (!(hi >= lo)) return undefined;
  let drawn = 0;
  for (const word of ["lower", "upper"]) {
    const from = get(`${word}${key}From`);
    const to = get(`${word}${key}To`);
    if (from === undefined || to === undefined) continue;
    drawn++;
    layers.push({
      type: "area",
      part: `${word}-limit-band`,
      points: [{ x: lo, y: from }, { x: hi, y: from }, { x: hi, y: to }, { x: lo, y: to }],
      colour: FIGURE.limits,
      opacity: 0.14,
    });
  }
  if (!drawn) return undefined;
  return `Shaded: the 95% confidence interval of each limit (${
    which === "exact" ? "exact, non-central t" : "approximate, Bland and Altman"
  }).`;
}
