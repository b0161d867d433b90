/**
 * Escaping for the exported page: every piece of user text goes through these before it is
 * placed in markup.
 *
 * @module
 */

const ENTITIES: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/**
 * Escape text for an HTML element's content or a quoted attribute value.
 *
 * @example
 * ```ts
 * import { escapeHtml } from "./_escape.ts";
 * escapeHtml('<a href="x">'); // "&lt;a href=&quot;x&quot;&gt;"
 * ```
 */
export function escapeHtml(text: unknown): string {
  return String(text).replace(/[&<>"']/g, (c) => ENTITIES[c]);
}

/**
 * A fragment identifier made only of safe characters, for `id` and `href="#…"`.
 *
 * @example
 * ```ts
 * import { anchorId } from "./_escape.ts";
 * anchorId("cell", "trials.va"); // "cell-trials-va"
 * ```
 */
export function anchorId(prefix: string, name: string): string {
  return `${prefix}-${name.replace(/[^A-Za-z0-9_-]+/g, "-")}`;
}
