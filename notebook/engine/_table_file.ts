/**
 * Which files a `file:` table may read: a regular file inside the notebook's folder tree,
 * reached without a symbolic link, unless links are allowed (then the link's target must
 * still be a regular file). A device such as `/dev/zero`, a pipe or a folder is never read,
 * so a notebook can neither show another file's text nor hang on an endless one.
 *
 * @module
 */

import { isAbsolute, join, relative, resolve } from "node:path";

/** How table files may be reached. */
export interface TableFilePolicy {
  /** Follow symbolic links (to a regular file anywhere). Default: refuse them. */
  readonly followLinks?: boolean;
}

/** A table file that may not be read, with the reason in words. */
export class TableFileRefused extends Error {
  /** @param path the name as the notebook gives it; @param why the reason. */
  constructor(readonly path: string, why: string) {
    super(why);
    this.name = "TableFileRefused";
  }
}

/**
 * The full path of table file `rel` beside a notebook in `dir`, checked against the policy.
 *
 * @example
 * ```ts
 * import { checkedTableFile } from "./_table_file.ts";
 * const dir = Deno.makeTempDirSync();
 * Deno.writeTextFileSync(`${dir}/a.csv`, "x\n1\n");
 * checkedTableFile(dir, "a.csv").endsWith("/a.csv"); // true
 * Deno.removeSync(dir, { recursive: true });
 * ```
 * @throws {TableFileRefused} for a path leaving the folder, a symbolic link (unless
 * allowed), or anything but a regular file.
 * @throws {Deno.errors.NotFound} when the file does not exist.
 */
export function checkedTableFile(dir: string, rel: string, policy: TableFilePolicy = {}): string {
  if (isAbsolute(rel) || rel.split(/[\\/]/).includes("..") || /^[A-Za-z]:/.test(rel)) {
    throw new TableFileRefused(rel, "a table file must be inside the notebook's folder");
  }
  const root = resolve(dir);
  const full = resolve(join(root, rel));
  const back = relative(root, full);
  if (back.startsWith("..") || isAbsolute(back)) {
    throw new TableFileRefused(rel, "a table file must be inside the notebook's folder");
  }
  if (!policy.followLinks) {
    // Every part of the path below the folder, the file itself included, is no link.
    let at = root;
    for (const part of back.split(/[\\/]/)) {
      at = join(at, part);
      if (Deno.lstatSync(at).isSymlink) {
        throw new TableFileRefused(
          rel,
          "it is a symbolic link; copy the data beside the notebook (or run with --follow-links)",
        );
      }
    }
  }
  const info = Deno.statSync(full);
  if (!info.isFile) {
    throw new TableFileRefused(
      rel,
      info.isDirectory
        ? "it is a folder, not a CSV file"
        : "it is not a regular file (a device or pipe?)",
    );
  }
  return full;
}
