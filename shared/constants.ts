/**
 * Reference values used by `lib/` and exposed to notebooks by `cells/`, each tied to an
 * entry of the sources registry (`shared/sources.ts`). Values are plain numbers in the
 * stated unit; `cells/` turns them into unit-carrying notebook constants.
 *
 * @example
 * ```ts
 * import { REFERENCE_VALUES } from "./constants.ts";
 * REFERENCE_VALUES.reducedEyePower.value; // 60
 * ```
 *
 * @module
 */

/** One reference value with its unit and the id of its source. */
export interface ReferenceValue {
  /** The number, in `unit`. */
  readonly value: number;
  /** Unit as written in notebooks ("D", "mm", "um", "nm", "arcmin", "" for a pure number). */
  readonly unit: string;
  /** Id in the sources registry. */
  readonly source: string;
  /** What the value is, one line. */
  readonly summary: string;
}

/** The registry of reference values, keyed by the name notebooks use. */
export const REFERENCE_VALUES = {
  reducedEyePower: {
    value: 60,
    unit: "D",
    source: "emsley-reduced-eye",
    summary: "Power of Emsley's reduced eye.",
  },
  reducedEyeIndex: {
    value: 4 / 3,
    unit: "",
    source: "emsley-reduced-eye",
    summary: "Refractive index of Emsley's reduced eye.",
  },
  lensMeasureIndex: {
    value: 1.53,
    unit: "",
    source: "lens-measure",
    summary: "Index for which a lens measure (lens clock) is usually calibrated.",
  },
  referenceOptotypeArcmin: {
    value: 5,
    unit: "arcmin",
    source: "iso-8596",
    summary: "Overall angular size of the reference optotype at decimal acuity 1.0.",
  },
  fovealConeSpacing: {
    value: 2.5,
    unit: "um",
    source: "curcio-1990",
    summary: "Foveal cone spacing (about 0.5 arcmin).",
  },
  chi2Quantile95Df2: {
    value: 5.991,
    unit: "",
    source: "chi2-ellipse",
    summary: "95% quantile of the χ² distribution with 2 degrees of freedom.",
  },
  blurAcuitySlope: {
    value: 0.65,
    unit: "",
    source: "smith-1991",
    summary:
      "MAR (arcmin) per mm of pupil per D of defocus once blur dominates: MAR ≈ k·A·ΔF (an approximation, from memory).",
  },
  photopicWavelength: {
    value: 555,
    unit: "nm",
    source: "common-practice",
    summary: "Wavelength of peak photopic sensitivity, the usual default for diffraction.",
  },
} as const satisfies Record<string, ReferenceValue>;

/** Names of the reference values. */
export type ReferenceName = keyof typeof REFERENCE_VALUES;
