/**
 * Acuity cells: notations and conversions, scoring a chart reading, chart geometry and the
 * chance of being credited with a line by guessing.
 *
 * @example
 * ```ts
 * import { ACUITY_FORMULAS } from "./acuity.ts";
 * ACUITY_FORMULAS.some((f) => f.name === "toLogMAR"); // true
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec, type ParamSpec } from "./catalogue.ts";
import { Column, makeTable, type TableValue } from "./table.ts";
import { defineValueType, sourcesOfValue } from "./types.ts";
import { formatMeasure } from "./display.ts";
import {
  AcuityValue,
  acuityValue,
  findColumn,
  NOTATION_SOURCES,
  rowCount,
} from "./_acuity_values.ts";
import {
  type Acuity,
  acuityFromDecimal,
  acuityFromLetterScore,
  acuityFromLogMAR,
  acuityFromMAR,
  bareNumberMessage,
  decimalOf,
  formatAcuity,
  formatSnellen,
  letterScoreOf,
  marOf,
  parseAcuity,
  readNotation,
  withNotation,
} from "../lib/acuity.ts";
import { type ChartScore, regularChart, scoreChart } from "../lib/acuity_scoring.ts";
import {
  acuityForLetter,
  letterHeight,
  referToInfinity,
  testDistanceVergence,
} from "../lib/chart.ts";
import {
  guessAnyLine,
  guessChance,
  guessChanceDistinct,
  letterSetSize,
  naiveGuessChance,
} from "../lib/guessing.ts";
import { trialLogMAR } from "../lib/endpoint.ts";
import { LentilInputError } from "../lib/errors.ts";

const ACUITY: ParamSpec = { name: "acuity", type: "acuity", doc: 'an acuity (or text like "6/9")' };
const RETURNS_ACUITY = { type: "acuity", doc: "an acuity" } as const;
const acuityOf = (x: unknown): Acuity => x as AcuityValue;
const DISTANCE: ParamSpec = {
  name: "distance",
  type: "quantity",
  unit: "m",
  range: [0.1, 100],
  doc: "test distance",
};

/** A chart reading as a value: shows the line and letter-by-letter results. */
export class ChartScoreValue {
  /** @param score the scored reading. */
  constructor(readonly score: ChartScore) {}
}

defineValueType<ChartScoreValue>({
  name: "chartScore",
  summary: "a scored chart reading (line and letter-by-letter acuity)",
  is: (x): x is ChartScoreValue => x instanceof ChartScoreValue,
  display: ({ score: s }) => {
    const line = s.lineLogMAR === null
      ? "no line credited"
      : `line ${formatAcuity(acuityFromLogMAR(s.lineLogMAR))}${
        s.lineMissed ? ` -${s.lineMissed}` : ""
      }${s.nextLineRead ? ` +${s.nextLineRead}` : ""}`;
    const letters = s.letterLogMAR === null
      ? "no letter read"
      : `letter by letter ${formatAcuity(acuityFromLogMAR(s.letterLogMAR))}`;
    const notes = s.notes.length ? ` (${s.notes.join("; ")})` : "";
    return `${line}; ${letters}; ${s.lettersRead} letters${notes}`;
  },
  headline: ({ score: s }) =>
    s.letterLogMAR === null
      ? "no letter read"
      : `${formatAcuity(acuityFromLogMAR(s.letterLogMAR))} letter by letter`,
  parts: ({ score: s }) => [
    {
      key: "lineLogMAR",
      label: "line credited",
      value: s.lineLogMAR,
      display: s.lineLogMAR === null
        ? "no line credited"
        : `${formatAcuity(acuityFromLogMAR(s.lineLogMAR))}${
          s.lineMissed ? ` -${s.lineMissed}` : ""
        }${s.nextLineRead ? ` +${s.nextLineRead}` : ""}`,
    },
    {
      key: "letterLogMAR",
      label: "letter by letter",
      value: s.letterLogMAR,
      display: s.letterLogMAR === null
        ? "no letter read"
        : formatAcuity(acuityFromLogMAR(s.letterLogMAR)),
    },
    {
      key: "lettersRead",
      label: "letters read",
      value: s.lettersRead,
      display: formatMeasure(s.lettersRead, "count"),
    },
    { key: "lineMissed", label: "letters missed on the line credited", value: s.lineMissed },
    { key: "nextLineRead", label: "letters read on the next line", value: s.nextLineRead },
    ...s.notes.map((n, i) => ({ key: `note${i + 1}`, label: "note", value: n })),
  ],
  json: ({ score }) => score,
});

function readAcuityArg(value: unknown, notation?: string): AcuityValue {
  if (value instanceof AcuityValue) return notation ? acuityValue(value, notation) : value;
  if (typeof value === "string") return acuityValue(parseAcuity(value), notation);
  if (typeof value === "number") {
    if (!notation) {
      throw new LentilInputError(bareNumberMessage(String(value)));
    }
    const n = readNotation(notation);
    const a = n === "logMAR"
      ? acuityFromLogMAR(value)
      : n === "decimal"
      ? acuityFromDecimal(value)
      : n === "MAR"
      ? acuityFromMAR(value)
      : n === "letters"
      ? acuityFromLetterScore(value)
      : undefined;
    if (!a) {
      throw new LentilInputError(
        `a Snellen fraction is written as text, e.g. acuity("6/9")`,
      );
    }
    return new AcuityValue(a);
  }
  throw new LentilInputError(`expected an acuity, text or a number`);
}

function chartScoreOf(
  table: TableValue,
  given: readonly unknown[] | undefined,
  sizeName?: string,
  lettersName?: string,
  readName?: string,
): ChartScore {
  const size = findColumn(table, "line size", sizeName, ["size", "logMAR", "line"]);
  const letters = findColumn(table, "letters per line", lettersName, ["letters", "count"]);
  const n = rowCount(table);
  const lines = Array.from({ length: n }, (_, i) => ({
    logMAR: trialLogMAR(size.data[i] as number, i + 1),
    letters: Number(letters.data[i]),
  }));
  if (given && given.length > n) {
    throw new LentilInputError(`${given.length} readings given for a chart of ${n} lines`);
  }
  const read = given ? undefined : findColumn(table, "letters read", readName, ["read", "correct"]);
  const counts = Array.from({ length: n }, (_, i) => {
    const v = given ? given[i] : read!.data[i];
    if (v === null || v === undefined || v === "") return null;
    return Number(v);
  });
  return scoreChart(lines, counts);
}

/** Acuity formulas. */
export const ACUITY_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "acuity",
    group: "acuity",
    summary:
      'An acuity from text ("6/9", "20/40", "0.3 logMAR", "1.0 decimal", "85 letters", "CF", "HM", "LP", "NLP", "N8 at 40 cm", "1.0 M at 40 cm") or a number in a named notation; a number without its notation is refused, as text or as a number. CF and HM take published logMAR substitutions for statistics, LP and NLP conventional ones (never measured acuities). A second argument changes the notation it is shown in.',
    params: [
      { name: "value", type: "any", doc: "text, a number, or an acuity" },
      {
        name: "notation",
        type: "text",
        optional: true,
        doc: "logMAR, decimal, MAR, letters, feet or metres",
      },
    ],
    returns: RETURNS_ACUITY,
    sources: [
      ...NOTATION_SOURCES,
      "ferris-1982",
      "schulze-bonsel-2006",
      "lange-2009",
      "low-vision-conventions",
      "sloan-habel-1956",
      "law-1951",
    ],
    cites: sourcesOfValue,
    example: 'acuity("20/40")',
    fn: (value, notation) => readAcuityArg(value, notation as string | undefined),
  }),
  defineFormula({
    name: "acuityAs",
    group: "acuity",
    summary: "The same acuity shown in another notation.",
    params: [ACUITY, {
      name: "notation",
      type: "text",
      doc: "logMAR, decimal, MAR, letters, feet or metres",
    }],
    returns: RETURNS_ACUITY,
    sources: NOTATION_SOURCES,
    example: 'acuityAs("6/12", "decimal")',
    fn: (a, notation) => new AcuityValue(withNotation(acuityOf(a), notation as string)),
  }),
  defineFormula({
    name: "toLogMAR",
    group: "acuity",
    summary: "logMAR of an acuity (log10 of the MAR in arcmin).",
    params: [ACUITY],
    returns: { type: "number", display: "logMAR", doc: "logMAR" },
    sources: NOTATION_SOURCES,
    example: 'toLogMAR("20/200")',
    fn: (a) => acuityOf(a).logMAR,
  }),
  defineFormula({
    name: "toDecimal",
    group: "acuity",
    summary: "Decimal acuity V (test distance over letter distance).",
    params: [ACUITY],
    returns: { type: "number", display: "decimal", doc: "decimal acuity" },
    sources: NOTATION_SOURCES,
    example: 'toDecimal("6/9")',
    fn: (a) => decimalOf(acuityOf(a)),
  }),
  defineFormula({
    name: "toMAR",
    group: "acuity",
    summary: "Minimum angle of resolution, 1/V.",
    params: [ACUITY],
    returns: { type: "quantity", unit: "arcmin", doc: "MAR" },
    sources: NOTATION_SOURCES,
    example: 'toMAR("20/40")',
    fn: (a) => marOf(acuityOf(a)),
  }),
  defineFormula({
    name: "letterScore",
    group: "acuity",
    summary: "Letter score 85 − 50·logMAR (five-letter lines in 0.1 log steps).",
    params: [ACUITY],
    returns: { type: "number", display: "letters", doc: "letters" },
    sources: ["ferris-1982", "bailey-lovie-1976"],
    example: 'letterScore("0.3 logMAR")',
    fn: (a) => letterScoreOf(acuityOf(a)),
  }),
  snellenFormula("ft"),
  snellenFormula("m"),
  defineFormula({
    name: "scoreChart",
    group: "acuity",
    summary:
      "Score a chart reading from a table of its lines (size, letters per line, letters read; blank = not shown) or the table and a list of letters read, largest line first: line acuity by the more-than-half rule and letter-by-letter logMAR, with the assumptions stated.",
    params: [
      { name: "chart", type: "table", doc: "one row per line of the chart" },
      {
        name: "read",
        type: "list",
        optional: true,
        doc: "letters read per line, largest first (instead of a read column)",
      },
      {
        name: "sizeColumn",
        type: "text",
        optional: true,
        doc: "line size column (logMAR or acuity; default size)",
      },
      {
        name: "lettersColumn",
        type: "text",
        optional: true,
        doc: "letters on the line (default letters)",
      },
      { name: "readColumn", type: "text", optional: true, doc: "letters read (default read)" },
    ],
    returns: { type: "chartScore", doc: "the scored reading" },
    sources: ["bailey-lovie-1976", "common-practice"],
    example: "scoreChart(logMARChart(), [5, 5, 5, 5, 5, 5, 5, 5, 4, 3, 1])",
    fn: (t, r, s, l, c) =>
      new ChartScoreValue(
        chartScoreOf(
          t as TableValue,
          r as unknown[] | undefined,
          s as string,
          l as string,
          c as string,
        ),
      ),
  }),
  defineFormula({
    name: "logMARChart",
    group: "acuity",
    summary:
      "A chart table of equal lines in equal log steps (default: 14 five-letter lines from 1.0 logMAR in 0.1 steps) with a read column left blank.",
    params: [],
    options: [
      {
        name: "top",
        type: "number",
        range: [-0.5, 2.5],
        default: 1,
        doc: "largest line, logMAR",
      },
      {
        name: "lines",
        type: "integer",
        range: [1, 40],
        default: 14,
        doc: "number of lines",
      },
      {
        name: "letters",
        type: "integer",
        range: [1, 20],
        default: 5,
        doc: "letters per line",
      },
      {
        name: "step",
        type: "number",
        range: [0.01, 0.5],
        default: 0.1,
        doc: "log step between lines",
      },
    ],
    returns: { type: "table", doc: "columns size (logMAR), letters, read" },
    sources: ["bailey-lovie-1976", "ferris-1982"],
    example: "logMARChart({top: 1.0, lines: 14})",
    fn: (top, lines, letters, step) => {
      const chart = regularChart(top as number, lines as number, letters as number, step as number);
      return makeTable("chart", [
        new Column("size", "number", "logMAR", Float64Array.from(chart, (l) => l.logMAR), {
          label: "line size",
        }),
        new Column("letters", "number", "", Float64Array.from(chart, (l) => l.letters), {
          label: "letters on the line",
          decimals: 0,
        }),
        new Column("read", "number", "", new Float64Array(chart.length).fill(NaN), {
          label: "letters read",
          decimals: 0,
        }),
      ]);
    },
  }),
  defineFormula({
    name: "letterHeight",
    group: "acuity",
    summary: "Height of a letter for an acuity at a distance (5′ overall at V = 1.0).",
    params: [ACUITY, DISTANCE],
    returns: { type: "quantity", unit: "mm", doc: "letter height" },
    sources: ["iso-8596"],
    example: 'letterHeight("6/6", 6 m)',
    fn: (a, d) => letterHeight(decimalOf(acuityOf(a)), d as number),
  }),
  defineFormula({
    name: "acuityForLetter",
    group: "acuity",
    summary: "The acuity a letter of a given height presents at a distance.",
    params: [
      { name: "height", type: "quantity", unit: "mm", range: [0.01, 2000], doc: "letter height" },
      DISTANCE,
    ],
    returns: RETURNS_ACUITY,
    sources: ["iso-8596"],
    example: "acuityForLetter(8.73 mm, 6 m)",
    fn: (h, d) => new AcuityValue(acuityFromDecimal(acuityForLetter(h as number, d as number))),
  }),
  defineFormula({
    name: "testDistanceVergence",
    group: "acuity",
    summary: "Vergence a chart at a test distance presents at the eye, −1/d.",
    params: [DISTANCE],
    returns: { type: "quantity", unit: "D", display: "exact", doc: "vergence" },
    sources: ["test-distance-vergence"],
    example: "testDistanceVergence(6 m)",
    fn: (d) => testDistanceVergence(d as number),
  }),
  defineFormula({
    name: "referToInfinity",
    group: "acuity",
    summary: "A refraction found at a test distance referred to infinity (adds −1/d).",
    params: [
      { name: "power", type: "quantity", unit: "D", doc: "power found at the test distance" },
      DISTANCE,
    ],
    returns: { type: "quantity", unit: "D", doc: "power for infinity" },
    sources: ["test-distance-vergence"],
    caution: true,
    example: "referToInfinity(-1 D, 4 m)",
    fn: (p, d) => referToInfinity(p as number, d as number),
  }),
  ...guessFormulas(),
];

/** snellenFeet and snellenMetres, declared from one template. */
function snellenFormula(unit: "ft" | "m"): FormulaSpec {
  const feet = unit === "ft";
  const distance: ParamSpec = feet
    ? { name: "testDistance", type: "quantity", unit: "ft", range: [1, 100], doc: "" }
    : DISTANCE;
  return defineFormula({
    name: feet ? "snellenFeet" : "snellenMetres",
    group: "acuity",
    summary: `The Snellen fraction in ${feet ? "feet" : "metres"}, as written (${
      feet ? "20/40" : "6/9, 4/5"
    }), at any test distance.`,
    params: [ACUITY],
    options: [{
      ...distance,
      name: "testDistance",
      default: feet ? 20 : 6,
      doc: `test distance (default ${feet ? "20 ft" : "6 m"})`,
    }],
    returns: { type: "text", doc: "the fraction" },
    sources: NOTATION_SOURCES,
    example: feet ? 'snellenFeet("6/12")' : 'snellenMetres("20/25", {testDistance: 4 m})',
    fn: (a, d) => formatSnellen(acuityOf(a), unit, d as number),
  });
}

function setSize(x: unknown): number {
  if (typeof x === "string" || typeof x === "number") return letterSetSize(x);
  throw new LentilInputError('the letter set is its letters as text ("CDHKNORSVZ") or a count');
}

function guessFormulas(): FormulaSpec[] {
  const SET: ParamSpec = {
    name: "set",
    type: "any",
    doc: 'the letter set as text ("CDHKNORSVZ") or its size (4 or 8 for a ring\'s positions)',
  };
  const ON_LINE: ParamSpec = {
    name: "onLine",
    type: "integer",
    range: [1, 100],
    doc: "letters on the line",
  };
  const NEEDED: ParamSpec = {
    name: "needed",
    type: "integer",
    range: [0, 100],
    doc: "letters needed for credit",
  };
  const CHANCE = { type: "number", display: "chance", doc: "probability" } as const;
  return [
    defineFormula({
      name: "guessChance",
      group: "guessing",
      summary:
        "Chance of being credited with a line by guessing alone: the binomial tail P(X ≥ needed), X ~ Bin(onLine, 1/set).",
      params: [SET, ON_LINE, NEEDED],
      returns: CHANCE,
      sources: ["binomial-tail", "sloan-1959"],
      example: 'guessChance("CDHKNORSVZ", 5, 3)',
      fn: (s, n, k) => guessChance(setSize(s), n as number, k as number),
    }),
    defineFormula({
      name: "guessChanceDistinct",
      group: "guessing",
      summary:
        "The same chance when the letters on the line are distinct and so are the letters named (no repetition on either side).",
      params: [SET, ON_LINE, NEEDED],
      returns: CHANCE,
      sources: ["matching-problem"],
      example: 'guessChanceDistinct("CDHKNORSVZ", 5, 3)',
      fn: (s, n, k) => guessChanceDistinct(setSize(s), n as number, k as number),
    }),
    defineFormula({
      name: "naiveGuessChance",
      group: "guessing",
      summary: "The naive figure (1/set)^needed, which ignores the other letters of the line.",
      params: [SET, NEEDED],
      returns: CHANCE,
      sources: ["common-practice"],
      example: "naiveGuessChance(9, 3)",
      fn: (s, k) => naiveGuessChance(setSize(s), k as number),
    }),
    defineFormula({
      name: "guessAnyLine",
      group: "guessing",
      summary:
        "Chance of being credited with one or more of several lines in a row by guessing alone.",
      params: [SET, ON_LINE, NEEDED, {
        name: "lines",
        type: "integer",
        range: [1, 100],
        doc: "lines guessed",
      }],
      options: [{
        name: "distinct",
        type: "boolean",
        default: false,
        doc: "use the no-repetition form",
      }],
      returns: CHANCE,
      sources: ["binomial-tail"],
      example: "guessAnyLine(10, 5, 3, 3)",
      fn: (s, n, k, l, d) =>
        guessAnyLine(setSize(s), n as number, k as number, l as number, d as boolean),
    }),
  ];
}
