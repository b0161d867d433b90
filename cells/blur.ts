/**
 * Blur and accommodation cells: blur discs, diffraction, pinholes, the comparison with the
 * retina and the optotype, the defocus at which a line fails, amplitudes by age and
 * through-focus predictions.
 *
 * @example
 * ```ts
 * import { BLUR_FORMULAS } from "./blur.ts";
 * BLUR_FORMULAS.some((f) => f.name === "blurDisc"); // true
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec, type OptionSpec, type ParamSpec } from "./catalogue.ts";
import { Column, makeTable } from "./table.ts";
import { defineValueType } from "./types.ts";
import { AcuityValue, Measures } from "./_acuity_values.ts";
import { type Acuity, acuityFromLogMAR, decimalOf, marOf } from "../lib/acuity.ts";
import {
  airyDisc,
  blurDisc,
  blurredMAR,
  combinedBlur,
  compareBlur,
  failingDefocus,
  pinholeBlur,
  retinalBlur,
} from "../lib/blur.ts";
import {
  accommodativeDemand,
  type AgeAmplitude,
  amplitudeByAge,
  type AmplitudeLevel,
  minusAbsorbed,
} from "../lib/accommodation.ts";
import { powerRange, predictThroughFocus } from "../lib/through_focus.ts";
import { fixed, signed } from "./display.ts";
import { markExact, quantity } from "./quantity.ts";
import { REFERENCE_VALUES } from "../shared/constants.ts";

const PUPIL: ParamSpec = {
  name: "pupil",
  type: "quantity",
  unit: "mm",
  range: [1, 9],
  doc: "pupil diameter",
};
const DEFOCUS: ParamSpec = {
  name: "defocus",
  type: "quantity",
  unit: "D",
  range: [-50, 50],
  doc: "defocus (either sign)",
};
const WAVELENGTH = optionalQuantity(
  "wavelength",
  "nm",
  [380, 780],
  REFERENCE_VALUES.photopicWavelength.value,
  "wavelength (default 555 nm)",
);
const AGE: ParamSpec = {
  name: "age",
  type: "quantity",
  unit: "years",
  range: [0, 100],
  doc: "age",
};
const SLOPE: OptionSpec = {
  name: "slope",
  type: "number",
  range: [0.05, 5],
  default: REFERENCE_VALUES.blurAcuitySlope.value,
  doc: "k in MAR ≈ k·A·ΔF, arcmin per mm per D (default 0.65, from memory)",
};
const ARCMIN = { type: "quantity", unit: "arcmin" } as const;

/** A quantity option with its default (in `unit`). */
function optionalQuantity(
  name: string,
  unit: string,
  range: readonly [number, number],
  fallback: number,
  doc: string,
): OptionSpec {
  return { name, type: "quantity", unit, range, default: fallback, doc };
}

const TEST_DISTANCE = optionalQuantity(
  "testDistance",
  "m",
  [0.1, 1e6],
  6,
  "chart distance (default 6 m)",
);
const acuityOf = (x: unknown): Acuity => x as AcuityValue;

/** Hofstetter's three amplitudes at an age, as a value. */
export class AmplitudeValue {
  /** @param amplitude the amplitudes. */
  constructor(readonly amplitude: AgeAmplitude) {}
}

defineValueType<AmplitudeValue>({
  name: "amplitude",
  summary: "amplitudes of accommodation at an age (minimum, mean, maximum)",
  is: (x): x is AmplitudeValue => x instanceof AmplitudeValue,
  display: ({ amplitude: a }) =>
    `minimum ${a.minimum.toFixed(2)} D, mean ${a.mean.toFixed(2)} D, maximum ${
      a.maximum.toFixed(2)
    } D at ${a.age} years${a.clamped ? " (held at 0 where the formula goes below)" : ""}`,
  headline: ({ amplitude: a }) => `${fixed(a.mean, 2)} D mean at ${a.age} years`,
  parts: ({ amplitude: a }) => [
    {
      key: "minimum",
      label: "minimum (Hofstetter)",
      value: markExact(quantity(a.minimum, "D"), { unsigned: true }),
    },
    {
      key: "mean",
      label: "mean (Hofstetter)",
      value: markExact(quantity(a.mean, "D"), { unsigned: true }),
    },
    {
      key: "maximum",
      label: "maximum (Hofstetter)",
      value: markExact(quantity(a.maximum, "D"), { unsigned: true }),
    },
    { key: "age", label: "age", value: quantity(a.age, "years") },
    ...(a.clamped
      ? [{ key: "note", label: "note", value: "held at 0 where the formula goes below" }]
      : []),
  ],
  json: ({ amplitude }) => amplitude,
});

/** Blur and accommodation formulas. */
export const BLUR_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "blurDisc",
    group: "blur",
    summary: "Angular diameter of the geometric blur disc, pupil × defocus (small angles).",
    params: [PUPIL, DEFOCUS],
    returns: { ...ARCMIN, doc: "blur-disc diameter" },
    sources: ["smith-1982"],
    example: "blurDisc(4 mm, 1 D)",
    fn: (p, d) => blurDisc(p as number, d as number),
  }),
  defineFormula({
    name: "retinalBlur",
    group: "blur",
    summary: "Diameter of the blur disc on the retina of a named schematic eye.",
    params: [PUPIL, DEFOCUS],
    options: [{
      name: "eye",
      type: "text",
      default: "emsley",
      doc: "schematic eye (emsley: the reduced eye, +60 D)",
    }],
    returns: { type: "quantity", unit: "um", doc: "retinal blur diameter" },
    sources: ["smith-1982", "emsley-reduced-eye"],
    example: "retinalBlur(4 mm, 1 D)",
    fn: (p, d, e) => retinalBlur(p as number, d as number, e as string),
  }),
  defineFormula({
    name: "airyDisc",
    group: "blur",
    summary: "Angular diameter of the diffraction (Airy) disc, 2.44·λ/A.",
    params: [PUPIL],
    options: [WAVELENGTH],
    returns: { ...ARCMIN, doc: "Airy disc diameter to the first dark ring" },
    sources: ["airy-disc"],
    example: "airyDisc(3 mm, {wavelength: 555 nm})",
    fn: (p, w) => airyDisc(p as number, w as number),
  }),
  defineFormula({
    name: "combinedBlur",
    group: "blur",
    summary:
      "Geometric blur and diffraction combined by root-sum-of-squares of their diameters (an estimate).",
    params: [PUPIL, DEFOCUS],
    options: [WAVELENGTH],
    returns: { ...ARCMIN, doc: "combined blur diameter" },
    sources: ["smith-1982", "airy-disc", "blur-quadrature"],
    example: "combinedBlur(3 mm, 0.5 D)",
    fn: (p, d, w) => combinedBlur(p as number, d as number, w as number).combined,
  }),
  defineFormula({
    name: "pinholeBlur",
    group: "blur",
    summary:
      "The blur with and without a pinhole: geometric blur shrinks with the aperture, diffraction grows.",
    params: [
      {
        name: "pinhole",
        type: "quantity",
        unit: "mm",
        range: [0.3, 3],
        doc: "pinhole diameter",
      },
      DEFOCUS,
      PUPIL,
    ],
    options: [WAVELENGTH],
    returns: {
      type: "any",
      doc: "combined blur through the pupil and the pinhole, and their ratio",
    },
    sources: ["smith-1982", "airy-disc", "blur-quadrature"],
    example: "pinholeBlur(1.2 mm, 2 D, 5 mm)",
    fn: (h, d, p, w) => {
      const r = pinholeBlur(h as number, d as number, p as number, w as number);
      return new Measures("pinhole", [
        {
          key: "withoutPinhole",
          label: "blur without the pinhole",
          value: r.pupil.combined,
          unit: "arcmin",
        },
        {
          key: "withPinhole",
          label: "blur through the pinhole",
          value: r.pinhole.combined,
          unit: "arcmin",
        },
        {
          key: "pinholeGeometric",
          label: "through the pinhole, geometric part",
          value: r.pinhole.geometric,
          unit: "arcmin",
        },
        {
          key: "pinholeDiffraction",
          label: "through the pinhole, diffraction part",
          value: r.pinhole.diffraction,
          unit: "arcmin",
        },
        {
          key: "ratio",
          label: "pinhole blur as a share of the blur without it",
          value: r.ratio,
          unit: "",
        },
      ]);
    },
  }),
  defineFormula({
    name: "compareBlur",
    group: "blur",
    summary:
      "A blur compared with the foveal cone spacing and with the detail and size of an optotype of a given acuity.",
    params: [
      { name: "blur", type: "quantity", unit: "arcmin", range: [0, 1e5], doc: "blur diameter" },
      { name: "acuity", type: "acuity", doc: "the optotype's acuity" },
    ],
    returns: { type: "measures", doc: "sizes (arcmin) and ratios" },
    sources: ["curcio-1990", "iso-8596", "emsley-reduced-eye"],
    example: 'compareBlur(blurDisc(3 mm, 0.5 D), "6/6")',
    fn: (b, a) => {
      const c = compareBlur(b as number, decimalOf(acuityOf(a)));
      return new Measures("blur comparison", [
        { key: "blur", label: "blur", value: c.blur, unit: "arcmin" },
        { key: "coneSpacing", label: "foveal cone spacing", value: c.coneSpacing, unit: "arcmin" },
        { key: "detail", label: "optotype detail (stroke, gap)", value: c.detail, unit: "arcmin" },
        { key: "letter", label: "optotype size (overall)", value: c.letter, unit: "arcmin" },
        { key: "blurOverCones", label: "blur in cone spacings", value: c.toCones, unit: "" },
        { key: "blurOverDetail", label: "blur in optotype details", value: c.toDetail, unit: "" },
        { key: "blurOverLetter", label: "blur in optotype sizes", value: c.toLetter, unit: "" },
      ]);
    },
  }),
  defineFormula({
    name: "failingDefocus",
    group: "blur",
    summary:
      "Defocus at which a line should just fail, from MAR ≈ k·pupil·defocus: an approximation (Smith 1991, from memory).",
    params: [{ name: "acuity", type: "acuity", doc: "the line" }, PUPIL],
    options: [{
      name: "inFocus",
      type: "acuity",
      doc: "acuity in focus (default 6/6), as for blurredAcuity",
    }, SLOPE],
    returns: {
      type: "quantity",
      unit: "D",
      display: "exact",
      doc: "defocus (an approximation)",
    },
    sources: ["smith-1991"],
    example: 'failingDefocus("6/12", 4 mm)',
    fn: (a, p, f, k) =>
      failingDefocus(decimalOf(acuityOf(a)), p as number, {
        baselineMAR: f === undefined ? 1 : marOf(acuityOf(f)),
        slope: k as number,
      }),
  }),
  defineFormula({
    name: "blurredAcuity",
    group: "blur",
    summary:
      "Acuity expected with defocus: √(MAR₀² + (k·pupil·defocus)²), an approximation (Smith 1991, from memory).",
    params: [PUPIL, DEFOCUS],
    options: [{
      name: "inFocus",
      type: "acuity",
      doc: "acuity in focus (default 6/6)",
    }, SLOPE],
    returns: { type: "acuity", doc: "acuity expected (an approximation)" },
    sources: ["smith-1991"],
    example: "blurredAcuity(4 mm, 1 D)",
    fn: (p, d, a, k) => {
      const mar0 = a === undefined ? 1 : marOf(acuityOf(a));
      const mar = blurredMAR(p as number, d as number, { baselineMAR: mar0, slope: k as number });
      return new AcuityValue(acuityFromLogMAR(Math.log10(mar)));
    },
  }),
  defineFormula({
    name: "amplitudeByAge",
    group: "accommodation",
    summary: "Amplitude of accommodation by age: Hofstetter's minimum, mean and maximum.",
    params: [AGE],
    returns: { type: "amplitude", doc: "minimum, mean and maximum amplitude" },
    sources: ["hofstetter-1950"],
    example: "amplitudeByAge(40 years)",
    fn: (age) => new AmplitudeValue(amplitudeByAge(age as number)),
  }),
  defineFormula({
    name: "accommodativeDemand",
    group: "accommodation",
    summary: "Accommodation a target at a distance asks for, 1/distance.",
    params: [{
      name: "distance",
      type: "quantity",
      unit: "m",
      range: [0.001, 1e6],
      doc: "target distance",
    }],
    returns: { type: "quantity", unit: "D", display: "exact", doc: "demand" },
    sources: ["common-practice"],
    example: "accommodativeDemand(40 cm)",
    fn: (d) => accommodativeDemand(d as number),
  }),
  defineFormula({
    name: "minusAbsorbed",
    group: "accommodation",
    summary:
      "Extra minus an eye of a given age can absorb by accommodating without losing acuity at a test distance.",
    params: [
      AGE,
    ],
    options: [
      TEST_DISTANCE,
      {
        name: "level",
        type: "text",
        default: "mean",
        choices: ["minimum", "mean", "maximum"],
        doc: "which amplitude: minimum, mean or maximum (default mean)",
      },
    ],
    returns: { type: "quantity", unit: "D", display: "exact", doc: "minus absorbed" },
    sources: ["hofstetter-1950", "common-practice"],
    example: "minusAbsorbed(30 years)",
    fn: (age, d, level) =>
      minusAbsorbed(age as number, { testDistance: d as number, level: level as AmplitudeLevel }),
  }),
  defineFormula({
    name: "throughFocus",
    group: "accommodation",
    summary:
      "Predicted acuity against trial lens power around a correction, with an amplitude of accommodation (0 for none), from the blur approximation (Smith 1991, from memory): a table of lens, va (logMAR) and residual defocus.",
    params: [
      { name: "rx", type: "quantity", unit: "D", doc: "the eye's correction at infinity" },
      PUPIL,
    ],
    options: [
      optionalQuantity("amplitude", "D", [0, 30], 0, "accommodation available (default 0)"),
      optionalQuantity(
        "span",
        "D",
        [0.25, 10],
        2,
        "powers from rx + span to rx − span (default 2 D)",
      ),
      optionalQuantity("step", "D", [0.05, 2], 0.25, "step between powers (default 0.25 D)"),
      TEST_DISTANCE,
    ],
    returns: { type: "table", doc: "lens (D), va (logMAR), residual (D)" },
    sources: ["smith-1991", "test-distance-vergence"],
    example: "throughFocus(-1 D, 4 mm, {amplitude: 2 D})",
    fn: (rx, pupil, amp, span, step, d) => {
      const r = rx as number;
      const powers = powerRange(r + (span as number), r - (span as number), step as number);
      const pts = predictThroughFocus(powers, {
        rx: r,
        pupil: pupil as number,
        amplitude: amp as number,
        testDistance: d as number,
      });
      return makeTable(`throughFocus ${signed(r)} D`, [
        new Column("lens", "quantity", "D", Float64Array.from(pts, (p) => p.power), {
          label: "trial lens",
        }),
        new Column("va", "number", "logMAR", Float64Array.from(pts, (p) => p.logMAR), {
          label: "predicted acuity",
        }),
        new Column("residual", "quantity", "D", Float64Array.from(pts, (p) => p.residual), {
          label: "defocus left",
        }),
      ]);
    },
  }),
];
