/**
 * The chance of being credited with a line by guessing alone. A letter set of m letters (or
 * a forced-choice optotype with m positions: a ring with 4 or 8 gap positions), n letters on
 * the line, k needed for credit.
 *
 * - Independent guesses: X ~ Bin(n, 1/m), the chance is the tail P(X ≥ k)
 *   (binomial-tail). This holds whenever the guesses are independent, whether or not the
 *   letters on the line repeat.
 * - No repetition: the line's n letters are distinct and so are the n letters named; the
 *   number of matches is counted exactly by inclusion–exclusion (matching-problem).
 * - The naive figure (1/m)^k counts only the one way of naming the k needed letters and
 *   ignores the other letters of the line; it is smaller.
 *
 * @example
 * ```ts
 * import { guessChance, naiveGuessChance } from "./guessing.ts";
 * naiveGuessChance(9, 3).toFixed(6); // "0.001372" (1 in 729)
 * guessChance(10, 5, 3).toFixed(5); // "0.00856"
 * ```
 *
 * @module
 */

import { checkRange, LentilInputError } from "./errors.ts";

/** Largest letter set and longest line accepted. */
export const MAX_SET = 100;

/**
 * The number of letters in a letter set given as its letters ("CDHKNORSVZ", spaces and
 * commas ignored, any case) or as a count. Sources: sloan-1959 (the ten-letter set),
 * common-practice.
 *
 * @example
 * ```ts
 * import { letterSetSize } from "./guessing.ts";
 * letterSetSize("C D H K N O R S V Z"); // 10
 * letterSetSize(4); // 4
 * ```
 * @throws {LentilInputError} for a repeated letter or fewer than two;
 * {@linkcode LentilRangeError} for a count outside 2–100.
 */
export function letterSetSize(set: string | number): number {
  if (typeof set === "number") {
    checkRange("letters in the set", set, 2, MAX_SET);
    if (!Number.isInteger(set)) {
      throw new LentilInputError(`letters in the set must be a whole number (got ${set})`);
    }
    return set;
  }
  const letters = [...set.replace(/[\s,;]+/g, "").toUpperCase()];
  const seen = new Set<string>();
  for (const ch of letters) {
    if (seen.has(ch)) throw new LentilInputError(`letter set "${set}" repeats ${ch}`);
    seen.add(ch);
  }
  if (seen.size < 2) {
    throw new LentilInputError(`letter set "${set}" needs at least two different letters`);
  }
  return letterSetSize(seen.size);
}

function checkLine(set: number, onLine: number, needed: number): void {
  letterSetSize(set);
  checkRange("letters on the line", onLine, 1, MAX_SET);
  checkRange("letters needed", needed, 0, onLine);
  for (const [what, v] of [["letters on the line", onLine], ["letters needed", needed]] as const) {
    if (!Number.isInteger(v)) {
      throw new LentilInputError(`${what} must be a whole number (got ${v})`);
    }
  }
}

function choose(n: number, k: number): number {
  let c = 1;
  for (let i = 1; i <= k; i++) c = (c * (n - k + i)) / i;
  return c;
}

/**
 * Chance of being credited with a line by independent guesses: P(X ≥ needed) for
 * X ~ Bin(onLine, 1/set). Source: binomial-tail.
 *
 * @example
 * ```ts
 * import { guessChance } from "./guessing.ts";
 * guessChance(4, 1, 1); // 0.25
 * guessChance(8, 5, 3).toFixed(4); // "0.0161"
 * ```
 * @throws {LentilRangeError} or {@linkcode LentilInputError} for a set, line or count
 * that does not fit together.
 */
export function guessChance(set: number, onLine: number, needed: number): number {
  checkLine(set, onLine, needed);
  const p = 1 / set;
  let sum = 0;
  for (let j = needed; j <= onLine; j++) {
    sum += choose(onLine, j) * p ** j * (1 - p) ** (onLine - j);
  }
  return Math.min(1, sum);
}

function fallingBig(n: number, k: number): bigint {
  let r = 1n;
  for (let i = 0; i < k; i++) r *= BigInt(n - i);
  return r;
}

function chooseBig(n: number, k: number): bigint {
  return fallingBig(n, k) / fallingBig(k, k);
}

/**
 * Chance of being credited with a line of `onLine` distinct letters from a set of `set`
 * when the letters named are distinct too (no repetition on either side): exactly, the
 * share of the set's ordered selections that match the line in at least `needed` places.
 * Matches in exactly j places: C(n, j)·Σₜ (−1)ᵗ C(n−j, t)·P(m−j−t, n−j−t), out of P(m, n).
 * Source: matching-problem.
 *
 * @example
 * ```ts
 * import { guessChanceDistinct } from "./guessing.ts";
 * guessChanceDistinct(3, 3, 3); // 1 / 6
 * guessChanceDistinct(10, 5, 3).toFixed(4); // "0.0111"
 * ```
 * @throws {LentilInputError} when the set has fewer letters than needed or than the line
 * holds.
 */
export function guessChanceDistinct(set: number, onLine: number, needed: number): number {
  if (Number.isInteger(set) && set < needed) {
    throw new LentilInputError(
      `the letter set has ${set} letters, fewer than the ${needed} needed for the line`,
    );
  }
  checkLine(set, onLine, needed);
  if (set < onLine) {
    throw new LentilInputError(
      `a line of ${onLine} distinct letters needs a set of at least ${onLine}; the set has ${set}`,
    );
  }
  let favourable = 0n;
  for (let j = needed; j <= onLine; j++) {
    const r = onLine - j;
    let others = 0n;
    for (let t = 0; t <= r; t++) {
      const term = chooseBig(r, t) * fallingBig(set - j - t, r - t);
      others += t % 2 === 0 ? term : -term;
    }
    favourable += chooseBig(onLine, j) * others;
  }
  const total = fallingBig(set, onLine);
  // Divide in BigInt first to keep precision for large totals.
  const scale = 10n ** 18n;
  return Number((favourable * scale) / total) / 1e18;
}

/**
 * The naive figure: the chance of guessing `needed` given letters all right, (1/set)^k.
 * It ignores the other letters on the line and the ways of choosing which are right.
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { naiveGuessChance } from "./guessing.ts";
 * naiveGuessChance(9, 3).toFixed(6); // "0.001372" (1 in 729)
 * ```
 * @throws {LentilRangeError} for a set outside 2–100 or a count outside 0–100.
 */
export function naiveGuessChance(set: number, needed: number): number {
  letterSetSize(set);
  checkRange("letters needed", needed, 0, MAX_SET);
  return (1 / set) ** needed;
}

/**
 * Chance of being credited with one or more of `lines` lines in a row by guessing alone,
 * each line guessed independently: 1 − (1 − p)^lines with p from {@linkcode guessChance}
 * (or {@linkcode guessChanceDistinct} when `distinct`). Source: binomial-tail.
 *
 * @example
 * ```ts
 * import { guessAnyLine, guessChance } from "./guessing.ts";
 * const p = guessChance(10, 5, 3);
 * guessAnyLine(10, 5, 3, 2) === 1 - (1 - p) ** 2; // true
 * ```
 * @throws {LentilRangeError} for a line count outside 1–100.
 */
export function guessAnyLine(
  set: number,
  onLine: number,
  needed: number,
  lines: number,
  distinct = false,
): number {
  checkRange("lines guessed", lines, 1, MAX_SET);
  const p = distinct ? guessChanceDistinct(set, onLine, needed) : guessChance(set, onLine, needed);
  return 1 - (1 - p) ** lines;
}
