/**
 * Lens making and checking in the formula language: surface sag, centre and edge
 * thickness, the comparison across common indices (a table), the frame's minimum lens
 * diameter, the true power from a lens-measure reading, verification against ANSI
 * Z80.1-2015 (the `toleranceReport` value type), and near demand with a tentative add.
 *
 * @example
 * ```ts
 * import { getLanguage } from "./language.ts";
 * const lang = getLanguage();
 * const v = lang.compile(lang.parse("nearDemand(40 cm)")).evaluate({});
 * lang.describe(v).display; // "+2.50 D"
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec, type OptionSpec, type ParamSpec } from "./catalogue.ts";
import { Column, type ColumnShow, makeTable } from "./table.ts";
import { type CheckLine, defineValueType } from "./types.ts";
import { formatNumber } from "./display.ts";
import { markExact, quantity } from "./quantity.ts";
import { defineRecordType, describeValue } from "./present.ts";
import type { RxValue } from "./rx.ts";
import type { AmplitudeLevel } from "../lib/accommodation.ts";
import { nearDemand, tentativeAdd, WORKING_DISTANCE_RANGE_CM } from "../lib/near.ts";
import {
  blankSize,
  COMMON_INDICES,
  DEFAULT_FRONT_CURVE,
  DIAMETER_RANGE,
  EDGING_ALLOWANCE,
  frameDiameter,
  type FrameEdges,
  frameEdges,
  INDEX_RANGE,
  lensThickness,
  surfaceRadius,
  surfaceSag,
  thicknessByIndex,
  trueLensPower,
} from "../lib/thickness.ts";
import {
  checkLens,
  checkPair,
  type ToleranceCheck,
  type ToleranceReport,
} from "../lib/tolerance.ts";
import { REFERENCE_VALUES } from "../shared/constants.ts";

const mm = (v: number) => `${v.toFixed(2)} mm`;
const edgeWords = (e: FrameEdges["thickest"]) =>
  `${mm(e.thickness)} at the ${e.edge} edge (${
    e.meridian === 180 ? "horizontal" : "vertical"
  } meridian, ${e.meridian}°)`;

/** The fields of a `frameEdges` result: each edge's thickness, and the thickest with its meridian. */
interface FrameEdgesRecord {
  centre: unknown;
  nasal: unknown;
  temporal: unknown;
  upper: unknown;
  lower: unknown;
  thickest: unknown;
  thickestEdge: string;
  thickestMeridian: unknown;
  distances: string;
}

/** The `frameEdges` record: a plain record, so a later cell reads `edges.temporal`. */
export const FRAME_EDGES_RECORD = defineRecordType<FrameEdgesRecord>({
  name: "frameEdges",
  summary: "edge thickness at the nasal, temporal, upper and lower edges of a frame",
  headline: (r) => `thickest edge ${describeValue(r.thickest).display}, ${r.thickestEdge}`,
  parts: [
    { key: "centre", label: "centre thickness" },
    { key: "nasal", label: "nasal edge" },
    { key: "temporal", label: "temporal edge" },
    { key: "upper", label: "upper edge" },
    { key: "lower", label: "lower edge" },
    { key: "thickest", label: "thickest edge" },
    { key: "thickestEdge", label: "where the thickest edge is" },
    { key: "thickestMeridian", label: "meridian of the thickest edge" },
    { key: "distances", label: "edges from the optical centre" },
  ],
});

function frameEdgesRecord(e: FrameEdges): FrameEdgesRecord {
  const at = (edge: string) => quantity(e.edges.find((x) => x.edge === edge)!.thickness, "mm");
  return FRAME_EDGES_RECORD.make({
    centre: quantity(e.centre, "mm"),
    nasal: at("nasal"),
    temporal: at("temporal"),
    upper: at("upper"),
    lower: at("lower"),
    thickest: quantity(e.thickest.thickness, "mm"),
    thickestEdge: edgeWords(e.thickest).replace(/^\S+ mm at the /, ""),
    thickestMeridian: quantity(e.thickest.meridian, "deg"),
    distances: e.edges.map((x) => `${x.edge} ${mm(x.distance)}`).join(", "),
  });
}

/** A verification result as a value of the formula language. */
export class ToleranceReportValue {
  /** @param report the checks against the standard. */
  constructor(readonly report: ToleranceReport) {}
}

/** A power in a check: two decimals, three when the figure is on an eighth-dioptre step. */
function checkPower(v: number, sign = true): string {
  const r3 = Math.round(v * 1000) / 1000;
  const digits = Math.abs(r3 * 100 - Math.round(r3 * 100)) > 1e-6 ? 3 : 2;
  const text = Math.abs(r3).toFixed(digits);
  const zero = Number(text) === 0;
  return `${!sign || zero ? "" : v > 0 ? "+" : "-"}${text} D`;
}

/** A prism or position figure of a check with its direction, as an optician reads it. */
function directed(c: ToleranceCheck, v: number): string {
  const unit = c.unit === "mm" ? "mm" : "Δ";
  const amount = `${Math.abs(v).toFixed(2)} ${unit}`;
  if (Math.round(Math.abs(v) * 100) === 0) return `0.00 ${unit}`;
  switch (c.direction) {
    case "imbalance":
      return `${amount} (${v > 0 ? "R" : "L"} relatively base up)`;
    case "horizontal":
    case "net-horizontal":
      return `${amount} ${v > 0 ? "BI" : "BO"}`;
    case "vertical":
      return `${amount} ${v > 0 ? "BU" : "BD"}`;
    case "height":
      return `${amount} (R ${v > 0 ? "higher" : "lower"})`;
    case "centres":
      return `${amount} ${v > 0 ? "wider" : "narrower"}`;
    default:
      return amount;
  }
}

/** The figures of one check as displayed, in one place for the line and the table. */
function checkFigures(c: ToleranceCheck) {
  const size = (v: number) =>
    c.unit === "deg"
      ? `${formatNumber(v)}°`
      : c.unit === "D"
      ? checkPower(v, false)
      : `${v.toFixed(2)} ${c.unit === "mm" ? "mm" : "Δ"}`;
  const value = (v: number) =>
    c.unit === "deg" ? `${formatNumber(v)}°` : c.unit === "D" ? checkPower(v) : directed(c, v);
  // The deviation is measured − ordered: signed for powers and axes; for prism and positions,
  // the amount in the direction it points (a base-down deviation reads "0.50 Δ BD").
  const deviation = c.unit === "deg"
    ? `${c.deviation > 0 ? "+" : c.deviation < 0 ? "-" : ""}${size(Math.abs(c.deviation))}`
    : c.unit === "D"
    ? checkPower(c.deviation)
    : directed(c, c.deviation);
  const atLimit = size(Math.abs(c.margin)) === size(0);
  const ownPass = c.margin >= 0;
  const margin = ownPass
    ? atLimit ? "at the limit" : `${size(c.margin)} inside the limit`
    : `${atLimit ? "just" : size(-c.margin)} beyond the limit`;
  const tolerance = c.limit === "at-most"
    ? `at most ${size(c.tolerance)}`
    : `±${size(c.tolerance)}`;
  return {
    ordered: value(c.ordered),
    measured: value(c.measured),
    deviation,
    tolerance,
    remark: c.remark ? `${margin}; ${c.remark}` : margin,
  };
}

/** The clause without the standard's name, for a line that already names the standard. */
function clauseTitle(clause: string): string {
  return clause.replace(/^ANSI Z80\.1-2015, /, "");
}

function describeCheck(c: ToleranceCheck): string {
  const f = checkFigures(c);
  const verdict = c.pass ? `pass, ${f.remark}` : `FAIL, ${f.remark}`;
  return `${c.quantity}: ordered ${f.ordered}, measured ${f.measured}, deviation ${f.deviation}, tolerance ${f.tolerance}: ${verdict} (${
    clauseTitle(c.clause)
  })`;
}

/** A lens's thickness: centre, thinnest and thickest edge. */
export const THICKNESS_RECORD = defineRecordType<
  { centre: unknown; edgeThin: unknown; edgeThick: unknown }
>({
  name: "thickness",
  summary: "the centre and edge thickness of a lens",
  headline: (r) =>
    `centre ${describeValue(r.centre).display}, thickest edge ${
      describeValue(r.edgeThick).display
    }`,
  parts: [
    { key: "centre", label: "centre thickness" },
    { key: "edgeThin", label: "thinnest edge" },
    { key: "edgeThick", label: "thickest edge" },
  ],
});

/** A tentative near add and how it was found. */
const TENTATIVE_ADD_RECORD = defineRecordType<
  { add: unknown; needed: unknown; demand: unknown; amplitude: unknown; usable: unknown }
>({
  name: "tentativeAdd",
  summary: "a tentative near add with the demand and the usable amplitude",
  headline: (r) => `add ${describeValue(r.add).display}`,
  parts: [
    { key: "add", label: "tentative add (rounded up to 0.25 D)" },
    { key: "needed", label: "add needed, exact" },
    { key: "demand", label: "near demand" },
    { key: "amplitude", label: "expected amplitude of accommodation" },
    { key: "usable", label: "usable amplitude (reserve kept)" },
  ],
});

/** The `toleranceReport` value type. */
export const TOLERANCE_REPORT_TYPE = defineValueType<ToleranceReportValue>({
  name: "toleranceReport",
  summary:
    "lens verification against a tolerance standard, quantity by quantity (deviation = measured − ordered)",
  is: (x): x is ToleranceReportValue => x instanceof ToleranceReportValue,
  display: (v) =>
    `${v.report.standard}: ${v.report.pass ? "pass" : "FAIL"} — ${
      v.report.checks.map(describeCheck).join("; ")
    }`,
  headline: (v) => `${v.report.standard}: ${v.report.pass ? "PASS" : "FAIL"}`,
  checks: (v) =>
    v.report.checks.map((c): CheckLine => {
      const f = checkFigures(c);
      return {
        quantity: c.quantity,
        ordered: f.ordered,
        measured: f.measured,
        deviation: f.deviation,
        tolerance: f.tolerance,
        verdict: c.pass ? "pass" : "fail",
        clause: c.clause,
        remark: f.remark,
      };
    }),
  json: (v) => v.report,
});

const rxOf = (x: unknown) => (x as RxValue).rx;
const INDEX: ParamSpec = {
  name: "index",
  type: "number",
  range: INDEX_RANGE,
  doc: "refractive index of the lens material",
};
const DIAMETER: ParamSpec = {
  name: "diameter",
  type: "quantity",
  unit: "mm",
  range: DIAMETER_RANGE,
  doc: "lens diameter (uncut, or twice the farthest edge point from the optical centre)",
};
const BOX_A: ParamSpec = {
  name: "boxA",
  type: "quantity",
  unit: "mm",
  range: [20, 80],
  doc: "box width A",
};
const BOX_B: ParamSpec = {
  name: "boxB",
  type: "quantity",
  unit: "mm",
  range: [10, 80],
  doc: "box depth B",
};
const MIN_THICKNESS: ParamSpec = {
  name: "minThickness",
  type: "quantity",
  unit: "mm",
  range: [0, 10],
  doc: "thickness at the thinnest point (centre of a minus lens, edge of a plus lens)",
};
const FRONT: OptionSpec = {
  name: "frontCurve",
  type: "quantity",
  unit: "D",
  range: [-20, 20],
  default: DEFAULT_FRONT_CURVE,
  doc: "front surface power in the lens material (default +4.00 D)",
};
const THICKNESS_PARAMS = [
  { name: "rx", type: "rx", doc: "the lens power" },
  INDEX,
  DIAMETER,
  MIN_THICKNESS,
] as const;

function thickness(r: unknown, index: unknown, d: unknown, t: unknown, f: unknown) {
  return lensThickness(rxOf(r), {
    index: index as number,
    diameter: d as number,
    minThickness: t as number,
    frontCurve: f as number,
  });
}

const THICKNESS_COMMON = {
  group: "thickness",
  params: THICKNESS_PARAMS,
  options: [FRONT],
  sources: ["jalie-lenses"],
  caution: true,
} as const;

/** Lens, verification and near formulas. */
export const LENS_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "sag",
    group: "thickness",
    summary: "Sag of a spherical surface over a chord: r − √(r² − (d/2)²).",
    params: [
      { name: "radius", type: "quantity", unit: "mm", range: [1, 1e6], doc: "surface radius" },
      { name: "diameter", type: "quantity", unit: "mm", range: [0, 200], doc: "chord diameter" },
    ],
    returns: { type: "quantity", unit: "mm", doc: "sag" },
    sources: ["jalie-lenses"],
    example: "sag(100 mm, 60 mm)",
    fn: (r, d) => surfaceSag(r as number, (d as number) / 2),
  }),
  defineFormula({
    name: "surfaceRadius",
    group: "thickness",
    summary: "Radius of a surface of a given power in a material: r = (n − 1)/F.",
    params: [
      { name: "power", type: "quantity", unit: "D", range: [-30, 30], doc: "surface power" },
      INDEX,
    ],
    returns: { type: "quantity", unit: "mm", doc: "radius (Infinity for a plano surface)" },
    sources: ["jalie-lenses"],
    example: "surfaceRadius(5 D, 1.5)",
    fn: (p, n) => surfaceRadius(p as number, n as number),
  }),
  defineFormula({
    ...THICKNESS_COMMON,
    name: "lensThickness",
    summary:
      "Centre thickness and the thinnest and thickest edge of a spherocylindrical lens (thin-lens estimate).",
    returns: { type: "any", doc: "record centre, edgeThin, edgeThick (mm)" },
    example: 'lensThickness(rx("-4.00 / -1.00 x 180"), 1.6, 60 mm, 1.5 mm)',
    fn: (r, n, d, t, f) => {
      const x = thickness(r, n, d, t, f);
      return THICKNESS_RECORD.make({
        centre: quantity(x.centre, "mm"),
        edgeThin: quantity(x.edgeThin, "mm"),
        edgeThick: quantity(x.edgeThick, "mm"),
      });
    },
  }),
  ...([
    ["centreThickness", "centre", "Centre thickness", 'rx("+4.00 DS"), 1.5, 60 mm, 1 mm'],
    ["edgeThickness", "edgeThick", "Thickest edge", 'rx("-6.00 DS"), 1.67, 60 mm, 1.5 mm'],
  ] as const).map(([name, key, what, args]) =>
    defineFormula({
      ...THICKNESS_COMMON,
      name,
      summary: `${what} of a spherocylindrical lens (thin-lens estimate).`,
      returns: { type: "quantity", unit: "mm", doc: what.toLowerCase() },
      example: `${name}(${args})`,
      fn: (r, n, d, t, f) => thickness(r, n, d, t, f)[key],
    })
  ),
  defineFormula({
    name: "thicknessByIndex",
    group: "thickness",
    summary: `The same lens estimated in each common index (${
      COMMON_INDICES.map((n) => n.toFixed(2)).join(", ")
    }), same front curve.`,
    params: THICKNESS_PARAMS.filter((p) => p.name !== "index"),
    options: [FRONT],
    returns: { type: "table", doc: "table index, centre, edgeThin, edgeThick (mm)" },
    sources: ["jalie-lenses"],
    caution: true,
    example: 'thicknessByIndex(rx("-6.00 / -1.00 x 90"), 60 mm, 1.5 mm)',
    fn: (r, d, t, f) => {
      const rows = thicknessByIndex(rxOf(r), {
        diameter: d as number,
        minThickness: t as number,
        frontCurve: f as number,
      });
      const col = (
        name: string,
        unit: string,
        pick: (x: (typeof rows)[number]) => number,
        show: ColumnShow,
      ) =>
        new Column(name, unit ? "quantity" : "number", unit, Float64Array.from(rows, pick), show);
      return makeTable("thicknessByIndex", [
        col("index", "", (x) => x.index, { label: "refractive index", decimals: 2 }),
        col("centre", "mm", (x) => x.centre, { label: "centre thickness" }),
        col("edgeThin", "mm", (x) => x.edgeThin, { label: "thinnest edge" }),
        col("edgeThick", "mm", (x) => x.edgeThick, { label: "thickest edge" }),
      ]);
    },
  }),
  defineFormula({
    name: "frameDiameter",
    group: "thickness",
    summary:
      "Fallback blank size when the frame's effective diameter is not known: twice the distance from the optical centre to the farthest box corner, plus a margin. An upper bound that can refuse a strong lens the frame would take; use blankSize with the ED when you have it.",
    params: [
      BOX_A,
      BOX_B,
      {
        name: "decentration",
        type: "quantity",
        unit: "mm",
        range: [-15, 15],
        doc: "optical centre from the box centre",
      },
    ],
    options: [
      {
        name: "margin",
        type: "quantity",
        unit: "mm",
        range: [0, 10],
        default: 2,
        doc: "allowance for edging",
      },
    ],
    returns: { type: "quantity", unit: "mm", doc: "minimum lens diameter" },
    sources: ["common-practice"],
    caution: true,
    example: "frameDiameter(52 mm, 40 mm, 3 mm)",
    fn: (a, b, dec, m) => frameDiameter(a as number, b as number, dec as number, m as number),
  }),
  defineFormula({
    name: "blankSize",
    group: "thickness",
    summary:
      "Minimum blank for a frame by the trade's rule: effective diameter + 2 × decentration + an allowance for edging (about 2 mm).",
    params: [
      {
        name: "ed",
        type: "quantity",
        unit: "mm",
        range: [20, 90],
        doc: "the frame's effective diameter (twice its longest radius from the box centre)",
      },
      {
        name: "decentration",
        type: "quantity",
        unit: "mm",
        range: [-15, 15],
        doc: "optical centre from the box centre, in or out",
      },
    ],
    options: [
      {
        name: "allowance",
        type: "quantity",
        unit: "mm",
        range: [0, 10],
        default: EDGING_ALLOWANCE,
        doc: "allowance for edging (default 2 mm)",
      },
    ],
    returns: { type: "quantity", unit: "mm", doc: "minimum blank diameter" },
    sources: ["minimum-blank"],
    caution: true,
    example: "blankSize(57 mm, 5 mm)",
    fn: (ed, dec, a) => blankSize(ed as number, dec as number, a as number),
  }),
  defineFormula({
    name: "frameEdges",
    group: "thickness",
    summary:
      "Edge thickness where the frame is: at the nasal, temporal, upper and lower edges of the box from the decentred optical centre, each in its own meridian's power, and the thickest edge with its meridian (thin-lens estimate).",
    params: [
      { name: "rx", type: "rx", doc: "the lens power" },
      INDEX,
      BOX_A,
      BOX_B,
      {
        name: "decentration",
        type: "quantity",
        unit: "mm",
        range: [-15, 15],
        doc: "optical centre from the box centre toward the nose (negative: toward the temple)",
      },
      MIN_THICKNESS,
    ],
    options: [
      FRONT,
      {
        name: "verticalDecentration",
        type: "quantity",
        unit: "mm",
        range: [-15, 15],
        default: 0,
        doc: "optical centre above the box centre (negative: below; default 0 mm)",
      },
    ],
    returns: {
      type: "frameEdges",
      doc: "centre, nasal, temporal, upper, lower, thickest (mm) and thickestMeridian",
    },
    sources: ["jalie-lenses", "sine-squared", "common-practice"],
    caution: true,
    example: 'frameEdges(rx("-4.00 / -2.00 x 90"), 1.6, 54 mm, 40 mm, 3 mm, 1.5 mm)',
    fn: (r, n, a, b, dec, t, f, dy) =>
      frameEdgesRecord(frameEdges(rxOf(r), {
        index: n as number,
        boxA: a as number,
        boxB: b as number,
        decentration: dec as number,
        verticalDecentration: dy as number,
        minThickness: t as number,
        frontCurve: f as number,
      })),
  }),
  defineFormula({
    name: "trueLensPower",
    group: "thickness",
    summary:
      "True power from a lens-measure reading made with a tool calibrated for another index: F × (n − 1)/(n_tool − 1).",
    params: [
      { name: "reading", type: "quantity", unit: "D", range: [-30, 30], doc: "the reading" },
      INDEX,
    ],
    options: [
      {
        ...INDEX,
        name: "toolIndex",
        default: REFERENCE_VALUES.lensMeasureIndex.value,
        doc: "index the tool is calibrated for (default 1.53)",
      },
    ],
    returns: { type: "quantity", unit: "D", doc: "true power" },
    sources: ["lens-measure"],
    example: "trueLensPower(6 D, 1.67)",
    fn: (f, n, t) => trueLensPower(f as number, n as number, t as number),
  }),
  defineFormula({
    name: "checkTolerance",
    group: "verification",
    summary:
      "A measured lens against the ordered prescription: each quantity, the ANSI Z80.1-2015 tolerance and its clause, the deviation (measured − ordered), pass or fail and by how much.",
    params: [
      { name: "ordered", type: "rx", doc: "the ordered prescription" },
      { name: "measured", type: "rx", doc: "the lens as measured" },
    ],
    returns: { type: "toleranceReport", doc: "the checks" },
    sources: ["ansi-z80.1-2015"],
    caution: true,
    example: 'checkTolerance(rx("-2.25 / -0.75 x 170"), rx("-2.37 / -0.62 x 175"))',
    fn: (o, m) => new ToleranceReportValue(checkLens(rxOf(o), rxOf(m))),
  }),
  defineFormula({
    name: "checkPairTolerance",
    group: "verification",
    summary:
      "A measured pair against the ordered pair under ANSI Z80.1-2015: each lens, the vertical imbalance and the net horizontal prism, and for strong lenses the position of the reference points (Prentice: mm = 10·Δ/F); each line names its clause, deviation = measured − ordered.",
    params: [
      { name: "orderedRight", type: "rx", doc: "ordered right lens" },
      { name: "orderedLeft", type: "rx", doc: "ordered left lens" },
      { name: "measuredRight", type: "rx", doc: "right lens as measured" },
      { name: "measuredLeft", type: "rx", doc: "left lens as measured" },
    ],
    returns: { type: "toleranceReport", doc: "the checks" },
    sources: ["ansi-z80.1-2015"],
    caution: true,
    example:
      'checkPairTolerance(rx("-2.00 DS"), rx("-2.50 DS"), rx("-2.05 DS 0.25 BU"), rx("-2.45 DS"))',
    fn: (or, ol, mr, ml) =>
      new ToleranceReportValue(checkPair(rxOf(or), rxOf(ol), rxOf(mr), rxOf(ml))),
  }),
  defineFormula({
    name: "nearDemand",
    group: "near",
    summary: "Accommodative demand of a target at a working distance: 1 / distance.",
    params: [{
      name: "distance",
      type: "quantity",
      unit: "cm",
      range: WORKING_DISTANCE_RANGE_CM,
      doc: "working distance",
    }],
    returns: { type: "quantity", unit: "D", display: "exact", doc: "demand" },
    sources: ["common-practice"],
    example: "nearDemand(40 cm)",
    fn: (d) => nearDemand(d as number),
  }),
  defineFormula({
    name: "tentativeAdd",
    group: "near",
    summary:
      "A tentative near add from age and working distance: demand less the usable part of the expected amplitude (a reserve kept), rounded up to 0.25 D.",
    params: [
      { name: "age", type: "quantity", unit: "years", range: [0, 100], doc: "age" },
      {
        name: "distance",
        type: "quantity",
        unit: "cm",
        range: WORKING_DISTANCE_RANGE_CM,
        doc: "working distance",
      },
    ],
    options: [
      {
        name: "reserve",
        type: "number",
        range: [0, 1],
        default: 0.5,
        doc: "fraction of the amplitude kept in reserve (0.5 half, 0.33 a third)",
      },
      {
        name: "level",
        type: "text",
        default: "minimum",
        choices: ["minimum", "mean", "maximum"],
        doc: 'Hofstetter line for the amplitude: "minimum" (default), "mean" or "maximum"',
      },
    ],
    returns: { type: "any", doc: "record add, needed, demand, amplitude, usable (D)" },
    sources: ["hofstetter-1950", "accommodative-reserve", "common-practice"],
    caution: true,
    example: "tentativeAdd(55 years, 40 cm)",
    fn: (age, d, reserve, level) => {
      const t = tentativeAdd(
        age as number,
        d as number,
        reserve as number,
        level as AmplitudeLevel,
      );
      return TENTATIVE_ADD_RECORD.make({
        add: quantity(t.add, "D"),
        needed: markExact(quantity(t.exact, "D")),
        demand: markExact(quantity(t.demand, "D")),
        amplitude: markExact(quantity(t.amplitude, "D"), { unsigned: true }),
        usable: markExact(quantity(t.usable, "D"), { unsigned: true }),
      });
    },
  }),
];
