/**
 * Through-focus curves: acuity against trial lens power, predicted from the blur
 * approximation with or without accommodation, and fitted to measured readings by least
 * squares.
 *
 * Prediction: with a lens P before an eye whose correction at infinity is R, a chart at d
 * metres asks for accommodation R − P + 1/d. A negative demand is myopic blur no
 * accommodation can clear; a positive one is cleared up to the amplitude and blurs beyond
 * it. The residual defocus gives MAR by {@linkcode blurredMAR} (smith-1991, an
 * approximation); amplitude 0 gives the curve without accommodation.
 *
 * Fitting (through-focus-fit, an empirical description): logMAR against power as
 * - `peak`: y = b + s·max(0, |P − c| − w/2), a flat-bottomed V: best focus c, flat width w;
 * - `hinge`: y = b + s·max(0, P − h), flat on the minus side (active accommodation): best
 *   focus h, the plus end of the plateau.
 * Depth of focus is the width of power over which the fitted curve stays within the
 * tolerance of its best, within the powers tested.
 *
 * @example
 * ```ts
 * import { fitThroughFocus } from "./through_focus.ts";
 * const pts = [1, 0.5, 0, -0.5, -1].map((p) => ({ power: p, logMAR: Math.max(0, p) * 0.4 }));
 * fitThroughFocus(pts, "hinge").bestFocus; // 0
 * ```
 *
 * @module
 */

import { checkFinite, checkRange, LentilInputError } from "./errors.ts";
import { type BlurAcuityOptions, blurredMAR } from "./blur.ts";
import { accommodativeDemand } from "./accommodation.ts";

/** One point of a through-focus curve. */
export interface FocusPoint {
  /** Trial lens power, D. */
  readonly power: number;
  /** Acuity, logMAR. */
  readonly logMAR: number;
}

/** One predicted point, with how it came about. */
export interface PredictedPoint extends FocusPoint {
  /** Accommodation the chart asks for with this lens, D (negative: fogged). */
  readonly demand: number;
  /** Accommodation used, D. */
  readonly accommodation: number;
  /** Defocus left after accommodating, D (0 = in focus). */
  readonly residual: number;
}

/** Inputs of a through-focus prediction. */
export interface PredictOptions extends BlurAcuityOptions {
  /** The eye's correction at infinity, D. */
  readonly rx: number;
  /** Pupil diameter, mm. */
  readonly pupil: number;
  /** Amplitude of accommodation available, D (0: none). */
  readonly amplitude?: number;
  /** Chart distance, m (default 6). */
  readonly testDistance?: number;
}

/**
 * Predicted logMAR for each trial lens power. Sources: smith-1991 (an approximation),
 * hofstetter-1950 (amplitudes to feed it), test-distance-vergence.
 *
 * @example
 * ```ts
 * import { predictThroughFocus } from "./through_focus.ts";
 * const [p] = predictThroughFocus([-1.5], { rx: -1, pupil: 4, amplitude: 2, testDistance: Infinity });
 * p.accommodation; // 0.5
 * p.logMAR; // 0
 * ```
 * @throws {LentilRangeError} for a bad pupil, amplitude, distance or power.
 */
export function predictThroughFocus(
  powers: readonly number[],
  options: PredictOptions,
): PredictedPoint[] {
  checkFinite("correction", options.rx);
  const amplitude = checkRange("amplitude", options.amplitude ?? 0, 0, 30, "D");
  const chart = accommodativeDemand(options.testDistance ?? 6);
  return powers.map((power, i) => {
    checkFinite(`lens power ${i + 1}`, power);
    const demand = options.rx - power + chart;
    const accommodation = Math.min(Math.max(demand, 0), amplitude);
    const residual = demand - accommodation;
    const logMAR = Math.log10(blurredMAR(options.pupil, residual, options));
    return { power, logMAR, demand, accommodation, residual };
  });
}

/**
 * Powers from `from` to `to` D in steps of `step` D (either direction), ends included.
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { powerRange } from "./through_focus.ts";
 * powerRange(1, 0, 0.25); // [1, 0.75, 0.5, 0.25, 0]
 * ```
 * @throws {LentilRangeError} for a step outside 0.01–10 D or more than 10 000 powers.
 */
export function powerRange(from: number, to: number, step: number): number[] {
  checkFinite("first power", from);
  checkFinite("last power", to);
  checkRange("power step", step, 0.01, 10, "D");
  const n = Math.floor(Math.abs(to - from) / step + 1e-9);
  checkRange("number of powers", n + 1, 1, 10000);
  const dir = to >= from ? 1 : -1;
  return Array.from({ length: n + 1 }, (_, i) => Math.round((from + dir * i * step) * 1e9) / 1e9);
}

/** The two through-focus models. */
export type FocusModel = "peak" | "hinge";

/** A fitted through-focus model. */
export interface FocusFit {
  /** Which model. */
  readonly model: FocusModel;
  /** Power of best focus, D (peak: centre; hinge: plus end of the plateau). */
  readonly bestFocus: number;
  /** Plus end of the fitted flat part, D (the fit's most plus lens with best acuity). */
  readonly plusEnd: number;
  /** Fitted best logMAR. */
  readonly bestLogMAR: number;
  /** logMAR lost per D of defocus outside the flat part. */
  readonly slope: number;
  /** Width of the flat part, D (hinge: from the most minus power tested). */
  readonly flatWidth: number;
  /** Powers (D) between which the fit is within `tolerance` of its best. */
  readonly depthOfFocus: { readonly from: number; readonly to: number; readonly width: number };
  /** True when the depth of focus reaches the end of the powers tested. */
  readonly depthOpen: boolean;
  /** Tolerance used for the depth of focus, logMAR. */
  readonly tolerance: number;
  /** Each point with its fitted value and residual (observed − fitted). */
  readonly residuals: readonly {
    power: number;
    observed: number;
    fitted: number;
    residual: number;
  }[];
  /** Root mean square residual, logMAR. */
  readonly rms: number;
  /** Sum of squared residuals. */
  readonly sumSquares: number;
  /** The fitted curve over the powers tested, for plotting. */
  readonly curve: readonly FocusPoint[];
}

function modelValue(model: FocusModel, p: number, b: number, s: number, c: number, w: number) {
  return b + s * shape(model, p, c, w);
}

function shape(model: FocusModel, p: number, c: number, w: number): number {
  return model === "peak" ? Math.max(0, Math.abs(p - c) - w / 2) : Math.max(0, p - c);
}

/**
 * Least squares of y = b + s·g with g = shape(p) for fixed break points; s held at ≥ 0.
 * Written without arrays: the grid search calls it up to 160 000 times a fit.
 */
function fitAt(
  model: FocusModel,
  powers: readonly number[],
  y: readonly number[],
  c: number,
  w: number,
): { b: number; s: number; sse: number } {
  const n = y.length;
  let sg = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    sg += shape(model, powers[i], c, w);
    sy += y[i];
  }
  const mg = sg / n;
  const my = sy / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    const dg = shape(model, powers[i], c, w) - mg;
    sxy += dg * (y[i] - my);
    sxx += dg ** 2;
  }
  const s = sxx > 1e-12 ? Math.max(0, sxy / sxx) : 0;
  const b = my - s * mg;
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (y[i] - b - s * shape(model, powers[i], c, w)) ** 2;
  return { b, s, sse };
}

/**
 * Fit a through-focus model to measured points by least squares: the break points are
 * searched on a grid of 0.01 D (coarser beyond 4 D of range, 400 steps) over the powers
 * tested, the level and slope solved exactly
 * for each. Source: through-focus-fit.
 *
 * @example
 * ```ts
 * import { fitThroughFocus } from "./through_focus.ts";
 * const pts = [1, 0.5, 0, -0.5, -1].map((p) => ({ power: p, logMAR: Math.abs(p) * 0.3 }));
 * fitThroughFocus(pts, "peak").bestFocus; // 0
 * ```
 * @throws {LentilInputError} with fewer than three distinct powers.
 */
export function fitThroughFocus(
  points: readonly FocusPoint[],
  model: FocusModel,
  tolerance = 0.02,
): FocusFit {
  // The same trials are often fitted again (a live edit of a cell beside them): the fit is
  // a pure function of its inputs, so the last few are kept.
  const key = `${model} ${tolerance} ${points.map((p) => `${p.power},${p.logMAR}`).join(" ")}`;
  const hit = recentFits.get(key);
  if (hit) return hit;
  const fit = searchFit(points, model, tolerance);
  recentFits.set(key, fit);
  if (recentFits.size > 32) recentFits.delete(recentFits.keys().next().value!);
  return fit;
}

/** The last fits made, by their inputs. */
const recentFits = new Map<string, FocusFit>();

/** {@linkcode fitThroughFocus} itself: the grid search. */
function searchFit(
  points: readonly FocusPoint[],
  model: FocusModel,
  tolerance: number,
): FocusFit {
  const powers = points.map((p) => p.power);
  const y = points.map((p) => p.logMAR);
  const distinct = new Set(powers).size;
  if (distinct < 3) {
    throw new LentilInputError(
      `a through-focus fit needs at least three different lens powers (got ${distinct})`,
    );
  }
  checkRange("tolerance", tolerance, 0, 1, "logMAR");
  const lo = Math.min(...powers);
  const hi = Math.max(...powers);
  const grid = Math.max(1, Math.min(400, Math.round((hi - lo) / 0.01)));
  const at = (i: number) => lo + ((hi - lo) * i) / grid;
  let best = { sse: Infinity, b: 0, s: 0, c: 0, w: 0 };
  const widths = model === "peak" ? grid : 0;
  for (let i = 0; i <= grid; i++) {
    const c = at(i);
    for (let j = 0; j <= widths; j++) {
      const w = 2 * (at(j) - lo);
      if (model === "peak" && (c - w / 2 < lo - 1e-9 && c + w / 2 > hi + 1e-9)) break;
      const { b, s, sse } = fitAt(model, powers, y, c, w);
      // Prefer, among equal fits, the narrowest flat part and the most plus break.
      if (sse < best.sse - 1e-12 || (Math.abs(sse - best.sse) <= 1e-12 && w < best.w)) {
        best = { sse, b, s, c, w };
      } else if (Math.abs(sse - best.sse) <= 1e-12 && w === best.w && c > best.c) {
        best = { sse, b, s, c, w };
      }
    }
  }
  const { b, s, c, w } = best;
  const f = (p: number) => modelValue(model, p, b, s, c, w);
  const residuals = points.map((p) => {
    const fitted = f(p.power);
    return { power: p.power, observed: p.logMAR, fitted, residual: p.logMAR - fitted };
  });
  const reach = s > 1e-9 ? tolerance / s : Infinity;
  const rawFrom = model === "peak" ? c - w / 2 - reach : -Infinity;
  const rawTo = (model === "peak" ? c + w / 2 : c) + reach;
  const from = Math.max(lo, rawFrom);
  const to = Math.min(hi, rawTo);
  const curve = powerRange(lo, hi, Math.max(0.01, (hi - lo) / 100)).map((p) => ({
    power: p,
    logMAR: f(p),
  }));
  const round = (x: number) => Math.round(x * 1e6) / 1e6;
  return {
    model,
    bestFocus: round(c),
    plusEnd: round(model === "peak" ? c + w / 2 : c),
    bestLogMAR: round(b),
    slope: round(s),
    flatWidth: round(model === "peak" ? w : c - lo),
    depthOfFocus: { from: round(from), to: round(to), width: round(to - from) },
    depthOpen: rawFrom < lo || rawTo > hi,
    tolerance,
    residuals,
    rms: Math.sqrt(best.sse / points.length),
    sumSquares: best.sse,
    curve,
  };
}
