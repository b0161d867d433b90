/**
 * Lentil's optics and acuity methods as plain functions: numbers and typed records in and
 * out, each citing its published source (see `shared/sources.ts` for the registry). Use
 * them from a script without the notebook.
 *
 * A short tour:
 *
 * ```ts
 * import assert from "node:assert/strict";
 * import {
 *   blurDisc,
 *   effectivePower,
 *   guessChance,
 *   parsePrescription,
 *   toPlusCylinder,
 *   toPowerVector,
 * } from "./mod.ts";
 *
 * // A +10.00 D spectacle lens 12 mm in front of the cornea is +11.36 D there.
 * assert.equal(effectivePower(10, 0.012).toFixed(2), "11.36");
 *
 * // A prescription transposed, and as a power vector (Thibos 1997): M = S + C/2.
 * const rx = parsePrescription("-2.00 / -1.00 x 180");
 * assert.equal(toPlusCylinder(rx).cylinder, 1);
 * assert.equal(toPowerVector(rx).m, -2.5);
 *
 * // The chance of being credited with a line by guessing: 3 of 5 letters from a set of 8.
 * assert.equal(guessChance(8, 5, 3).toFixed(4), "0.0161");
 *
 * // The angular blur disc (arcmin) of a 3 mm pupil with 0.50 D of defocus.
 * assert.equal(blurDisc(3, -0.5).toFixed(2), "5.16");
 * ```
 *
 * @module
 */

export * from "./accommodation.ts";
export * from "./acuity.ts";
export * from "./acuity_scoring.ts";
export * from "./agreement.ts";
export * from "./blur.ts";
export * from "./chart.ts";
export * from "./combine.ts";
export * from "./distributions.ts";
export * from "./ellipse.ts";
export * from "./endpoint.ts";
export * from "./errors.ts";
export * from "./eyes.ts";
export * from "./guessing.ts";
export * from "./near.ts";
export * from "./number_text.ts";
export * from "./power_matrix.ts";
export * from "./power_vector.ts";
export * from "./prescription.ts";
export * from "./prescription_format.ts";
export * from "./prism.ts";
export * from "./reliability.ts";
export * from "./seeded.ts";
export * from "./spherocylinder.ts";
export * from "./stats.ts";
export * from "./thickness.ts";
export * from "./through_focus.ts";
export * from "./tolerance.ts";
export * from "./transpose.ts";
export * from "./vertex.ts";
