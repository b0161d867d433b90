/**
 * Error classes shared by every layer. Each carries a message a user can act on: it names
 * the value that was wrong and what was expected.
 *
 * @example
 * ```ts
 * import { checkRange } from "./errors.ts";
 * checkRange("vertex distance", 12, 0, 25, "mm"); // returns 12
 * ```
 *
 * @module
 */

/** A value outside the range a method accepts (axis 181, pupil 12 mm, index 2.3, …). */
export class LentilRangeError extends RangeError {
  /**
   * An error naming the quantity, the value given and the accepted range.
   *
   * @param what the quantity, as a user would name it
   * @param value the value given
   * @param min the smallest accepted value
   * @param max the largest accepted value
   * @param unit the unit of all three, if any
   */
  constructor(
    readonly what: string,
    readonly value: number,
    readonly min: number,
    readonly max: number,
    readonly unit = "",
  ) {
    const u = unit ? ` ${unit}` : "";
    super(
      Number.isFinite(value)
        ? `${what} ${value}${u} is outside the accepted range ${min}–${max}${u}`
        : `${what} must be a finite number (got ${value})`,
    );
    this.name = "LentilRangeError";
  }
}

/** Text that does not parse as the notation expected (a prescription, an acuity, …). */
export class LentilParseError extends SyntaxError {
  /**
   * An error naming the text, what was expected and where it went wrong.
   *
   * @param input the text that failed
   * @param expected what was expected there
   * @param offset zero-based character offset of the offending part, when known
   */
  constructor(readonly input: string, readonly expected: string, readonly offset?: number) {
    super(
      offset === undefined
        ? `cannot read "${input}": ${expected}`
        : `cannot read "${input}" at character ${offset + 1}: ${expected}`,
    );
    this.name = "LentilParseError";
  }
}

/** Inputs that are each valid but cannot be used together (a set smaller than the letters needed, …). */
export class LentilInputError extends Error {
  /**
   * An error with a message a user can act on.
   *
   * @param message what is wrong and what to do about it
   */
  constructor(message: string) {
    super(message);
    this.name = "LentilInputError";
  }
}

/**
 * Return `value` when it is finite and within `[min, max]`, else throw a
 * {@linkcode LentilRangeError} naming it.
 *
 * @example
 * ```ts
 * import { checkRange } from "./errors.ts";
 * checkRange("pupil diameter", 4, 1, 9, "mm"); // 4
 * ```
 */
export function checkRange(
  what: string,
  value: number,
  min: number,
  max: number,
  unit = "",
): number {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new LentilRangeError(what, value, min, max, unit);
  }
  return value;
}

/**
 * Return `value` when it is a finite number, else throw a {@linkcode LentilRangeError}.
 *
 * @example
 * ```ts
 * import { checkFinite } from "./errors.ts";
 * checkFinite("sphere", -2.25); // -2.25
 * ```
 */
export function checkFinite(what: string, value: number): number {
  if (!Number.isFinite(value)) throw new LentilRangeError(what, value, -Infinity, Infinity);
  return value;
}
