/**
 * The cautions Lentil shows wherever a result could be used to make or fit a lens.
 *
 * @example
 * ```ts
 * import { CAUTIONS } from "./cautions.ts";
 * CAUTIONS.length > 0; // true
 * ```
 *
 * @module
 */

/** The cautions, one sentence each. */
export const CAUTIONS: readonly string[] = [
  "These calculations aid professional judgement and never replace it.",
  "A prescription is issued and checked by a licensed practitioner under local law.",
  "Finished lenses are verified on a focimeter before they are dispensed.",
  "Impact-resistance and dispensing rules differ by jurisdiction: follow local codes and licensed practice.",
];
