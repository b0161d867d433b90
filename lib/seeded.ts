/**
 * A small seeded pseudo-random generator (mulberry32), so that invented demo data, property
 * tests and benchmarks are the same on every run. Not for anything that needs real
 * randomness (the live page's token uses `crypto.getRandomValues`). Source: common-practice
 * (a widely used public-domain generator).
 *
 * @example
 * ```ts
 * import { seeded } from "./seeded.ts";
 * const a = seeded(7), b = seeded(7);
 * a() === b(); // true
 * ```
 *
 * @module
 */

/**
 * A generator of numbers in [0, 1) from a 32-bit seed; the same seed gives the same
 * sequence. Source: common-practice.
 *
 * @example
 * ```ts
 * import { seeded } from "./seeded.ts";
 * const r = seeded(42)();
 * r >= 0 && r < 1; // true
 * ```
 */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
