/**
 * The catalogue: how a pure `lib/` function becomes a notebook formula. A formula declares
 * its parameters (with units and accepted ranges), what it returns, its sources in the
 * registry (`shared/sources.ts`) and whether its result can feed the making or fitting of a
 * lens (then the engine shows the cautions). The formula reference in the README is
 * generated from these declarations.
 *
 * @example
 * ```ts
 * import { defineFormula } from "./catalogue.ts";
 * const half = defineFormula({
 *   name: "halfPower",
 *   group: "example",
 *   summary: "Half of a power.",
 *   params: [{ name: "power", type: "quantity", unit: "D", doc: "a power" }],
 *   returns: { type: "quantity", unit: "D", doc: "half of it" },
 *   sources: ["common-practice"],
 *   example: "halfPower(2 D)",
 *   fn: (p) => (p as number) / 2,
 * });
 * half.name; // "halfPower"
 * ```
 *
 * @module
 */

import { hasSource } from "../shared/sources.ts";
import type { MeasureKind } from "../lib/number_text.ts";

/** Built-in parameter and return types; value types registered in `types.ts` add more. */
export type BuiltinType =
  | "quantity"
  | "number"
  | "integer"
  | "text"
  | "boolean"
  | "any"
  | "list"
  | "column"
  | "table";

/** One declared parameter of a formula. */
export interface ParamSpec {
  /** Name shown in the reference and in error messages. */
  readonly name: string;
  /** A built-in type or the name of a registered value type (e.g. `"rx"`). */
  readonly type: BuiltinType | string;
  /**
   * For `quantity`: the unit the `lib` function expects. A notebook value in any
   * compatible unit is converted; a bare number is refused (the message shows the value
   * with this unit), so `1.2` can never be read as 1.2 mm by accident. Parameters of type
   * `number` or `integer` are unitless and take bare numbers.
   */
  readonly unit?: string;
  /** Inclusive accepted range, in `unit`. */
  readonly range?: readonly [number, number];
  /** May be left out; `fn` then receives `default` (or `undefined`). */
  readonly optional?: boolean;
  /** Value used when the argument is left out (already in `unit`). */
  readonly default?: unknown;
  /** For `text`: the words accepted; anything else is refused with this list. */
  readonly choices?: readonly string[];
  /**
   * What the refusal adds when the argument is of another kind, by the kind given (a value
   * type's name such as `"rx"`, which text that reads as one also matches; or `"quantity"`):
   * the formula that takes it, `{ rx: "a prescription moves with vertexRx(rx, from, to)" }`.
   */
  readonly hints?: Readonly<Record<string, string>>;
  /** One line: what the parameter is. */
  readonly doc: string;
}

/**
 * One named option of a formula: a setting given by name in an options record written as
 * the last argument, `endpoint(trials, {tolerance: 0.05, model: "peak"})`. Declared like a
 * parameter; an option is always optional and takes its `default` when left out.
 */
export type OptionSpec = Omit<ParamSpec, "optional">;

/** What a formula returns. */
export interface ReturnSpec {
  /** A built-in type or a registered value type. */
  readonly type: BuiltinType | string;
  /** For `quantity`: the unit of the number `fn` returns. */
  readonly unit?: string;
  /**
   * For a quantity in D: `"exact"` when the result is a measure rather than a lens power
   * (a vergence, a mean, a spread), shown to two decimals instead of in the power step.
   * Arithmetic on the result gives an ordinary power again. For a plain number, the kind of
   * measure it is (`"logMAR"`, `"letters"`, `"decimal"`…): a cell that is one call of the
   * formula shows it by that kind's rule (`MEASURE_RULES`).
   */
  readonly display?: "exact" | MeasureKind;
  /** One line: what the result is. */
  readonly doc: string;
}

/** The declaration of one formula. */
export interface FormulaSpec {
  /** Name in the formula language (camelCase, our own). */
  readonly name: string;
  /** Catalogue section, e.g. "prescription", "acuity". */
  readonly group: string;
  /** One sentence for the reference. */
  readonly summary: string;
  /** Declared parameters, in call order. */
  readonly params: readonly ParamSpec[];
  /** The last parameter may repeat. */
  readonly variadic?: boolean;
  /**
   * Settings given by name in a record after the arguments (`{step: 0.125 D}`). A
   * misspelt name is refused with the list of valid ones.
   */
  readonly options?: readonly OptionSpec[];
  /** Declared result. */
  readonly returns: ReturnSpec;
  /** Ids in the sources registry: every source the formula may cite (the reference lists all). */
  readonly sources: readonly string[];
  /**
   * The sources one call actually used, from the value it gave (an acuity read as CF cites
   * the CF substitution's source; one read as 6/9 only the notation sources); each must be
   * one of `sources`. A cell cites what its calls narrowed to; a computed column, evaluated
   * per row, cites the whole list. When omitted (or it gives `undefined`), a call cites all
   * of `sources`. `sourcesOfValue` (`cells/types.ts`) narrows by the result's value type.
   */
  readonly cites?: (result: unknown) => readonly string[] | undefined;
  /** True when the result could be used to make or fit a lens. */
  readonly caution?: boolean;
  /** A notebook expression that calls the formula; the docs test runs it. */
  readonly example: string;
  /**
   * The implementation: receives the converted arguments in `params` order, then each
   * option in `options` order (its `default` when not given), and returns the declared result.
   */
  readonly fn: (...args: unknown[]) => unknown;
}

/** A named reference constant exposed to notebooks. */
export interface ConstantSpec {
  /** Name in the formula language. */
  readonly name: string;
  /** The number, in `unit`. */
  readonly value: number;
  /** Unit ("" for a pure number). */
  readonly unit: string;
  /** Id in the sources registry. */
  readonly source: string;
  /** One line: what it is. */
  readonly summary: string;
}

/** A catalogue declaration that does not hold together (unknown source id, bad name, …). */
export class CatalogueError extends Error {
  /** @param message what is wrong with the declaration. */
  constructor(message: string) {
    super(message);
    this.name = "CatalogueError";
  }
}

const NAME = /^[a-z][A-Za-z0-9]*$/;

function checkSources(owner: string, ids: readonly string[]): void {
  for (const id of ids) {
    if (!hasSource(id)) {
      throw new CatalogueError(`${owner} cites unknown source "${id}" (shared/sources.ts)`);
    }
  }
}

/**
 * Declare a formula. Checks the name and that every source id is registered; returns the
 * declaration unchanged so modules can export it.
 *
 * @example
 * ```ts
 * import { defineFormula } from "./catalogue.ts";
 * defineFormula({
 *   name: "twice", group: "example", summary: "Double a number.",
 *   params: [{ name: "x", type: "number", doc: "a number" }],
 *   returns: { type: "number", doc: "2x" }, sources: ["common-practice"],
 *   example: "twice(2)", fn: (x) => 2 * (x as number),
 * }).params.length; // 1
 * ```
 * @throws {CatalogueError} on a malformed declaration.
 */
export function defineFormula(spec: FormulaSpec): FormulaSpec {
  if (!NAME.test(spec.name)) {
    throw new CatalogueError(`formula name "${spec.name}" must be camelCase letters and digits`);
  }
  if (spec.sources.length === 0) {
    throw new CatalogueError(`formula ${spec.name} must cite at least one source`);
  }
  checkSources(`formula ${spec.name}`, spec.sources);
  for (const p of [...spec.params, ...(spec.options ?? [])]) {
    if (p.type === "quantity" && !p.unit) {
      throw new CatalogueError(`formula ${spec.name}: quantity parameter ${p.name} needs a unit`);
    }
    if (p.choices && p.type !== "text") {
      throw new CatalogueError(`formula ${spec.name}: ${p.name} has choices but is not text`);
    }
  }
  if (spec.options?.length) {
    if (spec.variadic) {
      throw new CatalogueError(`formula ${spec.name}: a repeating formula cannot take options`);
    }
    const names = new Set<string>();
    for (const o of spec.options) {
      if (!NAME.test(o.name)) {
        throw new CatalogueError(`formula ${spec.name}: option "${o.name}" must be camelCase`);
      }
      if (names.has(o.name) || spec.params.some((p) => p.name === o.name)) {
        throw new CatalogueError(`formula ${spec.name}: option ${o.name} is declared twice`);
      }
      names.add(o.name);
    }
  }
  return spec;
}

/**
 * Declare a reference constant.
 *
 * @example
 * ```ts
 * import { defineConstant } from "./catalogue.ts";
 * defineConstant({ name: "eyePower", value: 60, unit: "D", source: "emsley-reduced-eye", summary: "reduced eye" }).unit; // "D"
 * ```
 * @throws {CatalogueError} on an unknown source id or a bad name.
 */
export function defineConstant(spec: ConstantSpec): ConstantSpec {
  if (!NAME.test(spec.name)) {
    throw new CatalogueError(`constant name "${spec.name}" must be camelCase letters and digits`);
  }
  checkSources(`constant ${spec.name}`, [spec.source]);
  return spec;
}

/** A whole catalogue: formulas and constants by name. */
export interface Catalogue {
  /** Formulas by name. */
  readonly formulas: ReadonlyMap<string, FormulaSpec>;
  /** Constants by name. */
  readonly constants: ReadonlyMap<string, ConstantSpec>;
}

/**
 * Assemble a catalogue from modules' declarations, refusing duplicate names.
 *
 * @example
 * ```ts
 * import { buildCatalogue } from "./catalogue.ts";
 * buildCatalogue([], []).formulas.size; // 0
 * ```
 * @throws {CatalogueError} when two declarations share a name.
 */
export function buildCatalogue(
  formulas: readonly FormulaSpec[],
  constants: readonly ConstantSpec[],
): Catalogue {
  const f = new Map<string, FormulaSpec>();
  const c = new Map<string, ConstantSpec>();
  for (const spec of formulas) {
    if (f.has(spec.name)) throw new CatalogueError(`formula ${spec.name} is declared twice`);
    f.set(spec.name, spec);
  }
  for (const spec of constants) {
    if (c.has(spec.name) || f.has(spec.name)) {
      throw new CatalogueError(`constant ${spec.name} clashes with another declaration`);
    }
    c.set(spec.name, spec);
  }
  return { formulas: f, constants: c };
}
