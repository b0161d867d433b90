/**
 * Repeatability and reliability in the formula language, from a table with a subject key
 * and repeated measures (one row per measurement): the within-subject SD, the coefficient
 * of repeatability and ICC(1,1) of any numeric column (acuity in logMAR, a length), the
 * same for M, J0 and J45 of refractions, and the six named intraclass correlations when a
 * rater or occasion column says who measured.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * const v = lang.compile(lang.parse('repeatability([1, 1.2, 2, 2.3, 3, 2.8], ["a", "a", "b", "b", "c", "c"])')).evaluate({});
 * lang.describe(v).display.startsWith("within-subject SD"); // true
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec } from "./catalogue.ts";
import type { Column } from "./table.ts";
import {
  asColumn,
  COL,
  columnNumbers,
  refractionArrays,
  RX_PARAMS,
  unitOf,
  vectorsOf,
} from "./stats.ts";
import { joinShared, qty, showStat, statRecord } from "./_stat_records.ts";
import type { DisplayOptions } from "./types.ts";
import { intraclassForms, repeatability } from "../lib/reliability.ts";
import { LentilInputError } from "../lib/errors.ts";
import type { Numbers } from "../lib/stats.ts";

function keysOf(c: Column): string[] {
  return Array.from(c.data as ArrayLike<unknown>, (v) => {
    if (v === null || v === undefined || (typeof v === "number" && Number.isNaN(v))) return "";
    return String(v);
  });
}

/** Rows grouped by subject, in order of first appearance, empty values left out. */
function matrixOf(values: Numbers, subject: string[]): number[][] {
  const groups = new Map<string, number[]>();
  subject.forEach((k, i) => {
    if (k === "" || Number.isNaN(values[i])) return;
    groups.set(k, [...(groups.get(k) ?? []), values[i]]);
  });
  return [...groups.values()];
}

function repeatabilityLine(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  const out = [
    `within-subject SD ${show("sw")} (95% CI ${joinShared(show("swFrom"), " to ", show("swTo"))})`,
    `coefficient of repeatability ${show("repeatability")}`,
  ];
  if (r.icc !== undefined) {
    const two = (k: string) => (r[k] as number).toFixed(2);
    out.push(`ICC(1,1) ${two("icc")} (95% CI ${two("iccFrom")} to ${two("iccTo")})`);
  }
  out.push(`${r.subjects} subjects × ${r.repeats} measurements`);
  return out.join("; ");
}

const LABELS = {
  subjects: "subjects",
  repeats: "measurements of each subject",
  mean: "mean of all measurements",
  sw: "within-subject SD",
  swFrom: "within-subject SD, 95% confidence interval from",
  swTo: "within-subject SD, 95% confidence interval to",
  repeatability: "coefficient of repeatability (1.96·√2·Sw)",
  icc: "ICC(1,1), one-way random, single measure",
  iccFrom: "ICC(1,1), 95% confidence interval from",
  iccTo: "ICC(1,1), 95% confidence interval to",
};

/** Repeatability of one column as a record of the language. */
function repeatabilityRecord(values: Numbers, subject: string[], unit: string) {
  const r = repeatability(values, subject);
  const spread = (x: number) => (unit ? qty(Math.abs(x), unit) : x);
  const record: Record<string, unknown> = {
    subjects: r.subjects,
    repeats: r.repeats,
    mean: qty(r.mean, unit),
    sw: spread(r.sw),
    swFrom: spread(r.swCI.lower),
    swTo: spread(r.swCI.upper),
    repeatability: spread(r.repeatability),
  };
  if (r.msBetween > 0 && r.msWithin > 0) {
    const icc = intraclassForms(matrixOf(values, subject))[0];
    record.icc = icc.value;
    record.iccFrom = icc.lower;
    record.iccTo = icc.upper;
  }
  return statRecord(record, {
    display: repeatabilityLine,
    headline: repeatabilityLine,
    labels: LABELS,
  });
}

/** Each subject's rows must be given; lists written in a formula are read as columns. */
function subjectKeys(x: unknown, rows: number): string[] {
  const keys = keysOf(asColumn(x, "subject"));
  if (keys.length !== rows) {
    throw new LentilInputError(`the subject key has ${keys.length} rows, the values ${rows}`);
  }
  if (keys.every((k) => k === "")) {
    throw new LentilInputError("the subject key is empty in every row");
  }
  return keys;
}

/** The repeatability and reliability formulas. */
export const RELIABILITY_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "repeatability",
    group: "repeatability and reliability",
    summary:
      "Within-subject SD, coefficient of repeatability (1.96·√2·Sw ≈ 2.77·Sw) and ICC(1,1) of repeated measures of a numeric column (acuity, a length), one row per measurement, the same number for every subject.",
    params: [COL("column", "the measurements"), COL("subject", "the subject key of each row")],
    returns: {
      type: "any",
      doc: "subjects, repeats, mean, sw with its 95% CI, repeatability, icc with its 95% CI",
    },
    sources: ["bland-altman-1996", "shrout-fleiss-1979"],
    example: 'repeatability([0.1, 0.12, 0.3, 0.26, -0.02, 0.0], ["a", "a", "b", "b", "c", "c"])',
    fn: (c, s) => {
      const col = asColumn(c, "column");
      const values = columnNumbers(col);
      return repeatabilityRecord(values, subjectKeys(s, values.length), unitOf(col));
    },
  }),
  defineFormula({
    name: "rxRepeatability",
    group: "repeatability and reliability",
    summary:
      "Repeatability of refractions through power vectors: within-subject SD, coefficient of repeatability and ICC(1,1) of M, J0 and J45, from repeated refractions of each subject (or eye).",
    params: [COL("subject", "the subject (or eye) key of each row"), ...RX_PARAMS],
    returns: { type: "any", doc: "for M, J0 and J45: the repeatability record" },
    sources: ["bland-altman-1996", "shrout-fleiss-1979", "thibos-1997"],
    example:
      'rxRepeatability(["a", "a", "b", "b", "c", "c"], ["-1.00 / -0.50 x 90", "-1.25 / -0.50 x 85", "-2.00 DS", "-2.25 / -0.25 x 180", "+0.50 DS", "+0.75 DS"])',
    fn: (s, a, b, c) => {
      const cols = [a, b, c].filter((x) => x !== undefined).map((x) => asColumn(x, "rx"));
      const v = vectorsOf(refractionArrays(cols[0], cols[1], cols[2]));
      const keys = subjectKeys(s, v.m.length);
      return statRecord({
        M: repeatabilityRecord(v.m, keys, "D"),
        J0: repeatabilityRecord(v.j0, keys, "D"),
        J45: repeatabilityRecord(v.j45, keys, "D"),
      }, { labels: { M: "M (spherical equivalent)", J0: "J0", J45: "J45" } });
    },
  }),
  defineFormula({
    name: "reliability",
    group: "repeatability and reliability",
    summary:
      "The six intraclass correlations — ICC(1,1), (2,1), (3,1) and their averages of k measurements, named in words — with 95% confidence intervals, from one row per measurement with a subject key and a rater or occasion column.",
    params: [
      COL("column", "the measurements"),
      COL("subject", "the subject key of each row"),
      COL("rater", "the rater or occasion of each row"),
    ],
    returns: { type: "any", doc: "icc11, icc21, icc31, icc1k, icc2k, icc3k, subjects, raters" },
    sources: ["shrout-fleiss-1979", "mcgraw-wong-1996"],
    example:
      'reliability([9, 2, 6, 1, 8, 4, 7, 1], ["a", "a", "b", "b", "c", "c", "d", "d"], ["J1", "J2", "J1", "J2", "J1", "J2", "J1", "J2"])',
    fn: (c, s, j) => {
      const values = columnNumbers(asColumn(c, "column"));
      const keys = subjectKeys(s, values.length);
      const raters = keysOf(asColumn(j, "rater"));
      if (raters.length !== values.length) {
        throw new LentilInputError(
          `the rater column has ${raters.length} rows, the values ${values.length}`,
        );
      }
      const subjects = [...new Set(keys.filter((k) => k !== ""))];
      const who = [...new Set(raters.filter((k) => k !== ""))];
      const cell = new Map<string, number>();
      values.forEach((x, i) => {
        if (keys[i] === "" || raters[i] === "" || Number.isNaN(x)) return;
        const at = `${keys[i]}\u0000${raters[i]}`;
        if (cell.has(at)) {
          throw new LentilInputError(
            `subject ${keys[i]} is measured twice by ${raters[i]}: one row per subject and rater`,
          );
        }
        cell.set(at, x);
      });
      const table = subjects.map((k) =>
        who.map((w) => {
          const x = cell.get(`${k}\u0000${w}`);
          if (x === undefined) {
            throw new LentilInputError(
              `subject ${k} has no measurement by ${w}: every subject needs one by every rater or occasion`,
            );
          }
          return x;
        })
      );
      const forms = intraclassForms(table);
      const record: Record<string, unknown> = { subjects: subjects.length, raters: who.length };
      const labels: Record<string, string> = { raters: "raters or occasions" };
      const shown: Record<string, string> = {};
      for (const f of forms) {
        const key = `icc${f.form.slice(4, -1).replace(",", "")}`;
        record[key] = f.value;
        labels[key] = `${f.form.replace(",k", `,${who.length}`)}: ${f.description}`;
        shown[key] = `${f.value.toFixed(2)} (95% CI ${f.lower.toFixed(2)} to ${
          f.upper.toFixed(2)
        })`;
      }
      const line = () =>
        forms.map((f) => `${f.form.replace(",k", `,${who.length}`)} ${f.value.toFixed(2)}`)
          .join(", ") +
        `; ${subjects.length} subjects × ${who.length} raters`;
      return statRecord(record, {
        labels,
        partDisplay: (k) => shown[k],
        display: line,
        headline: line,
      });
    },
  }),
];
