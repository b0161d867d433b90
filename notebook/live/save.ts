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
 * Whether the file at `path` still holds what `known` describes, by the hash of its bytes:
 * a changed modification time alone is not a change when the bytes hash the same (a
 * `touch`, a copy back), and the same size and time are no proof of the same bytes.
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
  // Size and time alone do not tell: a change of the same size within the time stamp's
  // resolution (or on a file system with coarse times) keeps both. The bytes decide.
  if (stat.size !== known.size) return true;
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
 * version copied to {@linkcode backupPath} the same way (temporary, flushed, renamed), then
 * renamed into place. The file's permission bits are kept. Returns the fingerprint of what
 * was written.
 *
 * @example
 * ```ts ignore
 * import { writeAtomic } from "./save.ts";
 * await writeAtomic("trials.csv", new TextEncoder().encode("lens [D],va [logMAR]\n"));
 * ```
 * @throws {SaveError} when the folder is read-only, the disk is full, or writing fails
 * otherwise; temporary files are removed and the file and its backup are left as they were.
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
  const tmps: string[] = [];
  try {
    await writeFlushed(tmp, bytes, mode ?? 0o644, tmps);
    if (mode !== null) await Deno.chmod(tmp, mode & 0o7777);
    if (existed) {
      // The backup is written like the file: a complete copy beside it, flushed, then
      // renamed over the old backup, so the last good backup is never truncated.
      const bak = backupPath(path);
      const bakTmp = join(dir, `.${basename(bak)}.${randomSuffix()}.tmp`);
      await writeFlushed(bakTmp, await Deno.readFile(path), mode ?? 0o644, tmps);
      await Deno.rename(bakTmp, bak);
    }
    await Deno.rename(tmp, path);
  } catch (e) {
    for (const t of tmps) await Deno.remove(t).catch(() => {});
    throw saveError(path, e);
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

/** Write `bytes` to a new file and flush it to disk; its name goes into `made` first. */
async function writeFlushed(
  path: string,
  bytes: Uint8Array,
  mode: number,
  made: string[],
): Promise<void> {
  const file = await Deno.open(path, { write: true, createNew: true, mode });
  made.push(path);
  try {
    let done = 0;
    while (done < bytes.length) done += await file.write(bytes.subarray(done));
    await file.sync();
  } finally {
    file.close();
  }
}

/** Why a file could not be saved: the folder is read-only, the disk is full, or another cause. */
export type SaveFailure = "read-only" | "disk-full" | "other";

/**
 * A save that failed on the file system, in words a user can act on; nothing was replaced
 * (the file and its last backup are as they were).
 */
export class SaveError extends Error {
  /** @param file the file being saved; @param reason the kind; @param detail the system's words. */
  constructor(readonly file: string, readonly reason: SaveFailure, readonly detail: string) {
    super(
      `cannot save ${basename(file)}: ${
        reason === "read-only"
          ? "the folder is read-only"
          : reason === "disk-full"
          ? "the disk is full"
          : detail
      }`,
    );
    this.name = "SaveError";
  }
}

/**
 * Classify a file-system error met while saving.
 *
 * @example
 * ```ts
 * import { saveError } from "./save.ts";
 * saveError("a.lentil.md", new Deno.errors.PermissionDenied("denied")).reason; // "read-only"
 * ```
 */
export function saveError(path: string, e: unknown): SaveError {
  if (e instanceof SaveError) return e;
  const err = e as Error & { code?: string };
  const text = `${err?.name ?? ""} ${err?.code ?? ""} ${err?.message ?? e}`;
  if (
    e instanceof Deno.errors.PermissionDenied ||
    /EACCES|EROFS|EPERM|read-only|permission denied/i.test(text)
  ) {
    return new SaveError(path, "read-only", err?.message ?? String(e));
  }
  if (/ENOSPC|EDQUOT|no space left|quota exceeded|StorageFull|file too large|EFBIG/i.test(text)) {
    return new SaveError(path, "disk-full", err?.message ?? String(e));
  }
  return new SaveError(path, "other", err?.message ?? String(e));
}
