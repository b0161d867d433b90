/**
 * The sources registry: every published method, standard, reference value and trade
 * convention that a Lentil formula or constant rests on. This is the one source of truth
 * for citations; `lib/` cites entries by id in its JSDoc, `cells/` attaches ids to each
 * formula, and the engine lists them, transitively, beside every result.
 *
 * `status` says how far a reader can trust the citation:
 * - `published`: a paper, book or standard, cited in full;
 * - `common-practice`: a trade fact with no single source;
 * - `from-memory`: a value or citation recalled, not checked against the original.
 *
 * @example
 * ```ts
 * import { getSource } from "./sources.ts";
 * const s = getSource("thibos-1997");
 * console.log(s.status); // "published"
 * ```
 *
 * @module
 */

/** How far a citation can be trusted; see the module docs. */
export type SourceStatus = "published" | "common-practice" | "from-memory";

/** One entry of the registry. */
export interface Source {
  /** Stable id, kebab-case, used by code and notebooks. */
  readonly id: string;
  /** Full citation as a reader would look it up. */
  readonly citation: string;
  /** Trust mark; see {@linkcode SourceStatus}. */
  readonly status: SourceStatus;
  /** Optional remark: what exactly is taken from the source. */
  readonly note?: string;
}

const entries: readonly Source[] = [
  {
    id: "common-practice",
    citation: "Common practice in the optical and optometric trade (no single source).",
    status: "common-practice",
  },
  {
    id: "iso-13666-axis",
    citation:
      "ISO 13666 Ophthalmic optics — Spectacle lenses — Vocabulary; ISO 8429 Optics and optical instruments — Ophthalmology — Graduated dial scale (standard TABO axis notation, 0–180°).",
    status: "from-memory",
    note: "Axis 1–180, counter-clockwise from the right as seen facing the wearer.",
  },
  {
    id: "thibos-1997",
    citation:
      "Thibos LN, Wheeler W, Horner D. Power vectors: an application of Fourier analysis to the description and statistical analysis of refractive error. Optom Vis Sci 1997;74(6):367–375.",
    status: "published",
  },
  {
    id: "long-1976",
    citation:
      "Long WF. A matrix formalism for decentration problems. Am J Optom Physiol Opt 1976;53:27–33.",
    status: "published",
  },
  {
    id: "keating-1981",
    citation:
      "Keating MP. On the use of matrices for the mean value of refractive errors. Am J Optom Physiol Opt 1981;58:810–819.",
    status: "from-memory",
  },
  {
    id: "thompson-1899",
    citation:
      "Thompson SP. On obliquely-crossed cylindrical lenses. Proc Phys Soc London 1899;17:81.",
    status: "published",
    note:
      "Classical resultant of two cylinders crossed at any angle: C² = C1² + C2² + 2·C1·C2·cos 2θ.",
  },
  {
    id: "stokes-lens",
    citation:
      "Stokes GG. On a mode of measuring the astigmatism of a defective eye. Report of the British Association, 1849 (two equal cylinders of opposite sign crossed at a variable angle θ give a pure cross-cylinder of power 2·C·sin θ).",
    status: "from-memory",
  },
  {
    id: "sine-squared",
    citation:
      "Power in an oblique meridian, F(θ) = S + C·sin²(θ − α): common textbook result of visual optics.",
    status: "common-practice",
  },
  {
    id: "vertex-formula",
    citation:
      "Effective power F' = F / (1 − d·F): any visual optics text, e.g. Tunnacliffe AH, Introduction to Visual Optics, ABDO.",
    status: "published",
    note: "Check values: −10.00 D at 12 mm → −8.93 D at the cornea; +10.00 D → +11.36 D.",
  },
  {
    id: "prentice",
    citation: "Prentice's rule P(Δ) = c(cm) × F(D): common textbook result.",
    status: "common-practice",
  },
  {
    id: "jalie-lenses",
    citation: "Jalie M. The Principles of Ophthalmic Lenses. ABDO (sag and thickness formulas).",
    status: "from-memory",
  },
  {
    id: "minimum-blank",
    citation:
      "Minimum blank size = effective diameter (ED) + 2 × decentration per lens + about 2 mm for edging; ED is the frame's longest diameter through the box centre, smaller than the box diagonal.",
    status: "common-practice",
  },
  {
    id: "lens-measure",
    citation:
      "Lens measure (lens clock) correction F_true = F_read × (n − 1)/(n_tool − 1), tool usually calibrated for n = 1.53.",
    status: "common-practice",
  },
  {
    id: "ansi-z80.1-2015",
    citation:
      "ANSI Z80.1-2015 Ophthalmics — Prescription Ophthalmic Lenses — Recommendations (values as published in summaries of the standard).",
    status: "published",
    note:
      "Values checked against published summaries of the 2015 edition (a quick-reference guide) and the 2010 edition: powers, axis, add, 0.33 Δ or 1.0 mm at the prism reference point, and the mounted imbalance (0.33 Δ, or at most 1.0 mm difference in height of the reference points above ±3.375 D vertical; 0.67 Δ, or ±2.5 mm of the ordered distance between centres above ±2.75 D horizontal). Clauses are named by their titles; the clause numbers are from memory and not given. That either rule accepts a strong pair is our reading. International equivalents: ISO 21987 and ISO 8980-1.",
  },
  {
    id: "ico-1984",
    citation: "International Council of Ophthalmology. Visual Acuity Measurement Standard, 1984.",
    status: "published",
  },
  {
    id: "iso-8596",
    citation:
      "ISO 8596 Ophthalmic optics — Visual acuity testing — Standard and clinical optotypes and their presentation (reference optotype 5′ overall at V = 1.0).",
    status: "published",
  },
  {
    id: "bailey-lovie-1976",
    citation:
      "Bailey IL, Lovie JE. New design principles for visual acuity letter charts. Am J Optom Physiol Opt 1976;53:740–745.",
    status: "published",
  },
  {
    id: "ferris-1982",
    citation:
      "Ferris FL, Kassoff A, Bresnick GH, Bailey I. New visual acuity charts for clinical research. Am J Ophthalmol 1982;94:91–96.",
    status: "published",
  },
  {
    id: "sloan-1959",
    citation:
      "Sloan LL. New test charts for the measurement of visual acuity at far and near distances. Am J Ophthalmol 1959;48:807–813 (10 letters C D H K N O R S V Z).",
    status: "from-memory",
  },
  {
    id: "schulze-bonsel-2006",
    citation:
      'Schulze-Bonsel K, Feltgen N, Burau H, Hansen L, Bach M. Visual acuities "hand motion" and "counting fingers" can be quantified with the Freiburg Visual Acuity Test. Invest Ophthalmol Vis Sci 2006;47:1236–1240.',
    status: "published",
    note:
      "Counting fingers at 30 cm ≈ decimal 0.014 (logMAR 1.85); hand motion ≈ decimal 0.005 (logMAR 2.30); light perception not quantifiable (values from the published abstract).",
  },
  {
    id: "lange-2009",
    citation:
      'Lange C, Feltgen N, Junker B, Schulze-Bonsel K, Bach M. Resolving the clinical acuity categories "hand motion" and "counting fingers" using the Freiburg Visual Acuity Test (FrACT). Graefes Arch Clin Exp Ophthalmol 2009;247:137–142.',
    status: "published",
    note:
      "Counting fingers: mean logMAR 1.98 (decimal 0.010); hand motion: logMAR 2.28 (0.0052); light perception at the floor of the test, not quantifiable (values from the published abstract).",
  },
  {
    id: "low-vision-conventions",
    citation:
      "Conventional logMAR values some studies assign to light perception (2.7) and no light perception (3.0) so that every eye enters the statistics: conventions, never measured acuities, and they differ between studies.",
    status: "from-memory",
  },
  {
    id: "sloan-habel-1956",
    citation:
      "Sloan LL, Habel A. Am J Ophthalmol 1956;42:863–872 (M units for near print: 1 M: print whose letters subtend 5′ at 1 m, about 1.45 mm; near acuity = test distance in m / M size).",
    status: "from-memory",
  },
  {
    id: "law-1951",
    citation:
      "Law FW. Standardization of reading types. Br J Ophthalmol 1951 (N notation: the point size of Times Roman print; N8 is about 1 M).",
    status: "from-memory",
  },
  {
    id: "binomial-tail",
    citation: "Binomial and hypergeometric tail probabilities: any probability text.",
    status: "common-practice",
  },
  {
    id: "matching-problem",
    citation:
      "Matches between two arrangements drawn without repetition (the matching problem, generalised to partial permutations), counted by inclusion–exclusion: any combinatorics text.",
    status: "common-practice",
  },
  {
    id: "smith-1982",
    citation:
      "Smith G. Angular diameter of defocus blur discs. Am J Optom Physiol Opt 1982;59:885–889.",
    status: "published",
  },
  {
    id: "emsley-reduced-eye",
    citation: "Emsley HH. Visual Optics. Reduced eye: +60 D, n′ = 4/3.",
    status: "from-memory",
  },
  {
    id: "airy-disc",
    citation:
      "Airy disc angular diameter 2.44·λ/A for a circular pupil of diameter A: any optics text (e.g. Born M, Wolf E, Principles of Optics).",
    status: "published",
  },
  {
    id: "curcio-1990",
    citation:
      "Curcio CA, Sloan KR, Kalina RE, Hendrickson AE. Human photoreceptor topography. J Comp Neurol 1990;292:497–523.",
    status: "from-memory",
    note: "Foveal cone spacing about 2.5 µm, about 0.5′.",
  },
  {
    id: "smith-1991",
    citation:
      "Smith G. Relation between spherical refractive error and visual acuity. Optom Vis Sci 1991;68:591–598. Used as an approximation: MAR ≈ k·pupil·defocus once blur dominates.",
    status: "from-memory",
    note:
      "An approximation: MAR grows roughly in proportion to pupil × defocus once blur dominates.",
  },
  {
    id: "hofstetter-1950",
    citation:
      "Hofstetter HW. Useful age-amplitude formula. Optom World 1950;38:42–45 (minimum 15 − 0.25·age, mean 18.5 − 0.30·age, maximum 25 − 0.40·age).",
    status: "published",
  },
  {
    id: "accommodative-reserve",
    citation:
      "Keep half (or a third) of the amplitude of accommodation in reserve for sustained near work.",
    status: "common-practice",
  },
  {
    id: "test-distance-vergence",
    citation:
      "A chart at 6 m presents −0.17 D, at 4 m −0.25 D; add it to refer a refraction to infinity.",
    status: "common-practice",
  },
  {
    id: "most-plus-endpoint",
    citation:
      "Subjective endpoint: the most plus (least minus) lens that gives the best acuity (maximum plus for maximum visual acuity, MPMVA).",
    status: "common-practice",
  },
  {
    id: "blur-quadrature",
    citation:
      "Combining geometric blur and the diffraction disc by root-sum-of-squares of their diameters: a rule of thumb of optics, an estimate only.",
    status: "common-practice",
  },
  {
    id: "through-focus-fit",
    citation:
      "Least-squares fit of a piecewise-linear through-focus model to logMAR against lens power (a flat-bottomed peak, or a hinge with a flat minus side): an empirical description, not a physical model of the eye.",
    status: "common-practice",
  },
  {
    id: "bland-altman-1986",
    citation:
      "Bland JM, Altman DG. Statistical methods for assessing agreement between two methods of clinical measurement. Lancet 1986;1(8476):307–310.",
    status: "published",
  },
  {
    id: "chi2-ellipse",
    citation:
      "95% confidence ellipse of a bivariate mean from the covariance matrix and the χ² (2 d.f.) quantile 5.991: any multivariate statistics text.",
    status: "published",
  },
  {
    id: "welford-1962",
    citation:
      "Welford BP. Note on a method for calculating corrected sums of squares and products. Technometrics 1962;4(3):419–420.",
    status: "published",
    note: "One-pass update of the mean and of sums of squares and products.",
  },
  {
    id: "hyndman-fan-1996",
    citation:
      "Hyndman RJ, Fan Y. Sample quantiles in statistical packages. Am Stat 1996;50(4):361–365.",
    status: "published",
    note: "Quantiles by definition 7: linear interpolation, h = (n − 1)·p.",
  },
  {
    id: "numerical-recipes-2007",
    citation:
      "Press WH, Teukolsky SA, Vetterling WT, Flannery BP. Numerical Recipes: The Art of Scientific Computing, 3rd ed. Cambridge University Press 2007, §6.1–6.2, 6.4 (gamma, incomplete gamma and beta functions).",
    status: "from-memory",
    note:
      "Lanczos log-gamma; incomplete beta by continued fraction (modified Lentz); incomplete gamma by series and continued fraction. Checked against jstat in the tests.",
  },
  {
    id: "abramowitz-stegun-1964",
    citation:
      "Abramowitz M, Stegun IA. Handbook of Mathematical Functions. National Bureau of Standards 1964, 26.2.23 (rational approximation of the normal quantile); 26.7.10 (normal approximation of the non-central t).",
    status: "from-memory",
    note:
      "26.2.23 is used only as the starting value of a Newton refinement; 26.7.10 for the non-central t quantile at 10,000 d.f. and more, checked against the exact mixture.",
  },
  {
    id: "lenth-1989",
    citation:
      "Lenth RV. Algorithm AS 243: Cumulative distribution function of the non-central t distribution. Appl Stat 1989;38(1):185–189.",
    status: "from-memory",
    note:
      "The non-central t as a Poisson mixture of incomplete beta functions; summed outward from the mode here. Checked against jstat.",
  },
  {
    id: "bland-altman-1999",
    citation:
      "Bland JM, Altman DG. Measuring agreement in method comparison studies. Stat Methods Med Res 1999;8(2):135–160.",
    status: "published",
    note:
      "Approximate confidence interval of a limit of agreement (standard error √(3s²/n)); regression of the difference on the mean; limits when a subject gives several pairs (true value varying: one-way analysis of variance of the differences).",
  },
  {
    id: "bland-altman-1996",
    citation: "Bland JM, Altman DG. Statistics notes: Measurement error. BMJ 1996;313:744.",
    status: "published",
    note:
      "Within-subject SD from repeated measures; the difference of two measurements lies within 2.77·Sw (1.96·√2) for 95% of pairs.",
  },
  {
    id: "carkeet-2015",
    citation:
      "Carkeet A. Exact parametric confidence intervals for Bland-Altman limits of agreement. Optom Vis Sci 2015;92(3):e71–e80.",
    status: "published",
    note:
      "Each limit considered alone: one-sided tolerance factors of a normal distribution, quantiles of the non-central t with n − 1 d.f. and non-centrality 1.96·√n.",
  },
  {
    id: "shrout-fleiss-1979",
    citation:
      "Shrout PE, Fleiss JL. Intraclass correlations: uses in assessing rater reliability. Psychol Bull 1979;86(2):420–428.",
    status: "published",
    note:
      "ICC(1,1), (2,1), (3,1) and their k-rater averages from the mean squares; a 6-target × 4-judge example with its values.",
  },
  {
    id: "mcgraw-wong-1996",
    citation:
      "McGraw KO, Wong SP. Forming inferences about some intraclass correlation coefficients. Psychol Methods 1996;1(1):30–46.",
    status: "published",
    note:
      "Names of the forms (one-way random; two-way random, absolute agreement; two-way mixed, consistency; single or average measures) and F-based confidence intervals.",
  },
  {
    id: "murdoch-1998",
    citation:
      "Murdoch IE, Morris SS, Cousens SN. People and eyes: statistical approaches in ophthalmology. Br J Ophthalmol 1998;82(8):971–973.",
    status: "published",
    note:
      "Fellow eyes are correlated: analyse one eye per person, the person, or allow for the pairing.",
  },
  {
    id: "armstrong-2013",
    citation:
      "Armstrong RA. Statistical guidelines for the analysis of data obtained from one or both eyes. Ophthalmic Physiol Opt 2013;33(1):7–14.",
    status: "published",
  },
  {
    id: "ying-2017",
    citation:
      "Ying GS, Maguire MG, Glynn R, Rosner B. Tutorial on biostatistics: statistical analysis for correlated binary eye data. Ophthalmic Epidemiol 2017;24(2):130–140.",
    status: "published",
    note:
      "Subject-level (cluster-robust) standard errors; the design effect for pairs of eyes is 1 + ρ.",
  },
  {
    id: "liang-zeger-1986",
    citation:
      "Liang KY, Zeger SL. Longitudinal data analysis using generalized linear models. Biometrika 1986;73(1):13–22.",
    status: "published",
    note:
      "The sandwich (cluster-robust) variance: sums of residuals within each cluster; here with the small-sample factor G/(G − 1) for G clusters (from memory).",
  },
  {
    id: "hotelling-1931",
    citation:
      "Hotelling H. The generalization of Student's ratio. Ann Math Stat 1931;2(3):360–378.",
    status: "published",
    note:
      "Confidence region of a mean vector of p variables: n(x̄ − μ)ᵀS⁻¹(x̄ − μ) ≤ p(n − 1)/(n − p)·F(p, n − p); for p = 2, 2(n − 1)/(n − 2)·F(2, n − 2).",
  },
  {
    id: "rfc-4180",
    citation:
      "Shafranovich Y. Common Format and MIME Type for Comma-Separated Values (CSV) Files. RFC 4180, IETF, 2005.",
    status: "published",
  },
];

const byId: ReadonlyMap<string, Source> = new Map(entries.map((s) => [s.id, s]));

/** Error thrown when code asks for a source id the registry does not hold. */
export class UnknownSourceError extends Error {
  /** Create the error for the missing `id`. */
  constructor(readonly id: string) {
    super(`Unknown source id "${id}": add it to shared/sources.ts before citing it.`);
    this.name = "UnknownSourceError";
  }
}

/**
 * Look up one source by id.
 *
 * @example
 * ```ts
 * import { getSource } from "./sources.ts";
 * getSource("prentice").status; // "common-practice"
 * ```
 * @throws {UnknownSourceError} when the id is not registered.
 */
export function getSource(id: string): Source {
  const s = byId.get(id);
  if (!s) throw new UnknownSourceError(id);
  return s;
}

/**
 * Whether `id` names a registered source.
 *
 * @example
 * ```ts
 * import { hasSource } from "./sources.ts";
 * hasSource("thibos-1997"); // true
 * ```
 */
export function hasSource(id: string): boolean {
  return byId.has(id);
}

/**
 * Every registered source, in registry order.
 *
 * @example
 * ```ts
 * import { listSources } from "./sources.ts";
 * listSources().length > 0; // true
 * ```
 */
export function listSources(): readonly Source[] {
  return entries;
}

/**
 * A short trust label for display: "" for published sources, otherwise
 * "common practice, no source" or "from memory".
 *
 * @example
 * ```ts
 * import { getSource, statusLabel } from "./sources.ts";
 * statusLabel(getSource("sloan-1959")); // "from memory"
 * ```
 */
export function statusLabel(s: Source): string {
  switch (s.status) {
    case "published":
      return "";
    case "common-practice":
      return "common practice, no source";
    case "from-memory":
      return "from memory";
  }
}
