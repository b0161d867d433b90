/**
 * Which sources an evaluation actually used. A formula that declares `cites` narrows its
 * citations from the value it gave (an acuity read as CF cites the CF substitution's
 * source, one read as 6/9 only the notation sources); while an evaluation runs inside
 * {@linkcode citing}, every call of such a formula adds its narrowed list.
 *
 * @module
 */

import type { FormulaSpec } from "./catalogue.ts";

/** The open collections, innermost last (an evaluation may run inside another). */
const open: Set<string>[] = [];

/**
 * Run an evaluation and collect the sources that formulas declaring `cites` narrowed to.
 * Formulas without `cites` add nothing here: their whole list is known before evaluation.
 *
 * @example
 * ```ts
 * import { citing } from "./_citations.ts";
 * citing(() => 1 + 1).value; // 2
 * ```
 */
export function citing<T>(run: () => T): { value: T; cited: ReadonlySet<string> } {
  const cited = new Set<string>();
  open.push(cited);
  try {
    return { value: run(), cited };
  } finally {
    open.pop();
  }
}

/**
 * The sources one call of `spec` used, given its result: its `cites` narrowing, kept to the
 * sources it declares (so the formula reference always lists every one it may cite).
 *
 * @example
 * ```ts
 * import { citedBy } from "./_citations.ts";
 * import { defineFormula } from "./catalogue.ts";
 * const f = defineFormula({
 *   name: "pick", group: "example", summary: "A number.", params: [],
 *   returns: { type: "number", doc: "a number" }, sources: ["ico-1984", "iso-8596"],
 *   cites: () => ["iso-8596"], example: "pick()", fn: () => 1,
 * });
 * citedBy(f, 1); // ["iso-8596"]
 * ```
 */
export function citedBy(spec: FormulaSpec, result: unknown): readonly string[] {
  const narrowed = spec.cites?.(result);
  if (!narrowed) return spec.sources;
  return narrowed.filter((id) => spec.sources.includes(id));
}

/** Record one call's citations in the open collection, if any (the formula's wrapper calls it). */
export function noteCitations(spec: FormulaSpec, result: unknown): void {
  const into = open[open.length - 1];
  if (!into || !spec.cites) return;
  for (const id of citedBy(spec, result)) into.add(id);
}
