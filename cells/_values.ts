/**
 * Helpers shared by the prescription, prism and lens cells: quantities of the shared
 * language (created when a formula runs), numbers read from list entries, and the eye
 * argument.
 *
 * The language is reached through a hook that `mod.ts` sets ({@linkcode useLanguage}) rather
 * than a static import of `language.ts`: that import would close the cycle
 * `language.ts → mod.ts → rx.ts → language.ts`, and loading `rx.ts` first would then make
 * `mod.ts` read `RX_FORMULAS` before it exists.
 *
 * @module
 */

import { LentilInputError } from "../lib/errors.ts";
import { type Eye, parseEye } from "../lib/prism.ts";
import type { Language } from "./language.ts";

let languageGetter: (() => Language) | undefined;

/** Set how formulas reach the shared language (called once by `mod.ts`). */
export function useLanguage(get: () => Language): void {
  languageGetter = get;
}

function getLanguage(): Language {
  if (!languageGetter) {
    throw new Error("the formula language is not loaded: import cells/language.ts first");
  }
  return languageGetter();
}

/** A quantity of the formula language. */
export function quantity(value: number, unit: string): unknown {
  return getLanguage().quantity(value + 0, unit);
}

/** A list entry (a number or a quantity) read as a number in `unit`. */
export function numberIn(x: unknown, unit: string): number {
  return getLanguage().toNumberIn(x, unit);
}

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
