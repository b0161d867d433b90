/**
 * Lentil's version, as printed by `lentil --version` and in exported pages' footers. Keep it
 * equal to `version` in `deno.json`.
 *
 * @example
 * ```ts
 * import { VERSION } from "./version.ts";
 * VERSION; // "0.1.0"
 * ```
 *
 * @module
 */

/** The version string. */
export const VERSION = "0.1.0";
