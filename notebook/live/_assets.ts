/**
 * The live page's script, as the source files in `client/` (checked by `deno lint` and
 * `deno check` like any other source): read from disk once, served as JavaScript modules.
 *
 * @example
 * ```ts
 * import { clientFiles } from "./_assets.ts";
 * (await clientFiles()).has("main.js"); // true
 * ```
 *
 * @module
 */

/** The modules of the page's script, `main.js` first; nothing else is served. */
export const CLIENT_MODULES: readonly string[] = [
  "main.js",
  "state.js",
  "dom.js",
  "cells.js",
  "tables.js",
  "page.js",
];

let loaded: Promise<ReadonlyMap<string, string>> | undefined;

async function readModule(name: string): Promise<string> {
  const url = new URL(`./client/${name}`, import.meta.url);
  if (url.protocol === "file:") return await Deno.readTextFile(url);
  const res = await fetch(url);
  if (!res.ok) throw new Error(`cannot read the page's script ${name}: ${res.status}`);
  return await res.text();
}

/**
 * The page's script modules by file name, read once per process.
 *
 * @example
 * ```ts
 * import { clientFiles } from "./_assets.ts";
 * (await clientFiles()).get("main.js")!.includes("import"); // true
 * ```
 */
export function clientFiles(): Promise<ReadonlyMap<string, string>> {
  loaded ??= Promise.all(CLIENT_MODULES.map(async (n) => [n, await readModule(n)] as const))
    .then((pairs) => new Map(pairs));
  return loaded;
}
