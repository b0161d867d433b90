/**
 * SQL names from notebook names: only plain names (letters, digits, `_`, not starting with a
 * digit) are accepted, and they are always written in double quotes, so no notebook text can
 * change the meaning of a statement.
 *
 * @module
 */

const PLAIN = /^[A-Za-z_][A-Za-z0-9_]{0,62}$/;

/** A name that cannot be written as an SQL identifier. */
export class SqlNameError extends Error {
  /** @param name the rejected name. */
  constructor(readonly identifier: string) {
    super(
      `"${identifier}" cannot be used as an SQL name (letters, digits and _ only, not starting with a digit, at most 63)`,
    );
    this.name = "SqlNameError";
  }
}

/**
 * Quote a notebook name as an SQL identifier, after checking it is a plain name.
 *
 * @example
 * ```ts
 * import { quoteName } from "./_names.ts";
 * quoteName("sph"); // '"sph"'
 * ```
 * @throws {SqlNameError} when the name is not plain.
 */
export function quoteName(name: string): string {
  if (!PLAIN.test(name)) throw new SqlNameError(name);
  return `"${name}"`;
}
