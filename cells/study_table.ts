/**
 * A table of results laid out as a paper's supplement prints it: one row per measure,
 * columns measure | n | persons | meanSD (mean ± SD) | ci95 (95% CI) | median | range |
 * eyes (what was done with both eyes), the unit written once beside the measure's name. The result is a table value, so it shows on the
 * page like any table and writes as CSV.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * import { tableInfo } from "./table.ts";
 * const lang = getLanguage();
 * const t = lang.compile(lang.parse("studyTable([1, 2, 3, 4])")).evaluate({});
 * tableInfo(t)?.columns.map((c) => c.name).slice(0, 4); // ["measure", "n", "persons", "meanSD"]
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec } from "./catalogue.ts";
import { Column, makeTable } from "./table.ts";
import { columnNumbers, unitOf } from "./stats.ts";
import { DEFAULT_DISPLAY } from "./types.ts";
import { qty, showStat } from "./_stat_records.ts";
import { EYE_OPTIONS, meanInterval, splitOptions } from "./study.ts";
import { COL } from "./stats.ts";
import { sampleStats } from "../lib/stats.ts";
import { LentilInputError } from "../lib/errors.ts";

/** A figure as a paper's table prints it: the trade's decimals, the unit left to the row. */
function figure(x: number, unit: string, spread = false): string {
  const text = showStat(spread ? "sd" : "mean", qty(x, unit), DEFAULT_DISPLAY);
  return unit
    ? text.replace(new RegExp(`\\s*${unit.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}$`), "")
    : text;
}

/** Headings in words of the studyTable columns whose names are identifiers. */
const STUDY_LABELS: Readonly<Record<string, string>> = {
  meanSD: "mean ± SD",
  ci95: "95% CI",
  persons: "persons",
};

/** The supplement-table formulas. */
export const STUDY_TABLE_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "studyTable",
    group: "study statistics",
    summary:
      "A supplement-ready table, one row per measure: measure (unit) | n | persons | meanSD (mean ± SD) | ci95 (95% CI) | median | range | eyes; the CI counts persons when a subject key and an eye column are found (options as for meanCI).",
    params: [
      COL("first", "the first measure, a numeric column"),
      ...["second", "third", "fourth", "fifth", "sixth", "seventh", "eighth"].map((w) =>
        COL(w, `the ${w} measure`, true)
      ),
    ],
    options: EYE_OPTIONS,
    returns: { type: "table", doc: "the table: text columns as printed" },
    sources: ["welford-1962", "hyndman-fan-1996", "murdoch-1998", "liang-zeger-1986"],
    example: "studyTable([-1.25 D, -1.5 D, -1 D, -2 D], [0.1, 0.0, 0.2, 0.1])",
    fn: (...args) => {
      const { cols, settings } = splitOptions(args, EYE_OPTIONS);
      if (!cols.length) throw new LentilInputError("studyTable: give at least one column");
      const out: Record<string, string[]> = {
        measure: [],
        n: [],
        persons: [],
        meanSD: [],
        ci95: [],
        median: [],
        range: [],
        eyes: [],
      };
      for (const c of cols) {
        const unit = unitOf(c);
        const s = sampleStats(columnNumbers(c));
        if (s.n < 2) {
          throw new LentilInputError(
            `studyTable: ${c.name} has ${s.n} value${s.n === 1 ? "" : "s"}; a row needs at least 2`,
          );
        }
        const m = meanInterval(c, settings);
        out.measure.push(unit ? `${c.name} (${unit})` : c.name);
        out.n.push(String(m.n));
        out.persons.push(m.subjects !== undefined ? String(m.subjects) : "");
        out.meanSD.push(`${figure(s.mean, unit)} ± ${figure(s.sd, unit, true)}`);
        out.ci95.push(`${figure(m.from, unit)} to ${figure(m.to, unit)}`);
        out.median.push(figure(s.median, unit));
        out.range.push(`${figure(s.lowest, unit)} to ${figure(s.highest, unit)}`);
        out.eyes.push(m.warning ? `${m.note}; warning: ${m.warning}` : m.note);
      }
      return makeTable(
        "studyTable",
        Object.entries(out).map(([name, data]) =>
          new Column(name, "text", "", data, { label: STUDY_LABELS[name] ?? name })
        ),
      );
    },
  }),
];
