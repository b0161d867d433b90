/**
 * Core formulas every notebook has: reference constants from `shared/constants.ts` and the
 * vertex step for a single power. Domain modules add the rest.
 *
 * @example
 * ```ts
 * import { CORE_FORMULAS } from "./core.ts";
 * CORE_FORMULAS.some((f) => f.name === "vertexPower"); // true
 * ```
 *
 * @module
 */

import { type ConstantSpec, defineConstant, defineFormula, type FormulaSpec } from "./catalogue.ts";
import { REFERENCE_VALUES } from "../shared/constants.ts";
import { effectivePower } from "../lib/vertex.ts";

/** Core formulas. */
export const CORE_FORMULAS: readonly FormulaSpec[] = [
  defineFormula({
    name: "vertexPower",
    group: "vertex",
    summary:
      "Effective power of a single power moved from one vertex distance to another (e.g. spectacle plane to the cornea).",
    params: [
      {
        name: "power",
        type: "quantity",
        unit: "D",
        doc: "power at the first position",
        hints: { rx: "a prescription moves with vertexRx(rx, from, to), meridian by meridian" },
      },
      {
        name: "from",
        type: "quantity",
        unit: "mm",
        range: [0, 25],
        doc: "vertex distance of the first position",
      },
      {
        name: "to",
        type: "quantity",
        unit: "mm",
        range: [0, 25],
        optional: true,
        default: 0,
        doc: "vertex distance of the new position (0 = at the cornea)",
      },
    ],
    returns: { type: "quantity", unit: "D", doc: "power needed at the new position" },
    sources: ["vertex-formula"],
    caution: true,
    example: "vertexPower(-10 D, 12 mm)",
    fn: (power, from, to) =>
      effectivePower(power as number, ((from as number) - (to as number)) / 1000),
  }),
];

/** Reference constants, one per entry of `shared/constants.ts`. */
export const CORE_CONSTANTS: readonly ConstantSpec[] = Object.entries(REFERENCE_VALUES).map((
  [name, v],
) => defineConstant({ name, value: v.value, unit: v.unit, source: v.source, summary: v.summary }));
