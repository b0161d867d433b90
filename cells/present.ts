/**
 * How a result reads, for every surface at once: the terminal, the exported page, the live
 * page and JSON all render from what {@linkcode present} returns. A value's headline (the line
 * a practitioner reads first), its parts (labelled in words, each with its display text),
 * its check lines and, for a table, its first rows come from the value type's declaration
 * (`cells/types.ts`); no surface special-cases a type.
 *
 * Records that formulas return are declared with {@linkcode defineRecordType}: the record
 * stays a plain object (a later cell reads `t.centre`), and its headline and parts labels
 * are declared once beside the formula. The part keys are the record's field names.
 *
 * @example
 * ```ts
 * import { defineRecordType, present } from "./present.ts";
 * const pair = defineRecordType<{ near: number; far: number }>({
 *   name: "examplePair",
 *   summary: "two distances",
 *   headline: (r) => `${r.near} to ${r.far}`,
 *   parts: [{ key: "near", label: "nearest" }, { key: "far", label: "farthest" }],
 * });
 * const shown = present(pair.make({ near: 1, far: 3 }));
 * shown.headline; // "1 to 3"
 * shown.parts?.[1].label; // "farthest"
 * ```
 *
 * @module
 */

import { countText } from "../lib/number_text.ts";
import { Column, type TableInfo, tableInfo } from "./table.ts";
import { formulaMath, isExact, isUnsigned, quantityParts, roundingNote } from "./quantity.ts";
import {
  type CheckLine,
  DEFAULT_DISPLAY,
  defineValueType,
  type DisplayOptions,
  typeOfValue,
  type ValuePart,
  type ValueType,
} from "./types.ts";
import {
  fixed,
  formatMeasure,
  formatNumber,
  formatQuantity,
  type MeasureKind,
  signed,
  unitText,
} from "./display.ts";

/** How a value is shown and serialised on one line. */
export interface Described {
  /** Text as the trade writes it, unit included. */
  readonly display: string;
  /** Plain JSON value (a number in `unit` for quantities). */
  readonly value: unknown;
  /** Unit of `value` ("" when none). */
  readonly unit: string;
}

/** One part of a result as every surface shows it. */
export interface PartView {
  /** The name a later cell reads it by (the record's field name). */
  readonly key: string;
  /** Its label in words. */
  readonly label: string;
  /** Its display text. */
  readonly display: string;
  /** Its JSON value (a number in `unit` for a quantity). */
  readonly value: unknown;
  /** Unit of `value` ("" when none). */
  readonly unit: string;
}

/** A table as every surface shows it: the first rows as display text, and the counts. */
export interface TableShown {
  /** Table name. */
  readonly name: string;
  /** Columns in order, computed ones last. */
  readonly columns: readonly {
    /** The identifier a later cell reads it by (`thick.edgeThin`). */
    readonly name: string;
    /** Its heading in words ("thinnest edge"), when it has one besides its name. */
    readonly label?: string;
    readonly unit: string;
    readonly numeric: boolean;
    readonly computed: boolean;
  }[];
  /** The rows shown, as display text, one string a column. */
  readonly rows: readonly (readonly string[])[];
  /** Rows the table holds. */
  readonly rowCount: number;
  /** Rows left out as unreadable. */
  readonly excluded: number;
  /** CSV file the data came from, if any. */
  readonly file?: string;
  /** The line under the table, in words: "2,000 rows, 11 columns (9 from study.csv, 2 computed); rows 1–25 shown". */
  readonly footer: string;
}

/** A result as every surface renders it. */
export interface Presented extends Described {
  /** The line read first (for a plain value, its display). */
  readonly headline: string;
  /** The labelled parts read under the headline, when the value has parts. */
  readonly parts?: readonly PartView[];
  /** The lines of a check, when the value is one. */
  readonly checks?: readonly CheckLine[];
  /** The rows of a table result. */
  readonly table?: TableShown;
}

/** Settings of {@linkcode present}. */
export interface PresentSettings {
  /** The kind of measure a plain number result is (a formula's declared `display`). */
  readonly kind?: MeasureKind;
  /** Rows of a table shown (default 25; a table at most 5 rows longer is shown whole). */
  readonly maxRows?: number;
}

/** Rows of a table shown by default. */
export const DEFAULT_ROWS_SHOWN = 25;

const math = () => formulaMath();

/**
 * Display and serialise a value on one line, by the display rule of its kind.
 *
 * @example
 * ```ts
 * import { describeValue } from "./present.ts";
 * describeValue(0.1996, undefined, "logMAR").display; // "0.20 logMAR"
 * describeValue(true).display; // "yes"
 * ```
 */
export function describeValue(
  x: unknown,
  options: DisplayOptions = DEFAULT_DISPLAY,
  kind?: MeasureKind,
): Described {
  if (typeof x === "number") {
    return { display: kind ? formatMeasure(x, kind) : formatNumber(x), value: x, unit: "" };
  }
  if (typeof x === "string") return { display: x, value: x, unit: "" };
  if (typeof x === "boolean") return { display: x ? "yes" : "no", value: x, unit: "" };
  const q = quantityParts(x);
  if (q) {
    const step = isExact(x) ? 0 : options.powerStep;
    const shown = q.unit === "D" && isUnsigned(x)
      ? `${fixed(Math.abs(q.value), 2)} D`
      : formatQuantity(q.value, q.unit, step);
    const rounded = roundingNote(x);
    return { display: rounded ? `${shown} (rounded: ${rounded})` : shown, ...q };
  }
  if (x instanceof Column) {
    return {
      display: `column ${x.name} (${countText(x.length)} rows${
        x.unit ? `, ${unitText(x.unit)}` : ""
      })`,
      value: columnJson(x, options),
      unit: x.unit,
    };
  }
  const info = tableInfo(x);
  if (info) {
    return {
      display: `table ${info.name}: ${tableCounts(info)}${
        info.excluded ? `; ${leftOut(info.excluded)}` : ""
      }`,
      value: {
        rows: info.rowCount,
        excluded: info.excluded,
        ...(info.file ? { file: info.file } : {}),
        columns: info.columns.map((c) => ({ name: c.name, type: c.type, unit: c.unit })),
      },
      unit: "",
    };
  }
  const t = typeOfValue(x);
  if (t) return { display: t.display(x, options), value: t.json(x), unit: t.unit?.(x) ?? "" };
  if (math().isMatrix(x) || Array.isArray(x)) {
    const arr = math().isMatrix(x) ? (x as { toArray(): unknown[] }).toArray() : x as unknown[];
    const parts = arr.map((v) => describeValue(v, options, kind));
    return {
      display: `[${parts.map((p) => p.display).join(", ")}]`,
      value: parts.map((p) => p.value),
      unit: parts.length && parts.every((p) => p.unit === parts[0].unit) ? parts[0].unit : "",
    };
  }
  if (x === null || x === undefined) return { display: "nothing", value: null, unit: "" };
  if (typeof x === "function") return { display: "a function", value: null, unit: "" };
  if (typeof x === "object") {
    const entries = Object.entries(x as Record<string, unknown>).map(([k, v]) =>
      [k, describeValue(v, options)] as const
    );
    return {
      display: entries.map(([k, d]) => `${k}: ${d.display}`).join(", "),
      value: Object.fromEntries(entries.map(([k, d]) => [k, d.value])),
      unit: "",
    };
  }
  return { display: String(x), value: String(x), unit: "" };
}

/** A column's values as JSON: numbers in its unit (null where empty), or each value's JSON. */
function columnJson(c: Column, options: DisplayOptions): unknown[] {
  return c.data instanceof Float64Array
    ? Array.from(c.data, (v) => (Number.isNaN(v) ? null : v))
    : c.data.map((v) => describeValue(v, options).value);
}

/**
 * A result with its headline, parts, check lines or table rows, as every surface shows it.
 *
 * @example
 * ```ts
 * import { present } from "./present.ts";
 * present({ a: 1, b: "two" }).parts?.map((p) => p.label); // ["a", "b"]
 * present(75.02, undefined, { kind: "letters" }).headline; // "75 letters"
 * ```
 */
export function present(
  x: unknown,
  options: DisplayOptions = DEFAULT_DISPLAY,
  settings: PresentSettings = {},
): Presented {
  const d = describeValue(x, options, settings.kind);
  const info = tableInfo(x);
  if (info) {
    const table = showTable(info, options, settings.maxRows);
    return { ...d, headline: `table ${info.name}`, table };
  }
  const t = typeOfValue(x);
  if (t) {
    const grouped = groupParts(t.parts?.(x, options) ?? [], options);
    const parts = grouped.rest.map((p) => partView(p, options));
    const checks = t.checks?.(x, options);
    return {
      ...d,
      headline: t.headline?.(x, options) ?? d.display,
      ...(parts.length ? { parts } : {}),
      ...(checks?.length ? { checks } : {}),
      ...(grouped.table ? { table: grouped.table } : {}),
    };
  }
  if (isPlainRecord(x)) {
    const grouped = groupParts(
      Object.entries(x).map(([key, value]) => ({ key, label: key, value })),
      options,
    );
    const parts = grouped.rest.map((p) => partView(p, options));
    const keys = Object.keys(x);
    const headline = grouped.table && !parts.length
      ? `${keys.length} groups: ${keys.join(", ")}`
      : "";
    return {
      ...d,
      headline,
      ...(parts.length ? { parts } : {}),
      ...(grouped.table ? { table: grouped.table } : {}),
    };
  }
  return { ...d, headline: d.display };
}

/**
 * Parts that are themselves records with the same parts (statistics by group, agreement of
 * M, J0 and J45) read as one table: a row each, a column for each of their parts.
 */
function groupParts(
  parts: readonly ValuePart[],
  options: DisplayOptions,
): { rest: readonly ValuePart[]; table?: TableShown } {
  const inner = parts.map((p) => {
    const t = typeOfValue(p.value);
    return t?.parts && !tableInfo(p.value) ? t.parts(p.value, options) : undefined;
  });
  const members = parts.filter((_, i) => inner[i]?.length);
  if (members.length < 2) return { rest: parts };
  const keys: string[] = [];
  const labels = new Map<string, string>();
  for (const list of inner) {
    for (const q of list ?? []) {
      if (!labels.has(q.key)) {
        keys.push(q.key);
        labels.set(q.key, q.label);
      }
    }
  }
  // A row for each of their parts, a column for each record: few columns, however many parts.
  const byKey = members.map((p) =>
    new Map((inner[parts.indexOf(p)] ?? []).map((q) => [q.key, q] as const))
  );
  const rows = keys.map((k) => [
    labels.get(k)!,
    ...byKey.map((m) => {
      const q = m.get(k);
      return q ? q.display ?? oneLine(q.value, options) : "";
    }),
  ]);
  const numericLike = (i: number) =>
    rows.every((r) => r[i] === "" || /^[+\-−]?\d/.test(r[i]) || r[i] === "not available");
  const table: TableShown = {
    name: "",
    columns: [
      { name: "", unit: "", numeric: false, computed: false },
      ...members.map((p, i) => ({
        name: p.label,
        unit: "",
        numeric: numericLike(i + 1),
        computed: false,
      })),
    ],
    rows,
    rowCount: rows.length,
    excluded: 0,
    footer: "",
  };
  return { rest: parts.filter((_, i) => !inner[i]?.length), table };
}

function isPlainRecord(x: unknown): x is Record<string, unknown> {
  if (x === null || typeof x !== "object" || Array.isArray(x)) return false;
  if (math().isMatrix(x) || quantityParts(x) || x instanceof Column) return false;
  const proto = Object.getPrototypeOf(x);
  return proto === Object.prototype || proto === null;
}

/** A declared part as every surface shows it. */
export function partView(p: ValuePart, options: DisplayOptions = DEFAULT_DISPLAY): PartView {
  const d = describeValue(p.value, options);
  return {
    key: p.key,
    label: p.label,
    display: p.display ?? oneLine(p.value, options),
    value: d.value,
    unit: d.unit,
  };
}

/** The one-line text of a value inside another: a typed value's headline, else its display. */
function oneLine(x: unknown, options: DisplayOptions): string {
  const t = typeOfValue(x);
  if (t?.headline) {
    const parts = t.parts?.(x, options) ?? [];
    const h = t.headline(x, options);
    return parts.length ? `${h} (${partsLine(parts, options)})` : h;
  }
  return describeValue(x, options).display;
}

function partsLine(parts: readonly ValuePart[], options: DisplayOptions): string {
  return parts.map((p) => `${p.label}: ${p.display ?? describeValue(p.value, options).display}`)
    .join("; ");
}

// ---- tables -------------------------------------------------------------------------------

/**
 * The counts of a table in words: "2,000 rows, 11 columns (9 from study.csv, 2 computed)".
 *
 * @example
 * ```ts
 * import { tableCounts } from "./present.ts";
 * import { Column, makeTable, tableInfo } from "./table.ts";
 * const t = makeTable("t", [new Column("x", "number", "", new Float64Array(2000))]);
 * tableCounts(tableInfo(t)!); // "2,000 rows, 1 column"
 * ```
 */
export function tableCounts(info: TableInfo): string {
  const n = info.rowCount;
  const c = info.columns.length;
  const computed = info.columns.filter((col) => isComputed(info, col)).length;
  const rows = `${countText(n)} row${n === 1 ? "" : "s"}`;
  const cols = `${c} column${c === 1 ? "" : "s"}`;
  const from = info.file ? ` from ${info.file}` : " entered";
  const split = computed
    ? ` (${c - computed}${from}, ${computed} computed)`
    : info.file
    ? ` (all${from})`
    : "";
  return `${rows}, ${cols}${split}`;
}

function leftOut(n: number): string {
  return `${countText(n)} unreadable row${n === 1 ? "" : "s"} left out`;
}

function isComputed(info: TableInfo, c: Column): boolean {
  return info.dataColumns !== undefined && info.columns.indexOf(c) >= info.dataColumns;
}

/**
 * A column's heading as every surface writes it: its label in words (its name when it has
 * none), then its unit in brackets.
 *
 * @example
 * ```ts
 * import { columnHeading } from "./present.ts";
 * columnHeading({ name: "edgeThin", label: "thinnest edge", unit: "mm" }); // "thinnest edge [mm]"
 * columnHeading({ name: "va", unit: "" }); // "va"
 * ```
 */
export function columnHeading(c: { name: string; label?: string; unit: string }): string {
  return `${c.label ?? c.name}${c.unit ? ` [${c.unit}]` : ""}`;
}

/**
 * The text of one table cell by the display rule of its column's unit (the header carries
 * the unit, so a number shows bare), or with the decimals its column declares: "" where
 * empty.
 *
 * @example
 * ```ts
 * import { tableCellText } from "./present.ts";
 * import { Column } from "./table.ts";
 * tableCellText(new Column("va", "quantity", "logMAR", new Float64Array([0.1996])), 0); // "0.20"
 * ```
 */
export function tableCellText(
  c: Column,
  i: number,
  options: DisplayOptions = DEFAULT_DISPLAY,
): string {
  const v = c.data[i];
  if (c.numeric) {
    const n = v as number;
    if (Number.isNaN(n)) return "";
    const d = c.show.decimals;
    if (d !== undefined) return c.unit === "D" && n > 0 ? "+" + n.toFixed(d) : n.toFixed(d);
    if (c.unit === "D") return signed(n);
    if (c.unit === "") return formatNumber(n);
    const shown = formatQuantity(n, c.unit);
    const u = unitText(c.unit);
    return shown.endsWith(u) ? shown.slice(0, shown.length - u.length).trim() : shown;
  }
  if (v === null || v === undefined) return "";
  return oneLine(v, options);
}

/**
 * The first rows of a table as display text, with the footer in words.
 *
 * @example
 * ```ts
 * import { showTable } from "./present.ts";
 * import { Column, makeTable, tableInfo } from "./table.ts";
 * const t = makeTable("t", [new Column("x", "number", "", Float64Array.from({ length: 40 }, (_, i) => i))]);
 * showTable(tableInfo(t)!).footer; // "40 rows, 1 column; rows 1–25 shown"
 * ```
 */
export function showTable(
  info: TableInfo,
  options: DisplayOptions = DEFAULT_DISPLAY,
  maxRows = DEFAULT_ROWS_SHOWN,
): TableShown {
  const cut = info.rowCount > maxRows + 5;
  const shown = cut ? maxRows : info.rowCount;
  const rows: string[][] = [];
  for (let i = 0; i < shown; i++) rows.push(info.columns.map((c) => tableCellText(c, i, options)));
  info.columns.forEach((c, j) => {
    if (c.numeric && c.unit === "" && c.show.decimals === undefined) evenDecimals(rows, j);
  });
  const facts = [tableCounts(info)];
  if (info.excluded) {
    facts.push(leftOut(info.excluded));
  }
  if (cut) facts.push(`rows 1–${countText(shown)} shown`);
  return {
    name: info.name,
    columns: info.columns.map((c) => ({
      name: c.name,
      ...(c.show.label ? { label: c.show.label } : {}),
      unit: c.unit,
      numeric: c.numeric,
      computed: isComputed(info, c),
    })),
    rows,
    rowCount: info.rowCount,
    excluded: info.excluded,
    ...(info.file ? { file: info.file } : {}),
    footer: facts.join("; "),
  };
}

/**
 * One precision down a plain-number column: every shown number gets the decimals of the
 * one with most (1.5, 1.53 become 1.50, 1.53), zeros added, nothing rounded further.
 */
function evenDecimals(rows: string[][], j: number): void {
  const plain = /^[-+]?\d+(?:\.(\d+))?$/;
  let most = 0;
  for (const r of rows) {
    const m = plain.exec(r[j]);
    if (r[j] && !m) return;
    most = Math.max(most, m?.[1]?.length ?? 0);
  }
  if (!most) return;
  for (const r of rows) {
    if (!r[j]) continue;
    const have = r[j].indexOf(".") < 0 ? 0 : r[j].length - r[j].indexOf(".") - 1;
    r[j] += (have ? "" : ".") + "0".repeat(most - have);
  }
}

// ---- records ------------------------------------------------------------------------------

const RECORD_KINDS = new WeakMap<object, string>();

/** One declared part of a record type. */
export interface RecordPartSpec<T> {
  /** The record's field name: the key a later cell reads it by. */
  readonly key: keyof T & string;
  /** Its label in words (with its unit, where the unit is not in the display). */
  readonly label: string;
  /** Display text, when the value's own rule is not the one (a covariance in D²). */
  readonly display?: (value: unknown, record: T, options: DisplayOptions) => string;
  /** Leave the part out of the display when this says so (an empty note). */
  readonly when?: (record: T) => boolean;
}

/** The declaration of a record type. */
export interface RecordTypeSpec<T> {
  /** Type name (for the reference and `typeOfValue`). */
  readonly name: string;
  /** One line for the reference. */
  readonly summary: string;
  /** The line read first. */
  readonly headline: (record: T, options: DisplayOptions) => string;
  /** The parts, in reading order. */
  readonly parts: readonly RecordPartSpec<T>[];
  /** Check lines, for a record that is a check. */
  readonly checks?: (record: T, options: DisplayOptions) => readonly CheckLine[];
}

/** A declared record type: its value type, and `make` to mark a record as one. */
export interface RecordType<T> {
  /** The registered value type. */
  readonly type: ValueType<T>;
  /** Mark `fields` as a record of this type; returns the same object. */
  make(fields: T): T;
}

/**
 * Declare a record type: a plain object whose fields are read by later cells, shown as a
 * headline and labelled parts everywhere.
 *
 * @example
 * ```ts
 * import { defineRecordType } from "./present.ts";
 * const r = defineRecordType<{ n: number }>({
 *   name: "exampleCount", summary: "a count",
 *   headline: (r) => `${r.n} eyes`, parts: [{ key: "n", label: "eyes" }],
 * });
 * r.type.display(r.make({ n: 3 }), { powerStep: 0.25 }); // "3 eyes"
 * ```
 */
export function defineRecordType<T extends object>(spec: RecordTypeSpec<T>): RecordType<T> {
  const parts = (r: T, options: DisplayOptions): ValuePart[] =>
    spec.parts.filter((p) => p.when?.(r) ?? true).map((p) => {
      const value = (r as Record<string, unknown>)[p.key];
      return {
        key: p.key,
        label: p.label,
        value,
        ...(p.display ? { display: p.display(value, r, options) } : {}),
      };
    });
  const type = defineValueType<T>({
    name: spec.name,
    summary: spec.summary,
    is: (x): x is T => x !== null && typeof x === "object" && RECORD_KINDS.get(x) === spec.name,
    headline: spec.headline,
    parts,
    ...(spec.checks ? { checks: spec.checks } : {}),
    display: (r, options) => {
      const h = spec.headline(r, options);
      const p = parts(r, options);
      return p.length > 1 || (p.length === 1 && !spec.checks)
        ? `${h} (${partsLine(p, options)})`
        : h;
    },
    json: (r) =>
      Object.fromEntries(
        Object.entries(r).map(([k, v]) => [k, describeValue(v).value]),
      ),
  });
  return {
    type,
    make(fields: T): T {
      RECORD_KINDS.set(fields, spec.name);
      return fields;
    },
  };
}

/**
 * The record type a value was marked with, if any.
 *
 * @example
 * ```ts
 * import { recordKind } from "./present.ts";
 * recordKind({}); // undefined
 * ```
 */
export function recordKind(x: unknown): string | undefined {
  return x !== null && typeof x === "object" ? RECORD_KINDS.get(x) : undefined;
}

/**
 * A part's display by a named kind of measure (for a declaration's `display`).
 *
 * @example
 * ```ts
 * import { byKind } from "./present.ts";
 * byKind("covariance")(0.0123); // "0.0123 D²"
 * ```
 */
export function byKind(kind: MeasureKind): (value: unknown) => string {
  return (value) => {
    const q = quantityParts(value);
    const n = q ? q.value : typeof value === "number" ? value : NaN;
    return Number.isNaN(n) ? describeValue(value).display : formatMeasure(n, kind);
  };
}
