/**
 * How a figure's axis reads, by the kind of measure on it: a power in dioptres is ticked on
 * lens steps (0.25 D and multiples) with signs (`+1.00`); logMAR on 0.1 steps with two
 * decimals; anything else on 1, 2 or 5 times a power of ten. Titles are the column's name in
 * words with its unit in brackets: `lens (D)`, `pair mean (D)`, `visual acuity (logMAR)`.
 *
 * @example
 * ```ts
 * import { axisTicks } from "./_axes.ts";
 * axisTicks("power", 0.9, 2.6).labels; // ["+1.00", "+1.50", "+2.00", "+2.50"]
 * ```
 *
 * @module
 */

import {
  formatMeasure,
  formatNumber,
  kindOfUnit,
  measureText,
  signed,
} from "../../cells/display.ts";

/** The kind of measure on an axis. */
export type AxisKind = "power" | "logmar" | "count" | "plain";

/** Ticks of an axis: the domain they span, their values and their labels. */
export interface AxisTicks {
  /** Lowest and highest value the axis shows. */
  readonly domain: readonly [number, number];
  /** Tick values, ascending. */
  readonly values: readonly number[];
  /** Tick labels, one per value. */
  readonly labels: readonly string[];
  /** The step between ticks. */
  readonly step: number;
}

/** Lens steps for a power axis, smallest first (D). Common practice, no source. */
const POWER_STEPS = [0.25, 0.5, 1, 2, 2.5, 5, 10, 20, 25, 50, 100];

/** At most this many intervals between ticks. */
const MAX_INTERVALS = 8;

/**
 * The kind of axis a column's unit asks for.
 *
 * @example
 * ```ts
 * import { axisKind } from "./_axes.ts";
 * axisKind("D"); // "power"
 * axisKind("logMAR"); // "logmar"
 * axisKind("mm"); // "plain"
 * ```
 */
export function axisKind(unit: string | undefined): AxisKind {
  const u = (unit ?? "").trim();
  if (u === "D" || u === "1/m") return "power";
  if (u.toLowerCase() === "logmar") return "logmar";
  return "plain";
}

function niceStep(span: number, integer: boolean): number {
  const raw = span / MAX_INTERVALS;
  const mag = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 2.5, 5, 10]) {
    const s = m * mag;
    if (s >= raw && (!integer || Number.isInteger(s))) return s;
  }
  return 10 * mag;
}

function decimalsOf(step: number): number {
  for (let d = 0; d < 6; d++) {
    if (Math.abs(Math.round(step * 10 ** d) - step * 10 ** d) < 1e-9) return d;
  }
  return 6;
}

/**
 * Ticks for values from `lo` to `hi` on an axis of the given kind. The domain is widened to
 * whole ticks; a single value is given one step either side.
 *
 * @example
 * ```ts
 * import { axisTicks } from "./_axes.ts";
 * axisTicks("logmar", -0.08, 0.3).labels; // ["-0.10", "0.00", "0.10", "0.20", "0.30"]
 * axisTicks("count", 0, 37).values.at(-1); // 40
 * ```
 */
export function axisTicks(kind: AxisKind, lo: number, hi: number): AxisTicks {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) [lo, hi] = [0, 1];
  if (lo > hi) [lo, hi] = [hi, lo];
  let step: number;
  if (kind === "power") {
    const span = hi - lo || 0.5;
    step = POWER_STEPS.find((s) => span / s <= MAX_INTERVALS) ?? niceStep(span, false);
  } else if (kind === "logmar") {
    const span = hi - lo || 0.2;
    step = span <= 1.6 ? 0.1 : span <= 3.2 ? 0.2 : 0.5;
  } else {
    const span = hi - lo || (Math.abs(hi) || 1);
    step = niceStep(span, kind === "count");
    if (kind === "count") step = Math.max(1, step);
  }
  let a = Math.floor(lo / step + 1e-9);
  let b = Math.ceil(hi / step - 1e-9);
  if (a === b) {
    a -= 1;
    b += 1;
  }
  const values: number[] = [];
  for (let k = a; k <= b; k++) values.push(Number((k * step).toFixed(10)));
  const digits = decimalsOf(step);
  const labels = values.map((v) => {
    if (kind === "power") return signed(v);
    if (kind === "logmar") return Math.abs(v) < 1e-9 ? "0.00" : v.toFixed(2);
    return Math.abs(v) < 1e-12 ? "0" : v.toFixed(digits);
  });
  return { domain: [a * step, b * step], values, labels, step };
}

/** Trade abbreviations written out in axis titles. Common practice, no source. */
const WORDS: Readonly<Record<string, string>> = {
  va: "visual acuity",
  bcva: "best corrected visual acuity",
  se: "spherical equivalent",
  sph: "sphere",
  cyl: "cylinder",
};

/** Units as the trade writes them. */
const UNIT_TEXT: Readonly<Record<string, string>> = { um: "µm", prism: "Δ", deg: "°" };

/**
 * A column's name in words: camelCase and underscores split, trade abbreviations written out;
 * names that are symbols of the trade (`M`, `J0`, `J45`) stay as they are.
 *
 * @example
 * ```ts
 * import { columnWords } from "./_axes.ts";
 * columnWords("pairDifference"); // "pair difference"
 * columnWords("va"); // "visual acuity"
 * columnWords("J45"); // "J45"
 * ```
 */
export function columnWords(name: string): string {
  const known = WORDS[name.toLowerCase()];
  if (known) return known;
  if (/^[A-Z][0-9]*$/.test(name) || /^J\d+$/.test(name)) return name;
  return name.replace(/_+/g, " ").replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/\b([A-Z])([a-z])/g, (_, a: string, b: string) => a.toLowerCase() + b).trim();
}

/**
 * An axis title: the column in words and its unit in brackets.
 *
 * @example
 * ```ts
 * import { axisTitle } from "./_axes.ts";
 * axisTitle("lens", "D"); // "lens (D)"
 * axisTitle("va", "logMAR"); // "visual acuity (logMAR)"
 * axisTitle("blurDisc", "um"); // "blur disc (µm)"
 * ```
 */
export function axisTitle(name: string, unit: string | undefined): string {
  const words = columnWords(name);
  if (!unit) return words;
  return `${words} (${UNIT_TEXT[unit] ?? unit})`;
}

/**
 * A value as a figure's label writes it: a power signed in D, logMAR two decimals, others
 * with their unit.
 *
 * @example
 * ```ts
 * import { valueText } from "./_axes.ts";
 * valueText(1.75, "D"); // "+1.75 D"
 * valueText(-0.08, "logMAR"); // "-0.08 logMAR"
 * ```
 */
export function valueText(v: number, unit: string | undefined): string {
  const kind = axisKind(unit);
  // One display rule per kind of measure (lib/number_text.ts), as results and messages use.
  if (kind === "power") return formatMeasure(v, "measure");
  if (kind === "logmar") return formatMeasure(v, "logMAR");
  const rule = unit ? kindOfUnit(unit) : undefined;
  if (rule) return measureText(v, rule, unit);
  const n = formatNumber(v);
  return unit ? `${n} ${UNIT_TEXT[unit] ?? unit}` : n;
}
