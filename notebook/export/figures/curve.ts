/**
 * `figure: curve`: a line through the rows in order of the horizontal column, with a mark on
 * each; `mark` (a cell) marks a point or a power in words (an endpoint as
 * `endpoint +1.75 D`), `fitted` (a cell) draws the fitted curve it holds, dashed.
 *
 * @module
 */

import { FIGURE } from "../_palette.ts";
import { type Layer, seriesColour } from "../_chart.ts";
import { valueText } from "../_axes.ts";
import { markOf, pointsOf, type XY } from "../_plot_values.ts";
import type { FigureDef } from "./figure.ts";

/** The curve figure. */
export const curve: FigureDef = {
  name: "curve",
  summary: "a line through the rows in order of the horizontal column",
  vertical: true,
  keys: {
    mark: "cell whose value marks a point or a power (curve); `cell.part` picks a part",
    fitted: "cell holding fitted curve points, drawn dashed (curve)",
  },
  draw(input) {
    const { xs, ys, series } = input;
    const layers: Layer[] = [];
    // One line per series, in order of the horizontal value.
    const groups = new Map<number, XY[]>();
    for (let i = 0; i < xs.length; i++) {
      const k = series ? series[i] : 0;
      let g = groups.get(k);
      if (!g) groups.set(k, g = []);
      g.push({ x: xs[i], y: ys[i] });
    }
    for (const [k, pts] of groups) {
      pts.sort((a, b) => a.x - b.x);
      layers.push({ type: "line", part: "curve", points: pts, colour: seriesColour(k) });
    }
    layers.push(input.rowMarks("rows", { size: 6 }));
    const fitV = input.cell("fitted");
    if (fitV !== undefined) {
      const fit = pointsOf(fitV);
      if (!fit) input.problem("fitted: the cell holds no curve points", "fitted");
      else {
        layers.push({
          type: "line",
          part: "fitted",
          points: fit,
          colour: FIGURE.fitted,
          dash: "6 4",
          width: 1.6,
        });
      }
    }
    const markV = input.cell("mark");
    if (markV !== undefined) {
      const m = markOf(markV);
      if (!m) input.problem("mark: the cell holds no point or power", "mark");
      else {
        const isEndpoint = markV !== null && typeof markV === "object" && "endpoint" in markV;
        const what = isEndpoint ? "endpoint" : input.cellName("mark") ?? "marked";
        const label = `${what} ${valueText(m.x, input.horizontal.unit)}`;
        layers.push({ type: "rule", part: "mark", axis: "x", at: m.x, dash: "3 3" });
        if (m.y !== undefined) {
          layers.push({ type: "ring", part: "mark-point", at: { x: m.x, y: m.y }, label });
        } else {
          layers.push({ type: "rule", part: "mark", axis: "x", at: m.x, dash: "3 3", label });
        }
      }
    }
    return { layers };
  },
};
