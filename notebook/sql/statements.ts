/**
 * A notebook's table work written out as standard SQL, to run where the data already lives:
 * one view per set of computed columns (a set reads the table and earlier sets only) and one
 * aggregate query per statistics cell, returning the totals (count, missing, means, variances
 * and covariances, smallest and largest) from which Lentil's numbers follow. The SQL uses
 * only standard aggregates with `FILTER`, `SIN`, `COS`, `POWER` and `DOUBLE PRECISION`, so it
 * runs on PostgreSQL, on engines that speak its dialect, and on DuckDB.
 *
 * Numbers in the text are written from numbers (never copied from the notebook), and every
 * name is a checked, quoted identifier.
 *
 * @module
 */

import type { TableWork } from "./work.ts";
import { statisticQuery } from "./work.ts";
import { quoteName } from "./_names.ts";
import { REFRACTION_COLUMNS } from "../engine/_tables.ts";

/** A number as an SQL literal of type DOUBLE PRECISION. */
export function sqlNumber(x: number): string {
  if (!Number.isFinite(x)) throw new RangeError(`${x} cannot be written as an SQL number`);
  return `CAST(${String(x)} AS DOUBLE PRECISION)`;
}

/** The SQL of a table's work, with the names of its views and queries. */
export interface WrittenSql {
  /** The whole text: comments, views, queries. */
  readonly text: string;
  /** The views, in order (name and statement). */
  readonly views: readonly { name: string; sql: string }[];
  /** One query per statistics cell. */
  readonly queries: readonly { cell: string; fn: string; sql: string }[];
  /** A query counting rows outside the accepted ranges (bad rows in Lentil). */
  readonly badRows: string;
}

const TYPE_WORD: Readonly<Record<string, string>> = {
  quantity: "DOUBLE PRECISION",
  number: "DOUBLE PRECISION",
  text: "TEXT",
};

const HOW: Readonly<Record<string, string>> = {
  countOf: "the count is n",
  meanOf: "the mean is mean_0",
  sdOf: "the standard deviation is SQRT(cov_0_0)",
  meanRx:
    "means of M, J0, J45 (mean_0..2); Lentil turns the mean vector back into sphere, cylinder and axis (Thibos 1997)",
  vectorStats: "means, variances and covariances of M, J0, J45",
  agreement:
    "bias is mean_0, SD is SQRT(cov_0_0); limits of agreement are bias ± 1.96 SD (Bland & Altman 1986)",
};

/**
 * Write a table's work as SQL over a source table or view named `source` (default: the
 * notebook's table name) holding the table's columns.
 *
 * @example
 * ```ts
 * import { writeSql } from "./statements.ts";
 * const w = writeSql({
 *   table: "eyes",
 *   inputs: [{ name: "sph", type: "quantity", unit: "D", numeric: true }],
 *   columns: [{ name: "M2", sql: '("sph" * CAST(2 AS DOUBLE PRECISION))', unit: "D", set: 1, line: 5 }],
 *   statistics: [{ cell: "avg", fn: "meanOf", args: ["M2"], variables: ['"M2"'], unit: "D", line: 6 }],
 *   sets: 1,
 * }, { notebook: "a.lentil.md" });
 * w.views[0].name; // "eyes_set1"
 * ```
 */
export function writeSql(
  work: TableWork,
  options: { notebook: string; source?: string },
): WrittenSql {
  const source = quoteName(options.source ?? work.table);
  const lines: string[] = [
    `-- Lentil: the table work of ${options.notebook.replace(/[\r\n]/g, " ")}, table ${work.table}`,
    "-- Standard SQL for PostgreSQL (and engines that speak its dialect) and DuckDB.",
    `-- Source: a table or view ${source} with these columns (empty cells as NULL):`,
    ...work.inputs.map((c) =>
      `--   ${quoteName(c.name)} ${TYPE_WORD[c.numeric ? c.type : "text"] ?? "TEXT"}${
        c.unit ? ` (in ${c.unit})` : ""
      }`
    ),
    "-- Rows must be in one cylinder form (Lentil transposes a mixed-sign cylinder column; this SQL does not).",
    "",
  ];
  const ranges: string[] = [];
  for (const c of work.inputs) {
    const rule = REFRACTION_COLUMNS[c.name.toLowerCase()];
    if (rule && c.type === "quantity" && c.unit === rule.unit) {
      const q = quoteName(c.name);
      ranges.push(`${q} < ${sqlNumber(rule.range[0])} OR ${q} > ${sqlNumber(rule.range[1])}`);
    }
  }
  const badRows = `SELECT COUNT(*) AS bad_rows FROM ${source}${
    ranges.length ? `\nWHERE ${ranges.join("\n   OR ")}` : " WHERE FALSE"
  }`;
  lines.push(
    "-- Rows outside the accepted ranges (Lentil stops at them, or leaves them out with bad rows: skip):",
  );
  lines.push(`${badRows};`, "");
  const views: { name: string; sql: string }[] = [];
  let from = source;
  for (let s = 1; s <= work.sets; s++) {
    const name = quoteName(`${work.table}_set${s}`);
    const cols = work.columns.filter((c) => c.set === s);
    const sql = `CREATE VIEW ${name} AS\nSELECT\n  src.*,\n  ${
      cols.map((c) => `${c.sql} AS ${quoteName(c.name)}`).join(",\n  ")
    }\nFROM ${from} AS src`;
    lines.push(
      `-- Computed columns ${
        cols.map((c) => `${c.name}${c.unit ? ` [${c.unit}]` : ""}`).join(", ")
      }`,
      `${sql};`,
      "",
    );
    views.push({ name: name.slice(1, -1), sql });
    from = name;
  }
  const queries: { cell: string; fn: string; sql: string }[] = [];
  for (const st of work.statistics) {
    const sql = statisticQuery(st, from);
    lines.push(
      `-- ${st.cell} = ${st.fn}(${
        st.args.map((a) => `${work.table}.${a}`).join(", ")
      })  (line ${st.line})`,
      `-- totals over complete rows; ${HOW[st.fn] ?? ""}${st.unit ? ` (in ${st.unit})` : ""}`,
      `${sql};`,
      "",
    );
    queries.push({ cell: st.cell, fn: st.fn, sql });
  }
  return { text: lines.join("\n"), views, queries, badRows };
}
