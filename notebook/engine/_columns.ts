/**
 * Computed columns: a column formula is compiled once into a JavaScript loop over the
 * table's column arrays, or, when the compiler cannot vouch for the result, evaluated row by
 * row through the formula language. Both paths give the same column.
 *
 * The compiler accepts a safe subset of the language: numbers, columns and scalar cells,
 * `+ - * / ^` and unary minus, comparisons and `c ? a : b` (both branches of one unit),
 * parentheses, quantity literals (`0.25 D`), a whitelist of
 * functions (sin cos tan atan2 sqrt abs exp log log10 min max pow round floor ceil, plus
 * catalogue formulas whose parameters and result are all numbers or quantities) and the
 * constants pi, e and tau. Units are tracked statically: a quantity is held as the language
 * holds it, in SI base units, with the unit it would be shown in; any combination the
 * compiler is not sure of (a unit times a unit, a unit inside `exp`, a value of another
 * type) sends the whole formula to the row-wise path. Functions whose number semantics the
 * language defines in its own way (rounding, powers of negative numbers, min and max) are
 * called through the language itself, one element at a time, so they agree exactly.
 *
 * Columns of text and typed records (an acuity as text, `[prism]`, `[rx]`) are compiled too:
 * their values reach catalogue formulas as they are, through the language's own argument
 * checks (`bindFormula`), units are checked once for the column, quantities are built only
 * where a formula of records takes a quantity column, and a formula's number result in its
 * declared unit stays a number. Any refusal at any row hands the whole column to the
 * row-wise path, so results and errors (at their rows) are the language's own.
 *
 * The loop is generated as JavaScript source built only from fixed templates: every leaf
 * is an index into an array of inputs (columns, constants, functions, values), never text
 * from the notebook, so no user string reaches `new Function`.
 *
 * @module
 */

import type { MathNode } from "mathjs";
import type { Language } from "../../cells/language.ts";
import type { FormulaSpec } from "../../cells/catalogue.ts";
import { Column } from "../../cells/table.ts";
import { typeOfValue } from "../../cells/types.ts";
import { bindFormula } from "../../cells/_arguments.ts";
import { RowScope } from "./_scope.ts";

/** What the compiler needs to know of an input column. */
export interface ColumnShape {
  /** Column name (visible by bare name in the formula). */
  readonly name: string;
  /** "quantity", "number", "text" or a value type. */
  readonly type: string;
  /** Unit of a quantity column. */
  readonly unit: string;
  /** True when the data is a Float64Array. */
  readonly numeric: boolean;
}

/** Something that evaluates a parsed formula in a scope (the language's compiled form). */
export interface RowEvaluator {
  /** Evaluate in a scope. */
  evaluate(scope: unknown): unknown;
}

/** A compiled or row-wise plan for one computed column. */
export interface ColumnPlan {
  /** True when the formula compiled to a loop over arrays. */
  readonly compiled: boolean;
  /** Why it did not compile, when it did not. */
  readonly reason?: string;
  /**
   * Compute the column over `columns` (in the same order and shape as planned) of `rows`
   * rows. Falls back to row-wise evaluation when the compiled loop meets a value it cannot
   * take (a range check, a result of another type), so errors read as the language's own.
   */
  run(columns: readonly Column[], rows: number): { column: Column; path: "compiled" | "row-wise" };
}

/** The parts of a mathjs Unit the compiler reads. */
interface UnitParts {
  readonly value: number | null;
  readonly units: readonly {
    readonly unit: { readonly name: string; readonly offset: number; dimensions: number[] };
    readonly prefix: { readonly name: string; readonly value: number };
    readonly power: number;
  }[];
  formatUnits(): string;
}

/**
 * A static type: a plain number, a quantity (held in SI) with its unit, a bare unit name, or
 * a value the language holds as it is (text, true/false, a typed record such as an acuity or
 * a prism) with its type's name.
 */
type Ty =
  | { readonly kind: "num" }
  | { readonly kind: "qty"; readonly unit: string; readonly base: string }
  | { readonly kind: "unit"; readonly unit: string; readonly base: string; readonly scale: number }
  | { readonly kind: "val"; readonly type: string };

interface Gen {
  readonly code: string;
  readonly ty: Ty;
  /** For a quantity column read as it is: the raw value's code and its unit. */
  readonly raw?: { readonly code: string; readonly unit: string };
}

class Unsupported extends Error {}

const NUM: Ty = { kind: "num" };

/** Built-in constants the language resolves from its own namespace. */
const BUILTIN_CONSTANTS: Readonly<Record<string, number>> = {
  pi: Math.PI,
  e: Math.E,
  tau: 2 * Math.PI,
};

/** Functions whose number semantics are those of `Math` (argument kinds in `args`). */
const MATH_FUNCTIONS: Readonly<Record<string, { js: string; arity: number; angle?: boolean }>> = {
  sin: { js: "Math.sin", arity: 1, angle: true },
  cos: { js: "Math.cos", arity: 1, angle: true },
  tan: { js: "Math.tan", arity: 1, angle: true },
  atan2: { js: "Math.atan2", arity: 2 },
  exp: { js: "Math.exp", arity: 1 },
};

/** Functions called through the language for numbers, element by element. */
const LANGUAGE_FUNCTIONS: Readonly<Record<string, readonly [number, number]>> = {
  sqrt: [1, 1],
  log: [1, 1],
  log10: [1, 1],
  pow: [2, 2],
  round: [1, 1],
  floor: [1, 1],
  ceil: [1, 1],
  min: [1, 16],
  max: [1, 16],
};

const ANGLE_PROBE = "rad";

/** The comparison operators, as the language names their functions. */
const COMPARISONS: ReadonlySet<string> = new Set([
  "larger",
  "smaller",
  "largerEq",
  "smallerEq",
  "equal",
  "unequal",
]);

/** Scale (SI value of 1 unit) and dimension key of a simple unit, or undefined. */
function unitInfo(lang: Language, name: string): { scale: number; base: string } | undefined {
  if (!lang.isUnit(name)) return undefined;
  const u = lang.quantity(1, name) as unknown as UnitParts;
  if (u.units.length !== 1) return undefined;
  const p = u.units[0];
  if (p.power !== 1 || p.unit.offset !== 0 || typeof u.value !== "number") return undefined;
  return { scale: u.value, base: p.unit.dimensions.join(",") };
}

interface Inputs {
  readonly columns: number[];
  readonly colScale: number[];
  readonly consts: number[];
  readonly fns: ((...a: never[]) => unknown)[];
  readonly values: unknown[];
}

function isUnitValue(x: unknown): x is UnitParts {
  return x !== null && typeof x === "object" && (x as { type?: string }).type === "Unit" &&
    Array.isArray((x as UnitParts).units);
}

/** Compile `node` to a loop, or throw Unsupported with the reason. */
function generate(
  node: MathNode,
  shapes: readonly ColumnShape[],
  scope: ReadonlyMap<string, unknown>,
  lang: Language,
): { body: string; ty: Ty; inputs: Inputs } {
  const inputs: Inputs = { columns: [], colScale: [], consts: [], fns: [], values: [] };
  const byName = new Map(shapes.map((s, i) => [s.name, i]));
  const angle = unitInfo(lang, ANGLE_PROBE)!;
  const konst = (v: number): string => {
    inputs.consts.push(v);
    return `k${inputs.consts.length - 1}`;
  };
  const fn = (f: (...a: never[]) => unknown): string => {
    inputs.fns.push(f);
    return `f${inputs.fns.length - 1}`;
  };
  const held = (v: unknown): string => {
    inputs.values.push(v);
    return `v${inputs.values.length - 1}`;
  };
  const column = (j: number): string => {
    let at = inputs.columns.indexOf(j);
    if (at < 0) {
      inputs.columns.push(j);
      at = inputs.columns.length - 1;
    }
    return `c${at}[i]`;
  };
  const need = (ok: boolean, why: string) => {
    if (!ok) throw new Unsupported(why);
  };
  const langFn = (name: string): (...a: unknown[]) => unknown => {
    const f = lang.compile(lang.parse(name)).evaluate({});
    need(typeof f === "function", `function ${name} is not available`);
    return f as (...a: unknown[]) => unknown;
  };
  const numberOnly = (f: (...a: unknown[]) => unknown, name: string) => (...a: number[]) => {
    const r = f(...a);
    if (typeof r !== "number") throw new Unsupported(`${name} gave a value that is not a number`);
    return r;
  };

  const readsColumns = (n: MathNode): boolean =>
    n.filter((m) => m.type === "SymbolNode" && byName.has((m as unknown as { name: string }).name))
      .length > 0;

  const visit = (n: MathNode): Gen => {
    const any = n as unknown as Record<string, unknown>;
    switch (n.type) {
      case "ConstantNode": {
        if (typeof any.value === "string") {
          return { code: held(any.value), ty: { kind: "val", type: "text" } };
        }
        if (typeof any.value === "boolean") {
          return { code: held(any.value), ty: { kind: "val", type: "boolean" } };
        }
        need(typeof any.value === "number", "a constant that is not a number");
        return { code: konst(any.value as number), ty: NUM };
      }
      case "ParenthesisNode":
        return visit(any.content as MathNode);
      case "SymbolNode":
        return symbol(any.name as string);
      case "OperatorNode":
        return operator(any.fn as string, any.args as MathNode[]);
      case "ConditionalNode":
        return conditional(
          any.condition as MathNode,
          any.trueExpr as MathNode,
          any.falseExpr as MathNode,
        );
      case "FunctionNode": {
        const f = any.fn as MathNode;
        need(f.type === "SymbolNode", "a call of something that is not a name");
        return call((f as unknown as { name: string }).name, any.args as MathNode[]);
      }
      default:
        throw new Unsupported(`${n.type} is outside the compiled subset`);
    }
  };

  const symbol = (name: string): Gen => {
    const j = byName.get(name);
    if (j !== undefined) {
      const s = shapes[j];
      if (!s.numeric) {
        // Text and typed records reach formulas as they are, as the language passes them.
        need(s.type !== "quantity" && s.type !== "number", `column ${name} has empty values`);
        return { code: column(j), ty: { kind: "val", type: s.type } };
      }
      if (s.type === "quantity" && s.unit) {
        const u = unitInfo(lang, s.unit);
        need(!!u, `unit ${s.unit} of column ${name}`);
        // The language makes a quantity from `value + 0` (no signed zero); so does the loop.
        const code = `(${column(j)}+0)`;
        return {
          code: u!.scale === 1 ? code : `(${code}*${konst(u!.scale)})`,
          ty: { kind: "qty", unit: s.unit, base: u!.base },
          raw: { code: column(j), unit: s.unit },
        };
      }
      return { code: column(j), ty: NUM };
    }
    if (scope.has(name)) {
      const v = scope.get(name);
      if (typeof v === "number") return { code: konst(v), ty: NUM };
      if (typeof v === "string") return { code: held(v), ty: { kind: "val", type: "text" } };
      if (typeof v === "boolean") return { code: held(v), ty: { kind: "val", type: "boolean" } };
      const t = isUnitValue(v) ? undefined : typeOfValue(v);
      if (t) return { code: held(v), ty: { kind: "val", type: t.name } };
      need(isUnitValue(v), `${name} is not a number or a quantity`);
      const u = v as UnitParts;
      const unit = u.formatUnits();
      const info = unitInfo(lang, unit);
      need(!!info && typeof u.value === "number", `unit of ${name}`);
      return { code: konst(u.value as number), ty: { kind: "qty", unit, base: info!.base } };
    }
    if (name in BUILTIN_CONSTANTS && lang.isBuiltinSymbol(name)) {
      return { code: konst(BUILTIN_CONSTANTS[name]), ty: NUM };
    }
    const info = unitInfo(lang, name);
    need(!!info, `name ${name}`);
    return { code: "", ty: { kind: "unit", unit: name, base: info!.base, scale: info!.scale } };
  };

  const value = (g: Gen): Gen => {
    need(g.ty.kind !== "unit", "a unit on its own");
    return g;
  };
  /** A number or a quantity, for arithmetic and `Math` functions. */
  const scalar = (g: Gen): Gen => {
    need(g.ty.kind !== "val", `arithmetic on ${g.ty.kind === "val" ? g.ty.type : ""} values`);
    return g;
  };

  const operator = (op: string, args: MathNode[]): Gen => {
    if (op === "unaryMinus" || op === "unaryPlus") {
      const a = scalar(value(visit(args[0])));
      return op === "unaryMinus" ? { code: `(-${a.code})`, ty: a.ty } : { code: a.code, ty: a.ty };
    }
    need(args.length === 2, `operator ${op}`);
    if (COMPARISONS.has(op)) return comparison(op, args);
    const [l, r] = args.map((a) => scalar(visit(a)));
    switch (op) {
      case "add":
      case "subtract": {
        const a = value(l);
        const b = value(r);
        const sign = op === "add" ? "+" : "-";
        if (a.ty.kind === "num" && b.ty.kind === "num") {
          return { code: `(${a.code}${sign}${b.code})`, ty: NUM };
        }
        need(
          a.ty.kind === "qty" && b.ty.kind === "qty" && a.ty.base === b.ty.base,
          "adding a number to a quantity, or quantities of different kinds",
        );
        return { code: `(${a.code}${sign}${b.code})`, ty: a.ty };
      }
      case "multiply": {
        if (l.ty.kind === "unit" || r.ty.kind === "unit") {
          const [u, x] = l.ty.kind === "unit" ? [l, r] : [r, l];
          need(x.ty.kind === "num" && u.ty.kind === "unit", "a unit times a quantity");
          const ut = u.ty as Extract<Ty, { kind: "unit" }>;
          return {
            code: `(${x.code}*${konst(ut.scale)})`,
            ty: { kind: "qty", unit: ut.unit, base: ut.base },
          };
        }
        need(l.ty.kind === "num" || r.ty.kind === "num", "a quantity times a quantity");
        return { code: `(${l.code}*${r.code})`, ty: l.ty.kind === "num" ? r.ty : l.ty };
      }
      case "divide": {
        const a = value(l);
        const b = value(r);
        if (b.ty.kind === "num") return { code: `(${a.code}/${b.code})`, ty: a.ty };
        need(
          a.ty.kind === "qty" && b.ty.kind === "qty" && a.ty.base === b.ty.base,
          "dividing by a quantity of another kind",
        );
        return { code: `(${a.code}/${b.code})`, ty: NUM };
      }
      case "pow": {
        const a = value(l);
        const b = value(r);
        need(a.ty.kind === "num" && b.ty.kind === "num", "a power of a quantity");
        return { code: `${fn(numberOnly(langFn("pow"), "pow"))}(${a.code},${b.code})`, ty: NUM };
      }
      default:
        throw new Unsupported(`operator ${op} is outside the compiled subset`);
    }
  };

  /**
   * `< <= > >= == !=` on numbers, or on quantities of one kind (the language compares
   * quantities by their SI values, with its own tolerance: the same function is called).
   */
  const comparison = (op: string, args: MathNode[]): Gen => {
    const [l, r] = args.map((a) => scalar(value(visit(a))));
    need(
      (l.ty.kind === "num" && r.ty.kind === "num") ||
        (l.ty.kind === "qty" && r.ty.kind === "qty" && l.ty.base === r.ty.base),
      "comparing a number with a quantity, or quantities of different kinds",
    );
    const f = langFn(op);
    const compare = (a: number, b: number) => {
      const out = f(a, b);
      if (typeof out !== "boolean") {
        throw new Unsupported(`${op} gave a value that is not true or false`);
      }
      return out;
    };
    return { code: `${fn(compare)}(${l.code},${r.code})`, ty: { kind: "val", type: "boolean" } };
  };

  /** `c ? a : b` on a comparison, both branches of one type (one unit for quantities). */
  const conditional = (c: MathNode, a: MathNode, b: MathNode): Gen => {
    const test = value(visit(c));
    need(
      test.ty.kind === "val" && test.ty.type === "boolean",
      "a condition that is not a comparison",
    );
    const yes = value(visit(a));
    const no = value(visit(b));
    const same = yes.ty.kind === no.ty.kind && (
      yes.ty.kind === "num" ||
      (yes.ty.kind === "qty" && no.ty.kind === "qty" && yes.ty.unit === no.ty.unit) ||
      (yes.ty.kind === "val" && no.ty.kind === "val" && yes.ty.type === no.ty.type)
    );
    need(same, "branches of different kinds or units");
    return { code: `(${test.code}?${yes.code}:${no.code})`, ty: yes.ty };
  };

  const call = (name: string, args: MathNode[]): Gen => {
    need(!scope.has(name) && !byName.has(name), `${name} is a value, not a function`);
    const m = MATH_FUNCTIONS[name];
    if (m) {
      need(args.length === m.arity, `${name} with ${args.length} arguments`);
      const gs = args.map((a) => scalar(value(visit(a))));
      for (const g of gs) {
        need(
          g.ty.kind === "num" || (!!m.angle && g.ty.kind === "qty" && g.ty.base === angle.base),
          `${name} of a quantity`,
        );
      }
      return { code: `${m.js}(${gs.map((g) => g.code).join(",")})`, ty: NUM };
    }
    if (name === "abs") {
      need(args.length === 1, "abs with more than one argument");
      const a = scalar(value(visit(args[0])));
      return { code: `Math.abs(${a.code})`, ty: a.ty };
    }
    const lf = LANGUAGE_FUNCTIONS[name];
    if (lf) {
      need(args.length >= lf[0] && args.length <= lf[1], `${name} with ${args.length} arguments`);
      const gs = args.map((a) => value(visit(a)));
      need(gs.every((g) => g.ty.kind === "num"), `${name} of a quantity`);
      const f = fn(numberOnly(langFn(name), name));
      return { code: `${f}(${gs.map((g) => g.code).join(",")})`, ty: NUM };
    }
    const spec = lang.catalogue.formulas.get(name);
    need(!!spec, `function ${name} is outside the compiled subset`);
    return formula(spec!, args);
  };

  const formula = (spec: FormulaSpec, args: MathNode[]): Gen => {
    const scalar = (t: string) => t === "quantity" || t === "number" || t === "integer";
    const optionRecord = args.length > 0 && args[args.length - 1].type === "ObjectNode";
    if (
      spec.variadic || optionRecord || !spec.params.every((p) => scalar(p.type)) ||
      !scalar(spec.returns.type)
    ) {
      return typedFormula(spec, args);
    }
    need(args.length <= spec.params.length, `${spec.name} with too many arguments`);
    need(
      (spec.options ?? []).every((o) => typeof o.default === "number"),
      `${spec.name} with options`,
    );
    const codes: string[] = [];
    spec.params.forEach((p, i) => {
      if (i >= args.length) {
        need(!!p.optional, `${spec.name} without ${p.name}`);
        codes.push(konst(p.default === undefined ? NaN : p.default as number));
        need(typeof p.default === "number", `${spec.name}: default of ${p.name}`);
        return;
      }
      const g = value(visit(args[i]));
      if (g.ty.kind === "num") {
        // A bare number for a parameter with a unit is refused row-wise, with the fix.
        need(p.type !== "quantity", `${spec.name}: ${p.name} without a unit`);
        return void codes.push(g.code);
      }
      need(p.type === "quantity", `${spec.name}: ${p.name} is a plain number`);
      const pu = unitInfo(lang, p.unit!);
      need(!!pu && pu.base === (g.ty as { base: string }).base, `${spec.name}: unit of ${p.name}`);
      codes.push(pu!.scale === 1 ? g.code : `(${g.code}/${konst(pu!.scale)})`);
    });
    for (const o of spec.options ?? []) codes.push(konst(o.default as number));
    // No option record: the options take their defaults, as the language passes them.
    for (const o of spec.options ?? []) {
      codes.push(typeof o.default === "number" ? konst(o.default) : held(o.default));
    }
    const f = fn(checkedFormula(spec));
    const call = `${f}(${codes.join(",")})`;
    if (spec.returns.type === "quantity" && spec.returns.unit) {
      const code = `(${call}+0)`;
      const ru = unitInfo(lang, spec.returns.unit);
      need(!!ru, `${spec.name}: unit of the result`);
      return {
        code: ru!.scale === 1 ? code : `(${code}*${konst(ru!.scale)})`,
        ty: { kind: "qty", unit: spec.returns.unit, base: ru!.base },
      };
    }
    return { code: call, ty: NUM };
  };

  /**
   * A formula that takes or gives text or typed records: called as the language calls it
   * (the same argument checks and conversions), with quantities built only for quantity
   * columns passed to it; a number result in the declared unit stays a number.
   */
  const typedFormula = (spec: FormulaSpec, args: MathNode[]): Gen => {
    const codes = args.map((a) => {
      if (!readsColumns(a)) {
        // The same value on every row: evaluated once, by the language itself.
        let v: unknown;
        try {
          v = lang.compile(a).evaluate(new RowScope(scope));
        } catch {
          throw new Unsupported(`${spec.name}: an argument that does not evaluate`);
        }
        return held(v);
      }
      const g = value(visit(a));
      if (g.ty.kind !== "qty") return g.code;
      need(!!g.raw, `${spec.name}: a computed quantity passed to a formula of records`);
      const unit = g.raw!.unit;
      return `${fn((v: number) => lang.quantity(v, unit))}(${g.raw!.code})`;
    });
    const call = `${fn(boundFormula(spec))}(${codes.join(",")})`;
    const returns = spec.returns;
    if (returns.type === "quantity" && returns.unit) {
      const ru = unitInfo(lang, returns.unit);
      need(!!ru, `${spec.name}: unit of the result`);
      const code = `(${fn(numberResult(spec))}(${call})+0)`;
      return {
        code: ru!.scale === 1 ? code : `(${code}*${konst(ru!.scale)})`,
        ty: { kind: "qty", unit: returns.unit, base: ru!.base },
      };
    }
    if (returns.type === "quantity" || returns.type === "number" || returns.type === "integer") {
      return { code: `${fn(numberResult(spec))}(${call})`, ty: NUM };
    }
    return { code: call, ty: { kind: "val", type: returns.type } };
  };

  const top = value(visit(node));
  return { body: top.code, ty: top.ty, inputs };
}

/** A catalogue formula called with numbers already in its units, checked as the language checks. */
function checkedFormula(spec: FormulaSpec): (...a: number[]) => number {
  const params = spec.params;
  return (...a: number[]) => {
    for (let i = 0; i < params.length; i++) {
      const p = params[i];
      const x = a[i];
      if (!Number.isFinite(x)) throw new Unsupported(`${spec.name}: ${p.name} not finite`);
      if (p.type === "integer" && !Number.isInteger(x)) throw new Unsupported("not whole");
      if (p.range && (x < p.range[0] || x > p.range[1])) throw new Unsupported("out of range");
    }
    const r = spec.fn(...a);
    if (typeof r !== "number") {
      throw new Unsupported(`${spec.name} gave a value that is not a number`);
    }
    return r;
  };
}

const BOUND = new WeakMap<FormulaSpec, (...a: unknown[]) => unknown>();

/**
 * A catalogue formula with the language's own argument checks and conversions, its result
 * left as the formula gives it (no quantity built); any refusal hands the column back to the
 * row-wise path, so the error reads as the language's own, at its row.
 */
function boundFormula(spec: FormulaSpec): (...a: unknown[]) => unknown {
  let f = BOUND.get(spec);
  if (!f) {
    const bound = bindFormula(spec, (out) => out);
    f = (...a: unknown[]) => {
      try {
        return bound(...a);
      } catch (e) {
        throw new Unsupported(`${spec.name}: ${(e as Error).message}`);
      }
    };
    BOUND.set(spec, f);
  }
  return f;
}

/** The check that a formula declared to give a number gave one. */
function numberResult(spec: FormulaSpec): (x: unknown) => number {
  return (x: unknown) => {
    if (typeof x !== "number") {
      throw new Unsupported(`${spec.name} gave a value that is not a number`);
    }
    return x;
  };
}

type Loop = (
  c: readonly ArrayLike<unknown>[],
  k: readonly number[],
  f: readonly ((...a: never[]) => unknown)[],
  v: readonly unknown[],
  out: Float64Array | unknown[],
  n: number,
) => void;

function buildLoop(body: string, inputs: Inputs, outScale: number): Loop {
  const lines = ['"use strict";', "return function loop(c, k, f, v, out, n) {"];
  inputs.columns.forEach((_, i) => lines.push(`const c${i} = c[${i}];`));
  inputs.consts.forEach((_, i) => lines.push(`const k${i} = k[${i}];`));
  inputs.fns.forEach((_, i) => lines.push(`const f${i} = f[${i}];`));
  inputs.values.forEach((_, i) => lines.push(`const v${i} = v[${i}];`));
  const scaled = outScale === 1 ? body : `${body}/kOut`;
  if (outScale !== 1) lines.push(`const kOut = k[${inputs.consts.length}];`);
  lines.push(`for (let i = 0; i < n; i++) out[i] = ${scaled};`, "};");
  // The source is assembled from the fixed templates above only (see the module docs).
  return new Function(lines.join("\n"))() as Loop;
}

/**
 * Plan a computed column: compile `node` for columns of these shapes if it can be, else
 * plan row-wise evaluation with `evaluator`. `scope` holds the notebook's scalar values.
 *
 * @example
 * ```ts ignore
 * const plan = planColumn("m", lang.parse("sph + cyl / 2"), evaluator, shapes, scope, lang);
 * plan.compiled; // true
 * ```
 */
export function planColumn(
  name: string,
  node: MathNode,
  evaluator: RowEvaluator,
  shapes: readonly ColumnShape[],
  scope: ReadonlyMap<string, unknown>,
  lang: Language,
): ColumnPlan {
  const rowWise = (columns: readonly Column[], rows: number) =>
    evaluateRowWise(name, evaluator, columns, rows, scope, lang);
  let gen: ReturnType<typeof generate>;
  try {
    gen = generate(node, shapes, scope, lang);
  } catch (e) {
    if (!(e instanceof Unsupported)) throw e;
    const reason = e.message;
    return {
      compiled: false,
      reason,
      run: (columns, rows) => ({ column: rowWise(columns, rows), path: "row-wise" }),
    };
  }
  let outUnit = "";
  let outScale = 1;
  if (gen.ty.kind === "qty") {
    const parts = lang.quantityParts(lang.quantity(1, gen.ty.unit))!;
    outUnit = parts.unit;
    outScale = outUnit ? unitInfo(lang, outUnit)?.scale ?? NaN : 1;
  }
  if (!Number.isFinite(outScale)) {
    return {
      compiled: false,
      reason: `unit ${outUnit} of the result`,
      run: (columns, rows) => ({ column: rowWise(columns, rows), path: "row-wise" }),
    };
  }
  const consts = outScale === 1 ? gen.inputs.consts : [...gen.inputs.consts, outScale];
  const loop = buildLoop(gen.body, gen.inputs, outScale);
  const values = gen.ty.kind === "val";
  return {
    compiled: true,
    run(columns, rows) {
      if (rows === 0) return { column: rowWise(columns, rows), path: "row-wise" };
      const arrays = gen.inputs.columns.map((j) => columns[j].data);
      const out = values ? new Array<unknown>(rows) : new Float64Array(rows);
      try {
        loop(arrays, consts, gen.inputs.fns, gen.inputs.values, out, rows);
      } catch (e) {
        if (!(e instanceof Unsupported)) throw e;
        return { column: rowWise(columns, rows), path: "row-wise" };
      }
      if (values) return { column: toColumn(name, out as unknown[], lang), path: "compiled" };
      const column = outUnit
        ? new Column(name, "quantity", outUnit, out)
        : new Column(name, "number", "", out);
      return { column, path: "compiled" };
    },
  };
}

/**
 * Row-wise evaluation through the formula language: each row's columns (quantities as the
 * language's quantities) over the notebook scope. Errors name the row (1-based).
 *
 * @example
 * ```ts ignore
 * const col = evaluateRowWise("m", evaluator, columns, 3, scope, lang);
 * ```
 */
export function evaluateRowWise(
  name: string,
  evaluator: RowEvaluator,
  columns: readonly Column[],
  rows: number,
  scope: ReadonlyMap<string, unknown>,
  lang: Language,
): Column {
  const row = new RowScope(scope);
  const out: unknown[] = new Array(rows);
  for (let i = 0; i < rows; i++) {
    for (const c of columns) {
      const v = c.data[i];
      row.row.set(
        c.name,
        c.type === "quantity" && typeof v === "number" ? lang.quantity(v, c.unit) : v,
      );
    }
    try {
      out[i] = evaluator.evaluate(row);
    } catch (e) {
      const err = e as Error;
      err.message = `row ${i + 1}: ${err.message}`;
      throw err;
    }
  }
  return toColumn(name, out, lang);
}

/**
 * Pack per-row results into a column: numbers and quantities into a Float64Array.
 *
 * @example
 * ```ts ignore
 * toColumn("x", [1, 2], lang).numeric; // true
 * ```
 */
export function toColumn(name: string, values: unknown[], lang: Language): Column {
  if (values.length === 0) return new Column(name, "number", "", new Float64Array());
  if (values.every((v) => typeof v === "number")) {
    return new Column(name, "number", "", Float64Array.from(values as number[]));
  }
  const first = lang.quantityParts(values[0]);
  if (first) {
    const data = new Float64Array(values.length);
    let ok = true;
    for (let i = 0; i < values.length && ok; i++) {
      try {
        data[i] = lang.toNumberIn(values[i], first.unit);
      } catch {
        ok = false;
      }
    }
    if (ok) return new Column(name, first.unit ? "quantity" : "number", first.unit, data);
  }
  const t = typeOfValue(values[0]);
  return new Column(name, t?.name ?? (typeof values[0] === "string" ? "text" : "any"), "", values);
}
