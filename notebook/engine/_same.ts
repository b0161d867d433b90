/**
 * Whether a cell computed again came to the same value: then the engine keeps the value it
 * had, so what reads it (the page's presented values, a plot drawn from it) knows it by
 * identity and is not made again. Tables, columns and large arrays are compared by identity
 * only; other values by their JSON, with the same prototype.
 *
 * @module
 */

import { Column, tableInfo } from "../../cells/table.ts";

/** Arrays longer than this are not compared element by element. */
const MAX_ITEMS = 2000;
/** JSON longer than this is not compared. */
const MAX_TEXT = 100_000;

/**
 * Whether `b` (just computed) is the same value as `a` (computed before from the same text).
 *
 * @example
 * ```ts
 * import { sameValue } from "./_same.ts";
 * sameValue({ a: 1, b: [2, 3] }, { a: 1, b: [2, 3] }); // true
 * sameValue({ a: 1 }, { a: 2 }); // false
 * ```
 */
export function sameValue(a: unknown, b: unknown): boolean {
  if (Object.is(a, b)) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  if (Object.getPrototypeOf(a) !== Object.getPrototypeOf(b)) return false;
  if (tableInfo(a) || tableInfo(b) || a instanceof Column || ArrayBuffer.isView(a)) return false;
  if (Array.isArray(a) && (a.length > MAX_ITEMS || a.length !== (b as unknown[]).length)) {
    return false;
  }
  try {
    const x = JSON.stringify(a);
    return x !== undefined && x.length <= MAX_TEXT && x === JSON.stringify(b);
  } catch {
    return false;
  }
}
