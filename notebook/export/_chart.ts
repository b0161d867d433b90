/**
 * Lentil's figure kit: a chart of layers (marks, lines, bars, rules, bands, a ring) on two
 * linear axes, written straight to SVG markup in Lentil's own look: axis titles in words with
 * the unit in brackets, ticks by the kind of measure (`_axes.ts`), a light grid, lentil-shaped
 * marks, and the palette of `_palette.ts`. User text is escaped; the figure is one
 * `role="img"` with a label in words, and its parts carry no ARIA attributes.
 *
 * @example
 * ```ts
 * import { chartSvg } from "./_chart.ts";
 * const svg = chartSvg({
 *   label: "two points",
 *   x: { title: "lens (D)", kind: "power" },
 *   y: { title: "visual acuity (logMAR)", kind: "logmar", reverse: true },
 *   layers: [{ type: "marks", part: "rows", xs: [0, 1], ys: [0.1, 0.3] }],
 * });
 * svg.startsWith("<svg"); // true
 * ```
 *
 * @module
 */

import { escapeHtml } from "./_escape.ts";
import { FIGURE, RAMP, SERIES } from "./_palette.ts";
import { type AxisKind, axisTicks } from "./_axes.ts";

/** A point. */
export interface Point {
  /** Horizontal value. */
  readonly x: number;
  /** Vertical value. */
  readonly y: number;
}

/** Shapes of a mark, one per series. */
export type Shape = "lentil" | "diamond" | "triangle" | "square" | "ring";

/** The order shapes are given to series in. */
export const SHAPES: readonly Shape[] = ["lentil", "diamond", "triangle", "square", "ring"];

/** One layer of a chart. */
export type Layer =
  | {
    /** Marks at points, in series told apart by colour and shape. */
    readonly type: "marks";
    /** Name of the part (`data-part`), for styling and tests. */
    readonly part: string;
    readonly xs: ArrayLike<number>;
    readonly ys: ArrayLike<number>;
    /** Series index of each point (default: all in series 0). */
    readonly series?: ArrayLike<number>;
    /** Per-point colour (a numeric colour-by), overriding the series colour. */
    readonly colours?: readonly string[];
    /** Mark size (half-width in px, default 5). */
    readonly size?: number;
    /** Fill opacity (default 0.9). */
    readonly opacity?: number;
  }
  | {
    /** A polyline (closed for an outline). */
    readonly type: "line";
    readonly part: string;
    readonly points: readonly Point[];
    readonly colour?: string;
    readonly width?: number;
    readonly dash?: string;
    readonly closed?: boolean;
  }
  | {
    /** Bars from zero, one per class. */
    readonly type: "bars";
    readonly part: string;
    readonly bars: readonly { readonly x0: number; readonly x1: number; readonly y: number }[];
    readonly colour?: string;
  }
  | {
    /** A line across the chart at a value, with an optional label. */
    readonly type: "rule";
    readonly part: string;
    readonly axis: "x" | "y";
    readonly at: number;
    readonly colour?: string;
    readonly dash?: string;
    readonly label?: string;
  }
  | {
    /** A filled area (a band or region), drawn under the marks. */
    readonly type: "area";
    readonly part: string;
    readonly points: readonly Point[];
    readonly colour?: string;
    readonly opacity?: number;
  }
  | {
    /** A ring around one point, with a label in words. */
    readonly type: "ring";
    readonly part: string;
    readonly at: Point;
    readonly label?: string;
    readonly colour?: string;
  };

/** One axis. */
export interface AxisSpec {
  /** Title in words (the unit in brackets). */
  readonly title: string;
  /** The kind of measure, which sets the ticks. */
  readonly kind: AxisKind;
  /** Draw high values at the bottom (vertical) or left (horizontal). */
  readonly reverse?: boolean;
  /** Values the axis must include besides the layers' (e.g. 0 for counts). */
  readonly include?: readonly number[];
  /** Start the values at the axis line, without the usual small gap (bars from zero). */
  readonly flush?: boolean;
}

/** The key to the series of a chart. */
export type Legend =
  | {
    readonly type: "series";
    /** The column that colours. */
    readonly title: string;
    /** Series names, by series index. */
    readonly names: readonly string[];
  }
  | {
    readonly type: "ramp";
    readonly title: string;
    /** Text at the light and the dark end. */
    readonly low: string;
    readonly high: string;
  };

/** A whole chart. */
export interface ChartSpec {
  /** What the figure shows, in words (the image's label). */
  readonly label: string;
  readonly x: AxisSpec;
  readonly y: AxisSpec;
  readonly layers: readonly Layer[];
  readonly legend?: Legend;
  /** Size in px (default 640 × 380). */
  readonly width?: number;
  readonly height?: number;
}

/** The colour of series `i`. */
export function seriesColour(i: number): string {
  return SERIES[i % SERIES.length];
}

/** The shape of series `i`. */
export function seriesShape(i: number): Shape {
  return SHAPES[i % SHAPES.length];
}

function mix(a: string, b: string, t: number): string {
  const p = (h: string, i: number) => parseInt(h.slice(1 + 2 * i, 3 + 2 * i), 16);
  let out = "#";
  for (let i = 0; i < 3; i++) {
    out += Math.round(p(a, i) + (p(b, i) - p(a, i)) * t).toString(16).padStart(2, "0");
  }
  return out;
}

/**
 * The colour of a value on the ramp from `lo` (light) to `hi` (dark).
 *
 * @example
 * ```ts
 * import { rampColour } from "./_chart.ts";
 * rampColour(0, 0, 1); // "#dcc99a"
 * ```
 */
export function rampColour(v: number, lo: number, hi: number): string {
  const t = hi > lo ? Math.min(1, Math.max(0, (v - lo) / (hi - lo))) : 0.5;
  return mix(RAMP[0], RAMP[1], t);
}

const r1 = (v: number) => String(Math.round(v * 10) / 10);

/** The path of one mark of a shape, centred at (x, y) with half-width s. */
function shapePath(shape: Shape, x: number, y: number, s: number): string {
  const X = r1(x), Y = r1(y);
  switch (shape) {
    case "lentil": {
      // Two arcs meeting at the ends: a biconvex lens seen edge on.
      const w = r1(2 * s), h = r1(1.2 * s);
      return `M${r1(x - s)},${Y}q${r1(s)},-${h} ${w},0q-${r1(s)},${h} -${w},0z`;
    }
    case "diamond":
      return `M${X},${r1(y - s)}l${r1(s)},${r1(s)}l-${r1(s)},${r1(s)}l-${r1(s)},-${r1(s)}z`;
    case "triangle":
      return `M${X},${r1(y - s)}l${r1(0.9 * s)},${r1(1.6 * s)}h-${r1(1.8 * s)}z`;
    case "square":
      return `M${r1(x - 0.75 * s)},${r1(y - 0.75 * s)}h${r1(1.5 * s)}v${r1(1.5 * s)}h-${
        r1(1.5 * s)
      }z`;
    case "ring": {
      const r = r1(0.8 * s);
      return `M${r1(x - 0.8 * s)},${Y}a${r},${r} 0 1,0 ${r1(1.6 * s)},0a${r},${r} 0 1,0 -${
        r1(1.6 * s)
      },0z`;
    }
  }
}

interface Scale {
  (v: number): number;
  readonly ticks: ReturnType<typeof axisTicks>;
}

function extent(spec: ChartSpec, axis: "x" | "y"): [number, number] {
  let lo = Infinity, hi = -Infinity;
  const see = (v: number) => {
    if (Number.isFinite(v)) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  };
  for (const v of spec[axis].include ?? []) see(v);
  for (const l of spec.layers) {
    switch (l.type) {
      case "marks": {
        const vs = axis === "x" ? l.xs : l.ys;
        for (let i = 0; i < vs.length; i++) see(vs[i]);
        break;
      }
      case "line":
      case "area":
        for (const p of l.points) see(p[axis]);
        break;
      case "bars":
        for (const b of l.bars) {
          if (axis === "x") {
            see(b.x0);
            see(b.x1);
          } else see(b.y);
        }
        break;
      case "rule":
        if (l.axis === axis) see(l.at);
        break;
      case "ring":
        see(l.at[axis]);
        break;
    }
  }
  return lo <= hi ? [lo, hi] : [0, 1];
}

function scale(spec: ChartSpec, axis: "x" | "y", from: number, to: number): Scale {
  const [lo, hi] = extent(spec, axis);
  const ticks = axisTicks(spec[axis].kind, lo, hi);
  const [d0, d1] = ticks.domain;
  const [a, b] = spec[axis].reverse ? [to, from] : [from, to];
  const f = ((v: number) => a + ((v - d0) / (d1 - d0)) * (b - a)) as Scale;
  (f as { ticks: typeof ticks }).ticks = ticks;
  return f;
}

/**
 * The chart as SVG markup.
 *
 * @example
 * ```ts
 * import { chartSvg } from "./_chart.ts";
 * const svg = chartSvg({
 *   label: "counts",
 *   x: { title: "M (D)", kind: "power" },
 *   y: { title: "number of rows", kind: "count", include: [0] },
 *   layers: [{ type: "bars", part: "classes", bars: [{ x0: 0, x1: 0.5, y: 3 }] }],
 * });
 * svg.includes('data-part="classes"'); // true
 * svg.includes("aria-label=\"counts\""); // true
 * ```
 */
export function chartSvg(spec: ChartSpec): string {
  const W = spec.width ?? 640;
  const H = spec.height ?? 380;
  const top = spec.legend ? 40 : 16;
  const left = 70, right = 20, bottom = 52;
  const inset = 10;
  const ix = spec.x.flush ? 0 : inset, iy = spec.y.flush ? 0 : inset;
  const X = scale(spec, "x", left + ix, W - right - ix);
  const Y = scale(spec, "y", H - bottom - iy, top + iy);
  const x0 = left, x1 = W - right, y0 = H - bottom, y1 = top;
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="lx-chart" viewBox="0 0 ${W} ${H}" ` +
      `width="${W}" height="${H}" role="img" aria-label="${escapeHtml(spec.label)}" ` +
      `font-size="12" fill="${FIGURE.title}">`,
  );
  // Grid, then the zero line of a power axis (plano) a little stronger.
  const grid: string[] = [];
  for (const v of X.ticks.values) grid.push(`M${r1(X(v))},${y1}V${y0}`);
  for (const v of Y.ticks.values) grid.push(`M${x0},${r1(Y(v))}H${x1}`);
  out.push(
    `<path data-part="grid" d="${
      grid.join("")
    }" stroke="${FIGURE.grid}" stroke-width="1" fill="none"/>`,
  );
  const zero: string[] = [];
  if (spec.x.kind === "power" && X.ticks.values.includes(0)) zero.push(`M${r1(X(0))},${y1}V${y0}`);
  if (spec.y.kind === "power" && Y.ticks.values.includes(0)) zero.push(`M${x0},${r1(Y(0))}H${x1}`);
  if (zero.length) {
    out.push(
      `<path data-part="zero" d="${
        zero.join("")
      }" stroke="${FIGURE.axis}" stroke-width="1" stroke-dasharray="1 3" fill="none"/>`,
    );
  }
  const order: Layer["type"][] = ["area", "bars", "line", "marks", "rule", "ring"];
  const labels: string[] = [];
  const frame = { x0, x1, y0, y1 };
  for (const type of order) {
    for (const l of spec.layers) if (l.type === type) out.push(layerSvg(l, X, Y, labels, frame));
  }
  // Axes: a line along the bottom and the left, tick labels, titles.
  out.push(
    `<path data-part="axes" d="M${x0},${y1}V${y0}H${x1}" stroke="${FIGURE.axis}" fill="none"/>`,
  );
  const tx = X.ticks.values.map((v, i) =>
    `<text x="${r1(X(v))}" y="${y0 + 18}">${escapeHtml(X.ticks.labels[i])}</text>`
  );
  out.push(
    `<g data-part="horizontal-ticks" text-anchor="middle" fill="${FIGURE.tick}" font-size="11" ` +
      `style="font-variant-numeric:tabular-nums">${tx.join("")}</g>`,
  );
  const ty = Y.ticks.values.map((v, i) =>
    `<text x="${x0 - 8}" y="${r1(Y(v) + 4)}">${escapeHtml(Y.ticks.labels[i])}</text>`
  );
  out.push(
    `<g data-part="vertical-ticks" text-anchor="end" fill="${FIGURE.tick}" font-size="11" ` +
      `style="font-variant-numeric:tabular-nums">${ty.join("")}</g>`,
  );
  out.push(
    `<text data-part="horizontal-title" x="${r1((x0 + x1) / 2)}" y="${H - 12}" ` +
      `text-anchor="middle" font-weight="600">${escapeHtml(spec.x.title)}</text>`,
  );
  const my = r1((y0 + y1) / 2);
  out.push(
    `<text data-part="vertical-title" x="16" y="${my}" transform="rotate(-90 16 ${my})" ` +
      `text-anchor="middle" font-weight="600">${escapeHtml(spec.y.title)}</text>`,
  );
  if (spec.legend) out.push(legendSvg(spec.legend, x0, x1));
  out.push(...labels);
  out.push("</svg>");
  return out.join("");
}

function layerSvg(
  l: Layer,
  X: Scale,
  Y: Scale,
  labels: string[],
  frame: { readonly x0: number; readonly x1: number; readonly y0: number; readonly y1: number },
): string {
  const { x0, x1, y0, y1 } = frame;
  switch (l.type) {
    case "marks": {
      const s = l.size ?? 5;
      const op = l.opacity ?? 0.9;
      if (l.colours) {
        // One path per point: each has its own colour from the ramp.
        const ps: string[] = [];
        for (let i = 0; i < l.xs.length; i++) {
          const x = l.xs[i], y = l.ys[i];
          if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
          ps.push(`<path d="${shapePath("lentil", X(x), Y(y), s)}" fill="${l.colours[i]}"/>`);
        }
        return `<g data-part="${l.part}" fill-opacity="${op}">${ps.join("")}</g>`;
      }
      const bySeries = new Map<number, string[]>();
      for (let i = 0; i < l.xs.length; i++) {
        const x = l.xs[i], y = l.ys[i];
        if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
        const k = l.series ? l.series[i] : 0;
        let d = bySeries.get(k);
        if (!d) bySeries.set(k, d = []);
        d.push(shapePath(seriesShape(k), X(x), Y(y), s));
      }
      // A white edge parts a few marks on a line; many marks go without, so clusters stay dark.
      const edge = l.xs.length <= 200 ? ` stroke="#fff" stroke-width="0.8"` : "";
      const paths = [...bySeries].sort((a, b) => a[0] - b[0]).map(([k, d]) => {
        const c = seriesColour(k);
        return seriesShape(k) === "ring"
          ? `<path data-series="${k}" d="${
            d.join("")
          }" fill="none" stroke="${c}" stroke-width="1.6"/>`
          : `<path data-series="${k}" d="${d.join("")}" fill="${c}" fill-opacity="${op}"${edge}/>`;
      });
      return `<g data-part="${l.part}">${paths.join("")}</g>`;
    }
    case "line": {
      const pts = l.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
      if (pts.length < 2) return "";
      const d = pts.map((p, i) => `${i ? "L" : "M"}${r1(X(p.x))},${r1(Y(p.y))}`).join("") +
        (l.closed ? "Z" : "");
      return `<path data-part="${l.part}" d="${d}" fill="none" stroke="${
        l.colour ?? FIGURE.data
      }" stroke-width="${l.width ?? 1.8}" stroke-linejoin="round"${
        l.dash ? ` stroke-dasharray="${l.dash}"` : ""
      }/>`;
    }
    case "area": {
      const pts = l.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
      if (pts.length < 3) return "";
      const d = pts.map((p, i) => `${i ? "L" : "M"}${r1(X(p.x))},${r1(Y(p.y))}`).join("") + "Z";
      return `<path data-part="${l.part}" d="${d}" fill="${l.colour ?? FIGURE.limits}" ` +
        `fill-opacity="${l.opacity ?? 0.15}" stroke="none"/>`;
    }
    case "bars": {
      const base = Math.min(y0, Y(Math.max(0, Y.ticks.domain[0])));
      const d = l.bars.map((b) => {
        const a = X(b.x0), c = X(b.x1), top = Y(b.y);
        const w = Math.max(0.5, Math.abs(c - a) - 1.5);
        return `M${r1(Math.min(a, c) + 0.75)},${r1(base)}v${r1(top - base)}h${r1(w)}V${r1(base)}z`;
      }).join("");
      return `<path data-part="${l.part}" d="${d}" fill="${
        l.colour ?? FIGURE.data
      }" fill-opacity="0.85"/>`;
    }
    case "rule": {
      const c = l.colour ?? FIGURE.marked;
      const dash = l.dash ? ` stroke-dasharray="${l.dash}"` : "";
      if (l.axis === "y") {
        const y = r1(Y(l.at));
        if (l.label) {
          labels.push(
            `<text data-part="${l.part}-label" x="${x1 - 6}" y="${r1(Y(l.at) - 6)}" ` +
              `text-anchor="end" fill="${c}" font-size="11.5" font-weight="600" ` +
              `paint-order="stroke" stroke="#fff" stroke-width="3">${escapeHtml(l.label)}</text>`,
          );
        }
        return `<path data-part="${l.part}" d="M${x0},${y}H${x1}" stroke="${c}" stroke-width="1.5"${dash}/>`;
      }
      const x = r1(X(l.at));
      if (l.label) {
        labels.push(
          `<text data-part="${l.part}-label" x="${r1(X(l.at) + 6)}" y="${y1 + 12}" ` +
            `fill="${c}" font-size="11.5" font-weight="600" paint-order="stroke" stroke="#fff" ` +
            `stroke-width="3">${escapeHtml(l.label)}</text>`,
        );
      }
      return `<path data-part="${l.part}" d="M${x},${y1}V${y0}" stroke="${c}" stroke-width="1.5"${dash}/>`;
    }
    case "ring": {
      const c = l.colour ?? FIGURE.marked;
      const x = X(l.at.x), y = Y(l.at.y);
      if (l.label) {
        const below = y < y1 + 30;
        labels.push(
          `<text data-part="${l.part}-label" x="${r1(x + 12)}" y="${
            r1(below ? y + 22 : y - 12)
          }" ` +
            `fill="${c}" font-size="12" font-weight="700" paint-order="stroke" stroke="#fff" ` +
            `stroke-width="3">${escapeHtml(l.label)}</text>`,
        );
      }
      return `<circle data-part="${l.part}" cx="${r1(x)}" cy="${
        r1(y)
      }" r="8" fill="none" stroke="${c}" stroke-width="2.2"/>`;
    }
  }
}

function legendSvg(legend: Legend, x0: number, x1: number): string {
  const parts: string[] = [];
  let x = x0;
  const y = 18;
  parts.push(
    `<text x="${x}" y="${y + 4}" font-weight="600">${escapeHtml(legend.title)}:</text>`,
  );
  x += 16 + 7 * legend.title.length;
  if (legend.type === "series") {
    legend.names.forEach((name, k) => {
      if (x > x1 - 40) return;
      const c = seriesColour(k);
      const sh = seriesShape(k);
      parts.push(
        sh === "ring"
          ? `<path d="${shapePath(sh, x + 6, y, 6)}" fill="none" stroke="${c}" stroke-width="1.6"/>`
          : `<path d="${shapePath(sh, x + 6, y, 6)}" fill="${c}"/>`,
      );
      parts.push(`<text x="${x + 16}" y="${y + 4}">${escapeHtml(name)}</text>`);
      x += 30 + 7.5 * name.length;
    });
  } else {
    parts.push(`<text x="${x}" y="${y + 4}">${escapeHtml(legend.low)}</text>`);
    x += 6 + 7 * legend.low.length;
    const steps = 8;
    for (let i = 0; i < steps; i++) {
      parts.push(
        `<rect x="${x + 10 * i}" y="${y - 6}" width="10" height="12" fill="${
          mix(RAMP[0], RAMP[1], i / (steps - 1))
        }"/>`,
      );
    }
    x += 10 * steps + 6;
    parts.push(`<text x="${x}" y="${y + 4}">${escapeHtml(legend.high)}</text>`);
  }
  return `<g data-part="key">${parts.join("")}</g>`;
}
