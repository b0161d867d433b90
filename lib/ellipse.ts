/**
 * The 95% ellipse of a bivariate sample (for refraction data: J0 against J45) from its mean
 * and covariance matrix. Two regions are offered: the confidence ellipse of the mean and
 * the ellipse expected to hold 95% of individual observations. Each is scaled by
 * Hotelling's T² (exact for normal data at any n ≥ 3: 2(n − 1)/(n − 2)·F(2, n − 2)) unless
 * the large-sample χ² form is asked for (for 2 degrees of freedom the χ² quantile has the
 * closed form −2·ln(1 − p), 5.991 at p = 0.95).
 *
 * Sources: hotelling-1931, chi2-ellipse.
 *
 * @example
 * ```ts
 * import { chiSquare2 } from "./ellipse.ts";
 * chiSquare2(0.95); // 5.991464547107979
 * ```
 *
 * @module
 */

import { LentilInputError, LentilRangeError } from "./errors.ts";
import { fQuantile } from "./distributions.ts";

/** An ellipse in the plane of two variables (x, y). */
export interface Ellipse {
  /** Centre, x. */
  readonly cx: number;
  /** Centre, y. */
  readonly cy: number;
  /** Semi-axis along the major direction. */
  readonly semiMajor: number;
  /** Semi-axis along the minor direction. */
  readonly semiMinor: number;
  /** Direction of the major axis, degrees counter-clockwise from +x, in (−90, 90]. */
  readonly angle: number;
  /** Coverage probability. */
  readonly level: number;
  /** The χ² (2 d.f.) quantile (the large-sample scale, kept for reference). */
  readonly chi2: number;
  /** How the region was scaled: Hotelling's T² (exact) or the large-sample χ². */
  readonly method?: EllipseMethod;
  /** The factor the covariance's eigenvalues were multiplied by (semi-axis = √(factor·λ)). */
  readonly scale?: number;
}

/** The scaling of an ellipse: Hotelling's T² (default) or the large-sample χ² form. */
export type EllipseMethod = "hotelling" | "chi-square";

/** A 2 × 2 covariance matrix: var x, var y, cov xy. */
export interface Covariance2 {
  /** Variance of x. */
  readonly xx: number;
  /** Variance of y. */
  readonly yy: number;
  /** Covariance of x and y. */
  readonly xy: number;
}

/**
 * Quantile of the χ² distribution with 2 degrees of freedom: −2·ln(1 − p).
 * Source: chi2-ellipse.
 *
 * @example
 * ```ts
 * import { chiSquare2 } from "./ellipse.ts";
 * chiSquare2(0.5); // 1.3862943611198906
 * ```
 * @throws {LentilRangeError} when p is not strictly between 0 and 1.
 */
export function chiSquare2(p: number): number {
  if (!(p > 0 && p < 1)) throw new LentilRangeError("coverage probability", p, 0, 1);
  return -2 * Math.log1p(-p);
}

/**
 * Eigenvalues (largest first) and major-axis direction of a 2 × 2 covariance matrix.
 * Source: chi2-ellipse.
 *
 * @example
 * ```ts
 * import { principalAxes } from "./ellipse.ts";
 * principalAxes({ xx: 4, yy: 1, xy: 0 }); // { major: 4, minor: 1, angle: 0 }
 * ```
 */
export function principalAxes(c: Covariance2): { major: number; minor: number; angle: number } {
  const mid = (c.xx + c.yy) / 2;
  const r = Math.hypot((c.xx - c.yy) / 2, c.xy);
  const angle = 0.5 * Math.atan2(2 * c.xy, c.xx - c.yy) * 180 / Math.PI;
  return { major: mid + r, minor: Math.max(0, mid - r), angle: angle === -90 ? 90 : angle };
}

/**
 * The ellipse of a bivariate sample at coverage `level`: of the mean (`"mean"`) or of
 * individual observations (`"observations"`). By Hotelling's T² the semi-axes are
 * √(c·λ/n) with c = 2(n − 1)/(n − 2)·F(2, n − 2) for the mean, and √(c·λ·(n + 1)/n) for a
 * new observation; by the large-sample χ² form (`method` "chi-square") √(χ²·λ/n) and √(χ²·λ).
 * Sources: hotelling-1931, chi2-ellipse.
 *
 * @example
 * ```ts
 * import { ellipseOf } from "./ellipse.ts";
 * const e = ellipseOf({ x: 0, y: 0 }, { xx: 1, yy: 1, xy: 0 }, 100, "mean");
 * e.semiMajor.toFixed(3); // "0.248"
 * ```
 * @throws {LentilInputError} with fewer than 3 observations or a covariance that is not
 * positive semi-definite.
 */
export function ellipseOf(
  centre: { x: number; y: number },
  cov: Covariance2,
  n: number,
  region: "mean" | "observations",
  level = 0.95,
  method: EllipseMethod = "hotelling",
): Ellipse {
  if (!(n >= 3)) {
    throw new LentilInputError(`an ellipse needs at least 3 observations, got ${n}`);
  }
  if (!(cov.xx >= 0 && cov.yy >= 0) || cov.xy * cov.xy > cov.xx * cov.yy * (1 + 1e-12)) {
    throw new LentilInputError(
      `covariance (var ${cov.xx}, ${cov.yy}; cov ${cov.xy}) is not positive semi-definite`,
    );
  }
  const chi2 = chiSquare2(level);
  const c = method === "chi-square" ? chi2 : hotellingScale(n, level);
  const k = region === "mean" ? c / n : method === "chi-square" ? chi2 : (c * (n + 1)) / n;
  return scaled(centre, cov, k, level, chi2, method);
}

function scaled(
  centre: { x: number; y: number },
  cov: Covariance2,
  k: number,
  level: number,
  chi2: number,
  method: EllipseMethod,
): Ellipse {
  const ax = principalAxes(cov);
  return {
    cx: centre.x,
    cy: centre.y,
    semiMajor: Math.sqrt(k * ax.major),
    semiMinor: Math.sqrt(k * ax.minor),
    angle: ax.angle,
    level,
    chi2,
    method,
    scale: k,
  };
}

/**
 * Hotelling's T² critical value for a mean of 2 variables from n observations:
 * 2(n − 1)/(n − 2)·F(level; 2, n − 2). Source: hotelling-1931.
 *
 * @example
 * ```ts
 * import { hotellingScale } from "./ellipse.ts";
 * hotellingScale(12).toFixed(3); // "8.197"
 * ```
 * @throws {LentilInputError} with fewer than 3 observations.
 */
export function hotellingScale(n: number, level = 0.95): number {
  if (!(n >= 3)) {
    throw new LentilInputError(`Hotelling's T² needs at least 3 observations, got ${n}`);
  }
  return ((2 * (n - 1)) / (n - 2)) * fQuantile(level, 2, n - 2);
}

/**
 * The confidence ellipse of a mean from the covariance matrix of the mean itself (for
 * example a cluster-robust one, from G subjects): semi-axes √(c·λ) with Hotelling's
 * c = 2(G − 1)/(G − 2)·F(2, G − 2), or χ² when asked.
 * Sources: hotelling-1931, chi2-ellipse, liang-zeger-1986.
 *
 * @example
 * ```ts
 * import { meanEllipse } from "./ellipse.ts";
 * meanEllipse({ x: 0, y: 0 }, { xx: 0.01, yy: 0.01, xy: 0 }, 1000, 0.95, "chi-square").semiMajor.toFixed(3); // "0.245"
 * ```
 * @throws {LentilInputError} with fewer than 3 subjects or a covariance that is not
 * positive semi-definite.
 */
export function meanEllipse(
  centre: { x: number; y: number },
  covOfMean: Covariance2,
  subjects: number,
  level = 0.95,
  method: EllipseMethod = "hotelling",
): Ellipse {
  checkCovariance(covOfMean);
  const chi2 = chiSquare2(level);
  const k = method === "chi-square" ? chi2 : hotellingScale(subjects, level);
  return scaled(centre, covOfMean, k, level, chi2, method);
}

function checkCovariance(cov: Covariance2): void {
  if (!(cov.xx >= 0 && cov.yy >= 0) || cov.xy * cov.xy > cov.xx * cov.yy * (1 + 1e-12)) {
    throw new LentilInputError(
      `covariance (var ${cov.xx}, ${cov.yy}; cov ${cov.xy}) is not positive semi-definite`,
    );
  }
}

/**
 * Whether a point lies inside (or on) an ellipse.
 * Source: chi2-ellipse.
 *
 * @example
 * ```ts
 * import { insideEllipse } from "./ellipse.ts";
 * insideEllipse({ cx: 0, cy: 0, semiMajor: 2, semiMinor: 1, angle: 0, level: 0.95, chi2: 5.99 }, 1.9, 0); // true
 * ```
 */
export function insideEllipse(e: Ellipse, x: number, y: number): boolean {
  const t = e.angle * Math.PI / 180;
  const dx = x - e.cx;
  const dy = y - e.cy;
  const u = dx * Math.cos(t) + dy * Math.sin(t);
  const v = -dx * Math.sin(t) + dy * Math.cos(t);
  const a = e.semiMajor || 1e-300;
  const b = e.semiMinor || 1e-300;
  return (u / a) ** 2 + (v / b) ** 2 <= 1 + 1e-12;
}

/**
 * Points along an ellipse's outline, for drawing: `count` points evenly spaced in the
 * parametric angle, starting at the end of the major axis. Source: chi2-ellipse (the
 * ellipse itself); the parametric form x = cx + a·cos p·cos θ − b·sin p·sin θ,
 * y = cy + a·cos p·sin θ + b·sin p·cos θ is plane geometry.
 *
 * @example
 * ```ts
 * import { ellipseOutline } from "./ellipse.ts";
 * ellipseOutline({ cx: 0, cy: 0, semiMajor: 2, semiMinor: 1, angle: 0 }, 4)[0]; // { x: 2, y: 0 }
 * ```
 */
export function ellipseOutline(
  e: Pick<Ellipse, "cx" | "cy" | "semiMajor" | "semiMinor" | "angle">,
  count = 96,
): { x: number; y: number }[] {
  const t = (e.angle * Math.PI) / 180;
  const [ct, st] = [Math.cos(t), Math.sin(t)];
  return Array.from({ length: count }, (_, i) => {
    const p = (2 * Math.PI * i) / count;
    const [u, w] = [e.semiMajor * Math.cos(p), e.semiMinor * Math.sin(p)];
    return { x: e.cx + u * ct - w * st, y: e.cy + u * st + w * ct };
  });
}
