/**
 * Helpers shared by the prism cells: the eye argument.
 *
 * @module
 */

import { LentilInputError } from "../lib/errors.ts";
import { type Eye, parseEye } from "../lib/prism.ts";

/** The first eye given among the candidates (text or already an eye). */
export function pickEye(...candidates: (string | Eye | undefined)[]): Eye | undefined {
  for (const c of candidates) if (c !== undefined && c !== "") return parseEye(c);
  return undefined;
}

/** Like {@linkcode pickEye}, but the eye is required; `why` says what it is needed for. */
export function requireEye(why: string, ...candidates: (string | Eye | undefined)[]): Eye {
  const eye = pickEye(...candidates);
  if (!eye) {
    throw new LentilInputError(
      `give the eye ("R" or "L") ${why}: base in and base out point opposite ways for the two eyes`,
    );
  }
  return eye;
}

/** Shared declaration of an optional eye parameter. */
export const EYE_PARAM = {
  name: "eye",
  type: "text",
  optional: true,
  doc: 'the eye, "R" or "L" (taken from the prescription when it names one)',
} as const;
