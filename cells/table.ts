/**
 * Tables and columns as values of the formula language. A table is a plain object whose
 * properties are its columns, so `trials.va` works in an expression; its metadata (name,
 * column order, row count, rows excluded) is kept beside it. Numeric columns hold a
 * `Float64Array` of numbers in the column's unit.
 *
 * @example
 * ```ts
 * import { Column, makeTable, tableInfo } from "./table.ts";
 * const t = makeTable("trials", [new Column("lens", "quantity", "D", new Float64Array([1, 0.75]))]);
 * tableInfo(t)?.rowCount; // 2
 * ```
 *
 * @module
 */

/** Storage of one column: numbers in a typed array, anything else in a plain array. */
export type ColumnData = Float64Array | unknown[];

/**
 * How a column reads on every surface (terminal, page, live page, JSON), beside the
 * identifier a later cell uses (`thick.edgeThin`).
 */
export interface ColumnShow {
  /** The heading in words ("thinnest edge"); the column's name when omitted. */
  readonly label?: string;
  /** Decimals every number of the column shows (indices: 2); the unit's rule when omitted. */
  readonly decimals?: number;
}

/** One column of a table. */
export class Column {
  /**
   * @param name column name; @param type "quantity", "number", "text" or a value type;
   * @param unit unit of a quantity column ("" otherwise); @param data the values;
   * @param show its heading in words and its decimals, when a formula declares them.
   */
  constructor(
    readonly name: string,
    readonly type: string,
    readonly unit: string,
    readonly data: ColumnData,
    readonly show: ColumnShow = {},
  ) {}

  /** Number of rows. */
  get length(): number {
    return this.data.length;
  }

  /** True when the column holds plain numbers (with or without a unit). */
  get numeric(): boolean {
    return this.data instanceof Float64Array;
  }
}

/**
 * A column whose rows are held elsewhere (in a database that computed what the notebook
 * shows): it knows its name, type, unit and row count, and holds no values.
 *
 * @example
 * ```ts
 * import { HeldColumn } from "./table.ts";
 * new HeldColumn("M", "quantity", "D", 1_000_000).length; // 1000000
 * ```
 */
export class HeldColumn extends Column {
  /**
   * @param name column name; @param type its type; @param unit its unit;
   * @param rows rows held elsewhere.
   */
  constructor(name: string, type: string, unit: string, readonly rows: number) {
    super(name, type, unit, type === "quantity" || type === "number" ? new Float64Array() : []);
  }

  /** Rows held elsewhere. */
  override get length(): number {
    return this.rows;
  }
}

/** Metadata of a table value. */
export interface TableInfo {
  /** Table name in the notebook. */
  readonly name: string;
  /** Columns in display order, computed ones last. */
  readonly columns: readonly Column[];
  /** Rows held. */
  readonly rowCount: number;
  /** Rows that could not be read and were excluded (counted, never silent). */
  readonly excluded: number;
  /** CSV file the data came from, relative to the notebook, if any. */
  readonly file?: string;
  /** The column naming the person (subject key), when the table block declares one. */
  readonly subject?: string;
  /** The column naming the eye (R or L), when the table block declares one. */
  readonly eye?: string;
  /** How many of the columns came with the table; those after them are computed. */
  readonly dataColumns?: number;
}

/** A table as the formula language sees it: columns by name. */
export type TableValue = Record<string, Column>;

const infos = new WeakMap<object, TableInfo>();
const owners = new WeakMap<Column, TableValue>();

/**
 * Make a table value from columns of equal length.
 *
 * @example
 * ```ts
 * import { Column, makeTable } from "./table.ts";
 * const t = makeTable("t", [new Column("x", "number", "", new Float64Array([1, 2]))]);
 * t.x.length; // 2
 * ```
 * @throws {RangeError} when the columns differ in length.
 */
export function makeTable(
  name: string,
  columns: readonly Column[],
  extra: { excluded?: number; file?: string; subject?: string; eye?: string } = {},
): TableValue {
  const rowCount = columns.length ? columns[0].length : 0;
  const value: TableValue = {};
  for (const c of columns) {
    if (c.length !== rowCount) {
      throw new RangeError(
        `table ${name}: column ${c.name} has ${c.length} rows, expected ${rowCount}`,
      );
    }
    value[c.name] = c;
    owners.set(c, value);
  }
  infos.set(value, {
    name,
    columns,
    rowCount,
    excluded: extra.excluded ?? 0,
    file: extra.file,
    ...(extra.subject ? { subject: extra.subject } : {}),
    ...(extra.eye ? { eye: extra.eye } : {}),
    dataColumns: columns.length,
  });
  return value;
}

/**
 * Add (or replace) a computed column on a table value in place; the column must have the
 * table's row count.
 *
 * @example
 * ```ts
 * import { addColumn, Column, makeTable, tableInfo } from "./table.ts";
 * const t = makeTable("t", [new Column("x", "number", "", new Float64Array([1, 2]))]);
 * addColumn(t, new Column("y", "number", "", new Float64Array([2, 4])));
 * tableInfo(t)?.columns.length; // 2
 * ```
 * @throws {RangeError} when the lengths differ.
 */
export function addColumn(table: TableValue, column: Column): void {
  const info = infos.get(table);
  if (!info) throw new TypeError("not a table value");
  if (column.length !== info.rowCount) {
    throw new RangeError(
      `table ${info.name}: column ${column.name} has ${column.length} rows, expected ${info.rowCount}`,
    );
  }
  table[column.name] = column;
  owners.set(column, table);
  const columns = info.columns.filter((c) => c.name !== column.name).concat([column]);
  infos.set(table, { ...info, columns });
}

/**
 * Metadata of a table value, or undefined when `x` is not a table.
 *
 * @example
 * ```ts
 * import { tableInfo } from "./table.ts";
 * tableInfo({}); // undefined
 * ```
 */
export function tableInfo(x: unknown): TableInfo | undefined {
  return x !== null && typeof x === "object" ? infos.get(x) : undefined;
}

/**
 * Whether `x` is a table value.
 *
 * @example
 * ```ts
 * import { isTable } from "./table.ts";
 * isTable(3); // false
 * ```
 */
export function isTable(x: unknown): x is TableValue {
  return tableInfo(x) !== undefined;
}

/**
 * The table a column belongs to (the latest one it was placed in), or undefined for a
 * column made inside a formula.
 *
 * @example
 * ```ts
 * import { Column, makeTable, tableOfColumn } from "./table.ts";
 * const x = new Column("x", "number", "", new Float64Array([1, 2]));
 * const t = makeTable("t", [x]);
 * tableOfColumn(x) === t; // true
 * ```
 */
export function tableOfColumn(c: Column): TableValue | undefined {
  return owners.get(c);
}
