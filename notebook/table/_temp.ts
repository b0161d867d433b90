/**
 * A temporary file beside an output that can never be one of the run's inputs: a fresh random
 * name in the output's folder, compared with every file the notebook reads, and created with
 * `createNew` so an existing file (an input, or anything else) is never opened for writing.
 *
 * @module
 */

import { basename, dirname, join, resolve } from "node:path";

/** The resolved path of a file, following links when it exists. */
async function where(path: string): Promise<string> {
  try {
    return await Deno.realPath(path);
  } catch {
    try {
      return join(await Deno.realPath(dirname(path)), basename(path));
    } catch {
      return resolve(path);
    }
  }
}

/** A temporary file created for writing. */
export interface TempFile {
  /** Its path. */
  readonly path: string;
  /** The open file. */
  readonly file: Deno.FsFile;
}

/**
 * Create a new temporary file in the folder of `out`, whose name differs from `out` and from
 * every path in `inputs` (compared after resolving links), and that did not exist before.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { join } from "node:path";
 * const dir = await Deno.makeTempDir();
 * const input = join(dir, "res.part");
 * await Deno.writeTextFile(input, "a\n1\n");
 * const t = await createTempBeside(join(dir, "res"), [input]);
 * t.file.close();
 * assert.notEqual(t.path, input);
 * assert.equal(await Deno.readTextFile(input), "a\n1\n");
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function createTempBeside(
  out: string,
  inputs: readonly string[],
): Promise<TempFile> {
  const taken = new Set(await Promise.all([out, ...inputs].map(where)));
  for (let attempt = 0; attempt < 100; attempt++) {
    const tag = crypto.randomUUID().slice(0, 8);
    const path = join(dirname(out), `.${basename(out)}.${tag}.part`);
    if (taken.has(await where(path))) continue;
    try {
      const file = await Deno.open(path, { write: true, createNew: true });
      return { path, file };
    } catch (e) {
      if (e instanceof Deno.errors.AlreadyExists) continue;
      throw e;
    }
  }
  throw new Error(`cannot find a free temporary name beside ${out}`);
}
