/**
 * Lentil's colours, declared once for the page (exported and live) and its figures. Chosen for
 * Lentil: a warm paper and rules, a deep slate ink for data, brick for what a figure marks, moss
 * for fitted curves, plum for limits. Every text colour reaches WCAG 2 AA (4.5:1) on the
 * backgrounds it is used on (`tests/palette_test.ts` checks it).
 *
 * @example
 * ```ts
 * import { PAGE, SERIES } from "./_palette.ts";
 * PAGE.paper; // "#ffffff"
 * SERIES.length >= 6; // true
 * ```
 *
 * @module
 */

/** Colours of the page: text, rules, bands, notices. */
export const PAGE = {
  /** Body text. */
  ink: "#1e2328",
  /** Secondary text (captions, expressions, meta lines). */
  muted: "#575e66",
  /** Rules between rows and around blocks. */
  rule: "#dcd6cb",
  /** Page background. */
  paper: "#ffffff",
  /** Band behind a block of cells. */
  band: "#f7f4ee",
  /** Links, headings' rule, focus rings. */
  accent: "#24566a",
  /** Background of the cautions. */
  cautionBg: "#fbf1d9",
  /** Text and border of the cautions. */
  caution: "#74480a",
  /** Errors, failed checks. */
  bad: "#9e2a1c",
  /** Background behind an error or a failed check. */
  badBg: "#fbe9e5",
  /** Passed checks. */
  good: "#2b6a3d",
  /** Background behind a passed check. */
  goodBg: "#e8f3ea",
} as const;

/** Colours inside a figure. */
export const FIGURE = {
  /** Data marks and lines when nothing colours them. */
  data: "#1f3d57",
  /** What a figure marks: an endpoint, limits' labels. */
  marked: "#a3401b",
  /** A fitted curve. */
  fitted: "#2e6b45",
  /** Limits and outlines (ellipses). */
  limits: "#6b3f88",
  /** Grid lines. */
  grid: "#e9e4da",
  /** The axis lines and the zero line of a power axis. */
  axis: "#8d8578",
  /** Tick labels. */
  tick: "#4d535b",
  /** Axis titles. */
  title: "#262b31",
} as const;

/** Colours of series told apart by a `colour-by` column, in order of first appearance. */
export const SERIES: readonly string[] = [
  "#1f3d57",
  "#b0531f",
  "#3a7a4f",
  "#774b96",
  "#8f6c0c",
  "#2a7383",
  "#913450",
  "#5d5a55",
];

/** The two ends of the ramp for a numeric `colour-by` column (light for low, dark for high). */
export const RAMP: readonly [string, string] = ["#dcc99a", "#1f3d57"];
