/**
 * File names the live page may name: plain names inside the notebook's folder, never a way
 * out of it (no `..`, no absolute path, no separators where a bare name is expected, no
 * symbolic link that leads elsewhere).
 *
 * @module
 */

import { isAbsolute, join, relative, resolve } from "node:path";

/** A refused file name, with the reason. */
export class UnsafePathError extends Error {
  /** @param file the name as given; @param why the reason. */
  constructor(readonly file: string, why: string) {
    super(`refused file name "${file}": ${why}`);
    this.name = "UnsafePathError";
  }
}

/**
 * Resolve `rel` inside `dir`, refusing anything that could leave it. When the file exists,
 * its real path (symbolic links followed) must be inside the real folder too.
 *
 * @example
 * ```ts
 * import { insideFolder } from "./_paths.ts";
 * insideFolder("/cases", "trials.csv"); // "/cases/trials.csv"
 * ```
 * @throws {UnsafePathError} for `..`, absolute paths, drive letters, backslashes or NUL.
 */
export function insideFolder(dir: string, rel: string): string {
  if (rel === "" || rel.length > 255) throw new UnsafePathError(rel, "empty or too long");
  if (/[\0\\]/.test(rel) || /^[A-Za-z]:/.test(rel) || isAbsolute(rel)) {
    throw new UnsafePathError(rel, "only plain paths inside the notebook's folder");
  }
  if (rel.split("/").some((seg) => seg === ".." || seg === "." || seg === "")) {
    throw new UnsafePathError(rel, "no '..', '.' or empty parts");
  }
  const root = resolve(dir);
  const full = resolve(join(root, rel));
  const back = relative(root, full);
  if (back.startsWith("..") || isAbsolute(back)) {
    throw new UnsafePathError(rel, "outside the notebook's folder");
  }
  let real: string | undefined;
  try {
    real = Deno.realPathSync(full);
  } catch {
    real = undefined; // not there (yet): nothing to follow
  }
  if (real !== undefined) {
    const realRoot = Deno.realPathSync(root);
    const r = relative(realRoot, real);
    if (r.startsWith("..") || isAbsolute(r)) {
      throw new UnsafePathError(rel, "a link that leads outside the notebook's folder");
    }
  }
  return full;
}

/**
 * Check a bare file name (no folder part) with the given ending, e.g. for a copy kept
 * beside the notebook.
 *
 * @example
 * ```ts
 * import { bareName } from "./_paths.ts";
 * bareName("case.edited.lentil.md", ".lentil.md"); // "case.edited.lentil.md"
 * ```
 * @throws {UnsafePathError} when the name has a folder part, starts with a dot or lacks the ending.
 */
export function bareName(name: string, ending: string): string {
  if (!/^[A-Za-z0-9][A-Za-z0-9._ -]{0,200}$/.test(name) || name.includes("..")) {
    throw new UnsafePathError(name, "a plain file name of letters, digits, '.', '_', '-', ' '");
  }
  if (!name.endsWith(ending)) throw new UnsafePathError(name, `the name must end in ${ending}`);
  return name;
}
