/**
 * Both eyes of one person. Fellow eyes are correlated, so a table of eyes is not a sample
 * of independent observations: an inferential statistic (a confidence interval, a test, the
 * confidence ellipse of a mean) must use one eye per person, the person's mean, or
 * standard errors built from subjects rather than eyes (cluster-robust). This module reads
 * the pairing of eyes within persons, chooses one eye per person (right, left, or a seeded
 * random choice), averages each person, gives cluster-robust standard errors and the
 * covariance of a mean vector, and the correlation between fellow eyes.
 *
 * Sources: murdoch-1998, armstrong-2013, ying-2017, liang-zeger-1986.
 *
 * @example
 * ```ts
 * import { eyePairing } from "./eyes.ts";
 * eyePairing(["a", "a", "b"], ["R", "L", "R"]).bothEyes; // 1
 * ```
 *
 * @module
 */

import { LentilInputError } from "./errors.ts";
import { seeded } from "./seeded.ts";
import { checkPaired, type Numbers } from "./stats.ts";
import { tQuantile } from "./distributions.ts";

/** Which eye a row is. */
export type Side = "R" | "L";

/** How the rows of a table fall into persons and eyes. */
export interface EyePairing {
  /** Persons (subjects) with at least one eye. */
  readonly subjects: number;
  /** Rows counted (both key and eye present). */
  readonly eyes: number;
  /** Persons with both eyes. */
  readonly bothEyes: number;
  /** Persons with one eye only. */
  readonly oneEye: number;
  /** Rows left out because the subject key or the eye was empty. */
  readonly missing: number;
  /** The row of each person's right and left eye (−1 when absent), in order of first appearance. */
  readonly persons: readonly { key: string; right: number; left: number }[];
  /** The person (index into `persons`) of each row, −1 when left out. */
  readonly personOfRow: Int32Array;
}

/**
 * The side of an eye from the words a table uses: R, L, OD, OS, right, left (any case).
 * Source: common-practice.
 *
 * @example
 * ```ts
 * import { sideOf } from "./eyes.ts";
 * sideOf("OS"); // "L"
 * ```
 * @throws {LentilInputError} on any other word.
 */
export function sideOf(text: string): Side | undefined {
  const t = text.trim().toUpperCase();
  if (t === "") return undefined;
  if (t === "R" || t === "OD" || t === "RIGHT" || t === "RE") return "R";
  if (t === "L" || t === "OS" || t === "LEFT" || t === "LE") return "L";
  throw new LentilInputError(
    `eye "${text}" is not an eye: write R or L (OD, OS, right and left are read too)`,
  );
}

/**
 * Read the pairing of eyes within persons from a subject key and an eye column.
 * Source: murdoch-1998.
 *
 * @example
 * ```ts
 * import { eyePairing } from "./eyes.ts";
 * eyePairing(["a", "a", "b", "b"], ["R", "L", "OD", "OS"]).subjects; // 2
 * ```
 * @throws {LentilInputError} when the columns differ in length, an eye is not R or L, or
 * a person has the same eye twice.
 */
export function eyePairing(subject: ArrayLike<string>, eye: ArrayLike<string>): EyePairing {
  checkPaired("subject key", subject.length, "eye column", eye.length);
  const index = new Map<string, number>();
  const persons: { key: string; right: number; left: number }[] = [];
  const personOfRow = new Int32Array(subject.length).fill(-1);
  let missing = 0;
  for (let i = 0; i < subject.length; i++) {
    const key = subject[i];
    const side = sideOf(eye[i]);
    if (key === "" || !side) {
      missing++;
      continue;
    }
    let p = index.get(key);
    if (p === undefined) {
      p = persons.length;
      index.set(key, p);
      persons.push({ key, right: -1, left: -1 });
    }
    const person = persons[p];
    const slot = side === "R" ? "right" : "left";
    if (person[slot] >= 0) {
      throw new LentilInputError(
        `subject ${key} has the ${side === "R" ? "right" : "left"} eye twice (rows ${
          person[slot] + 1
        } and ${i + 1}): one row per eye; for repeated measures use the repeatability formulas`,
      );
    }
    person[slot] = i;
    personOfRow[i] = p;
  }
  const bothEyes = persons.filter((p) => p.right >= 0 && p.left >= 0).length;
  return {
    subjects: persons.length,
    eyes: subject.length - missing,
    bothEyes,
    oneEye: persons.length - bothEyes,
    missing,
    persons,
    personOfRow,
  };
}

/** Which eye to keep of each person. */
export type EyeChoice = "right" | "left" | "random";

/**
 * The rows of one eye per person: the right, the left (persons without that eye are left
 * out), or one chosen at random with a seed (a person with one eye keeps it).
 * Sources: murdoch-1998, armstrong-2013.
 *
 * @example
 * ```ts
 * import { eyePairing, oneEyeRows } from "./eyes.ts";
 * oneEyeRows(eyePairing(["a", "a", "b"], ["R", "L", "L"]), "right"); // [0]
 * ```
 */
export function oneEyeRows(p: EyePairing, choice: EyeChoice, seed = 1): number[] {
  const random = seeded(seed);
  const rows: number[] = [];
  for (const person of p.persons) {
    if (choice === "right" && person.right >= 0) rows.push(person.right);
    else if (choice === "left" && person.left >= 0) rows.push(person.left);
    else if (choice === "random") {
      const both = person.right >= 0 && person.left >= 0;
      const pickRight = both ? random() < 0.5 : person.right >= 0;
      rows.push(pickRight ? person.right : person.left);
    }
  }
  return rows;
}

/**
 * The mean of each person's eyes for each of several variables (a row with any empty value
 * is left out; a person with no complete row is left out).
 * Source: murdoch-1998.
 *
 * @example
 * ```ts
 * import { eyePairing, personMeans } from "./eyes.ts";
 * personMeans(eyePairing(["a", "a"], ["R", "L"]), [[1, 3]]); // [Float64Array [2]]
 * ```
 */
export function personMeans(p: EyePairing, variables: readonly Numbers[]): Float64Array[] {
  const out: number[][] = variables.map(() => []);
  for (const person of p.persons) {
    const rows = [person.right, person.left].filter(
      (r) => r >= 0 && variables.every((v) => !Number.isNaN(v[r])),
    );
    if (!rows.length) continue;
    variables.forEach((v, k) => out[k].push(rows.reduce((s, r) => s + v[r], 0) / rows.length));
  }
  return out.map((xs) => Float64Array.from(xs));
}

/** The mean of eyes with standard errors from persons. */
export interface ClusteredMean {
  /** Eyes counted. */
  readonly n: number;
  /** Persons counted. */
  readonly subjects: number;
  /** Mean over eyes. */
  readonly mean: number;
  /** SD over eyes (descriptive). */
  readonly sd: number;
  /** Standard error as if eyes were independent, s/√n (the trap). */
  readonly naiveSE: number;
  /** Cluster-robust standard error from persons. */
  readonly robustSE: number;
  /** Design effect: robust variance / naive variance (about 1 + ρ for pairs). */
  readonly designEffect: number;
  /** Confidence interval of the mean, t with (persons − 1) d.f. and the robust SE. */
  readonly ci: { readonly lower: number; readonly upper: number };
  /** Confidence level. */
  readonly level: number;
}

/** Complete rows of the variables, with their person, grouped by person. */
function clusters(p: EyePairing, variables: readonly Numbers[]): number[][] {
  const groups = new Map<number, number[]>();
  for (let i = 0; i < p.personOfRow.length; i++) {
    const g = p.personOfRow[i];
    if (g < 0 || variables.some((v) => Number.isNaN(v[i]))) continue;
    const rows = groups.get(g) ?? [];
    rows.push(i);
    groups.set(g, rows);
  }
  return [...groups.values()];
}

/**
 * The cluster-robust covariance matrix of the mean of k variables over eyes, persons as
 * clusters: V = G/(G − 1) · Σ_g u_g u_gᵀ / n², with u_g the sum of the deviations of the
 * person's eyes from the mean (the sandwich form for a mean, with the small-sample factor
 * G/(G − 1)). Returns the means, V, the eyes n and the persons G.
 * Sources: liang-zeger-1986, ying-2017.
 *
 * @example
 * ```ts
 * import { clusteredCovariance, eyePairing } from "./eyes.ts";
 * const p = eyePairing(["a", "a", "b", "b", "c", "c"], ["R", "L", "R", "L", "R", "L"]);
 * clusteredCovariance(p, [[1, 1, 2, 2, 3, 3]]).cov[0][0].toFixed(4); // "0.3333"
 * ```
 * @throws {LentilInputError} with fewer than two persons.
 */
export function clusteredCovariance(
  p: EyePairing,
  variables: readonly Numbers[],
): { mean: number[]; cov: number[][]; n: number; subjects: number } {
  for (const v of variables) checkPaired("values", v.length, "eyes", p.personOfRow.length);
  const groups = clusters(p, variables);
  const G = groups.length;
  if (G < 2) {
    throw new LentilInputError(
      `standard errors from persons need at least two subjects, got ${G}`,
    );
  }
  const k = variables.length;
  const n = groups.reduce((s, g) => s + g.length, 0);
  const mean = variables.map((v) => groups.flat().reduce((s, r) => s + v[r], 0) / n);
  const cov = Array.from({ length: k }, () => new Array(k).fill(0));
  for (const g of groups) {
    const u = variables.map((v, a) => g.reduce((s, r) => s + v[r] - mean[a], 0));
    for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) cov[a][b] += u[a] * u[b];
  }
  const f = G / (G - 1) / (n * n);
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) cov[a][b] *= f;
  return { mean, cov, n, subjects: G };
}

/**
 * The mean of eyes with a cluster-robust standard error from persons, its naive
 * counterpart, the design effect and the t interval with (persons − 1) d.f.
 * Sources: liang-zeger-1986, ying-2017, murdoch-1998.
 *
 * @example
 * ```ts
 * import { clusteredMean, eyePairing } from "./eyes.ts";
 * const p = eyePairing(["a", "a", "b", "b", "c", "c"], ["R", "L", "R", "L", "R", "L"]);
 * clusteredMean(p, [1, 1.2, 2, 2.2, 3, 2.8]).designEffect > 1.5; // true
 * ```
 * @throws {LentilInputError} with fewer than two persons.
 */
export function clusteredMean(p: EyePairing, values: Numbers, level = 0.95): ClusteredMean {
  const { mean, cov, n, subjects } = clusteredCovariance(p, [values]);
  let ss = 0;
  for (let i = 0; i < values.length; i++) {
    if (p.personOfRow[i] >= 0 && !Number.isNaN(values[i])) ss += (values[i] - mean[0]) ** 2;
  }
  const sd = Math.sqrt(ss / (n - 1));
  const naiveSE = sd / Math.sqrt(n);
  const robustSE = Math.sqrt(cov[0][0]);
  const t = tQuantile((1 + level) / 2, subjects - 1);
  return {
    n,
    subjects,
    mean: mean[0],
    sd,
    naiveSE,
    robustSE,
    designEffect: naiveSE > 0 ? (robustSE / naiveSE) ** 2 : 1,
    ci: { lower: mean[0] - t * robustSE, upper: mean[0] + t * robustSE },
    level,
  };
}

/**
 * The correlation between fellow eyes: Pearson's r of the right eye's value against the
 * left eye's over persons with both eyes measured.
 * Sources: murdoch-1998, armstrong-2013.
 *
 * @example
 * ```ts
 * import { eyePairing, fellowEyeCorrelation } from "./eyes.ts";
 * const p = eyePairing(["a", "a", "b", "b", "c", "c"], ["R", "L", "R", "L", "R", "L"]);
 * fellowEyeCorrelation(p, [1, 1.1, 2, 2.1, 3, 3.3]).r.toFixed(3); // "0.997"
 * ```
 * @throws {LentilInputError} with fewer than three persons with both eyes.
 */
export function fellowEyeCorrelation(p: EyePairing, values: Numbers): { r: number; pairs: number } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (const person of p.persons) {
    if (person.right < 0 || person.left < 0) continue;
    const [x, y] = [values[person.right], values[person.left]];
    if (Number.isNaN(x) || Number.isNaN(y)) continue;
    xs.push(x);
    ys.push(y);
  }
  const m = xs.length;
  if (m < 3) {
    throw new LentilInputError(
      `the fellow-eye correlation needs at least three persons with both eyes, got ${m}`,
    );
  }
  const mx = xs.reduce((s, x) => s + x, 0) / m;
  const my = ys.reduce((s, y) => s + y, 0) / m;
  let sxy = 0, sxx = 0, syy = 0;
  for (let i = 0; i < m; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
    syy += (ys[i] - my) ** 2;
  }
  return { r: sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : NaN, pairs: m };
}

/**
 * The right and left eye's values of each person with both eyes measured, for a scatter
 * of fellow eyes. Source: murdoch-1998.
 *
 * @example
 * ```ts
 * import { eyePairing, fellowEyePairs } from "./eyes.ts";
 * fellowEyePairs(eyePairing(["a", "a"], ["R", "L"]), [1, 2]); // { right: [1], left: [2] }
 * ```
 */
export function fellowEyePairs(
  p: EyePairing,
  values: Numbers,
): { right: number[]; left: number[] } {
  const right: number[] = [];
  const left: number[] = [];
  for (const person of p.persons) {
    if (person.right < 0 || person.left < 0) continue;
    const [x, y] = [values[person.right], values[person.left]];
    if (Number.isNaN(x) || Number.isNaN(y)) continue;
    right.push(x);
    left.push(y);
  }
  return { right, left };
}
