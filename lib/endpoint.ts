/**
 * The subjective endpoint from a table of trial lenses and the acuity read with each: the
 * most plus lens that gives the best acuity (most-plus-endpoint), the plateau of equal
 * acuity on the minus side, warnings when the table suggests over-minus or stops too soon,
 * and a least-squares through-focus fit (through-focus-fit).
 *
 * "Best" is within a tolerance of the best reading, by default one letter (0.02 logMAR).
 * Rows may come in any order and a power may repeat; repeated powers with different
 * readings are reported as an error unless averaging is asked for.
 *
 * @example
 * ```ts
 * import { findEndpoint } from "./endpoint.ts";
 * const rows = [
 *   { power: 0.5, logMAR: 0.3 }, { power: 0.25, logMAR: 0.1 }, { power: 0, logMAR: 0 },
 *   { power: -0.25, logMAR: 0 }, { power: -0.5, logMAR: 0 }, { power: -0.75, logMAR: 0.2 },
 * ];
 * findEndpoint(rows).endpoint; // 0
 * ```
 *
 * @module
 */

import { checkRange, LentilInputError } from "./errors.ts";
import { type Acuity, LOGMAR_RANGE, parseAcuity } from "./acuity.ts";
import { type ChartLine, regularChart, scoreChart } from "./acuity_scoring.ts";
import { fitThroughFocus, type FocusFit, type FocusModel } from "./through_focus.ts";
import { minusAbsorbed } from "./accommodation.ts";
import { formatPower } from "./_power_text.ts";

/** One row of a trial table. */
export interface TrialRow {
  /** Trial lens power, D. */
  readonly power: number;
  /** Acuity read with it, logMAR. */
  readonly logMAR: number;
}

/** One distinct power of the table, with the rows it came from. */
export interface TrialPoint extends TrialRow {
  /** 1-based rows of the input that gave this power. */
  readonly rows: readonly number[];
}

/** A warning about the table. */
export interface EndpointWarning {
  /** Stable code: `plus-edge`, `minus-plateau`, `plateau-open`, `long-plateau`, `gap`. */
  readonly code: string;
  /** What the table shows and what to do, in words. */
  readonly message: string;
}

/** Options of {@linkcode findEndpoint}. */
export interface EndpointOptions {
  /** Readings within this of the best count as best, logMAR (default 0.02, one letter). */
  readonly tolerance?: number;
  /** What to do with a power repeated with different readings (default "report"). */
  readonly duplicates?: "report" | "mean";
  /** Through-focus model to fit (default "auto": the better by BIC, hinge on a tie). */
  readonly model?: FocusModel | "auto";
  /** Age in years: checks the minus plateau against the accommodation expected. */
  readonly age?: number;
  /** A minus plateau at least this wide draws the over-minus warning, D (default 0.5). */
  readonly plateauWarning?: number;
}

/** The endpoint and everything behind it. */
export interface EndpointResult {
  /** The most plus lens giving the best acuity, D. */
  readonly endpoint: number;
  /** The acuity read with it, logMAR. */
  readonly endpointLogMAR: number;
  /** The best reading of the table, logMAR. */
  readonly bestLogMAR: number;
  /** The tolerance that defined "best", logMAR. */
  readonly tolerance: number;
  /** The run of best acuity from the endpoint toward minus. */
  readonly plateau: {
    readonly from: number;
    readonly to: number;
    readonly width: number;
    readonly powers: number;
    readonly openMinus: boolean;
  };
  /** Warnings, most serious first. */
  readonly warnings: readonly EndpointWarning[];
  /** How the table was read (averaging, ordering), in words. */
  readonly notes: readonly string[];
  /** The distinct powers, most plus first. */
  readonly trials: readonly TrialPoint[];
  /** The through-focus fit chosen, or null with fewer than three powers. */
  readonly fit: FocusFit | null;
  /** The other model's fit, for comparison, or null. */
  readonly alternative: FocusFit | null;
}

/** Accepted trial lens powers, D. */
export const TRIAL_POWER_LIMIT = 30;

function groupRows(rows: readonly TrialRow[], duplicates: "report" | "mean", notes: string[]) {
  const groups = new Map<number, { power: number; rows: number[]; values: number[] }>();
  rows.forEach((r, i) => {
    const row = i + 1;
    checkRange(
      `lens power in row ${row}`,
      r.power,
      -TRIAL_POWER_LIMIT,
      TRIAL_POWER_LIMIT,
      "D",
    );
    checkRange(`logMAR in row ${row}`, r.logMAR, LOGMAR_RANGE[0], LOGMAR_RANGE[1]);
    const key = Math.round(r.power * 1e6) / 1e6;
    const g = groups.get(key) ?? { power: key, rows: [], values: [] };
    g.rows.push(row);
    g.values.push(r.logMAR);
    groups.set(key, g);
  });
  const points: TrialPoint[] = [];
  for (const g of groups.values()) {
    const spread = Math.max(...g.values) - Math.min(...g.values);
    const where = `lens ${formatPower(g.power)} (rows ${g.rows.join(", ")})`;
    const readings = g.values.map((v) => v.toFixed(2)).join(", ");
    if (spread > 1e-9 && duplicates === "report") {
      throw new LentilInputError(
        `${where} was read differently: ${readings} logMAR; correct the table or ask for repeated powers to be averaged (repeats "mean", the fifth argument of endpoint)`,
      );
    }
    const mean = g.values.reduce((a, v) => a + v, 0) / g.values.length;
    if (g.rows.length > 1) {
      notes.push(
        spread > 1e-9
          ? `${where}: readings ${readings} logMAR averaged to ${mean.toFixed(3)}`
          : `${where}: repeated with the same reading`,
      );
    }
    points.push({ power: g.power, logMAR: mean, rows: g.rows });
  }
  return points.sort((a, b) => b.power - a.power);
}

function bic(fit: FocusFit, params: number): number {
  const n = fit.residuals.length;
  const floor = n * 1e-4; // residuals below 0.01 logMAR are within reading noise
  return n * Math.log(Math.max(fit.sumSquares, floor) / n) + params * Math.log(n);
}

function chooseFit(
  trials: readonly TrialPoint[],
  model: FocusModel | "auto",
  tolerance: number,
  notes: string[],
): { fit: FocusFit | null; alternative: FocusFit | null } {
  if (trials.length < 3) {
    notes.push("fewer than three lens powers: no through-focus fit");
    return { fit: null, alternative: null };
  }
  const hinge = fitThroughFocus(trials, "hinge", tolerance);
  const peak = fitThroughFocus(trials, "peak", tolerance);
  if (model === "hinge") return { fit: hinge, alternative: peak };
  if (model === "peak") return { fit: peak, alternative: hinge };
  const pickPeak = bic(peak, 4) < bic(hinge, 3) - 2;
  notes.push(
    `through-focus model chosen by BIC: ${
      pickPeak ? "peak (acuity falls on both sides)" : "hinge (flat on the minus side)"
    }`,
  );
  return pickPeak ? { fit: peak, alternative: hinge } : { fit: hinge, alternative: peak };
}

/**
 * Find the subjective endpoint of a trial table. Sources: most-plus-endpoint,
 * through-focus-fit, hofstetter-1950 (with `age`).
 *
 * @example
 * ```ts
 * import { findEndpoint } from "./endpoint.ts";
 * const rows = [0.75, 0.5, 0.25, 0, -0.25].map((p) => ({ power: p, logMAR: Math.max(0, p - 0.25) * 0.4 }));
 * const r = findEndpoint(rows);
 * r.endpoint; // 0.25
 * r.warnings.map((w) => w.code); // ["minus-plateau", "plateau-open"]
 * ```
 * @throws {LentilInputError} for an empty table or conflicting repeated powers;
 * {@linkcode LentilRangeError} for a value out of range, naming its row.
 */
export function findEndpoint(
  rows: readonly TrialRow[],
  options: EndpointOptions = {},
): EndpointResult {
  if (rows.length === 0) throw new LentilInputError("the trial table has no rows");
  const tolerance = checkRange("tolerance", options.tolerance ?? 0.02, 0, 0.5, "logMAR");
  const plateauWarning = checkRange("plateau warning", options.plateauWarning ?? 0.5, 0, 10, "D");
  const notes: string[] = [];
  const trials = groupRows(rows, options.duplicates ?? "report", notes);
  const bestLogMAR = Math.min(...trials.map((t) => t.logMAR));
  const isBest = (t: TrialPoint) => t.logMAR <= bestLogMAR + tolerance + 1e-9;
  const first = trials.findIndex(isBest);
  let last = first;
  while (last + 1 < trials.length && isBest(trials[last + 1])) last++;
  const endpoint = trials[first];
  const plateauFrom = trials[last].power;
  const width = Math.round((endpoint.power - plateauFrom) * 1e6) / 1e6;
  const openMinus = last === trials.length - 1;
  const warnings: EndpointWarning[] = [];
  if (first === 0) {
    warnings.push({
      code: "plus-edge",
      message: `no lens more plus than ${
        formatPower(endpoint.power)
      } was tried: the table stops before the plateau ends on the plus side, so the endpoint may lie further plus (risk of over-minus); try more plus`,
    });
  }
  if (width >= plateauWarning - 1e-9 && last > first) {
    warnings.push({
      code: "minus-plateau",
      message: `acuity holds over ${width.toFixed(2)} D of extra minus (to ${
        formatPower(plateauFrom)
      }): accommodation is absorbing minus; prescribing from the minus side would over-minus`,
    });
  }
  if (options.age !== undefined) {
    const most = minusAbsorbed(options.age, { level: "maximum" });
    if (width > most + 0.25) {
      warnings.push({
        code: "long-plateau",
        message: `the minus plateau (${width.toFixed(2)} D) is longer than the ${
          most.toFixed(2)
        } D of accommodation expected at most at age ${options.age}: check the readings`,
      });
    }
  }
  if (openMinus && trials.length > 1) {
    warnings.push({
      code: "plateau-open",
      message: `best acuity still at the most minus lens tried (${
        formatPower(plateauFrom)
      }): the table stops before the plateau ends on the minus side, so its width is at least ${
        width.toFixed(2)
      } D`,
    });
  }
  const gap = trials.findIndex((t, i) => i > last && isBest(t));
  if (gap >= 0) {
    warnings.push({
      code: "gap",
      message: `best acuity again at ${formatPower(trials[gap].power)} after poorer readings at ${
        formatPower(trials[last + 1].power)
      }: check the readings`,
    });
  }
  if (rows.some((r, i) => i > 0 && r.power > rows[i - 1].power) && rows.length > 1) {
    notes.push("rows were not in order of power; sorted most plus first");
  }
  const { fit, alternative } = chooseFit(trials, options.model ?? "auto", tolerance, notes);
  return {
    endpoint: endpoint.power,
    endpointLogMAR: endpoint.logMAR,
    bestLogMAR,
    tolerance,
    plateau: { from: plateauFrom, to: endpoint.power, width, powers: last - first + 1, openMinus },
    warnings,
    notes,
    trials,
    fit,
    alternative,
  };
}

/** Acuity as it may come in a trial table cell. */
export type TrialAcuity = number | string | Acuity;

/**
 * logMAR of one trial-table cell: a number (logMAR), an acuity value, acuity text ("6/9",
 * "0.2 logMAR", "85 letters") or the letters read on each line of `chart`, largest line
 * first, as text of two or more counts ("5 5 4 2" or "lines 5,5,4,2"; scored letter by
 * letter). The default chart has five-letter lines from 1.0 logMAR in 0.1 steps.
 * Sources: ico-1984, bailey-lovie-1976.
 *
 * @example
 * ```ts
 * import { trialLogMAR } from "./endpoint.ts";
 * trialLogMAR("6/6", 1); // 0
 * trialLogMAR("5 5 5 5 5 5 5 5 5 5 5 3", 1).toFixed(2); // "-0.06"
 * ```
 * @throws {LentilParseError} or {@linkcode LentilInputError} naming the row.
 */
export function trialLogMAR(
  cell: TrialAcuity,
  row: number,
  chart: readonly ChartLine[] = regularChart(),
): number {
  if (typeof cell === "number") {
    return checkRange(`logMAR in row ${row}`, cell, LOGMAR_RANGE[0], LOGMAR_RANGE[1]);
  }
  if (typeof cell === "object" && cell !== null && typeof cell.logMAR === "number") {
    return cell.logMAR;
  }
  if (typeof cell !== "string") {
    throw new LentilInputError(`row ${row}: the acuity cell is empty or not an acuity`);
  }
  const counts = /^\s*(?:lines?\s*:?\s*)?(\d+(?:[\s,;]+\d+)+)\s*$/i.exec(cell);
  try {
    if (!counts) return parseAcuity(cell).logMAR;
    const read = counts[1].split(/[\s,;]+/).map(Number);
    if (read.length > chart.length) {
      throw new LentilInputError(
        `${read.length} line counts given but the chart has ${chart.length} lines`,
      );
    }
    const all = [...read, ...Array(chart.length - read.length).fill(null)];
    const score = scoreChart(chart, all);
    if (score.letterLogMAR === null) throw new LentilInputError("no letter read");
    return score.letterLogMAR;
  } catch (e) {
    const err = e as Error;
    err.message = `row ${row}: ${err.message}`;
    throw err;
  }
}
