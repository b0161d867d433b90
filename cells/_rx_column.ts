/**
 * A column of prescriptions read once into sphere, cylinder and axis arrays. Text in the
 * plain forms a refraction column holds (`-2.25 / -0.75 x 170`, `+1.00 DS`, `-2.00`,
 * `plano`) is read by a fast path that checks what the prescription parser checks (the
 * sphere and cylinder ranges, at most three decimals, whole-degree axes 0–180 with 0 written
 * 180); anything else — an eye, an add, a prism, a decimal comma, another separator, a value
 * the fast path would refuse — goes through the prescription parser itself, so both give
 * the same numbers and the same errors. Prescription values (`[rx]` cells already read) are
 * taken as they are.
 *
 * Source: common-practice (the trade's prescription notation, as `lib/prescription.ts`).
 *
 * @module
 */

import { CYLINDER_RANGE, parsePrescription, SPHERE_RANGE } from "../lib/prescription.ts";

/** Sphere, cylinder and axis (D, D, deg) of a column; NaN where a cell is empty. */
export interface RxArrays {
  /** Spheres (D). */
  readonly sph: Float64Array;
  /** Cylinders (D). */
  readonly cyl: Float64Array;
  /** Axes (deg). */
  readonly axis: Float64Array;
}

const POWER = String.raw`[+-]?\d{1,2}(?:\.\d{1,3})?`;
const FULL = new RegExp(String.raw`^\s*(${POWER})\s*\/\s*(${POWER})\s*[x×]\s*(\d{1,3})\s*$`);
const SPHERE_ONLY = new RegExp(String.raw`^\s*(${POWER})(?:\s*DS)?\s*$`);
const PLANO = /^\s*(?:pl|plano)\s*$/i;

function inRange(x: number, r: readonly [number, number]): boolean {
  return x >= r[0] && x <= r[1];
}

/**
 * One prescription text's sphere, cylinder and axis by the fast path, or undefined when the
 * text is not in a plain form (or a check would fail: the prescription parser then says why).
 *
 * @example
 * ```ts
 * import { fastRx } from "./_rx_column.ts";
 * fastRx("-2.25 / -0.75 x 170"); // [-2.25, -0.75, 170]
 * fastRx("R -2.25 / -0.75 x 170"); // undefined (an eye: the full parser reads it)
 * ```
 */
export function fastRx(text: string): [number, number, number] | undefined {
  let m = FULL.exec(text);
  if (m) {
    const s = Number(m[1]) + 0;
    const c = Number(m[2]) + 0;
    const a = Number(m[3]);
    if (!inRange(s, SPHERE_RANGE) || !inRange(c, CYLINDER_RANGE) || a > 180) return undefined;
    return [s, c, a === 0 ? 180 : a];
  }
  m = SPHERE_ONLY.exec(text);
  if (m) {
    const s = Number(m[1]) + 0;
    return inRange(s, SPHERE_RANGE) ? [s, 0, 180] : undefined;
  }
  return PLANO.test(text) ? [0, 0, 180] : undefined;
}

/**
 * Read a column of prescriptions (text or prescription values) into arrays, once.
 *
 * @example
 * ```ts
 * import { readRxColumn } from "./_rx_column.ts";
 * const r = readRxColumn(["-2.25 / -0.75 x 170", "", "R +1.00 DS"]);
 * [r.sph[0], r.cyl[0], r.axis[0], r.sph[2]]; // [-2.25, -0.75, 170, 1]
 * ```
 * @throws {Error} the prescription parser's error, prefixed with the row, for text it refuses.
 */
export function readRxColumn(cells: ArrayLike<unknown>, name = "rx"): RxArrays {
  const n = cells.length;
  const sph = new Float64Array(n).fill(NaN);
  const cyl = new Float64Array(n).fill(NaN);
  const axis = new Float64Array(n).fill(NaN);
  for (let i = 0; i < n; i++) {
    const v = cells[i];
    if (v === null || v === undefined || v === "") continue;
    if (typeof v === "string") {
      const f = fastRx(v);
      if (f) {
        sph[i] = f[0];
        cyl[i] = f[1];
        axis[i] = f[2];
        continue;
      }
      let p;
      try {
        p = parsePrescription(v);
      } catch (e) {
        const err = e as Error;
        err.message = `column ${name}, row ${i + 1}: ${err.message}`;
        throw err;
      }
      sph[i] = p.sphere;
      cyl[i] = p.cylinder;
      axis[i] = p.axis;
      continue;
    }
    const rx = ((v as { rx?: unknown }).rx ?? v) as {
      sphere?: unknown;
      cylinder?: unknown;
      axis?: unknown;
    };
    if (typeof rx.sphere !== "number" || typeof rx.cylinder !== "number") {
      throw new TypeError(`column ${name}, row ${i + 1}: not a prescription`);
    }
    sph[i] = rx.sphere;
    cyl[i] = rx.cylinder;
    axis[i] = typeof rx.axis === "number" ? rx.axis : 180;
  }
  return { sph, cyl, axis };
}
