/**
 * Loads the expression library's factories the formula language uses (module by module,
 * never the library's index, which builds every one of its functions on import) and creates
 * an instance from them with the library's documented `create(factories, config)`.
 *
 * @module
 */

import { countText } from "../lib/number_text.ts";
import type { ConfigOptions, FactoryFunctionMap, MathJsInstance } from "mathjs";
import { MATHJS_FACTORIES } from "./_mathjs_files.ts";
import { MAX_RANGE_LENGTH, NOTEBOOK_CONSTANTS, NOTEBOOK_FUNCTION_NAMES } from "./functions.ts";

const folder = new URL("./", import.meta.resolve("mathjs"));

type Create = (factories: FactoryFunctionMap, config?: ConfigOptions) => MathJsInstance;

// One module after another: Deno's loader takes many concurrent dynamic imports of one
// package far more slowly than the same imports in turn.
const createModule = await import(new URL("core/create.js", folder).href);
const byFile = new Map<string, Record<string, unknown>>();
for (const [file] of MATHJS_FACTORIES) {
  if (!byFile.has(file)) byFile.set(file, await import(new URL(file, folder).href));
}

/** A factory of the library: a function of its dependencies, with its name and their names. */
interface Factory {
  (deps: Record<string, unknown>): unknown;
  isFactory: true;
  fn: string;
  dependencies: string[];
  meta?: unknown;
}

/**
 * Dependencies these factories only call (read from the library's source): they are handed
 * over as forwarders, so the quantity type does not build matrix multiplication and
 * inversion (through `pow`) before a formula needs them.
 */
const CALLED_LATER: Readonly<Record<string, readonly string[]>> = {
  createUnitClass: ["pow", "fix", "round", "equal"],
  createPow: ["identity", "multiply", "inv", "matrix"],
};

/** `f` with the dependencies `later` forwarded to the instance on first call. */
function deferring(f: Factory, later: readonly string[]): Factory {
  const kept = f.dependencies.filter((d) => !later.includes(d.replace(/^\?/, "")));
  const wrapped = ((deps: Record<string, unknown>) => {
    const math = deps.math as Record<string, (...a: unknown[]) => unknown>;
    const forwards = Object.fromEntries(
      later.map((name) => [name, (...a: unknown[]) => math[name](...a)]),
    );
    return f({ ...deps, ...forwards });
  }) as Factory;
  wrapped.isFactory = true;
  wrapped.fn = f.fn;
  wrapped.dependencies = [...kept, "math"].sort();
  if (f.meta) wrapped.meta = f.meta;
  return wrapped;
}

/** The chosen factories by export name (`createAdd`, …). */
const factories = Object.fromEntries(
  MATHJS_FACTORIES.map(([file, name]) => {
    const f = byFile.get(file)?.[name] as Factory | undefined;
    if (typeof f !== "function") {
      throw new Error(`the expression library has no ${name} in ${file} (reinstall or regenerate)`);
    }
    return [name, CALLED_LATER[name] ? deferring(f, CALLED_LATER[name]) : f];
  }),
) as unknown as FactoryFunctionMap;

/** A range too long for a notebook. */
export class RangeLengthError extends RangeError {
  /** @param count how many values the range would hold. */
  constructor(readonly count: number) {
    super(
      `a range of ${
        Number.isFinite(count) ? countText(count) : "endless"
      } values is more than a notebook takes (at most ${countText(MAX_RANGE_LENGTH)})`,
    );
    this.name = "RangeLengthError";
  }
}

/**
 * A new instance holding only the chosen functions. Formulas see only the functions and
 * constants of `cells/functions.ts` (what the chosen ones depend on stays internal), and a
 * range is refused before it is built when it would hold more than `MAX_RANGE_LENGTH` values.
 *
 * @example
 * ```ts
 * import { createMath } from "./_mathjs.ts";
 * createMath().parse("2 + 3").compile().evaluate(); // 5
 * ```
 */
export function createMath(): MathJsInstance {
  const math = (createModule.create as Create)(factories, {});
  const inExpressions = (math as unknown as { expression: { mathWithTransform: Fns } })
    .expression.mathWithTransform;
  for (const name of Object.keys(inExpressions)) {
    if (name === "config" || NOTEBOOK_FUNCTION_NAMES.has(name)) continue;
    if (NOTEBOOK_CONSTANTS.includes(name)) continue;
    delete inExpressions[name];
  }
  // The library builds its functions on first use; so does the bounded range.
  const transforms = (math as unknown as { expression: { transform: Fns } }).expression.transform;
  const range = (...args: unknown[]) => transforms.range(...args);
  const m = math as unknown as Fns;
  const bounded = (...args: unknown[]) => {
    if (typeof args[0] === "string") {
      throw new TypeError("range takes numbers: write 1:10 or range(1, 10, 1)");
    }
    const [start, end, step = 1] = args;
    const span = m.divide(m.subtract(end, start), step);
    const count = typeof span === "number" ? Math.floor(span) + 1 : NaN;
    if (!(count <= MAX_RANGE_LENGTH)) throw new RangeLengthError(count);
    return range(...args);
  };
  Object.defineProperty(inExpressions, "range", { value: bounded, enumerable: true });
  return math;
}

type Fns = Record<string, (...a: unknown[]) => unknown>;

/**
 * Offer `functions` to formulas under their names (over a library function of the same name,
 * which the library's own functions keep using).
 *
 * @example
 * ```ts
 * import { createMath, provideInFormulas } from "./_mathjs.ts";
 * const math = createMath();
 * provideInFormulas(math, { twice: (x: number) => 2 * x });
 * math.parse("twice(3)").compile().evaluate(); // 6
 * ```
 */
export function provideInFormulas(
  math: MathJsInstance,
  functions: Readonly<Record<string, unknown>>,
): void {
  const inExpressions = (math as unknown as { expression: { mathWithTransform: Fns } })
    .expression.mathWithTransform;
  for (const [name, value] of Object.entries(functions)) {
    Object.defineProperty(inExpressions, name, {
      value,
      enumerable: true,
      configurable: true,
      writable: true,
    });
  }
}

/**
 * Make `names` refuse to run in formulas, with a message naming the function. Only the
 * formulas' namespace changes: the library's own functions keep the real ones (its `config`
 * above all, which functions built later still read), and the formulas' `config` keeps the
 * settings the expression nodes read from it.
 *
 * @example
 * ```ts
 * import { createMath, refuseInFormulas } from "./_mathjs.ts";
 * const math = createMath();
 * refuseInFormulas(math, ["config"]);
 * try {
 *   math.parse("config({})").compile().evaluate();
 * } catch (e) {
 *   (e as Error).message; // "function config is not available in Lentil formulas"
 * }
 * ```
 */
export function refuseInFormulas(math: MathJsInstance, names: readonly string[]): void {
  const inExpressions = (math as unknown as { expression: { mathWithTransform: Fns } })
    .expression.mathWithTransform;
  for (const name of names) {
    const refused = () => {
      throw new Error(`function ${name} is not available in Lentil formulas`);
    };
    if (name === "config") {
      const real = math.config as unknown as Record<string, unknown>;
      for (const key of Object.keys(real)) {
        Object.defineProperty(refused, key, { get: () => real[key], enumerable: true });
      }
    }
    Object.defineProperty(inExpressions, name, {
      value: refused,
      enumerable: true,
      configurable: true,
      writable: true,
    });
  }
}
