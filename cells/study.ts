/**
 * The inferential statistics of a study in the formula language, aware of both eyes of one
 * person: the confidence ellipse of a mean (J0, J45) by Hotelling's T², the t interval of a
 * mean, the correlation between fellow eyes, and Bland–Altman agreement with confidence
 * intervals of the bias and of both limits, proportional bias, repeated pairs and the
 * length of the power-vector difference.
 *
 * Each takes named options in a record after its arguments; `eyes` chooses what to do when a
 * subject key and an eye column are found (see `_eyes_context.ts`), and the result says
 * what was done. A statistic computed on eyes as if independent carries a warning with the
 * fix.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * const v = lang.compile(lang.parse("meanCI([1, 2, 3, 4])")).evaluate({});
 * lang.describe(v).display.startsWith("mean 2.5"); // true
 * ```
 *
 * @module
 */

import { countText } from "../lib/number_text.ts";
import { defineFormula, type FormulaSpec, type OptionSpec } from "./catalogue.ts";
import type { Column } from "./table.ts";
import {
  agreementHeadline,
  agreementRecord,
  asColumn,
  COL,
  columnNumbers,
  ellipseFields,
  refractionArrays,
  RX_PARAMS,
  unitOf,
  vectorsOf,
} from "./stats.ts";
import { joinShared, qty, showStat, statRecord } from "./_stat_records.ts";
import { applyEyes, descriptiveNote, EYE_OPTIONS, eyeContext } from "./_eyes_context.ts";
import type { DisplayOptions } from "./types.ts";
import {
  agreementFrom,
  proportionalBias,
  repeatedAgreement,
  vectorDifferenceLength,
} from "../lib/agreement.ts";
import { type EllipseMethod, ellipseOf, meanEllipse } from "../lib/ellipse.ts";
import { clusteredCovariance, clusteredMean, fellowEyeCorrelation } from "../lib/eyes.ts";
import { RunningMoments } from "../lib/stats.ts";
import { tQuantile } from "../lib/distributions.ts";
import { LentilInputError } from "../lib/errors.ts";

const METHOD: OptionSpec = {
  name: "method",
  type: "text",
  choices: ["hotelling", "chi-square"],
  default: "hotelling",
  doc:
    'how the ellipse is scaled: "hotelling" (default, exact for normal data at any n) or "chi-square" (the large-sample form, labelled)',
};

/**
 * The columns and the named options of a call: the formula receives its parameters, then
 * each option in declaration order.
 */
function split(args: unknown[], options: readonly OptionSpec[]) {
  const k = options.length;
  const values = args.slice(args.length - k);
  const cols = args.slice(0, args.length - k).filter((x) => x !== undefined).map((x, i) =>
    asColumn(x, `argument ${i + 1}`)
  );
  const settings: Record<string, unknown> = {};
  options.forEach((o, i) => {
    if (values[i] !== undefined) settings[o.name] = values[i];
  });
  for (const key of ["subject", "eye"]) {
    if (settings[key] !== undefined) settings[key] = asColumn(settings[key], key);
  }
  return { cols, settings };
}

function complete(arrays: Float64Array[]): Float64Array[] {
  const keep: number[] = [];
  for (let i = 0; i < arrays[0].length; i++) {
    if (arrays.every((a) => !Number.isNaN(a[i]))) keep.push(i);
  }
  return arrays.map((a) => Float64Array.from(keep, (i) => a[i]));
}

function moments(arrays: Float64Array[]): RunningMoments {
  const r = new RunningMoments(arrays.length);
  const row = new Float64Array(arrays.length);
  for (let i = 0; i < arrays[0].length; i++) {
    arrays.forEach((a, k) => (row[k] = a[i]));
    r.push(row);
  }
  return r;
}

function refractionOf(cols: Column[]) {
  if (cols.length !== 1 && cols.length !== 3) {
    throw new LentilInputError(
      "give one column of prescriptions, or three columns: sphere, cylinder and axis",
    );
  }
  return vectorsOf(refractionArrays(cols[0], cols[1], cols[2]));
}

function fellowEyeParts(
  ctx: ReturnType<typeof eyeContext>,
  arrays: Float64Array[],
  names: string[],
): Record<string, unknown> {
  if (!ctx || ctx.pairing.bothEyes < 3) return {};
  const out: Record<string, unknown> = {};
  names.forEach((name, k) => {
    const r = fellowEyeCorrelation(ctx.pairing, arrays[k]).r;
    if (Number.isFinite(r)) out[`fellowEye${name}`] = r;
  });
  return out;
}

function ellipseFormula(region: "mean" | "observations"): FormulaSpec {
  const name = region === "mean" ? "ellipse95" : "spread95";
  const specs = region === "mean" ? [...EYE_OPTIONS, METHOD] : [METHOD];
  return defineFormula({
    name,
    group: "study statistics",
    summary: region === "mean"
      ? "95% confidence ellipse of the mean (J0, J45) of refractions by Hotelling's T²; both eyes of one person handled as the eyes setting says (default: standard errors from persons)."
      : "Ellipse expected to hold 95% of the eyes' (J0, J45), by Hotelling's T² for a new eye (a description of all eyes).",
    params: RX_PARAMS,
    options: specs,
    returns: {
      type: "any",
      doc:
        "region, centre, semi-axes (D), angle of the major axis (deg), n, what was done with both eyes",
    },
    sources: region === "mean"
      ? ["hotelling-1931", "chi2-ellipse", "thibos-1997", "murdoch-1998", "liang-zeger-1986"]
      : ["hotelling-1931", "chi2-ellipse", "thibos-1997"],
    example:
      `${name}([-1 D, -1.5 D, -2 D, -1 D], [-0.5 D, -0.75 D, -0.25 D, -1 D], [90 deg, 85 deg, 10 deg, 170 deg])`,
    fn: (...args) => {
      const { cols, settings } = split(args, specs);
      const method = (settings.method as EllipseMethod | undefined) ?? "hotelling";
      const v = refractionOf(cols);
      const xy = [v.j0, v.j45];
      if (region === "observations") {
        const [x, y] = complete(xy);
        const r = moments([x, y]);
        if (r.count < 3) {
          throw new LentilInputError(`an ellipse needs at least 3 eyes, got ${r.count}`);
        }
        const e = ellipseOf(
          { x: r.mean(0), y: r.mean(1) },
          { xx: r.variance(0), yy: r.variance(1), xy: r.covariance(0, 1) },
          r.count,
          "observations",
          0.95,
          method,
        );
        const note = descriptiveNote(eyeContext(cols[0], {}));
        return ellipseFields(e, region, r.count, note ? { eyes: note } : {});
      }
      const ctx = eyeContext(cols[0], settings);
      const applied = applyEyes(ctx, xy, settings);
      const extra: Record<string, unknown> = { eyes: applied.note };
      if (applied.warning) extra.warning = applied.warning;
      Object.assign(extra, fellowEyeParts(ctx, xy, ["J0", "J45"]));
      if (applied.clusters) {
        const c = clusteredCovariance(applied.clusters, xy);
        if (c.subjects < 3) {
          throw new LentilInputError(
            `an ellipse of the mean needs at least 3 persons, got ${c.subjects}`,
          );
        }
        const e = meanEllipse(
          { x: c.mean[0], y: c.mean[1] },
          { xx: c.cov[0][0], yy: c.cov[1][1], xy: c.cov[0][1] },
          c.subjects,
          0.95,
          method,
        );
        return ellipseFields(e, region, c.n, { subjects: c.subjects, ...extra });
      }
      const [x, y] = complete(applied.arrays);
      const r = moments([x, y]);
      if (r.count < 3) {
        throw new LentilInputError(`an ellipse of the mean needs at least 3 eyes, got ${r.count}`);
      }
      const e = ellipseOf(
        { x: r.mean(0), y: r.mean(1) },
        { xx: r.variance(0), yy: r.variance(1), xy: r.covariance(0, 1) },
        r.count,
        "mean",
        0.95,
        method,
      );
      return ellipseFields(e, region, r.count, extra);
    },
  });
}

function meanCIHeadline(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  return `${show("mean")} (95% CI ${joinShared(show("from"), " to ", show("to"))})${
    r.warning ? " — warning: eyes taken as independent" : ""
  }`;
}

function meanCILine(r: Record<string, unknown>, options: DisplayOptions): string {
  const show = (k: string) => showStat(k, r[k], options);
  const out = [
    `mean ${show("mean")} (95% CI ${joinShared(show("from"), " to ", show("to"))})`,
    `SD ${show("sd")}`,
    `n ${r.n}`,
  ];
  if (r.subjects !== undefined) out.push(`${r.subjects} persons`);
  for (const k of ["eyes", "warning"]) if (typeof r[k] === "string") out.push(`${k}: ${r[k]}`);
  return out.join("; ");
}

/** A mean with its 95% t interval, both eyes of one person handled as the settings say. */
export interface MeanInterval {
  /** Values used. */
  readonly n: number;
  /** Persons, when standard errors came from persons. */
  readonly subjects?: number;
  /** Robust variance / naive variance, when standard errors came from persons. */
  readonly designEffect?: number;
  /** Mean, SD, standard error and the interval, in the column's unit. */
  readonly mean: number;
  /** SD of the values used. */
  readonly sd: number;
  /** Standard error of the mean. */
  readonly se: number;
  /** 95% interval, from. */
  readonly from: number;
  /** 95% interval, to. */
  readonly to: number;
  /** What was done with both eyes, in words. */
  readonly note: string;
  /** Set when eyes were taken as independent. */
  readonly warning?: string;
}

/**
 * The mean of a column with its 95% t interval: standard errors from persons by default
 * when persons are found, else as the `eyes` setting says.
 *
 * @throws {LentilInputError} with fewer than two values (or persons).
 */
export function meanInterval(col: Column, settings: Record<string, unknown>): MeanInterval {
  const ctx = eyeContext(col, settings);
  const applied = applyEyes(ctx, [columnNumbers(col)], settings);
  const said = { note: applied.note, ...(applied.warning ? { warning: applied.warning } : {}) };
  if (applied.clusters) {
    const m = clusteredMean(applied.clusters, applied.arrays[0]);
    return {
      n: m.n,
      subjects: m.subjects,
      designEffect: m.designEffect,
      mean: m.mean,
      sd: m.sd,
      se: m.robustSE,
      from: m.ci.lower,
      to: m.ci.upper,
      ...said,
    };
  }
  const [x] = complete(applied.arrays);
  const r = moments([x]);
  const n = r.count;
  if (n < 2) throw new LentilInputError(`a confidence interval needs at least 2 values, got ${n}`);
  const se = r.sd(0) / Math.sqrt(n);
  const t = tQuantile(0.975, n - 1);
  return {
    n,
    mean: r.mean(0),
    sd: r.sd(0),
    se,
    from: r.mean(0) - t * se,
    to: r.mean(0) + t * se,
    ...said,
  };
}

/** The settings of the study statistics that handle both eyes. */
export { EYE_OPTIONS, split as splitOptions };

const FELLOW_OPTIONS = EYE_OPTIONS.filter((o) => o.name === "subject" || o.name === "eye");

/** The study statistics formulas. */
export const STUDY_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "meanCI",
    group: "study statistics",
    summary:
      "Mean of a numeric column with its 95% confidence interval by Student's t; both eyes of one person handled as the eyes setting says (default: standard errors from persons).",
    params: [COL("column", "a numeric column")],
    options: EYE_OPTIONS,
    returns: {
      type: "any",
      doc: "mean, sd, standard error, 95% CI from and to, n, persons, what was done",
    },
    sources: ["murdoch-1998", "liang-zeger-1986", "ying-2017"],
    example: "meanCI([-1.25 D, -1.5 D, -1 D, -2 D])",
    fn: (...args) => {
      const { cols, settings } = split(args, EYE_OPTIONS);
      const col = cols[0];
      const unit = unitOf(col);
      const m = meanInterval(col, settings);
      return statRecord({
        n: m.n,
        mean: qty(m.mean, unit),
        sd: qty(m.sd, unit),
        se: qty(m.se, unit),
        from: qty(m.from, unit),
        to: qty(m.to, unit),
        ...(m.subjects !== undefined ? { subjects: m.subjects, designEffect: m.designEffect } : {}),
        eyes: m.note,
        ...(m.warning ? { warning: m.warning } : {}),
      }, { display: meanCILine, headline: meanCIHeadline });
    },
  }),
  defineFormula({
    name: "fellowEyes",
    group: "study statistics",
    summary:
      "Correlation between fellow eyes (Pearson's r of right against left over persons with both eyes), with the design effect 1 + r of a mean over both eyes.",
    params: [COL("column", "a numeric column of a table with a subject key and an eye column")],
    options: FELLOW_OPTIONS,
    returns: { type: "any", doc: "r, pairs of eyes, persons, design effect" },
    sources: ["murdoch-1998", "armstrong-2013", "ying-2017"],
    example:
      'fellowEyes([1, 1.2, 2, 2.1, 3, 2.7], {subject: ["a", "a", "b", "b", "c", "c"], eye: ["R", "L", "R", "L", "R", "L"]})',
    fn: (...args) => {
      const { cols, settings } = split(args, FELLOW_OPTIONS);
      const ctx = eyeContext(cols[0], settings);
      if (!ctx) {
        throw new LentilInputError(
          "fellowEyes needs the persons behind the rows: name a subject and an eye column (table lines subject: and eye:, or {subject: …, eye: …})",
        );
      }
      const { r, pairs } = fellowEyeCorrelation(ctx.pairing, columnNumbers(cols[0]));
      if (!Number.isFinite(r)) {
        throw new LentilInputError(
          "the fellow-eye correlation is undefined: no spread among right or left eyes",
        );
      }
      return statRecord({
        r,
        pairs,
        subjects: ctx.pairing.subjects,
        designEffect: 1 + r,
        eyes: ctx.found,
      }, {
        headline: () => `r ${r.toFixed(2)} over ${countText(pairs)} persons with both eyes`,
      });
    },
  }),
  ellipseFormula("mean"),
  ellipseFormula("observations"),
  defineFormula({
    name: "agreement",
    group: "study statistics",
    summary:
      "Bland–Altman bias and 95% limits of agreement (bias ± 1.96 SD) of two paired numeric columns, with 95% confidence intervals of the bias and of each limit (approximate and exact); with both eyes of persons, limits over repeated pairs.",
    params: [
      COL("a", "first method's column"),
      COL("b", "second method's column, same rows"),
    ],
    options: EYE_OPTIONS,
    returns: {
      type: "any",
      doc: "n, bias, sd, lower, upper (in a's unit), their 95% CIs, what was done",
    },
    sources: ["bland-altman-1986", "bland-altman-1999", "carkeet-2015"],
    example: "agreement([1, 2, 3.5, 2.5], [0.75, 2.25, 3, 2.5])",
    fn: (...args) => {
      const { cols, settings } = split(args, EYE_OPTIONS);
      if (cols.length !== 2) {
        throw new LentilInputError(`agreement takes two columns, got ${cols.length}`);
      }
      const unit = unitOf(cols[0]);
      const xa = columnNumbers(cols[0]);
      const xb = columnNumbers(cols[1], unit || undefined);
      if (xa.length !== xb.length) {
        throw new LentilInputError(
          `paired data must have one row each: ${xa.length} and ${xb.length} rows`,
        );
      }
      const d = xa.map((x, i) => x - xb[i]);
      return agreementOf(d, eyeContext(cols[0], settings), settings, unit);
    },
  }),
  defineFormula({
    name: "rxAgreement",
    group: "study statistics",
    summary:
      "Bland–Altman agreement of paired refractions on M, J0 and J45 (with confidence intervals) and the dioptric length of the power-vector difference: rxAgreement(a.rx, b.rx) or with sphere, cylinder and axis columns of each.",
    params: [
      COL("a", "first method's prescriptions, or its sphere column"),
      COL("b", "second method's prescriptions, or the first's cylinder column"),
      COL("aAxis", "first method's axis column", true),
      COL("bSph", "second method's sphere column", true),
      COL("bCyl", "second method's cylinder column", true),
      COL("bAxis", "second method's axis column", true),
    ],
    options: EYE_OPTIONS,
    returns: {
      type: "any",
      doc:
        "n and, for M, J0 and J45: bias, sd, lower, upper and their CIs; the vector-difference length",
    },
    sources: ["bland-altman-1986", "bland-altman-1999", "carkeet-2015", "thibos-1997"],
    example:
      'rxAgreement(["-1.00 / -0.50 x 90", "-2.00 DS", "+0.50 / -0.25 x 180"], ["-1.25 / -0.50 x 85", "-2.25 DS", "+0.50 DS"])',
    fn: (...args) => {
      const { cols, settings } = split(args, EYE_OPTIONS);
      let ra, rb;
      if (cols.length === 2) {
        ra = vectorsOf(refractionArrays(cols[0]));
        rb = vectorsOf(refractionArrays(cols[1]));
      } else if (cols.length === 6) {
        ra = vectorsOf(refractionArrays(cols[0], cols[1], cols[2]));
        rb = vectorsOf(refractionArrays(cols[3], cols[4], cols[5]));
      } else {
        throw new LentilInputError(
          `give two columns of prescriptions, or six columns (sphere, cylinder, axis of each); got ${cols.length}`,
        );
      }
      const ctx = eyeContext(cols[0], settings);
      const diff = (k: "m" | "j0" | "j45") => ra[k].map((x, i) => x - rb[k][i]);
      const [dm, dj0, dj45] = [diff("m"), diff("j0"), diff("j45")];
      const len = vectorDifferenceLength(dm, dj0, dj45);
      const note = descriptiveNote(ctx);
      return statRecord({
        n: len.n,
        M: agreementOf(dm, ctx, settings, "D"),
        J0: agreementOf(dj0, ctx, settings, "D"),
        J45: agreementOf(dj45, ctx, settings, "D"),
        length: statRecord({
          n: len.n,
          mean: qty(len.mean, "D"),
          sd: qty(len.sd, "D"),
          median: qty(len.median, "D"),
          upper95: qty(len.upper95, "D"),
          ...(note ? { eyes: note } : {}),
        }),
      }, {
        headline: (rec, options) =>
          (["M", "J0", "J45"] as const).map((k) =>
            `${k} ${agreementHeadline(rec[k] as Record<string, unknown>, options)}`
          ).join("; "),
        labels: {
          n: "pairs",
          M: "M (spherical equivalent)",
          J0: "J0",
          J45: "J45",
        },
      });
    },
  }),
  defineFormula({
    name: "proportionalBias",
    group: "study statistics",
    summary:
      'Proportional bias: regression of the difference a − b on the mean of each pair, with the slope\'s 95% CI and its t test against zero; on one eye per person when asked (eyes: "right", "left", "random").',
    params: [COL("a", "first method's column"), COL("b", "second method's column, same rows")],
    options: EYE_OPTIONS,
    returns: { type: "any", doc: "n, slope, intercept, slope's 95% CI, t, p, what was done" },
    sources: ["bland-altman-1999", "murdoch-1998"],
    example: "proportionalBias([1, 2, 3.5, 2.5], [0.75, 2.25, 3, 2.4])",
    fn: (...args) => {
      const { cols, settings } = split(args, EYE_OPTIONS);
      const [ca, cb] = cols;
      const unit = unitOf(ca);
      const ctx = eyeContext(ca, settings);
      const oneEye = ["right", "left", "random"].includes(String(settings.eyes));
      if (settings.eyes === "person mean") {
        throw new LentilInputError(
          'proportional bias is tested on pairs: use one eye per person (eyes: "right", "left" or "random")',
        );
      }
      const applied = applyEyes(
        ctx,
        [columnNumbers(ca), columnNumbers(cb, unit || undefined)],
        oneEye ? settings : { ...settings, eyes: "as independent" },
      );
      const r = proportionalBias(applied.arrays[0], applied.arrays[1]);
      const warning = ctx && !oneEye && ctx.pairing.bothEyes
        ? `${
          countText(ctx.pairing.bothEyes)
        } persons give both eyes: the test takes eyes as independent, so p is too small; write {eyes: "right"} (one eye per person)`
        : undefined;
      const headline = () =>
        `slope ${r.slope.toFixed(3)} (95% CI ${r.slopeCI.lower.toFixed(3)} to ${
          r.slopeCI.upper.toFixed(3)
        }), p ${r.p < 0.001 ? "< 0.001" : r.p.toFixed(3)}${
          warning ? " — warning: eyes taken as independent" : ""
        }`;
      return statRecord({
        n: r.n,
        slope: r.slope,
        slopeFrom: r.slopeCI.lower,
        slopeTo: r.slopeCI.upper,
        intercept: qty(r.intercept, unit),
        t: r.t,
        p: r.p,
        eyes: applied.note,
        ...(warning ? { warning } : {}),
      }, { headline });
    },
  }),
];

/** Agreement of differences, with both eyes of a person handled as the settings say. */
function agreementOf(
  d: Float64Array,
  ctx: ReturnType<typeof eyeContext>,
  settings: Record<string, unknown>,
  unit: string,
): Record<string, unknown> {
  if (settings.eyes === "person mean") {
    throw new LentilInputError(
      'limits of agreement from the mean of each person\'s eyes would be too narrow: use eyes "by person" (repeated pairs) or one eye ("right", "left", "random")',
    );
  }
  const applied = applyEyes(ctx, [d], settings);
  if (applied.clusters && applied.subjectOfRow && ctx!.pairing.bothEyes > 0) {
    const keys = applied.subjectOfRow;
    const r = repeatedAgreement(d, keys);
    const m = clusteredMean(applied.clusters, d);
    return agreementRecord(r, unit, {
      biasFrom: qty(m.ci.lower, unit),
      biasTo: qty(m.ci.upper, unit),
      subjects: r.subjects,
      eyes:
        `${applied.note}; limits over repeated pairs (between- and within-person variance); the confidence intervals of the limits need one eye per person (eyes: "right")`,
    }, false);
  }
  const r = new RunningMoments(1);
  for (const x of applied.arrays[0]) r.push1(x);
  const a = agreementFrom(r, 0);
  if (a.n < 2) throw new LentilInputError(`agreement needs at least 2 complete pairs, got ${a.n}`);
  return agreementRecord(a, unit, {
    eyes: applied.note,
    ...(applied.warning ? { warning: applied.warning } : {}),
  });
}
