/**
 * The endpoint cell: the subjective endpoint from a table of trial lenses and acuities,
 * returned as a value whose display summarises endpoint, plateau, warnings and fit, and
 * whose JSON holds every detail, including the fitted curve for plotting.
 *
 * @example
 * ```ts
 * import { ENDPOINT_FORMULAS } from "./endpoint.ts";
 * ENDPOINT_FORMULAS[0].name; // "endpoint"
 * ```
 *
 * @module
 */

import { defineFormula, type FormulaSpec } from "./catalogue.ts";
import { Column, makeTable, type TableValue } from "./table.ts";
import { defineValueType, type ValuePart } from "./types.ts";
import { markExact, quantity } from "./quantity.ts";
import { findColumn, rowCount } from "./_acuity_values.ts";
import { fixed, formatMeasure, formatPower } from "./display.ts";
import { type EndpointResult, findEndpoint, trialLogMAR, type TrialRow } from "../lib/endpoint.ts";
import type { ChartLine } from "../lib/acuity_scoring.ts";
import { LentilInputError } from "../lib/errors.ts";
import type { FocusModel } from "../lib/through_focus.ts";

/** An endpoint result as a value of the formula language. */
export class EndpointValue {
  /** @param result the endpoint and its details. */
  constructor(readonly result: EndpointResult) {}
}

const logMAR = (v: number) => formatMeasure(v, "logMAR");
const dioptres = (v: number) => `${fixed(v, 2)} D`;

function plateauText(r: EndpointResult): string {
  return `${formatPower(r.plateau.to)} to ${formatPower(r.plateau.from)} (${
    dioptres(r.plateau.width)
  } wide${r.plateau.openMinus && r.trials.length > 1 ? ", open on the minus side" : ""})`;
}

function displayEndpoint({ result: r }: EndpointValue): string {
  const parts = [
    `endpoint ${formatPower(r.endpoint)} (${logMAR(r.endpointLogMAR)}; best ${
      logMAR(r.bestLogMAR)
    }, tolerance ${logMAR(r.tolerance)})`,
    `plateau ${plateauText(r)}`,
  ];
  if (r.fit) {
    const f = r.fit;
    parts.push(
      `fit ${f.model}: best focus ${formatPower(f.bestFocus)}, depth of focus ${
        dioptres(f.depthOfFocus.width)
      }${f.depthOpen ? " or more" : ""}, rms ${fixed(f.rms, 3)} logMAR`,
    );
  }
  for (const w of r.warnings) parts.push(`warning: ${w.message}`);
  return parts.join("; ");
}

/** The endpoint's parts: keys as a later cell reads them, labels in words. */
function endpointParts({ result: r }: EndpointValue): ValuePart[] {
  const parts: ValuePart[] = [
    {
      key: "endpoint",
      label: "endpoint (most plus lens with the best acuity)",
      value: quantity(r.endpoint, "D"),
      display: formatPower(r.endpoint),
    },
    {
      key: "endpointLogMAR",
      label: "acuity at the endpoint",
      value: r.endpointLogMAR,
      display: logMAR(r.endpointLogMAR),
    },
    { key: "bestLogMAR", label: "best acuity", value: r.bestLogMAR, display: logMAR(r.bestLogMAR) },
    {
      key: "tolerance",
      label: "acuity counted as the best within",
      value: r.tolerance,
      display: logMAR(r.tolerance),
    },
    {
      key: "plateauFrom",
      label: "best acuity from (most minus lens)",
      value: quantity(r.plateau.from, "D"),
      display: formatPower(r.plateau.from),
    },
    {
      key: "plateauTo",
      label: "best acuity to (most plus lens)",
      value: quantity(r.plateau.to, "D"),
      display: formatPower(r.plateau.to),
    },
    {
      key: "plateauWidth",
      label: "width of the best-acuity range",
      value: markExact(quantity(r.plateau.width, "D"), { unsigned: true }),
      display: `${dioptres(r.plateau.width)}${
        r.plateau.openMinus && r.trials.length > 1 ? ", open on the minus side" : ""
      }`,
    },
  ];
  if (r.fit) {
    const f = r.fit;
    parts.push(
      {
        key: "bestFocus",
        label: `best focus (fitted ${f.model} curve)`,
        value: markExact(quantity(f.bestFocus, "D")),
        display: formatPower(f.bestFocus),
      },
      {
        key: "depthOfFocus",
        label: "depth of focus",
        value: markExact(quantity(f.depthOfFocus.width, "D"), { unsigned: true }),
        display: `${dioptres(f.depthOfFocus.width)}${f.depthOpen ? " or more" : ""}`,
      },
      {
        key: "rms",
        label: "fit residual (root mean square)",
        value: f.rms,
        display: `${fixed(f.rms, 3)} logMAR`,
      },
    );
  }
  r.warnings.forEach((w, i) =>
    parts.push({ key: `warning${i + 1}`, label: "warning", value: w.message })
  );
  r.notes.forEach((n, i) => parts.push({ key: `note${i + 1}`, label: "note", value: n }));
  return parts;
}

defineValueType<EndpointValue>({
  name: "endpoint",
  summary: "a subjective endpoint found from a trial table",
  is: (x): x is EndpointValue => x instanceof EndpointValue,
  display: displayEndpoint,
  headline: ({ result: r }) =>
    `${formatPower(r.endpoint)} (${logMAR(r.endpointLogMAR)})${
      r.warnings.length ? `, ${r.warnings.length} warning${r.warnings.length === 1 ? "" : "s"}` : ""
    }`,
  parts: endpointParts,
  json: ({ result }) => ({ ...result, caution: true }),
});

const POWER_NAMES = ["lens", "power", "trial", "sphere"];
const ACUITY_NAMES = ["va", "acuity", "logMAR", "letters", "reading"];

function trialRows(
  table: TableValue,
  powerColumn: string | undefined,
  acuityColumn: string | undefined,
  chart: readonly ChartLine[] | undefined,
): TrialRow[] {
  const power = findColumn(
    table,
    "lens power",
    powerColumn,
    POWER_NAMES,
    (c) => c.numeric && c.unit === "D",
  );
  const va = findColumn(
    table,
    "acuity",
    acuityColumn,
    ACUITY_NAMES,
    (c: Column) => c !== power,
  );
  if (!power.numeric) {
    throw new LentilInputError(`column ${power.name} must hold lens powers in D`);
  }
  if (power.unit && power.unit !== "D") {
    throw new LentilInputError(`column ${power.name} is in ${power.unit}, expected D`);
  }
  const n = rowCount(table);
  return Array.from({ length: n }, (_, i) => {
    const p = power.data[i] as number;
    if (!Number.isFinite(p)) {
      throw new LentilInputError(`row ${i + 1}: the lens power is missing`);
    }
    const cell = va.data[i];
    if (typeof cell === "number" && Number.isNaN(cell)) {
      throw new LentilInputError(`row ${i + 1}: the acuity is missing`);
    }
    return { power: p, logMAR: trialLogMAR(cell as number, i + 1, chart) };
  });
}

function chartLines(table: TableValue | undefined): ChartLine[] | undefined {
  if (!table) return undefined;
  const size = findColumn(table, "line size", undefined, ["size", "logMAR", "line"]);
  const letters = findColumn(table, "letters per line", undefined, ["letters", "count"]);
  return Array.from({ length: rowCount(table) }, (_, i) => ({
    logMAR: trialLogMAR(size.data[i] as number, i + 1),
    letters: Number(letters.data[i]),
  }));
}

/** The endpoint formulas. */
export const ENDPOINT_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "endpoint",
    group: "endpoint",
    summary:
      "The most plus lens giving the best acuity (within a tolerance, default one letter) from a table of trial lenses and acuities (logMAR, acuity text, or letters read per line), with the minus plateau, warnings and a through-focus fit.",
    params: [
      { name: "trials", type: "table", doc: "one row per trial lens, any order" },
      {
        name: "powerColumn",
        type: "text",
        optional: true,
        doc: "lens power column (default lens, or the first column in D)",
      },
      {
        name: "acuityColumn",
        type: "text",
        optional: true,
        doc: "acuity column: logMAR numbers, acuity text, or letters read per line (default va)",
      },
    ],
    options: [
      {
        name: "tolerance",
        type: "number",
        range: [0, 0.5],
        default: 0.02,
        doc: "logMAR within which a reading counts as best (default 0.02, one letter)",
      },
      {
        name: "repeats",
        type: "text",
        default: "report",
        choices: ["report", "mean"],
        doc: 'a power repeated with different readings: "report" (an error) or "mean"',
      },
      {
        name: "model",
        type: "text",
        default: "auto",
        choices: ["auto", "peak", "hinge"],
        doc: 'through-focus model: "auto", "peak" or "hinge"',
      },
      {
        name: "age",
        type: "quantity",
        unit: "years",
        range: [0, 100],
        doc: "age, to check the plateau against the accommodation expected",
      },
      {
        name: "chart",
        type: "table",
        doc:
          "chart lines (size, letters) for letters-per-line readings (default 1.0 to −0.3, 5 letters)",
      },
    ],
    returns: { type: "endpoint", doc: "endpoint, plateau, warnings and fit" },
    sources: ["most-plus-endpoint", "through-focus-fit", "bailey-lovie-1976"],
    caution: true,
    example: "endpoint(throughFocus(-1 D, 4 mm, {amplitude: 1 D}))",
    fn: (t, pc, ac, tol, repeats, model, age, chart) => {
      const table = t as TableValue;
      const rows = trialRows(
        table,
        pc as string | undefined,
        ac as string | undefined,
        chartLines(chart as TableValue | undefined),
      );
      return new EndpointValue(
        findEndpoint(rows, {
          tolerance: tol as number,
          duplicates: repeats as "report" | "mean",
          model: model as FocusModel | "auto",
          age: age as number | undefined,
        }),
      );
    },
  }),
  defineFormula({
    name: "endpointCurve",
    group: "endpoint",
    summary: "The fitted through-focus curve of an endpoint as a table (lens, va), for plotting.",
    params: [{ name: "result", type: "endpoint", doc: "an endpoint" }],
    returns: { type: "table", doc: "lens (D) and fitted va (logMAR)" },
    sources: ["through-focus-fit"],
    example: "endpointCurve(endpoint(throughFocus(-1 D, 4 mm)))",
    fn: (e) => {
      const fit = (e as EndpointValue).result.fit;
      if (!fit) {
        throw new LentilInputError("the endpoint has no through-focus fit (too few powers)");
      }
      return makeTable("endpointCurve", [
        new Column("lens", "quantity", "D", Float64Array.from(fit.curve, (p) => p.power), {
          label: "trial lens",
        }),
        new Column("va", "number", "logMAR", Float64Array.from(fit.curve, (p) => p.logMAR), {
          label: "fitted acuity",
        }),
      ]);
    },
  }),
];
