/**
 * Private: a trial lens power as text inside `lib/` messages ("+0.25 D", "0.00 D").
 *
 * @example
 * ```ts
 * import { formatPower } from "./_power_text.ts";
 * formatPower(-0.5); // "-0.50 D"
 * ```
 *
 * @module
 */

/**
 * Signed power with two decimals and the unit. Source: common-practice.
 *
 * @example
 * ```ts
 * import { formatPower } from "./_power_text.ts";
 * formatPower(0.25); // "+0.25 D"
 * ```
 */
export function formatPower(power: number): string {
  const hundredths = Math.round(power * 100);
  const sign = hundredths > 0 ? "+" : hundredths < 0 ? "-" : "";
  return `${sign}${(Math.abs(hundredths) / 100).toFixed(2)} D`;
}
