/**
 * Converting a table file Lentil wrote: a CSV with plain headers (`name [unit]`) to Parquet
 * with the same column names (so it reads back with its units), through the embedded DuckDB
 * confined to the output's folder.
 *
 * @module
 */

import { dirname, resolve } from "node:path";
import { openDuck, sqlText } from "./_open.ts";

/**
 * Write the CSV at `csv` as Parquet at `parquet` (both in one folder, paths of our own).
 *
 * @example
 * ```ts ignore
 * await csvToParquet("out/.results.part", "out/results.parquet");
 * ```
 */
export async function csvToParquet(csvPath: string, parquetPath: string): Promise<void> {
  const csv = resolve(csvPath);
  const parquet = resolve(parquetPath);
  const db = await openDuck(dirname(parquet));
  try {
    // COPY takes no bound parameters: the paths are written as quoted text (our own names).
    await db.rows(
      `COPY (SELECT * FROM read_csv(${sqlText(csv)}, header = true, delim = ',', quote = '"')) TO ${
        sqlText(parquet)
      } (FORMAT parquet)`,
    );
  } finally {
    db.close();
  }
}
