/**
 * Scoring a chart reading: the line acuity by the more-than-half rule and the
 * letter-by-letter logMAR, from the letters read on each line of a chart described by its
 * lines (size in logMAR, letters on the line).
 *
 * Each letter on a line is worth the log step from the next larger line divided by the
 * letters on the line: 0.1/5 = 0.02 logMAR on a chart of five-letter lines in 0.1 steps
 * (bailey-lovie-1976); the largest line takes the step to the line below it. A line read in
 * full, with every larger line, scores exactly its own size.
 *
 * How lines without a reading are counted (stated in the result's notes):
 * - lines larger than the first line attempted: read in full;
 * - a line skipped between attempted lines: read in full (as a larger line would be);
 * - lines smaller than the last line attempted: none read.
 *
 * @example
 * ```ts
 * import { scoreChart } from "./acuity_scoring.ts";
 * const lines = [0.3, 0.2, 0.1, 0].map((logMAR) => ({ logMAR, letters: 5 }));
 * const s = scoreChart(lines, [5, 5, 3, 1]);
 * s.lineLogMAR; // 0.1
 * s.letterLogMAR?.toFixed(2); // "0.06"
 * ```
 *
 * @module
 */

import { checkRange, LentilInputError } from "./errors.ts";
import { LOGMAR_RANGE } from "./acuity.ts";

/** One line of a chart. */
export interface ChartLine {
  /** Size of the line as logMAR. */
  readonly logMAR: number;
  /** Letters (or optotypes) on the line. */
  readonly letters: number;
}

/** How a line's count was arrived at. */
export type LineStatus = "read" | "above-start" | "skipped" | "not-attempted";

/** One line of a scored reading, largest first. */
export interface ScoredLine extends ChartLine {
  /** Letters counted as read (the reading, or the assumption for the status). */
  readonly read: number;
  /** Where the count came from. */
  readonly status: LineStatus;
  /** More than half the letters read. */
  readonly credited: boolean;
  /** logMAR credited per letter read on this line. */
  readonly perLetter: number;
}

/** The score of one chart reading. */
export interface ChartScore {
  /** Smallest line credited by the more-than-half rule (logMAR), or null if none. */
  readonly lineLogMAR: number | null;
  /** Letters missed on that line. */
  readonly lineMissed: number;
  /** Letters read on the next smaller line (0 when none or not attempted). */
  readonly nextLineRead: number;
  /** Letter-by-letter logMAR, or null when no letter was read. */
  readonly letterLogMAR: number | null;
  /** Letters counted as read, assumptions included. */
  readonly lettersRead: number;
  /** The lines, largest first, with their counts. */
  readonly lines: readonly ScoredLine[];
  /** Assumptions made and oddities found, in words. */
  readonly notes: readonly string[];
}

/**
 * Name a chart line by its place and size, for notes and errors. Source: common-practice.
 *
 * @example
 * ```ts
 * import { lineLabel } from "./acuity_scoring.ts";
 * lineLabel(2, 0.3); // "line 3 (0.30 logMAR)"
 * ```
 */
export function lineLabel(index: number, logMAR: number): string {
  return `line ${index + 1} (${logMAR.toFixed(2)} logMAR)`;
}

/**
 * Score a chart reading. `lines` may come in any order (they are sorted largest first;
 * `read` follows them); `read[i]` is the letters read on `lines[i]`, or null / NaN when the
 * line was not shown. Sources: bailey-lovie-1976 (letter-by-letter), common-practice
 * (more-than-half rule).
 *
 * @example
 * ```ts
 * import { scoreChart } from "./acuity_scoring.ts";
 * const lines = [1.0, 0.9, 0.8].map((logMAR) => ({ logMAR, letters: 5 }));
 * scoreChart(lines, [null, 5, 2]).lineLogMAR; // 0.9
 * ```
 * @throws {LentilInputError} for an empty chart, a size given twice, or readings and lines
 * that differ in number; {@linkcode LentilRangeError} for a count outside 0–letters.
 */
export function scoreChart(
  lines: readonly ChartLine[],
  read: readonly (number | null | undefined)[],
  options: { topStep?: number } = {},
): ChartScore {
  if (lines.length === 0) throw new LentilInputError("the chart has no lines");
  if (read.length !== lines.length) {
    throw new LentilInputError(
      `the chart has ${lines.length} lines but ${read.length} readings were given`,
    );
  }
  lines.forEach((l, i) => {
    checkRange(`size of chart row ${i + 1}`, l.logMAR, LOGMAR_RANGE[0], LOGMAR_RANGE[1]);
    checkRange(`letters on chart row ${i + 1}`, l.letters, 1, 100);
    if (!Number.isInteger(l.letters)) {
      throw new LentilInputError(`letters on chart row ${i + 1} must be a whole number`);
    }
  });
  const order = lines.map((_, i) => i).sort((a, b) => lines[b].logMAR - lines[a].logMAR);
  const sorted = order.map((i) => ({ ...lines[i], given: read[i], row: i + 1 }));
  for (let i = 1; i < sorted.length; i++) {
    if (Math.abs(sorted[i].logMAR - sorted[i - 1].logMAR) < 1e-9) {
      throw new LentilInputError(
        `chart rows ${sorted[i - 1].row} and ${sorted[i].row} have the same size ${
          sorted[i].logMAR.toFixed(2)
        } logMAR`,
      );
    }
  }
  const notes: string[] = [];
  const has = (v: number | null | undefined): v is number =>
    v !== null && v !== undefined && !Number.isNaN(v);
  sorted.forEach((l, i) => {
    if (has(l.given)) {
      checkRange(`letters read on ${lineLabel(i, l.logMAR)}`, l.given, 0, l.letters);
      if (!Number.isInteger(l.given)) {
        throw new LentilInputError(
          `letters read on ${lineLabel(i, l.logMAR)} must be a whole number (got ${l.given})`,
        );
      }
    }
  });
  const attempted = sorted.flatMap((l, i) => has(l.given) ? [i] : []);
  if (attempted.length === 0) throw new LentilInputError("no line of the chart was attempted");
  const first = attempted[0];
  const last = attempted[attempted.length - 1];
  const topStep = sorted.length > 1 ? sorted[0].logMAR - sorted[1].logMAR : options.topStep;
  if (topStep === undefined) {
    throw new LentilInputError("a chart of one line needs the step to the next size (topStep)");
  }

  const scored: ScoredLine[] = sorted.map((l, i) => {
    let status: LineStatus;
    let n: number;
    if (has(l.given)) [status, n] = ["read", l.given];
    else if (i < first) [status, n] = ["above-start", l.letters];
    else if (i < last) [status, n] = ["skipped", l.letters];
    else [status, n] = ["not-attempted", 0];
    const step = i === 0 ? topStep : sorted[i - 1].logMAR - l.logMAR;
    return {
      logMAR: l.logMAR,
      letters: l.letters,
      read: n,
      status,
      credited: 2 * n > l.letters,
      perLetter: Math.round((step / l.letters) * 1e12) / 1e12,
    };
  });

  if (first > 0) {
    notes.push(
      `${first} line${first === 1 ? "" : "s"} larger than ${
        lineLabel(first, sorted[first].logMAR)
      } counted as read in full`,
    );
  }
  scored.forEach((l, i) => {
    if (l.status !== "skipped") return;
    const nextRead = scored.slice(i + 1).find((x) => x.status === "read");
    const doubt = nextRead && !nextRead.credited
      ? "; the next line attempted was not credited, so test it"
      : "";
    notes.push(`${lineLabel(i, l.logMAR)} was skipped and is counted as read in full${doubt}`);
  });
  if (last < sorted.length - 1) {
    notes.push(`lines smaller than ${lineLabel(last, sorted[last].logMAR)} counted as not read`);
  }

  let best = -1;
  scored.forEach((l, i) => {
    if (l.credited) best = i;
  });
  const gap = scored.findIndex((l, i) => i < best && !l.credited);
  if (gap >= 0) {
    notes.push(
      `${lineLabel(gap, scored[gap].logMAR)} was not credited although a smaller line was`,
    );
  }
  const lettersRead = scored.reduce((s, l) => s + l.read, 0);
  const start = sorted[0].logMAR + topStep;
  const letterLogMAR = lettersRead === 0
    ? null
    : start - scored.reduce((s, l) => s + l.read * l.perLetter, 0);
  if (letterLogMAR === null) {
    notes.push(`no letter read: worse than ${lineLabel(0, sorted[0].logMAR)}, the largest line`);
  }
  const lineLogMAR = best < 0 ? null : scored[best].logMAR;
  if (best < 0 && letterLogMAR !== null) notes.push("no line has more than half its letters read");
  return {
    lineLogMAR,
    lineMissed: best < 0 ? 0 : scored[best].letters - scored[best].read,
    nextLineRead: best < 0 || best === scored.length - 1 ? 0 : scored[best + 1].read,
    letterLogMAR: letterLogMAR === null ? null : Math.round(letterLogMAR * 1e9) / 1e9,
    lettersRead,
    lines: scored,
    notes,
  };
}

/**
 * A chart of `count` lines of `letters` letters each, from `top` logMAR down in steps of
 * `step` (1.0 to 0.1 steps, five letters: the design of Bailey & Lovie and of the charts of
 * Ferris et al.). Sources: bailey-lovie-1976, ferris-1982.
 *
 * @example
 * ```ts
 * import { regularChart } from "./acuity_scoring.ts";
 * regularChart().length; // 14
 * regularChart()[13].logMAR; // -0.3
 * ```
 */
export function regularChart(top = 1.0, count = 14, letters = 5, step = 0.1): ChartLine[] {
  checkRange("number of chart lines", count, 1, 100);
  return Array.from({ length: count }, (_, i) => ({
    logMAR: Math.round((top - i * step) * 1e9) / 1e9,
    letters,
  }));
}
