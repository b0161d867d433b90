/**
 * Accommodation: the amplitude expected at an age, the demand of a target at a distance,
 * the part of the amplitude usable for sustained work, and how much extra minus an eye can
 * absorb (by accommodating) without losing acuity.
 *
 * Source: hofstetter-1950 (minimum 15 − 0.25·age, mean 18.5 − 0.30·age, maximum
 * 25 − 0.40·age, in D); accommodative-reserve (keep half or a third in reserve).
 *
 * @example
 * ```ts
 * import { amplitudeByAge } from "./accommodation.ts";
 * amplitudeByAge(40).mean; // 6.5
 * ```
 *
 * @module
 */

import { checkRange, LentilInputError } from "./errors.ts";

/** Amplitudes of accommodation expected at one age, in D. */
export interface AgeAmplitude {
  /** Age in years. */
  readonly age: number;
  /** Hofstetter's minimum, 15 − 0.25·age (never below 0). */
  readonly minimum: number;
  /** Hofstetter's mean, 18.5 − 0.30·age (never below 0). */
  readonly mean: number;
  /** Hofstetter's maximum, 25 − 0.40·age (never below 0). */
  readonly maximum: number;
  /** True when at least one of the three straight lines went below zero and was held at 0. */
  readonly clamped: boolean;
}

/** Which of Hofstetter's three lines to use. */
export type AmplitudeLevel = "minimum" | "mean" | "maximum";

/** Oldest age accepted (years); the formulas give 0 D well before it. */
export const MAX_AGE = 100;

/**
 * Expected amplitude of accommodation at `age` years: Hofstetter's minimum, mean and
 * maximum. Past about 60 years the straight lines reach zero; values are held at 0 and
 * `clamped` says so. Source: hofstetter-1950.
 *
 * @example
 * ```ts
 * import { amplitudeByAge } from "./accommodation.ts";
 * const a = amplitudeByAge(20);
 * [a.minimum, a.mean, a.maximum]; // [10, 12.5, 17]
 * ```
 * @throws {LentilRangeError} for an age outside 0–100 years.
 */
export function amplitudeByAge(age: number): AgeAmplitude {
  checkRange("age", age, 0, MAX_AGE, "years");
  const raw = [15 - 0.25 * age, 18.5 - 0.3 * age, 25 - 0.4 * age];
  const [minimum, mean, maximum] = raw.map((v) => Math.max(0, v));
  return { age, minimum, mean, maximum, clamped: raw.some((v) => v < 0) };
}

/**
 * One of the three amplitudes at `age` (D). Source: hofstetter-1950.
 *
 * @example
 * ```ts
 * import { amplitudeAt } from "./accommodation.ts";
 * amplitudeAt(40, "minimum"); // 5
 * ```
 * @throws {LentilRangeError} for an age outside 0–100 years.
 */
export function amplitudeAt(age: number, level: AmplitudeLevel = "mean"): number {
  const a = amplitudeByAge(age);
  if (level !== "minimum" && level !== "mean" && level !== "maximum") {
    throw new LentilInputError(
      `amplitude level "${level}" is not one of minimum, mean, maximum`,
    );
  }
  return a[level];
}

/**
 * Accommodative demand (D) of a target at `distance` metres from the eye: 1/distance;
 * `Infinity` gives 0. Source: common-practice.
 *
 * @example
 * ```ts
 * import { accommodativeDemand } from "./accommodation.ts";
 * accommodativeDemand(0.4); // 2.5
 * accommodativeDemand(Infinity); // 0
 * ```
 * @throws {LentilRangeError} for a distance that is not positive.
 */
export function accommodativeDemand(distance: number): number {
  if (distance === Infinity) return 0;
  checkRange("target distance", distance, 1e-3, 1e6, "m");
  return 1 / distance;
}

/**
 * The accommodation (D) usable for sustained work at `age`: the amplitude at `level`
 * less the fraction `reserve` kept back (0.5 keeps half; 1/3 keeps a third). Sources:
 * hofstetter-1950, accommodative-reserve.
 *
 * @example
 * ```ts
 * import { usableAccommodation } from "./accommodation.ts";
 * usableAccommodation(40, 0.5, "minimum"); // 2.5
 * ```
 * @throws {LentilRangeError} for an age outside 0–100 or a reserve outside 0–1.
 */
export function usableAccommodation(
  age: number,
  reserve = 0.5,
  level: AmplitudeLevel = "minimum",
): number {
  checkRange("reserve fraction", reserve, 0, 1);
  return amplitudeAt(age, level) * (1 - reserve);
}

/**
 * How much extra minus (D, a positive number) an eye of `age` can absorb by accommodating
 * without losing acuity while it views a chart at `testDistance` metres: the amplitude at
 * `level` less the demand the chart already makes, never below 0. With `reserve` > 0 that
 * fraction of the amplitude is kept back. Sources: hofstetter-1950, common-practice.
 *
 * @example
 * ```ts
 * import { minusAbsorbed } from "./accommodation.ts";
 * minusAbsorbed(40); // 6.5
 * minusAbsorbed(40, { testDistance: 4, level: "minimum" }); // 4.75
 * ```
 * @throws {LentilRangeError} for an age outside 0–100, a bad distance or reserve.
 */
export function minusAbsorbed(
  age: number,
  options: { testDistance?: number; level?: AmplitudeLevel; reserve?: number } = {},
): number {
  const usable = usableAccommodation(age, options.reserve ?? 0, options.level ?? "mean");
  return Math.max(0, usable - accommodativeDemand(options.testDistance ?? Infinity));
}
