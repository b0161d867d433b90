/**
 * An embedded DuckDB confined to one folder: files only inside the notebook's folder, no
 * other file or network access, no extensions loaded or installed, and the configuration
 * locked before any notebook work runs. Loaded on first use only (dynamic import), so
 * notebooks that never need it start as fast as before.
 *
 * @module
 */

import { resolve } from "node:path";

/** The parts of a DuckDB connection Lentil uses. */
export interface DuckConnection {
  /**
   * Run a statement with bound parameters and read every row as an object; `progress` is
   * called a few times a second with the part done (0–1, or -1 when unknown) and rows read.
   */
  rows(
    sql: string,
    params?: readonly (string | number)[],
    progress?: (fraction: number, rows: number) => void,
  ): Promise<Record<string, unknown>[]>;
  /** Close the connection and the database. */
  close(): void;
}

/** A DuckDB that cannot be loaded or started (the message says why). */
export class DuckUnavailableError extends Error {
  /** @param message why. */
  constructor(message: string) {
    super(message);
    this.name = "DuckUnavailableError";
  }
}

/**
 * A string as an SQL literal (quotes doubled); only for paths of our own, never notebook text.
 *
 * @example
 * ```ts
 * import { sqlText } from "./_open.ts";
 * sqlText("it's"); // "'it''s'"
 * ```
 */
export function sqlText(s: string): string {
  return literal(s);
}

function literal(s: string): string {
  if (/[\0\n\r]/.test(s)) throw new DuckUnavailableError(`the folder ${s} has an unusable name`);
  return `'${s.replaceAll("'", "''")}'`;
}

/**
 * Open an in-memory DuckDB that may read files in `folder` only.
 *
 * @example
 * ```ts ignore
 * const db = await openDuck(".");
 * await db.rows("SELECT 1 AS one");
 * db.close();
 * ```
 * @throws {DuckUnavailableError} when DuckDB cannot be loaded.
 */
export async function openDuck(
  folder: string,
  settings: { threads?: number; memoryLimit?: string } = {},
): Promise<DuckConnection> {
  let api: typeof import("@duckdb/node-api");
  try {
    api = await import("@duckdb/node-api");
  } catch (e) {
    throw new DuckUnavailableError(
      `the embedded database cannot be loaded (${(e as Error).message}); ` +
        "it needs --allow-ffi and the npm package @duckdb/node-api",
    );
  }
  const instance = await api.DuckDBInstance.create(":memory:", {
    autoinstall_known_extensions: "false",
    autoload_known_extensions: "false",
    threads: String(settings.threads ?? navigator.hardwareConcurrency ?? 2),
    memory_limit: settings.memoryLimit ?? "160MB",
    preserve_insertion_order: "true",
  });
  const c = await instance.connect();
  const dir = (await Deno.realPath(resolve(folder))).replace(/\/?$/, "/");
  await c.run(`SET allowed_directories = [${literal(dir)}]`);
  await c.run("SET enable_progress_bar = true");
  await c.run("SET enable_progress_bar_print = false");
  await c.run("SET enable_external_access = false");
  await c.run("SET lock_configuration = true");
  return {
    async rows(sql, params = [], progress) {
      const p = await c.prepare(sql);
      params.forEach((x, i) => {
        if (typeof x === "number") p.bindDouble(i + 1, x);
        else p.bindVarchar(i + 1, x);
      });
      const timer = progress
        ? setInterval(() => {
          const q = c.progress;
          progress(q.percentage < 0 ? -1 : q.percentage / 100, Number(q.rows_processed));
        }, 200)
        : undefined;
      try {
        const r = await p.runAndReadAll();
        return r.getRowObjects() as Record<string, unknown>[];
      } finally {
        if (timer !== undefined) clearInterval(timer);
      }
    },
    close() {
      c.closeSync();
      instance.closeSync();
    },
  };
}
