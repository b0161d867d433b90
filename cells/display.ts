/**
 * Display of results in the trade's conventions: powers signed with two decimals in the
 * notebook's power step (`+1.25 D`, with the exact value beside it when rounding changed
 * it), prism in Δ, whole-degree axes, lengths with sensible decimals.
 *
 * @example
 * ```ts
 * import { formatPower } from "./display.ts";
 * formatPower(1.25); // "+1.25 D"
 * formatPower(-8.928, 0.25); // "-9.00 D (exact -8.93)"
 * ```
 *
 * The digits of every kind of measure are declared once, in `lib/number_text.ts`
 * (`MEASURE_RULES`), so `lib/` messages follow them too; this module re-exports them.
 *
 * @module
 */

import {
  kindOfUnit,
  type MeasureKind,
  measureNumber,
  measureText,
  significant,
  unitText,
} from "../lib/number_text.ts";

/**
 * A signed power with two decimals; when `step` is given and the value is not on a step,
 * the nearest step is shown first and the exact value after it. Zero is "0.00".
 *
 * @example
 * ```ts
 * import { formatPower } from "./display.ts";
 * formatPower(-0.5); // "-0.50 D"
 * formatPower(0); // "0.00 D"
 * ```
 */
export function formatPower(value: number, step?: number, unit = "D"): string {
  const u = unit ? ` ${unit}` : "";
  if (!Number.isFinite(value)) return `${value}${u}`;
  if (step && step > 0 && Number.isFinite(value / step)) {
    const shown = signed(Math.round(value / step) * step);
    const exact = signed(value);
    if (shown !== exact) return `${shown}${u} (exact ${exact})`;
  }
  return `${signed(value)}${u}`;
}

/**
 * Signed two-decimal text for a power, "0.00" for zero.
 *
 * @example
 * ```ts
 * import { signed } from "./display.ts";
 * signed(2); // "+2.00"
 * signed(-1.375); // "-1.38"
 * ```
 */
export function signed(value: number): string {
  // Halves round away from zero for either sign (−1.375 → −1.38, as +1.375 → +1.38); the
  // small nudge absorbs binary representation (−1.375 × 100 is −137.49999…).
  const r = Math.round(Math.abs(value) * 100 + 1e-7) / 100;
  if (r === 0) return "0.00";
  // Beyond what two decimals can hold (|value| near the largest double): powers of ten.
  if (!Number.isFinite(r)) return (value > 0 ? "+" : "-") + Math.abs(value).toExponential(2);
  return (value > 0 ? "+" : "-") + r.toFixed(2);
}

/**
 * A plain number: integers as they are, others to `digits` significant figures without
 * trailing zeros.
 *
 * @example
 * ```ts
 * import { formatNumber } from "./display.ts";
 * formatNumber(1 / 729); // "0.001372"
 * formatNumber(8.7266); // "8.727"
 * ```
 */
export function formatNumber(value: number, digits = 4): string {
  return significant(value, digits);
}

/**
 * A quantity in the unit it carries, by the display rule of its kind of measure (see
 * `MEASURE_RULES`): powers in the step, Δ and mm to two decimals, whole degrees, arcmin to
 * one decimal, µm whole.
 *
 * @example
 * ```ts
 * import { formatQuantity } from "./display.ts";
 * formatQuantity(12, "mm"); // "12.00 mm"
 * formatQuantity(170, "deg"); // "170°"
 * formatQuantity(1.5, "prism"); // "1.50 Δ"
 * formatQuantity(36.14, "arcmin"); // "36.1 arcmin"
 * formatQuantity(12.4, "um"); // "12 µm"
 * ```
 */
export function formatQuantity(value: number, unit: string, powerStep?: number): string {
  if (unit === "D") return formatPower(value, powerStep);
  if (unit === "") return formatNumber(value);
  const kind = kindOfUnit(unit);
  if (kind) return measureText(value, kind, unit);
  return `${formatNumber(value)} ${unitText(unit)}`;
}

/**
 * A measure by the rule of its kind (`"logMAR"`, `"letters"`, `"covariance"`…), with its unit
 * word unless `bare` is set (a table cell whose header carries the unit).
 *
 * @example
 * ```ts
 * import { formatMeasure } from "./display.ts";
 * formatMeasure(0.1996, "logMAR"); // "0.20 logMAR"
 * formatMeasure(75.02, "letters"); // "75 letters"
 * formatMeasure(-0.0001548, "covariance"); // "-0.0001548 D²"
 * formatMeasure(0.1996, "logMAR", { bare: true }); // "0.20"
 * ```
 */
export function formatMeasure(
  value: number,
  kind: MeasureKind,
  options: { bare?: boolean; powerStep?: number } = {},
): string {
  if (kind === "power") {
    const t = formatPower(value, options.powerStep, options.bare ? "" : "D");
    return t;
  }
  return options.bare ? measureNumber(value, kind) : measureText(value, kind);
}

/**
 * An input as it was typed: a number with a unit (`12 mm`, `1.5prism`, `-4 D`) shows the
 * number exactly as written and the unit as the trade writes it; other inputs return
 * undefined (they display by their value).
 *
 * @example
 * ```ts
 * import { asTyped } from "./display.ts";
 * asTyped("12 mm"); // "12 mm"
 * asTyped("1.5 prism"); // "1.5 Δ"
 * asTyped("170 deg"); // "170°"
 * asTyped('rx("-2.00 DS")'); // undefined
 * ```
 */
export function asTyped(expression: string): string | undefined {
  const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?)\s*([A-Za-z]+(?:\^-?\d+)?)?\s*$/.exec(
    expression,
  );
  if (!m) return undefined;
  const [, n, unit] = m;
  if (!unit) return n;
  const u = unitText(unit);
  return u === "°" ? `${n}°` : `${n} ${u}`;
}

export {
  fixed,
  kindOfUnit,
  MEASURE_RULES,
  type MeasureKind,
  measureNumber,
  measureText,
  numberInMessage,
  unitText,
} from "../lib/number_text.ts";
