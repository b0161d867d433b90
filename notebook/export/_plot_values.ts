/**
 * Reading the JSON form of cell values for plots: a marked point (an endpoint), a list of
 * curve or outline points (a fitted through-focus curve, a confidence ellipse), and limits
 * of agreement. Nothing is computed here; the values come from cells (an ellipse's outline is traced
 * by `lib/ellipse.ts`).
 *
 * @module
 */

import { ellipseOutline } from "../../lib/ellipse.ts";

/** A plotted point. */
export interface XY {
  /** Horizontal value. */
  readonly x: number;
  /** Vertical value. */
  readonly y: number;
}

/** Limits of agreement as a cell gives them. */
export interface Limits {
  /** Mean difference (bias), if given. */
  readonly bias?: number;
  /** Lower limit. */
  readonly lower: number;
  /** Upper limit. */
  readonly upper: number;
}

const X_KEYS = ["x", "power", "lens", "defocus", "mean", "average", "j0", "M"];
const Y_KEYS = ["y", "logMAR", "logmar", "va", "acuity", "fitted", "difference", "diff", "j45"];
const POINT_LIST_KEYS = ["points", "outline", "boundary", "polygon", "ellipse", "curve", "fit"];
const MARK_X_KEYS = ["endpoint", "x", "power", "lens", "at", "value"];
const MARK_Y_KEYS = ["endpointLogMAR", "y", "logMAR", "va", "acuity"];

function num(v: unknown): number | undefined {
  if (typeof v === "number" && Number.isFinite(v)) return v;
  if (v && typeof v === "object" && "value" in v) return num((v as { value: unknown }).value);
  return undefined;
}

function pick(o: Record<string, unknown>, keys: readonly string[]): number | undefined {
  for (const k of keys) {
    const n = num(o[k]);
    if (n !== undefined) return n;
  }
  return undefined;
}

function asPoint(p: unknown): XY | undefined {
  if (Array.isArray(p) && p.length >= 2) {
    const x = num(p[0]);
    const y = num(p[1]);
    return x !== undefined && y !== undefined ? { x, y } : undefined;
  }
  if (p && typeof p === "object") {
    const o = p as Record<string, unknown>;
    const x = pick(o, X_KEYS);
    const y = pick(o, Y_KEYS);
    return x !== undefined && y !== undefined ? { x, y } : undefined;
  }
  return undefined;
}

/**
 * A list of points from a value: an array of `[x, y]` pairs or point records, or such an
 * array under a key like `points`, `outline`, `curve` or `fit.curve`. Undefined when none.
 *
 * @example
 * ```ts
 * import { pointsOf } from "./_plot_values.ts";
 * pointsOf({ fit: { curve: [{ power: 0, logMAR: 0 }, { power: 1, logMAR: 0.3 }] } })?.length; // 2
 * ```
 */
export function pointsOf(v: unknown, depth = 0): XY[] | undefined {
  if (depth > 3 || v === null || typeof v !== "object") return undefined;
  if (Array.isArray(v)) {
    if (v.length < 2) return undefined;
    const pts = v.map(asPoint);
    return pts.every((p) => p) ? pts as XY[] : undefined;
  }
  const o = v as Record<string, unknown>;
  for (const k of POINT_LIST_KEYS) {
    if (k in o) {
      const pts = pointsOf(o[k], depth + 1);
      if (pts) return pts;
    }
  }
  return outlineOf(o);
}

/**
 * The outline of an ellipse given by its centre (`cx`, `cy`, or `centreJ0`, `centreJ45`
 * as the statistics cells give it), semi-axes (`semiMajor`,
 * `semiMinor`) and the major axis direction (`angle`, degrees from +x), traced at 96 points
 * by `lib/ellipse.ts` for drawing. Undefined when the record is not such an ellipse.
 *
 * @example
 * ```ts
 * import { outlineOf } from "./_plot_values.ts";
 * outlineOf({ cx: 0, cy: 0, semiMajor: 2, semiMinor: 1, angle: 0 })?.[0]; // { x: 2, y: 0 }
 * ```
 */
export function outlineOf(o: Record<string, unknown>): XY[] | undefined {
  const cx = num(o.cx) ?? num(o.centreJ0) ?? num(o.centreX) ?? num(o.centerX);
  const cy = num(o.cy) ?? num(o.centreJ45) ?? num(o.centreY) ?? num(o.centerY);
  const a = num(o.semiMajor);
  const b = num(o.semiMinor);
  const angle = num(o.angle) ?? 0;
  if (cx === undefined || cy === undefined || a === undefined || b === undefined) return undefined;
  return ellipseOutline({ cx, cy, semiMajor: a, semiMinor: b, angle }, 96);
}

/**
 * The point a value marks: a number gives `x` only; a record gives `x` from `endpoint`,
 * `x`, `power`… and `y` from `endpointLogMAR`, `y`, `logMAR`… when present.
 *
 * @example
 * ```ts
 * import { markOf } from "./_plot_values.ts";
 * markOf({ endpoint: 0.25, endpointLogMAR: -0.1 }); // { x: 0.25, y: -0.1 }
 * markOf(0.5); // { x: 0.5 }
 * ```
 */
export function markOf(v: unknown): { x: number; y?: number } | undefined {
  const n = num(v);
  if (n !== undefined) return { x: n };
  if (Array.isArray(v)) {
    const p = asPoint(v);
    return p;
  }
  if (v && typeof v === "object") {
    const o = v as Record<string, unknown>;
    const x = pick(o, MARK_X_KEYS);
    if (x === undefined) return undefined;
    const y = pick(o, MARK_Y_KEYS);
    return y === undefined ? { x } : { x, y };
  }
  return undefined;
}

/**
 * Limits of agreement from a value: a record with `lower` and `upper` (or `low`/`high`,
 * `lowerLimit`/`upperLimit`) and optionally `bias` (or `mean`, `meanDifference`), possibly
 * under a `limits` key; or an array `[lower, bias, upper]` or `[lower, upper]`.
 *
 * @example
 * ```ts
 * import { limitsOf } from "./_plot_values.ts";
 * limitsOf({ bias: 0.1, lower: -0.4, upper: 0.6 }); // { bias: 0.1, lower: -0.4, upper: 0.6 }
 * ```
 */
export function limitsOf(v: unknown, depth = 0): Limits | undefined {
  if (depth > 3 || v === null || typeof v !== "object") return undefined;
  if (Array.isArray(v)) {
    const ns = v.map(num);
    if (!ns.every((n) => n !== undefined)) return undefined;
    if (ns.length === 3) return { lower: ns[0]!, bias: ns[1]!, upper: ns[2]! };
    if (ns.length === 2) return { lower: ns[0]!, upper: ns[1]! };
    return undefined;
  }
  const o = v as Record<string, unknown>;
  const lower = pick(o, ["lower", "low", "lowerLimit", "lo"]);
  const upper = pick(o, ["upper", "high", "upperLimit", "hi"]);
  const bias = pick(o, ["bias", "meanDifference", "meanDiff", "mean"]);
  if (lower !== undefined && upper !== undefined) {
    return bias === undefined ? { lower, upper } : { bias, lower, upper };
  }
  for (const k of ["limits", "agreement", "loa"]) {
    if (k in o) {
      const inner = limitsOf(o[k], depth + 1);
      if (inner) return inner.bias === undefined && bias !== undefined ? { ...inner, bias } : inner;
    }
  }
  return undefined;
}
