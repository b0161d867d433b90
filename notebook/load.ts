/**
 * Loading a notebook file from disk: strict UTF-8, tables' CSV files read from the
 * notebook's folder, and a clear error (never a stack trace) when the file is missing.
 *
 * @example
 * ```ts ignore
 * import { loadNotebook } from "./load.ts";
 * const loaded = await loadNotebook("seeds/dispense-check.lentil.md");
 * if (loaded.ok) console.log(loaded.notebook.results().length);
 * ```
 *
 * @module
 */

import { dirname } from "node:path";
import { checkedTableFile, type TableFilePolicy } from "./engine/_table_file.ts";
import { Notebook, type PreparedTable } from "./engine/engine.ts";
import { parseNotebook } from "./format/parse.ts";
import { countingStream, type ProgressListener } from "./progress.ts";
import { decodeNotebookLenient } from "./format/read.ts";
import type { Diagnostic } from "./format/diagnostic.ts";

/** How to load a notebook. */
export interface LoadOptions extends TableFilePolicy {
  /**
   * Work large `file:` tables (Parquet, big CSV, or `engine: duckdb`) in the embedded
   * database, bringing back only what the notebook shows (needs `--allow-ffi`).
   */
  readonly database?: boolean;
  /** Told how far each large table read has come (rows, part of the file). */
  readonly onProgress?: ProgressListener;
}

/** A loaded notebook, or the reason it could not be read at all. */
export type LoadResult =
  | { readonly ok: true; readonly notebook: Notebook; readonly bytes: Uint8Array }
  | { readonly ok: false; readonly diagnostic: Diagnostic };

/** A notebook file that cannot be opened (missing, a folder, not readable). */
export class NotebookFileError extends Error {
  /**
   * An error naming the notebook file and why it cannot be opened.
   *
   * @param path the file
   * @param message why it cannot be opened
   */
  constructor(readonly path: string, message: string) {
    super(message);
    this.name = "NotebookFileError";
  }
}

/**
 * Read the bytes of a notebook file, turning file-system failures into a
 * {@linkcode NotebookFileError} with a message a user can act on.
 *
 * @example
 * ```ts ignore
 * const bytes = await readNotebookBytes("case.lentil.md");
 * ```
 */
export async function readNotebookBytes(path: string): Promise<Uint8Array> {
  try {
    return await Deno.readFile(path);
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) {
      throw new NotebookFileError(path, `${path}: no such file`);
    }
    if (e instanceof Deno.errors.IsADirectory) {
      throw new NotebookFileError(path, `${path}: is a folder, not a notebook file`);
    }
    if (e instanceof Deno.errors.PermissionDenied) {
      throw new NotebookFileError(path, `${path}: permission denied (${(e as Error).message})`);
    }
    throw new NotebookFileError(path, `${path}: cannot be read (${(e as Error).message})`);
  }
}

/**
 * Build and evaluate a notebook from its bytes; CSV tables are streamed from `path`'s folder
 * (regular files only, no symbolic links unless `policy.followLinks`).
 *
 * @example
 * ```ts
 * import { notebookFromBytes } from "./load.ts";
 * const r = await notebookFromBytes(new TextEncoder().encode("~~~lentil\nx = 1\n~~~\n"), "x.lentil.md");
 * r.ok; // true
 * ```
 */
export async function notebookFromBytes(
  bytes: Uint8Array,
  path: string,
  options: LoadOptions = {},
): Promise<LoadResult> {
  const decoded = decodeNotebookLenient(bytes, path);
  const dir = dirname(path);
  let prepared: { tables?: Map<string, PreparedTable>; given?: Map<string, unknown> } = {};
  if (options.database) {
    const doc = parseNotebook(decoded.text, path);
    if (doc.tables.some((t) => t.options.file)) {
      // Loaded only when a notebook reads a table from a file.
      const duck = await import("./duck/load.ts");
      const blocks = await duck.duckTables(doc, path);
      if (blocks.length) {
        prepared = await duck.prepareInDuck(
          doc,
          path,
          blocks,
          options,
          undefined,
          options.onProgress,
        );
      }
    }
  }
  const notebook = await Notebook.load(decoded.text, path, {
    ...prepared,
    encoding: decoded.diagnostics,
    host: {
      // Only regular files in the notebook's folder tree (no links, devices or pipes).
      readText: (rel) => Deno.readTextFileSync(checkedTableFile(dir, rel, options)),
      open: (rel) => {
        const full = checkedTableFile(dir, rel, options);
        const stream = openStream(full);
        const listen = options.onProgress;
        if (!listen) return stream;
        const size = Deno.statSync(full).size;
        return countingStream(
          stream,
          size,
          (rows, fraction, done) => listen({ table: rel, file: rel, rows, fraction, done }),
        );
      },
    },
  });
  return { ok: true, notebook, bytes };
}

/** Open a file as a byte stream; a missing file fails here, at once, not mid-stream. */
function openStream(path: string): AsyncIterable<Uint8Array> {
  const file = Deno.openSync(path, { read: true });
  // The stream closes the file when it ends or is cancelled.
  return file.readable;
}

/**
 * Load and evaluate a notebook file.
 *
 * @example
 * ```ts ignore
 * import { loadNotebook } from "./load.ts";
 * const r = await loadNotebook("case.lentil.md");
 * ```
 * @throws {NotebookFileError} when the file cannot be read.
 */
export async function loadNotebook(path: string, options: LoadOptions = {}): Promise<LoadResult> {
  return notebookFromBytes(await readNotebookBytes(path), path, options);
}
