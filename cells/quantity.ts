/**
 * Quantities of the formula language: the one mathjs instance that knows Lentil's units
 * (diopter `D` = 1/m, prism dioptre `prism`), and small helpers to make, read and convert
 * quantities. Cell modules that build results with units import this module, never the
 * language itself, so any module can be loaded first.
 *
 * @example
 * ```ts
 * import { quantity, toNumberIn } from "./quantity.ts";
 * toNumberIn(quantity(250, "mm"), "m"); // 0.25
 * ```
 *
 * @module
 */

import type { MathJsInstance, Unit } from "mathjs";
import { createMath } from "./_mathjs.ts";
import { Column } from "./table.ts";

/**
 * The units Lentil documents. Cell names may not take these (they would shadow `12 mm`);
 * mathjs's other units stay usable but a cell of the same name takes precedence.
 */
export const LENTIL_UNITS: readonly string[] = [
  "D",
  "dpt",
  "prism",
  "pdpt",
  "mm",
  "cm",
  "m",
  "um",
  "nm",
  "deg",
  "arcmin",
  "arcsec",
  "rad",
  "years",
  "year",
];

/**
 * Every unit a formula may name: Lentil's own, their spellings, and a few lengths and times
 * a test distance or an age may come in. mathjs knows hundreds more (`bar`, `cd`, `lb`…);
 * a formula naming one of those is refused, so a typo cannot turn into a pressure.
 */
export const USABLE_UNITS: ReadonlySet<string> = new Set([
  ...LENTIL_UNITS,
  "dioptre",
  "diopter",
  "km",
  "ft",
  "foot",
  "feet",
  "inch",
  "degree",
  "degrees",
  "radian",
  "radians",
  "arcminute",
  "arcsecond",
  "s",
  "month",
  "months",
  "day",
  "days",
]);

/** Units whose values are shown in that unit rather than mathjs's choice. */
const PREFERRED_UNITS = [
  "D",
  "prism",
  "mm",
  "deg",
  "arcmin",
  "um",
  "nm",
  "years",
  "m",
  "cm",
  "km",
  "ft",
  "inch",
  "arcsec",
  "rad",
];

/** The parts of mathjs's typed-function that its type declarations leave out. */
interface TypedRegistry {
  addTypes(types: { name: string; test: (x: unknown) => boolean }[]): void;
  addConversions(
    conversions: { from: string; to: string; convert: (x: never) => unknown }[],
  ): void;
}

/** mathjs's typed-function registry of an instance. */
export function typedOf(math: MathJsInstance): TypedRegistry {
  return math.typed as unknown as TypedRegistry;
}

let shared: MathJsInstance | undefined;

/**
 * The shared mathjs instance with Lentil's units and the `Column` type registered. It holds
 * only the functions of `cells/functions.ts` and what they need.
 *
 * @example
 * ```ts
 * import { formulaMath } from "./quantity.ts";
 * formulaMath().parse("1 / (0.5 m)").compile().evaluate({}).toNumber("D"); // 2
 * ```
 */
export function formulaMath(): MathJsInstance {
  if (shared) return shared;
  const math = createMath();
  math.createUnit("D", { definition: "1 m^-1", aliases: ["dpt", "dioptre", "diopter"] });
  math.createUnit("prism", { aliases: ["pdpt"] });
  typedOf(math).addTypes([{ name: "Column", test: (x: unknown) => x instanceof Column }]);
  shared = math;
  typedOf(math).addConversions([{ from: "Column", to: "Array", convert: columnToArray }]);
  return math;
}

/**
 * A column's values as a plain array: quantities for a quantity column, numbers or
 * values otherwise. mathjs's own functions (`mean`, `max`, …) see columns this way.
 *
 * @example
 * ```ts
 * import { columnToArray } from "./quantity.ts";
 * import { Column } from "./table.ts";
 * columnToArray(new Column("x", "number", "", new Float64Array([1, 2]))); // [1, 2]
 * ```
 */
export function columnToArray(c: Column): unknown[] {
  if (c.data instanceof Float64Array) {
    if (c.type === "quantity" && c.unit) return Array.from(c.data, (v) => quantity(v, c.unit));
    return Array.from(c.data);
  }
  return c.data;
}

/**
 * A quantity: `value` in `unit`.
 *
 * @example
 * ```ts
 * import { quantity } from "./quantity.ts";
 * quantity(-2.5, "D").toString(); // "-2.5 D"
 * ```
 */
export function quantity(value: number, unit: string): Unit {
  const shape = SHAPES.get(unit) ?? shapeOf(unit);
  // The same object the library's `unit(value, text)` builds (a test holds them equal),
  // without reading the unit text again: tables make one quantity a value.
  const q = Object.create(shape.prototype) as UnitFields;
  q.fixPrefix = shape.fixPrefix;
  q.skipAutomaticSimplification = shape.skipAutomaticSimplification;
  q.units = shape.units.map((u) => ({ unit: u.unit, prefix: u.prefix, power: u.power }));
  q.dimensions = shape.dimensions.slice(0);
  let v = value + 0;
  for (const f of shape.factors) v = v * f;
  q.value = v;
  return q as unknown as Unit;
}

/** The fields of a library quantity that {@linkcode quantity} fills in. */
interface UnitFields {
  fixPrefix: boolean;
  skipAutomaticSimplification: boolean;
  units: { unit: { value: number; offset: number }; prefix: { value: number }; power: number }[];
  dimensions: number[];
  value: number;
}

/** A unit read from text once: its parts and the factors to its base units, in order. */
interface UnitShape extends Omit<UnitFields, "value"> {
  readonly prototype: object;
  readonly factors: readonly number[];
  readonly offsetFree: boolean;
}

const SHAPES = new Map<string, UnitShape>();

function shapeOf(unit: string): UnitShape {
  const u = formulaMath().unit(unit) as unknown as UnitFields;
  const shape: UnitShape = {
    prototype: Object.getPrototypeOf(u),
    fixPrefix: u.fixPrefix,
    skipAutomaticSimplification: u.skipAutomaticSimplification,
    units: u.units,
    dimensions: u.dimensions,
    // As the library normalises a number: times (unit × prefix) to the power, unit by unit.
    factors: u.units.map((p) => Math.pow(p.unit.value * p.prefix.value, p.power)),
    offsetFree: u.units.every((p) => p.unit.offset === 0),
  };
  SHAPES.set(unit, shape);
  return shape;
}

/**
 * `x.toNumber(unit)` for a quantity of the same kind, as the library computes it (divided by
 * (unit × prefix) to the power, unit by unit), without reading the unit text again; units
 * with an offset (none of Lentil's) go through the library.
 */
function numberIn(x: Unit, unit: string): number {
  const shape = SHAPES.get(unit) ?? shapeOf(unit);
  const own = (x as unknown as UnitFields).units;
  const v0 = (x as unknown as UnitFields).value;
  if (
    typeof v0 !== "number" || !shape.offsetFree || !own.every((u) => u.unit.offset === 0)
  ) {
    return x.toNumber(unit);
  }
  let v = v0;
  for (const f of shape.factors) v = v / f;
  return v;
}

/** One of each unit, to compare kinds of quantity with. */
const ONES = new Map<string, Unit>();

function one(unit: string): Unit {
  let u = ONES.get(unit);
  if (!u) ONES.set(unit, u = quantity(1, unit));
  return u;
}

const EXACT = Symbol("lentil.exact");
const UNSIGNED = Symbol("lentil.unsigned");
const ROUNDED = Symbol("lentil.rounded");

/**
 * Mark a quantity as rounded on request, with the step and rule in words, so its display
 * says so (`-2.50 D (rounded: 0.25 D step, nearest)`); returns it. Arithmetic on it gives
 * an unmarked quantity.
 *
 * @example
 * ```ts
 * import { markRounded, quantity, roundingNote } from "./quantity.ts";
 * roundingNote(markRounded(quantity(-2.5, "D"), "0.25 D step, nearest")); // "0.25 D step, nearest"
 * ```
 */
export function markRounded<T>(x: T, note: string): T {
  if (x !== null && typeof x === "object") {
    Object.defineProperty(x, ROUNDED, { value: note, enumerable: false });
  }
  return x;
}

/**
 * The rounding a quantity was marked with by {@linkcode markRounded}, if any.
 *
 * @example
 * ```ts
 * import { quantity, roundingNote } from "./quantity.ts";
 * roundingNote(quantity(1, "D")); // undefined
 * ```
 */
export function roundingNote(x: unknown): string | undefined {
  if (x === null || typeof x !== "object") return undefined;
  const note = (x as Record<symbol, unknown>)[ROUNDED];
  return typeof note === "string" ? note : undefined;
}

/**
 * Mark a quantity as a measure to be shown exactly (not in the power step); with
 * `unsigned`, as a size that never takes a sign (a standard deviation); returns it.
 *
 * @example
 * ```ts
 * import { isExact, markExact, quantity } from "./quantity.ts";
 * isExact(markExact(quantity(-0.17, "D"))); // true
 * ```
 */
export function markExact<T>(x: T, options: { unsigned?: boolean } = {}): T {
  if (x !== null && typeof x === "object") {
    Object.defineProperty(x, EXACT, { value: true, enumerable: false });
    if (options.unsigned) Object.defineProperty(x, UNSIGNED, { value: true, enumerable: false });
  }
  return x;
}

/**
 * Whether a quantity was marked as a size that takes no sign.
 *
 * @example
 * ```ts
 * import { isUnsigned, markExact, quantity } from "./quantity.ts";
 * isUnsigned(markExact(quantity(0.43, "D"), { unsigned: true })); // true
 * ```
 */
export function isUnsigned(x: unknown): boolean {
  return x !== null && typeof x === "object" && (x as Record<symbol, unknown>)[UNSIGNED] === true;
}

/**
 * Whether a quantity was marked by {@linkcode markExact}.
 *
 * @example
 * ```ts
 * import { isExact, quantity } from "./quantity.ts";
 * isExact(quantity(1, "D")); // false
 * ```
 */
export function isExact(x: unknown): boolean {
  return x !== null && typeof x === "object" && (x as Record<symbol, unknown>)[EXACT] === true;
}

/**
 * Whether `x` is a quantity (a mathjs Unit).
 *
 * @example
 * ```ts
 * import { isQuantity, quantity } from "./quantity.ts";
 * isQuantity(quantity(1, "mm")); // true
 * ```
 */
export function isQuantity(x: unknown): x is Unit {
  return formulaMath().isUnit(x);
}

/**
 * Read `x` as a number in `unit`. Bare numbers are taken as already in it; with `unit` ""
 * a quantity whose units cancel (cm × D) counts as a pure number.
 *
 * @example
 * ```ts
 * import { quantity, toNumberIn } from "./quantity.ts";
 * toNumberIn(quantity(2, "cm"), "mm"); // 20
 * toNumberIn(3, "D"); // 3
 * ```
 * @throws {TypeError} when the units are not compatible.
 */
export function toNumberIn(x: unknown, unit: string): number {
  if (typeof x === "number") return x;
  if (isQuantity(x)) {
    if (!unit) {
      const si = x.toSI();
      if (si.dimensions.every((d: number) => d === 0)) return si.toNumber();
      throw new TypeError(`expected a pure number, got ${x.toString()}`);
    }
    if (!x.equalBase(one(unit))) {
      throw new TypeError(`expected a quantity in ${unit}, got ${x.toString()}`);
    }
    return numberIn(x, unit);
  }
  if (typeof x === "boolean") throw new TypeError(`expected a number, got ${x}`);
  throw new TypeError(`expected a number${unit ? ` in ${unit}` : ""}, got ${typeof x}`);
}

/**
 * The number and display unit of a quantity (Lentil's own units preferred), or undefined
 * when `x` is not a quantity.
 *
 * @example
 * ```ts
 * import { quantity, quantityParts } from "./quantity.ts";
 * quantityParts(quantity(250, "mm")); // { value: 250, unit: "mm" }
 * ```
 */
export function quantityParts(x: unknown): { value: number; unit: string } | undefined {
  if (!isQuantity(x)) return undefined;
  for (const u of PREFERRED_UNITS) {
    if (x.equalBase(one(u))) {
      const own = x.formatUnits();
      const unit = PREFERRED_UNITS.includes(own) ? own : u;
      return { value: x.toNumber(unit), unit };
    }
  }
  const own = x.formatUnits();
  if (own === "") return { value: x.toSI().toNumber(), unit: "" };
  return { value: x.toNumber(), unit: own };
}
