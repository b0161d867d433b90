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
 * @module
 */

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
  if (step && step > 0) {
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
  if (!Number.isFinite(value)) return String(value);
  if (Number.isInteger(value) && Math.abs(value) < 1e15) return String(value);
  const abs = Math.abs(value);
  if (abs !== 0 && (abs < 1e-6 || abs >= 1e15)) return value.toExponential(digits - 1);
  const s = value.toPrecision(digits);
  return s.includes("e") ? s : s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}

/**
 * A quantity in the unit it carries, by the trade's conventions for that unit.
 *
 * @example
 * ```ts
 * import { formatQuantity } from "./display.ts";
 * formatQuantity(12, "mm"); // "12.00 mm"
 * formatQuantity(170, "deg"); // "170°"
 * formatQuantity(1.5, "prism"); // "1.50 Δ"
 * ```
 */
export function formatQuantity(value: number, unit: string, powerStep?: number): string {
  switch (unit) {
    case "D":
      return formatPower(value, powerStep);
    case "prism":
      return `${value.toFixed(2)} Δ`;
    case "deg":
      return Number.isInteger(value) ? `${value}°` : `${formatNumber(value)}°`;
    case "mm":
    case "cm":
      return `${value.toFixed(2)} ${unit}`;
    case "":
      return formatNumber(value);
    default:
      return `${formatNumber(value)} ${unit}`;
  }
}
