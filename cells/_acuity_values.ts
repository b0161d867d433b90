/**
 * Private helpers of the acuity, blur and endpoint cells: the `acuity` value type (shared
 * by all three), a record of named measurements with units (the modules do not import the
 * language, so that any of them can be loaded first), and column lookup in tables.
 *
 * @module
 */

import {
  type Acuity,
  type AcuityNotation,
  formatAcuity,
  type LowVisionCategory,
  parseAcuity,
  readNotation,
} from "../lib/acuity.ts";
import { LentilInputError } from "../lib/errors.ts";
import { formatMeasure, formatQuantity } from "./display.ts";
import { quantity } from "./quantity.ts";
import { type Column, tableInfo, type TableValue } from "./table.ts";
import { defineValueType } from "./types.ts";

/** An acuity as a value of the formula language; shown in its notation. */
export class AcuityValue implements Acuity {
  /** @param a the acuity record. */
  constructor(a: Acuity) {
    this.logMAR = a.logMAR;
    this.notation = a.notation;
    if (a.numerator !== undefined) this.numerator = a.numerator;
    if (a.letters !== undefined) this.letters = a.letters;
    if (a.category !== undefined) this.category = a.category;
    if (a.substitution !== undefined) this.substitution = a.substitution;
    if (a.nearDistance !== undefined) this.nearDistance = a.nearDistance;
  }
  /** logMAR. */
  readonly logMAR: number;
  /** Display notation. */
  readonly notation: AcuityNotation;
  /** Snellen numerator, if written as a fraction. */
  readonly numerator?: number;
  /** Letters added or missed on a Snellen line. */
  readonly letters?: number;
  /** A low-vision category (CF, HM, LP, NLP); `logMAR` is then its substitution. */
  readonly category?: LowVisionCategory;
  /** Source id of a category's substitution. */
  readonly substitution?: string;
  /** Test distance of a near acuity, m. */
  readonly nearDistance?: number;
}

/** The `acuity` value type. */
export const ACUITY_TYPE = defineValueType<AcuityValue>({
  name: "acuity",
  summary:
    'an acuity (acuity("6/9"), "20/40", "0.3 logMAR", "1.0 decimal", "85 letters", "CF", "HM", "LP", "NLP", "N8 at 40 cm", "1.0 M at 40 cm")',
  is: (x): x is AcuityValue => x instanceof AcuityValue,
  fromText: (text) => new AcuityValue(parseAcuity(text)),
  // A category shows as written ("CF") unless it was asked for in another notation.
  display: (a) => formatAcuity(a, a.category && a.notation !== "logMAR" ? a.notation : undefined),
  json: (a) => ({ ...a, decimal: 10 ** -a.logMAR, mar: 10 ** a.logMAR }),
  sources: acuitySources,
});

/** The notation sources: Snellen fractions, decimal, MAR and logMAR. */
export const NOTATION_SOURCES: readonly string[] = ["ico-1984", "iso-8596"];

/**
 * The sources an acuity's reading rests on: a category its substitution's source; a near
 * acuity the M-unit conversion (and the N-to-M rule for N notation); letters the letter
 * score; every other notation the notation sources.
 */
function acuitySources(a: AcuityValue): readonly string[] {
  if (a.category) return a.substitution ? [a.substitution] : ["low-vision-conventions"];
  const out: string[] = [];
  if (a.nearDistance !== undefined) {
    out.push("sloan-habel-1956");
    if (a.notation !== "nearM") out.push("law-1951");
    if (a.notation === "nearN" || a.notation === "nearM") return out;
  }
  if (a.notation === "letters") out.push("ferris-1982");
  else out.push(...NOTATION_SOURCES);
  return out;
}

/** Wrap an acuity record as a language value, optionally in another notation. */
export function acuityValue(a: Acuity, notation?: string): AcuityValue {
  return new AcuityValue(notation ? { ...a, notation: readNotation(notation) } : a);
}

/** One named measurement of a {@linkcode Measures} record. */
export interface Measure {
  /** Key in the JSON form (camelCase). */
  readonly key: string;
  /** Label in the display. */
  readonly label: string;
  /** The number, in `unit`. */
  readonly value: number;
  /** Unit ("" for a ratio). */
  readonly unit: string;
}

/** One measurement as shown: by its unit's rule, a ratio (no unit) to two decimals. */
function measureShown(i: Measure): string {
  return i.unit ? formatQuantity(i.value, i.unit) : formatMeasure(i.value, "ratio");
}

/** A record of named measurements, shown as "label value unit, …". */
export class Measures {
  /** @param summary what the record is; @param items the measurements, in display order. */
  constructor(readonly summary: string, readonly items: readonly Measure[]) {}
}

defineValueType<Measures>({
  name: "measures",
  summary: "a record of named measurements with units",
  is: (x): x is Measures => x instanceof Measures,
  display: (m) => m.items.map((i) => `${i.label} ${measureShown(i)}`).join(", "),
  headline: (m) => `${m.items[0].label} ${measureShown(m.items[0])}`,
  parts: (m) =>
    m.items.map((i) => ({
      key: i.key,
      label: i.label,
      value: i.unit ? quantity(i.value, i.unit) : i.value,
      display: measureShown(i),
    })),
  json: (m) =>
    Object.fromEntries(
      m.items.map((i) => [i.key, i.unit ? { value: i.value, unit: i.unit } : i.value]),
    ),
});

/**
 * A column of `table` by name (case-insensitive), or else the first whose name is one of
 * `fallbacks`, or else the first passing `accept`. `what` names the role in errors.
 */
export function findColumn(
  table: TableValue,
  what: string,
  name: string | undefined,
  fallbacks: readonly string[],
  accept: (c: Column) => boolean = () => false,
): Column {
  const info = tableInfo(table);
  const columns = info?.columns ?? Object.values(table);
  const names = columns.map((c) => c.name).join(", ");
  const byName = (n: string) => columns.find((c) => c.name.toLowerCase() === n.toLowerCase());
  if (name) {
    const c = byName(name);
    if (!c) {
      throw new LentilInputError(
        `table ${info?.name ?? ""} has no column "${name}" for the ${what} (columns: ${names})`,
      );
    }
    return c;
  }
  for (const f of fallbacks) {
    const c = byName(f);
    if (c) return c;
  }
  const c = columns.find(accept);
  if (!c) {
    throw new LentilInputError(
      `name the ${what} column of table ${info?.name ?? ""} (columns: ${names})`,
    );
  }
  return c;
}

/** The row count of a table value. */
export function rowCount(table: TableValue): number {
  return tableInfo(table)?.rowCount ?? Object.values(table)[0]?.length ?? 0;
}
