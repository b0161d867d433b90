/**
 * The whole catalogue of notebook formulas and constants. Each domain module exports its
 * declarations; add a module's arrays here to expose it.
 *
 * @example
 * ```ts
 * import { CATALOGUE } from "./mod.ts";
 * CATALOGUE.formulas.has("vertexPower"); // true
 * ```
 *
 * @module
 */

import { buildCatalogue, type Catalogue } from "./catalogue.ts";

export type {
  BuiltinType,
  Catalogue,
  ConstantSpec,
  FormulaSpec,
  OptionSpec,
  ParamSpec,
  ReturnSpec,
} from "./catalogue.ts";
import { CORE_CONSTANTS, CORE_FORMULAS } from "./core.ts";
import { RX_FORMULAS } from "./rx.ts";
import { PRISM_FORMULAS } from "./prism.ts";
import { LENS_FORMULAS } from "./lens.ts";
import { ACUITY_FORMULAS } from "./acuity.ts";
import { BLUR_FORMULAS } from "./blur.ts";
import { ENDPOINT_FORMULAS } from "./endpoint.ts";
import { STATS_FORMULAS } from "./stats.ts";
import { STUDY_FORMULAS } from "./study.ts";
import { RELIABILITY_FORMULAS } from "./reliability.ts";
import { STUDY_TABLE_FORMULAS } from "./study_table.ts";
import { PAIRING_FORMULAS } from "./pairing.ts";

/** Every formula and constant, checked for duplicate names. */
export const CATALOGUE: Catalogue = buildCatalogue(
  [
    ...CORE_FORMULAS,
    ...RX_FORMULAS,
    ...PRISM_FORMULAS,
    ...LENS_FORMULAS,
    ...ACUITY_FORMULAS,
    ...BLUR_FORMULAS,
    ...ENDPOINT_FORMULAS,
    ...PAIRING_FORMULAS,
    ...STATS_FORMULAS,
    ...STUDY_FORMULAS,
    ...RELIABILITY_FORMULAS,
    ...STUDY_TABLE_FORMULAS,
  ],
  [
    ...CORE_CONSTANTS,
  ],
);
