/**
 * Blur: the geometric blur disc of a defocused eye, its size on the retina of a schematic
 * eye, the effect of a pinhole, the diffraction (Airy) disc, their combination, comparison
 * with the foveal cone spacing and with an optotype's detail, and the defocus at which a
 * line should just fail.
 *
 * - Angular blur-disc diameter β (rad) = A (m) × ΔF (D), small angles (smith-1982).
 * - Retinal diameter through a reduced eye of power F with the pupil at its surface:
 *   b = A·|ΔF|/F (paraxial geometry; emsley-reduced-eye).
 * - Airy disc angular diameter (to the first dark ring) 2.44·λ/A (airy-disc).
 * - Combined estimate: √(β² + airy²), a rule of thumb (blur-quadrature).
 * - Acuity against defocus: MAR ≈ k·A·ΔF once blur dominates, k ≈ 0.65′ per mm per D
 *   (smith-1991: an approximation, from memory).
 *
 * @example
 * ```ts
 * import { blurDisc } from "./blur.ts";
 * blurDisc(4, 1).toFixed(2); // "13.75" (arcmin)
 * ```
 *
 * @module
 */

import { checkFinite, checkRange, LentilInputError } from "./errors.ts";
import { REFERENCE_VALUES } from "../shared/constants.ts";

/** Radians to arcmin. */
export const ARCMIN_PER_RAD = (180 * 60) / Math.PI;

/** Accepted pupil diameters, mm. */
export const PUPIL_RANGE = [1, 9] as const;
/** Accepted pinhole diameters, mm. */
export const PINHOLE_RANGE = [0.3, 3] as const;
/** Accepted wavelengths, nm (the visible band). */
export const WAVELENGTH_RANGE = [380, 780] as const;
/** Accepted defocus, D (either sign). */
export const DEFOCUS_LIMIT = 50;

/** A schematic eye as the blur functions need it. */
export interface SchematicEye {
  /** Name used to pick it. */
  readonly name: string;
  /** Equivalent power, D. */
  readonly power: number;
  /** Refractive index of the eye's medium. */
  readonly index: number;
  /** Registry id of its source. */
  readonly source: string;
}

/** The schematic eyes known by name. */
export const SCHEMATIC_EYES: Readonly<Record<string, SchematicEye>> = {
  emsley: {
    name: "emsley",
    power: REFERENCE_VALUES.reducedEyePower.value,
    index: REFERENCE_VALUES.reducedEyeIndex.value,
    source: REFERENCE_VALUES.reducedEyePower.source,
  },
};

/**
 * Look up a schematic eye by name. Source: emsley-reduced-eye.
 *
 * @example
 * ```ts
 * import { schematicEye } from "./blur.ts";
 * schematicEye("emsley").power; // 60
 * ```
 * @throws {LentilInputError} for a name not in {@linkcode SCHEMATIC_EYES}.
 */
export function schematicEye(name: string): SchematicEye {
  const eye = SCHEMATIC_EYES[name.trim().toLowerCase()];
  if (!eye) {
    throw new LentilInputError(
      `schematic eye "${name}" is not known; use one of ${Object.keys(SCHEMATIC_EYES).join(", ")}`,
    );
  }
  return eye;
}

function checkPupil(pupil: number, what = "pupil diameter"): number {
  return checkRange(what, pupil, PUPIL_RANGE[0], PUPIL_RANGE[1], "mm");
}

function checkDefocus(defocus: number): number {
  return checkRange("defocus", defocus, -DEFOCUS_LIMIT, DEFOCUS_LIMIT, "D");
}

/**
 * Angular diameter (arcmin) of the geometric blur disc for a pupil of `pupil` mm and
 * `defocus` D of either sign: β = A·|ΔF| radians. Source: smith-1982.
 *
 * @example
 * ```ts
 * import { blurDisc } from "./blur.ts";
 * blurDisc(3, -0.5).toFixed(2); // "5.16"
 * ```
 * @throws {LentilRangeError} for a pupil outside 1–9 mm or defocus beyond ±50 D.
 */
export function blurDisc(pupil: number, defocus: number): number {
  checkPupil(pupil);
  checkDefocus(defocus);
  return (pupil / 1000) * Math.abs(defocus) * ARCMIN_PER_RAD;
}

/**
 * Diameter (µm) of the blur disc on the retina of a named schematic eye: A·|ΔF|/F, the
 * pupil taken at the eye's refracting surface (paraxial). Sources: smith-1982,
 * emsley-reduced-eye.
 *
 * @example
 * ```ts
 * import { retinalBlur } from "./blur.ts";
 * retinalBlur(4, 1).toFixed(1); // "66.7"
 * ```
 * @throws {LentilRangeError} for a bad pupil or defocus; {@linkcode LentilInputError} for
 * an unknown eye.
 */
export function retinalBlur(pupil: number, defocus: number, eye = "emsley"): number {
  checkPupil(pupil);
  checkDefocus(defocus);
  const e = schematicEye(eye);
  return (pupil * Math.abs(defocus) / e.power) * 1000;
}

/**
 * Angular size (arcmin) of a retinal length of `microns` µm in a schematic eye: the
 * length over the nodal distance 1/F of the reduced eye. Source: emsley-reduced-eye.
 *
 * @example
 * ```ts
 * import { retinalAngle } from "./blur.ts";
 * retinalAngle(2.5).toFixed(2); // "0.52"
 * ```
 * @throws {LentilRangeError} for a negative or non-finite length.
 */
export function retinalAngle(microns: number, eye = "emsley"): number {
  checkRange("retinal length", microns, 0, 1e5, "um");
  return (microns / 1e6) * schematicEye(eye).power * ARCMIN_PER_RAD;
}

function airyFor(aperture: number, wavelength: number): number {
  checkRange("wavelength", wavelength, WAVELENGTH_RANGE[0], WAVELENGTH_RANGE[1], "nm");
  return ((2.44 * wavelength * 1e-9) / (aperture / 1000)) * ARCMIN_PER_RAD;
}

/**
 * Angular diameter (arcmin) of the Airy disc, to its first dark ring, for a pupil of
 * `pupil` mm at `wavelength` nm (default 555 nm): 2.44·λ/A. Source: airy-disc.
 *
 * @example
 * ```ts
 * import { airyDisc } from "./blur.ts";
 * airyDisc(3).toFixed(2); // "1.55"
 * ```
 * @throws {LentilRangeError} for a pupil outside 1–9 mm or a wavelength outside 380–780 nm.
 */
export function airyDisc(
  pupil: number,
  wavelength: number = REFERENCE_VALUES.photopicWavelength.value,
): number {
  checkPupil(pupil);
  return airyFor(pupil, wavelength);
}

/** Blur of one aperture: geometric, diffraction and combined (arcmin). */
export interface BlurEstimate {
  /** Aperture diameter used, mm. */
  readonly aperture: number;
  /** Geometric blur-disc diameter, arcmin. */
  readonly geometric: number;
  /** Airy disc diameter, arcmin. */
  readonly diffraction: number;
  /** √(geometric² + diffraction²), arcmin: an estimate. */
  readonly combined: number;
}

function estimate(aperture: number, defocus: number, wavelength: number): BlurEstimate {
  checkDefocus(defocus);
  const geometric = (aperture / 1000) * Math.abs(defocus) * ARCMIN_PER_RAD;
  const diffraction = airyFor(aperture, wavelength);
  return { aperture, geometric, diffraction, combined: Math.hypot(geometric, diffraction) };
}

/**
 * Geometric blur and diffraction together for a pupil: the root-sum-of-squares of the
 * blur-disc and Airy-disc diameters, an estimate only. Sources: smith-1982, airy-disc,
 * blur-quadrature.
 *
 * @example
 * ```ts
 * import { combinedBlur } from "./blur.ts";
 * combinedBlur(3, 0).combined.toFixed(2); // "1.55"
 * ```
 * @throws {LentilRangeError} for a bad pupil, defocus or wavelength.
 */
export function combinedBlur(
  pupil: number,
  defocus: number,
  wavelength: number = REFERENCE_VALUES.photopicWavelength.value,
): BlurEstimate {
  checkPupil(pupil);
  return estimate(pupil, defocus, wavelength);
}

/** What a pinhole does: the blur without and with it. */
export interface PinholeEffect {
  /** Through the natural pupil. */
  readonly pupil: BlurEstimate;
  /** Through the pinhole (or the pupil, when that is smaller). */
  readonly pinhole: BlurEstimate;
  /** Combined blur through the pinhole over that through the pupil. */
  readonly ratio: number;
}

/**
 * The effect of a pinhole of `pinhole` mm before an eye with a `pupil` mm pupil and
 * `defocus` D: geometric blur shrinks with the aperture, diffraction grows.
 * Sources: smith-1982, airy-disc, blur-quadrature.
 *
 * @example
 * ```ts
 * import { pinholeBlur } from "./blur.ts";
 * pinholeBlur(1, 2, 5).pinhole.geometric.toFixed(2); // "6.88"
 * ```
 * @throws {LentilRangeError} for a pinhole outside 0.3–3 mm or other bad inputs.
 */
export function pinholeBlur(
  pinhole: number,
  defocus: number,
  pupil: number,
  wavelength: number = REFERENCE_VALUES.photopicWavelength.value,
): PinholeEffect {
  checkRange("pinhole diameter", pinhole, PINHOLE_RANGE[0], PINHOLE_RANGE[1], "mm");
  checkPupil(pupil);
  const open = estimate(pupil, defocus, wavelength);
  const through = estimate(Math.min(pinhole, pupil), defocus, wavelength);
  return { pupil: open, pinhole: through, ratio: through.combined / open.combined };
}

/** A blur compared with the retina's sampling and with an optotype. */
export interface BlurComparison {
  /** The blur, arcmin. */
  readonly blur: number;
  /** Foveal cone spacing seen from the nodal point, arcmin. */
  readonly coneSpacing: number;
  /** The optotype's detail (stroke or gap), arcmin: 1′/V. */
  readonly detail: number;
  /** The optotype's overall size, arcmin: 5′/V. */
  readonly letter: number;
  /** Blur over cone spacing. */
  readonly toCones: number;
  /** Blur over the optotype detail. */
  readonly toDetail: number;
  /** Blur over the optotype's overall size. */
  readonly toLetter: number;
}

/**
 * Compare a blur of `blur` arcmin with the foveal cone spacing (2.5 µm through the
 * schematic eye, about 0.5′) and with the detail (1′/V) and overall size (5′/V) of an
 * optotype for decimal acuity `decimal`. Sources: curcio-1990, iso-8596,
 * emsley-reduced-eye.
 *
 * @example
 * ```ts
 * import { compareBlur } from "./blur.ts";
 * compareBlur(5, 1).toLetter; // 1
 * ```
 * @throws {LentilRangeError} for a negative blur or an acuity outside 0.001–10.
 */
export function compareBlur(blur: number, decimal: number, eye = "emsley"): BlurComparison {
  checkRange("blur", blur, 0, 1e5, "arcmin");
  checkRange("decimal acuity", decimal, 0.001, 10);
  const coneSpacing = retinalAngle(REFERENCE_VALUES.fovealConeSpacing.value, eye);
  const detail = 1 / decimal;
  const letter = REFERENCE_VALUES.referenceOptotypeArcmin.value / decimal;
  return {
    blur,
    coneSpacing,
    detail,
    letter,
    toCones: blur / coneSpacing,
    toDetail: blur / detail,
    toLetter: blur / letter,
  };
}

/** Options of the acuity-against-defocus approximation. */
export interface BlurAcuityOptions {
  /** k in MAR ≈ k·A·ΔF, arcmin per mm per D (default 0.65, from memory). */
  readonly slope?: number;
  /** The eye's MAR in focus, arcmin (default 1, i.e. V = 1.0). */
  readonly baselineMAR?: number;
}

function slopeOf(options: BlurAcuityOptions): number {
  return checkRange(
    "blur-acuity slope",
    options.slope ?? REFERENCE_VALUES.blurAcuitySlope.value,
    0.05,
    5,
  );
}

/**
 * Approximate MAR (arcmin) of an eye with `pupil` mm and `defocus` D:
 * √(MAR₀² + (k·A·ΔF)²), so that MAR tends to the in-focus MAR₀ and grows in proportion to
 * pupil × defocus once blur dominates. An approximation. Source: smith-1991.
 *
 * @example
 * ```ts
 * import { blurredMAR } from "./blur.ts";
 * blurredMAR(4, 0); // 1
 * blurredMAR(4, 2, { baselineMAR: 0.5 }).toFixed(2); // "5.22"
 * ```
 * @throws {LentilRangeError} for a bad pupil, defocus, slope or baseline.
 */
export function blurredMAR(
  pupil: number,
  defocus: number,
  options: BlurAcuityOptions = {},
): number {
  checkPupil(pupil);
  checkDefocus(defocus);
  const mar0 = checkRange("in-focus MAR", options.baselineMAR ?? 1, 0.1, 100, "arcmin");
  return Math.hypot(mar0, slopeOf(options) * pupil * defocus);
}

/**
 * The defocus (D, positive) at which a line of decimal acuity `decimal` should just fail
 * for a `pupil` mm pupil: where {@linkcode blurredMAR} reaches the line's MAR, with the same
 * default in-focus MAR of 1′ (6/6). With an in-focus MAR of 0 the result is MAR/(k·A). An
 * approximation, from memory. Source: smith-1991.
 *
 * @example
 * ```ts
 * import { failingDefocus } from "./blur.ts";
 * failingDefocus(0.5, 4).toFixed(2); // "0.67"
 * failingDefocus(0.5, 4, { baselineMAR: 0 }).toFixed(2); // "0.77"
 * ```
 * @throws {LentilInputError} when the line is at or beyond the in-focus acuity.
 */
export function failingDefocus(
  decimal: number,
  pupil: number,
  options: BlurAcuityOptions = {},
): number {
  checkRange("decimal acuity", decimal, 0.001, 10);
  checkPupil(pupil);
  const mar = 1 / decimal;
  const mar0 = checkFinite("in-focus MAR", options.baselineMAR ?? 1);
  if (mar0 < 0) throw new LentilInputError(`in-focus MAR ${mar0} must not be negative`);
  if (mar <= mar0) {
    throw new LentilInputError(
      `a line of MAR ${mar.toFixed(2)}′ is at or beyond the in-focus acuity (MAR ${mar0}′), ` +
        "so no defocus is needed to fail it: choose a larger line or a better in-focus acuity",
    );
  }
  return Math.sqrt(mar * mar - mar0 * mar0) / (slopeOf(options) * pupil);
}
