/**
 * Saving a file safely: write a temporary file in the same folder, flush it to disk, keep
 * the previous version as `NAME.bak`, then rename the temporary file over the original, so
 * a crash leaves either the old file or the new one, never half of one. A fingerprint
 * (SHA-256 of the bytes, size and modification time) taken when a file was read tells
 * whether it changed on disk since.
 *
 * @example
 * ```ts ignore
 * import { fingerprint, writeAtomic } from "./save.ts";
 * const before = await fingerprint("case.lentil.md");
 * await writeAtomic("case.lentil.md", new TextEncoder().encode("# Case\n"));
 * ```
 *
 * @module
 */

import { basename, dirname, join } from "node:path";

/** What a file held when it was read: undefined when it did not exist. */
export interface Fingerprint {
  /** SHA-256 of the bytes, hex. */
  readonly hash: string;
  /** Size in bytes. */
  readonly size: number;
  /** Modification time in ms since the epoch (0 when unknown). */
  readonly mtime: number;
}

/**
 * SHA-256 of bytes as hex.
 *
 * @example
 * ```ts
 * import { sha256Hex } from "./save.ts";
 * (await sha256Hex(new Uint8Array())).slice(0, 8); // "e3b0c442"
 * ```
 */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", bytes as Uint8Array<ArrayBuffer>);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

/**
 * The fingerprint of bytes just read from a file, with its stat.
 *
 * @example
 * ```ts
 * import { fingerprintOf } from "./save.ts";
 * (await fingerprintOf(new Uint8Array([1]), { mtime: null })).size; // 1
 * ```
 */
export async function fingerprintOf(
  bytes: Uint8Array,
  stat: { readonly mtime: Date | null },
): Promise<Fingerprint> {
  return { hash: await sha256Hex(bytes), size: bytes.length, mtime: stat.mtime?.getTime() ?? 0 };
}

/**
 * Read a file's fingerprint now, or undefined when it does not exist.
 *
 * @example
 * ```ts ignore
 * const fp = await fingerprint("case.lentil.md");
 * ```
 */
export async function fingerprint(path: string): Promise<Fingerprint | undefined> {
  try {
    const stat = await Deno.stat(path);
    return await fingerprintOf(await Deno.readFile(path), stat);
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) return undefined;
    throw e;
  }
}

/**
 * Whether the file at `path` still holds what `known` describes. A changed modification
 * time alone is not a change when the bytes hash the same (a `touch`, a copy back).
 *
 * @example
 * ```ts ignore
 * if (await changedOnDisk("case.lentil.md", known)) console.log("changed behind us");
 * ```
 */
export async function changedOnDisk(
  path: string,
  known: Fingerprint | undefined,
): Promise<boolean> {
  let stat: Deno.FileInfo;
  try {
    stat = await Deno.stat(path);
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) return known !== undefined;
    throw e;
  }
  if (!known) return true;
  if (stat.size === known.size && (stat.mtime?.getTime() ?? 0) === known.mtime) return false;
  const now = await fingerprint(path);
  return now?.hash !== known.hash;
}

/**
 * The path of the backup kept beside a saved file.
 *
 * @example
 * ```ts
 * import { backupPath } from "./save.ts";
 * backupPath("/cases/a.lentil.md"); // "/cases/a.lentil.md.bak"
 * ```
 */
export function backupPath(path: string): string {
  return `${path}.bak`;
}

function randomSuffix(): string {
  const b = crypto.getRandomValues(new Uint8Array(6));
  return [...b].map((x) => x.toString(16).padStart(2, "0")).join("");
}

/**
 * Write `bytes` to `path` atomically: temporary file in the same folder, flushed, the old
 * version copied to {@linkcode backupPath}, then renamed into place. The file's permission
 * bits are kept. Returns the fingerprint of what was written.
 *
 * @example
 * ```ts ignore
 * import { writeAtomic } from "./save.ts";
 * await writeAtomic("trials.csv", new TextEncoder().encode("lens [D],va [logMAR]\n"));
 * ```
 */
export async function writeAtomic(path: string, bytes: Uint8Array): Promise<Fingerprint> {
  const dir = dirname(path);
  const tmp = join(dir, `.${basename(path)}.${randomSuffix()}.tmp`);
  let mode: number | null = null;
  let existed = true;
  try {
    mode = (await Deno.stat(path)).mode;
  } catch (e) {
    if (!(e instanceof Deno.errors.NotFound)) throw e;
    existed = false;
  }
  const file = await Deno.open(tmp, { write: true, createNew: true, mode: mode ?? 0o644 });
  try {
    let done = 0;
    while (done < bytes.length) done += await file.write(bytes.subarray(done));
    await file.sync();
  } catch (e) {
    file.close();
    await Deno.remove(tmp).catch(() => {});
    throw e;
  }
  file.close();
  try {
    if (mode !== null) await Deno.chmod(tmp, mode & 0o7777);
    if (existed) await Deno.copyFile(path, backupPath(path));
    await Deno.rename(tmp, path);
  } catch (e) {
    await Deno.remove(tmp).catch(() => {});
    throw e;
  }
  try {
    const d = await Deno.open(dir, { read: true });
    await d.sync().catch(() => {});
    d.close();
  } catch {
    // Flushing the folder entry is best effort (not every platform opens folders).
  }
  return await fingerprintOf(bytes, await Deno.stat(path));
}
