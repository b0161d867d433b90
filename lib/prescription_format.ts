/**
 * Writing a prescription back in the trade's way: signed two-decimal powers, `plano` for a
 * zero sphere, `DS` for a sphere alone, whole-degree axes 1–180 (0 written as 180), then the
 * add and the prism with its base. The text reads back with `parsePrescription`.
 * Sources: common-practice, iso-13666-axis.
 *
 * @example
 * ```ts
 * import { formatPrescription } from "./prescription_format.ts";
 * formatPrescription({ sphere: -2.25, cylinder: -0.75, axis: 170 }); // "-2.25 / -0.75 × 170"
 * ```
 *
 * @module
 */

import type { Prescription } from "./prescription.ts";
import type { Prism } from "./prism.ts";
import { normaliseAxis } from "./spherocylinder.ts";

/**
 * A power as the trade writes it: sign and two decimals, "0.00" for zero; a power given to
 * three decimals (an eighth-dioptre step) keeps its third. Source: common-practice.
 *
 * @example
 * ```ts
 * import { signedPower } from "./prescription_format.ts";
 * signedPower(0.5); // "+0.50"
 * signedPower(-3.375); // "-3.375"
 * ```
 */
export function signedPower(value: number): string {
  // A power written to three decimals (an eighth-dioptre step, an instrument's reading)
  // keeps them; anything else, a computed figure included, is written to two.
  const thousandths = Math.round(value * 1000);
  const onThousandth = Math.abs(value * 1000 - thousandths) < 1e-6;
  if (onThousandth && thousandths % 10 !== 0) {
    return (value > 0 ? "+" : "-") + (Math.abs(thousandths) / 1000).toFixed(3);
  }
  const r = Math.round(value * 100) / 100;
  if (r === 0) return "0.00";
  return (r > 0 ? "+" : "-") + Math.abs(r).toFixed(2);
}

/**
 * An axis as written: whole degrees 1–180, 0 written as 180. Source: iso-13666-axis.
 *
 * @example
 * ```ts
 * import { formatAxis } from "./prescription_format.ts";
 * formatAxis(0.4); // "180"
 * ```
 */
export function formatAxis(axis: number): string {
  return String(normaliseAxis(Math.round(normaliseAxis(axis))));
}

/**
 * A prism as written: `1.50 Δ BI, 0.50 Δ BU` (two decimals; nothing for no prism).
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { formatPrism } from "./prescription_format.ts";
 * formatPrism({ horizontal: -2, vertical: 0.5 }); // "2.00 Δ BO, 0.50 Δ BU"
 * ```
 */
export function formatPrism(p: Prism): string {
  const parts: string[] = [];
  const h = Math.round(p.horizontal * 100) / 100;
  const v = Math.round(p.vertical * 100) / 100;
  if (h !== 0) parts.push(`${Math.abs(h).toFixed(2)} Δ ${h > 0 ? "BI" : "BO"}`);
  if (v !== 0) parts.push(`${Math.abs(v).toFixed(2)} Δ ${v > 0 ? "BU" : "BD"}`);
  return parts.join(", ");
}

/**
 * A prescription in the trade's way, e.g. `R: -2.25 / -0.75 × 170, add +2.00, 1.00 Δ BU`,
 * `+1.00 DS`, `plano / -0.50 × 90`, `plano`. The cylinder form is kept as given.
 * Sources: common-practice, iso-13666-axis.
 *
 * @example
 * ```ts
 * import { formatPrescription } from "./prescription_format.ts";
 * formatPrescription({ sphere: 1, cylinder: 0, axis: 180 }); // "+1.00 DS"
 * formatPrescription({ sphere: 0, cylinder: -0.5, axis: 0 }); // "plano / -0.50 × 180"
 * ```
 */
export function formatPrescription(rx: Prescription): string {
  const cyl = signedPower(rx.cylinder);
  const sph = signedPower(rx.sphere);
  let text: string;
  if (cyl === "0.00") text = sph === "0.00" ? "plano" : `${sph} DS`;
  else text = `${sph === "0.00" ? "plano" : sph} / ${cyl} × ${formatAxis(rx.axis)}`;
  const parts = [text];
  if (rx.add !== undefined) parts.push(`add ${signedPower(rx.add)}`);
  if (rx.prism) {
    const p = formatPrism(rx.prism);
    if (p) parts.push(p);
  }
  return (rx.eye ? `${rx.eye}: ` : "") + parts.join(", ");
}
