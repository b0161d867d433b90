/**
 * `figure: scatter`: one mark a row; `ellipse` (a cell) draws the outline it holds (e.g. a
 * region expected to hold 95% of eyes).
 *
 * @module
 */

import { FIGURE } from "../_palette.ts";
import type { Layer } from "../_chart.ts";
import { pointsOf } from "../_plot_values.ts";
import type { FigureDef } from "./figure.ts";

/** The scatter figure. */
export const scatter: FigureDef = {
  name: "scatter",
  summary: "one mark a row",
  vertical: true,
  keys: { ellipse: "cell holding an outline, e.g. a confidence ellipse (scatter)" },
  draw(input) {
    const layers: Layer[] = [input.rowMarks("rows", { size: 4, opacity: 0.6 })];
    const v = input.cell("ellipse");
    if (v !== undefined) {
      const ring = pointsOf(v);
      if (!ring) input.problem("ellipse: the cell holds no outline points", "ellipse");
      else {
        layers.push({
          type: "line",
          part: "ellipse",
          points: ring,
          closed: true,
          colour: FIGURE.limits,
          width: 2,
        });
      }
    }
    return { layers };
  },
};
