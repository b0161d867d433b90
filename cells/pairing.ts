/**
 * Pairing two tables row by row on key columns (subject, eye, …), for paired analyses of
 * data held as two tables — two methods, two visits. Rows present in only one table are
 * left out and counted; a key that repeats within a table is an error naming it.
 *
 * @example
 * ```ts
 * import { PAIRING_FORMULAS } from "./pairing.ts";
 * PAIRING_FORMULAS[0].name; // "pairRows"
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec } from "./catalogue.ts";
import { Column, makeTable, tableInfo, type TableValue } from "./table.ts";
import { LentilInputError } from "../lib/errors.ts";

function keyOf(cols: readonly Column[], row: number): string {
  return JSON.stringify(cols.map((c) => {
    const v = c.data[row];
    return typeof v === "object" && v !== null ? JSON.stringify(v) : v;
  }));
}

function index(t: TableValue, keys: readonly string[], which: string): Map<string, number> {
  const info = tableInfo(t)!;
  const cols = keys.map((k) => {
    const c = t[k];
    if (!c) {
      throw new LentilInputError(
        `the ${which} table ${info.name} has no key column "${k}" (columns: ${
          info.columns.map((x) => x.name).join(", ")
        })`,
      );
    }
    return c;
  });
  const rows = new Map<string, number>();
  for (let i = 0; i < info.rowCount; i++) {
    const key = keyOf(cols, i);
    if (rows.has(key)) {
      throw new LentilInputError(
        `key ${keys.map((k, j) => `${k} = ${JSON.parse(key)[j]}`).join(", ")} appears twice in ` +
          `table ${info.name} (rows ${rows.get(key)! + 1} and ${
            i + 1
          }): give keys that name one row`,
      );
    }
    rows.set(key, i);
  }
  return rows;
}

/** A column's rows picked out; `from` (the table it came from) joins its label in words. */
function pick(c: Column, rows: readonly number[], name: string, from?: string): Column {
  const show = from ? { ...c.show, label: `${c.show.label ?? c.name} (${from})` } : c.show;
  if (c.data instanceof Float64Array) {
    const src = c.data;
    return new Column(name, c.type, c.unit, Float64Array.from(rows, (i) => src[i]), show);
  }
  const src = c.data;
  return new Column(name, c.type, c.unit, rows.map((i) => src[i]), show);
}

/**
 * Pair the rows of two tables on key columns: the keys once, then every other column of the
 * first table with `1` after its name and of the second with `2`. Rows without a partner
 * are counted as excluded.
 */
export function pairRows(
  first: TableValue,
  second: TableValue,
  keys: readonly string[],
): TableValue {
  if (!keys.length) throw new LentilInputError('name at least one key column, e.g. "subject"');
  const a = tableInfo(first)!;
  const b = tableInfo(second)!;
  const ia = index(first, keys, "first");
  const ib = index(second, keys, "second");
  const rowsA: number[] = [];
  const rowsB: number[] = [];
  for (const [key, i] of ia) {
    const j = ib.get(key);
    if (j !== undefined) {
      rowsA.push(i);
      rowsB.push(j);
    }
  }
  const excluded = a.rowCount - rowsA.length + (b.rowCount - rowsB.length);
  // Each side's columns read by their table's name ("va (visit1)"), or first and second.
  const [fromA, fromB] = a.name === b.name ? ["first", "second"] : [a.name, b.name];
  const columns = [
    ...keys.map((k) => pick(first[k], rowsA, k)),
    ...a.columns.filter((c) => !keys.includes(c.name)).map((c) =>
      pick(c, rowsA, `${c.name}1`, fromA)
    ),
    ...b.columns.filter((c) => !keys.includes(c.name)).map((c) =>
      pick(c, rowsB, `${c.name}2`, fromB)
    ),
  ];
  return makeTable(`${a.name}_${b.name}`, columns, { excluded });
}

/** The pairing formulas. */
export const PAIRING_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "pairRows",
    group: "statistics",
    summary:
      "Pair the rows of two tables (two methods, two visits) on key columns; rows without a partner are left out and counted.",
    params: [
      {
        name: "first",
        type: "table",
        doc: "the first table (its columns get 1 after their names)",
      },
      { name: "second", type: "table", doc: "the second table (its columns get 2)" },
      { name: "key", type: "text", doc: 'a key column in both tables, e.g. "subject"' },
    ],
    variadic: true,
    returns: { type: "table", doc: "the paired table: keys, then name1 … and name2 … columns" },
    sources: ["common-practice"],
    example: 'pairRows(logMARChart(), logMARChart(), "size")',
    fn: (first, second, ...keys) =>
      pairRows(first as TableValue, second as TableValue, keys as string[]),
  }),
];
