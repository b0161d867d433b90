/**
 * How the study statistics find the persons behind a table of eyes, and what they do about
 * them. A subject key and an eye column are taken from the settings (`{subject: t.id, eye:
 * t.side}`), else from the table block (`subject:` and `eye:` lines), else detected by name
 * (a column called subject, person, patient or participant and one called eye or side) —
 * and the result says which. Then the `eyes` setting chooses what an inferential statistic
 * does with the two eyes of one person:
 *
 * - "by person" (the default): all eyes, standard errors from persons (cluster-robust);
 * - "right", "left": one eye per person; "random": one eye per person chosen with a seed;
 * - "person mean": the mean of each person's eyes;
 * - "as independent": every eye as if from a different person (shown with a warning).
 *
 * Sources: murdoch-1998, armstrong-2013, ying-2017.
 *
 * @module
 */

import { countText } from "../lib/number_text.ts";
import { type Column, tableInfo, tableOfColumn, type TableValue } from "./table.ts";
import { type EyePairing, eyePairing, oneEyeRows, personMeans, sideOf } from "../lib/eyes.ts";
import { LentilInputError } from "../lib/errors.ts";
import type { OptionSpec } from "./catalogue.ts";

/** What to do with the two eyes of one person. */
export type EyesChoice =
  | "by person"
  | "right"
  | "left"
  | "random"
  | "person mean"
  | "as independent";

/** The words the `eyes` setting accepts. */
export const EYES_CHOICES: readonly EyesChoice[] = [
  "by person",
  "right",
  "left",
  "random",
  "person mean",
  "as independent",
];

/** The named options every both-eyes-aware statistic takes. */
export const EYE_OPTIONS: readonly OptionSpec[] = [
  {
    name: "eyes",
    type: "text",
    choices: EYES_CHOICES,
    default: "by person",
    doc:
      'what to do with both eyes of one person: "by person" (default: standard errors from persons), "right", "left", "random" (one eye each), "person mean", "as independent" (warned)',
  },
  {
    name: "subject",
    type: "any",
    doc: "the subject-key column, when the table does not name one",
  },
  { name: "eye", type: "any", doc: "the eye column (R or L), when the table does not name one" },
  {
    name: "seed",
    type: "integer",
    default: 1,
    doc: 'seed of the random choice of eye (with eyes: "random")',
  },
];

/** The persons behind a column of eyes, and how they were found. */
export interface EyeContext {
  /** The pairing of rows into persons and eyes. */
  readonly pairing: EyePairing;
  /** Words: which columns, and whether declared or detected. */
  readonly found: string;
}

/** Column names by which a table's person (subject) key is detected. */
export const SUBJECT_NAMES: RegExp = /^(subject|subjectid|subject_id|person|patient|participant)$/i;
/** Column names by which a table's eye column is detected. */
export const EYE_NAMES: RegExp = /^(eye|side)$/i;

/**
 * Whether a table's rows are eyes of persons, by its declared `subject:`/`eye:` lines or by
 * the names of its columns: the subject and eye column names, or undefined.
 */
export function pairedColumns(
  columnNames: readonly string[],
  declared: { subject?: string; eye?: string } = {},
): { subject: string; eye: string } | undefined {
  if (declared.subject && declared.eye) return { subject: declared.subject, eye: declared.eye };
  const subject = columnNames.find((n) => SUBJECT_NAMES.test(n));
  const eye = columnNames.find((n) => EYE_NAMES.test(n));
  return subject && eye ? { subject, eye } : undefined;
}

function textOf(c: Column): string[] {
  return Array.from(c.data as ArrayLike<unknown>, (v) => {
    if (v === null || v === undefined || (typeof v === "number" && Number.isNaN(v))) return "";
    return String(v);
  });
}

function columnOf(table: TableValue, name: string, what: string): Column {
  const c = table[name];
  if (!c) {
    const info = tableInfo(table)!;
    throw new LentilInputError(
      `table ${info.name} names ${name} as its ${what} column, but has no column ${name}`,
    );
  }
  return c;
}

/**
 * The persons behind a column of eyes, or undefined when none can be found (a list written
 * in the formula, a table without subject and eye columns).
 *
 * @throws {LentilInputError} when a named column is missing, or its values are not eyes.
 */
export function eyeContext(
  column: Column,
  settings: Record<string, unknown>,
): EyeContext | undefined {
  const given = (k: string) => settings[k] as Column | undefined;
  if (given("subject") || given("eye")) {
    const s = given("subject");
    const e = given("eye");
    if (!s || !e) {
      throw new LentilInputError("give both settings subject and eye, or neither");
    }
    return {
      pairing: pairOf(s, e, column.length),
      found: `persons from ${s.name}, eyes from ${e.name} (given)`,
    };
  }
  const table = tableOfColumn(column);
  const info = table ? tableInfo(table) : undefined;
  if (!table || !info) return undefined;
  if (info.subject || info.eye) {
    if (!info.subject || !info.eye) {
      throw new LentilInputError(
        `table ${info.name} names ${
          info.subject ? "a subject" : "an eye"
        } column but not the other: add the ${info.subject ? "eye:" : "subject:"} line`,
      );
    }
    const s = columnOf(table, info.subject, "subject");
    const e = columnOf(table, info.eye, "eye");
    return {
      pairing: pairOf(s, e, column.length),
      found: `persons from ${s.name}, eyes from ${e.name} (named in table ${info.name})`,
    };
  }
  const s = info.columns.find((c) => SUBJECT_NAMES.test(c.name));
  const e = info.columns.find((c) => EYE_NAMES.test(c.name));
  if (!s || !e) return undefined;
  const eyes = textOf(e);
  try {
    eyes.forEach((x) => sideOf(x));
  } catch {
    return undefined;
  }
  const pairing = pairOf(s, e, column.length);
  if (pairing.bothEyes === 0) return undefined;
  return {
    pairing,
    found: `persons from ${s.name}, eyes from ${e.name} (detected by name in table ${info.name})`,
  };
}

function pairOf(s: Column, e: Column, rows: number): EyePairing {
  if (s.length !== rows || e.length !== rows) {
    throw new LentilInputError(
      `the subject and eye columns have ${s.length} and ${e.length} rows, the values ${rows}`,
    );
  }
  return eyePairing(textOf(s), textOf(e));
}

/** Values prepared for an inferential statistic, with what was done, in words. */
export interface EyesApplied {
  /** The values to use (one eye, person means, or all eyes). */
  readonly arrays: Float64Array[];
  /** For "by person": the pairing of the rows, for standard errors from persons. */
  readonly clusters?: EyePairing;
  /** What was done, in words (always set). */
  readonly note: string;
  /** Set when eyes of one person are treated as independent. */
  readonly warning?: string;
  /** The subject key of each value kept (for "by person"). */
  readonly subjectOfRow?: string[];
}

const count = (n: number, word: string) => `${countText(n)} ${word}${n === 1 ? "" : "s"}`;

/** What is said when no persons are found behind the rows. */
export const INDEPENDENT_NOTE = "rows taken as independent (no subject key and eye column found)";

/** The fix offered beside a statistic computed on eyes as if independent. */
export const EYES_FIX =
  'write {eyes: "by person"} (standard errors from persons), {eyes: "right"} or {eyes: "person mean"}';

/**
 * Apply the `eyes` choice to paired arrays of values (one per variable, same rows).
 */
export function applyEyes(
  ctx: EyeContext | undefined,
  arrays: Float64Array[],
  settings: Record<string, unknown>,
): EyesApplied {
  const choice = (settings.eyes as EyesChoice | undefined) ?? "by person";
  if (!ctx) {
    if (settings.eyes && settings.eyes !== "as independent" && settings.eyes !== "by person") {
      throw new LentilInputError(
        `eyes: "${settings.eyes}" needs the persons behind the rows: name a subject and an eye column (table lines subject: and eye:, or the settings subject and eye)`,
      );
    }
    return { arrays, note: INDEPENDENT_NOTE };
  }
  const p = ctx.pairing;
  const persons = `${count(p.eyes, "eye")} of ${count(p.subjects, "person")}`;
  switch (choice) {
    case "by person":
      return {
        arrays,
        clusters: p,
        note: `all ${persons}; standard errors from persons (cluster-robust); ${ctx.found}`,
        subjectOfRow: Array.from(p.personOfRow, (g) => (g >= 0 ? p.persons[g].key : "")),
      };
    case "right":
    case "left":
    case "random": {
      const seed = settings.seed === undefined ? 1 : Number(settings.seed);
      const rows = oneEyeRows(p, choice, seed);
      const which = choice === "random" ? `chosen at random (seed ${seed})` : `the ${choice} eye`;
      return {
        arrays: arrays.map((a) => Float64Array.from(rows, (r) => a[r])),
        note: `one eye per person, ${which}: ${count(rows.length, "eye")} of ${
          count(p.subjects, "person")
        }; ${ctx.found}`,
      };
    }
    case "person mean": {
      const means = personMeans(p, arrays);
      return {
        arrays: means,
        note: `the mean of each person's eyes: ${
          count(means[0]?.length ?? 0, "person")
        }; ${ctx.found}`,
      };
    }
    case "as independent":
      return {
        arrays,
        note: `all ${persons} taken as independent; ${ctx.found}`,
        warning: p.bothEyes
          ? `${
            count(p.bothEyes, "person")
          } give both eyes: fellow eyes are correlated, so this interval is too narrow; ${EYES_FIX}`
          : undefined,
      };
  }
}

/** A note for a descriptive statistic over all eyes. */
export function descriptiveNote(ctx: EyeContext | undefined): string | undefined {
  if (!ctx) return undefined;
  const p = ctx.pairing;
  return `all ${count(p.eyes, "eye")} of ${count(p.subjects, "person")} (descriptive; ${
    p.bothEyes ? "fellow eyes are correlated" : "one eye each"
  })`;
}
