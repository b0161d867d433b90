/**
 * Near vision: the accommodative demand at a working distance and a tentative near add
 * from age and working distance, keeping part of the amplitude of accommodation in reserve.
 * The age-amplitude relation comes from `accommodation.ts` (Hofstetter's lines).
 *
 * Tentative add = demand − usable accommodation, where usable = amplitude × (1 − reserve),
 * never below 0, then rounded up to the next step (toward plus) so that at least the
 * reserve is kept. Sources: hofstetter-1950, accommodative-reserve, common-practice.
 *
 * @example
 * ```ts
 * import { nearDemand } from "./near.ts";
 * nearDemand(40); // 2.5
 * ```
 *
 * @module
 */

import { amplitudeAt, type AmplitudeLevel } from "./accommodation.ts";
import { checkRange } from "./errors.ts";
import { roundPower } from "./vertex.ts";

/** Accepted working distances, cm. */
export const WORKING_DISTANCE_RANGE_CM = [10, 200] as const;

/**
 * Accommodative demand (D) of a target at `distanceCm` centimetres: 100 / distance.
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { nearDemand } from "./near.ts";
 * nearDemand(33.3).toFixed(2); // "3.00"
 * ```
 * @throws {LentilRangeError} for a distance outside 10–200 cm.
 */
export function nearDemand(distanceCm: number): number {
  checkRange(
    "working distance",
    distanceCm,
    WORKING_DISTANCE_RANGE_CM[0],
    WORKING_DISTANCE_RANGE_CM[1],
    "cm",
  );
  return 100 / distanceCm;
}

/** A tentative add and how it was reached. */
export interface TentativeAdd {
  /** Demand at the working distance, D. */
  readonly demand: number;
  /** Amplitude of accommodation expected at the age, D. */
  readonly amplitude: number;
  /** Accommodation usable for sustained work (amplitude less the reserve), D. */
  readonly usable: number;
  /** demand − usable, never below 0, D. */
  readonly exact: number;
  /** `exact` rounded up to the step, D. */
  readonly add: number;
}

/**
 * A tentative near add from age and working distance. Sources: hofstetter-1950,
 * accommodative-reserve.
 *
 * @param reserve fraction of the amplitude kept in reserve (0.5 keeps half, 1/3 a third).
 * @param level which of Hofstetter's lines gives the amplitude (default "minimum", the
 * cautious choice).
 * @example
 * ```ts
 * import { tentativeAdd } from "./near.ts";
 * tentativeAdd(50, 40).add; // 1.25 (demand 2.50, minimum amplitude 2.50, half of it usable)
 * ```
 * @throws {LentilRangeError} for an age outside 0–100, a distance outside 10–200 cm or a reserve outside 0–1.
 */
export function tentativeAdd(
  age: number,
  distanceCm: number,
  reserve = 0.5,
  level: AmplitudeLevel = "minimum",
  step = 0.25,
): TentativeAdd {
  const demand = nearDemand(distanceCm);
  checkRange("reserve fraction", reserve, 0, 1);
  const amplitude = amplitudeAt(age, level);
  const usable = amplitude * (1 - reserve);
  const exact = Math.max(0, demand - usable);
  return { demand, amplitude, usable, exact, add: roundPower(exact, step, "plus") };
}
