/**
 * A computed column's formula as an SQL expression, for the same subset the column compiler
 * accepts, tracked for units the same way: numbers, columns and scalar cells, `+ - * /`,
 * unary minus, powers of plain numbers, quantity literals (`0.25 D`), `sin cos tan atan2 sqrt
 * abs exp`, the constants pi, e and tau, and the power-vector formulas `vectorM`, `vectorJ0`
 * and `vectorJ45`. A quantity is held in SI base units inside the expression and converted to
 * the unit it is shown in at the end, so the numbers are those of the in-process path.
 *
 * Names become quoted identifiers through {@linkcode quoteName}; numbers become whatever the
 * caller's `value` function makes of them (a bound parameter, or a literal written from a
 * number), never notebook text.
 *
 * @module
 */

import type { MathNode } from "mathjs";
import type { Language } from "../../cells/language.ts";
import type { ColumnShape } from "../engine/_columns.ts";
import { quoteName } from "./_names.ts";

/** A formula outside the SQL subset (the reason says what). */
export class NotInSql extends Error {
  /** @param message what is outside the subset. */
  constructor(message: string) {
    super(message);
    this.name = "NotInSql";
  }
}

/** Turns a number into SQL text (a placeholder or a literal). */
export type SqlValue = (x: number) => string;

/** An expression with the unit its values are in ("" for plain numbers). */
export interface SqlExpression {
  /** SQL text. */
  readonly sql: string;
  /** Unit of the values ("" for plain numbers). */
  readonly unit: string;
}

type Ty =
  | { readonly kind: "num" }
  | { readonly kind: "qty"; readonly unit: string; readonly base: string }
  | { readonly kind: "unit"; readonly unit: string; readonly base: string; readonly scale: number };

interface Gen {
  readonly sql: string;
  readonly ty: Ty;
}

const NUM: Ty = { kind: "num" };

const BUILTIN: Readonly<Record<string, number>> = { pi: Math.PI, e: Math.E, tau: 2 * Math.PI };

const TRIG: Readonly<Record<string, string>> = { sin: "SIN", cos: "COS", tan: "TAN" };

interface UnitParts {
  readonly value: number | null;
  readonly units: readonly {
    readonly unit: { readonly offset: number; readonly dimensions: number[] };
    readonly power: number;
  }[];
  formatUnits(): string;
}

/** Scale (SI value of 1 unit) and dimension key of a simple unit, or undefined. */
export function unitScale(
  lang: Language,
  name: string,
): { scale: number; base: string } | undefined {
  if (!lang.isUnit(name)) return undefined;
  const u = lang.quantity(1, name) as unknown as UnitParts;
  if (u.units.length !== 1) return undefined;
  const p = u.units[0];
  if (p.power !== 1 || p.unit.offset !== 0 || typeof u.value !== "number") return undefined;
  return { scale: u.value, base: p.unit.dimensions.join(",") };
}

function isUnitValue(x: unknown): x is UnitParts {
  return x !== null && typeof x === "object" && (x as { type?: string }).type === "Unit" &&
    Array.isArray((x as UnitParts).units);
}

/**
 * The SQL expression of a column formula over columns of these shapes, with scalar cells
 * from `scope`. Column names are those of the row source the expression is used in.
 *
 * @example
 * ```ts
 * import { getLanguage } from "../../cells/language.ts";
 * import { sqlExpression } from "./expression.ts";
 * const lang = getLanguage();
 * const shapes = [
 *   { name: "sph", type: "quantity", unit: "D", numeric: true },
 *   { name: "cyl", type: "quantity", unit: "D", numeric: true },
 * ];
 * const e = sqlExpression(lang.parse("sph + cyl / 2"), shapes, new Map(), lang, String);
 * e.unit; // "D"
 * ```
 * @throws {NotInSql} when the formula is outside the subset.
 */
export function sqlExpression(
  node: MathNode,
  shapes: readonly ColumnShape[],
  scope: ReadonlyMap<string, unknown>,
  lang: Language,
  value: SqlValue,
): SqlExpression {
  const w = new SqlWriter(shapes, scope, lang, value);
  const top = w.val(w.visit(node));
  if (top.ty.kind !== "qty") return { sql: top.sql, unit: "" };
  const parts = lang.quantityParts(lang.quantity(1, top.ty.unit))!;
  const outUnit = parts.unit;
  if (!outUnit) return { sql: top.sql, unit: "" };
  const info = unitScale(lang, outUnit);
  need(!!info, `unit ${outUnit} of the result`);
  return {
    sql: info!.scale === 1 ? top.sql : `(${top.sql} / ${w.num(info!.scale)})`,
    unit: outUnit,
  };
}

function need(ok: boolean, why: string): void {
  if (!ok) throw new NotInSql(why);
}

/** Writes one formula's SQL: one method per node kind, operator and function family. */
class SqlWriter {
  readonly #byName: ReadonlyMap<string, ColumnShape>;
  readonly #angle: { scale: number; base: string };

  constructor(
    shapes: readonly ColumnShape[],
    readonly scope: ReadonlyMap<string, unknown>,
    readonly lang: Language,
    readonly value: SqlValue,
  ) {
    this.#byName = new Map(shapes.map((s) => [s.name, s]));
    this.#angle = unitScale(lang, "rad")!;
  }

  num(x: number): string {
    need(Number.isFinite(x), "a number that is not finite");
    return this.value(x);
  }

  scaled(sql: string, scale: number): string {
    return scale === 1 ? sql : `(${sql} * ${this.num(scale)})`;
  }

  val(g: Gen): Gen {
    need(g.ty.kind !== "unit", "a unit on its own");
    return g;
  }

  visit(n: MathNode): Gen {
    const any = n as unknown as Record<string, unknown>;
    switch (n.type) {
      case "ConstantNode":
        need(typeof any.value === "number", "a constant that is not a number");
        return { sql: this.num(any.value as number), ty: NUM };
      case "ParenthesisNode":
        return this.visit(any.content as MathNode);
      case "SymbolNode":
        return this.symbol(any.name as string);
      case "OperatorNode":
        return this.operator(any.fn as string, any.args as MathNode[]);
      case "FunctionNode": {
        const f = any.fn as MathNode;
        need(f.type === "SymbolNode", "a call of something that is not a name");
        return this.call((f as unknown as { name: string }).name, any.args as MathNode[]);
      }
      default:
        throw new NotInSql(`${n.type} is outside the SQL subset`);
    }
  }

  symbol(name: string): Gen {
    const s = this.#byName.get(name);
    if (s) return this.column(name, s);
    if (this.scope.has(name)) return this.cell(name, this.scope.get(name));
    const lang = this.lang;
    if (name in BUILTIN && lang.isBuiltinSymbol(name)) {
      return { sql: this.num(BUILTIN[name]), ty: NUM };
    }
    const info = unitScale(lang, name);
    need(!!info, `name ${name}`);
    return { sql: "", ty: { kind: "unit", unit: name, base: info!.base, scale: info!.scale } };
  }

  column(name: string, s: ColumnShape): Gen {
    need(s.numeric, `column ${name} holds ${s.type} values`);
    if (s.type === "quantity" && s.unit) {
      const u = unitScale(this.lang, s.unit);
      need(!!u, `unit ${s.unit} of column ${name}`);
      return {
        sql: this.scaled(quoteName(name), u!.scale),
        ty: { kind: "qty", unit: s.unit, base: u!.base },
      };
    }
    return { sql: quoteName(name), ty: NUM };
  }

  cell(name: string, v: unknown): Gen {
    if (typeof v === "number") return { sql: this.num(v), ty: NUM };
    need(isUnitValue(v), `${name} is not a number or a quantity`);
    const u = v as UnitParts;
    const unit = u.formatUnits();
    const info = unitScale(this.lang, unit);
    need(!!info && typeof u.value === "number", `unit of ${name}`);
    return { sql: this.num(u.value as number), ty: { kind: "qty", unit, base: info!.base } };
  }

  operator(op: string, args: MathNode[]): Gen {
    if (op === "unaryMinus" || op === "unaryPlus") {
      const a = this.val(this.visit(args[0]));
      return op === "unaryMinus" ? { sql: `(-${a.sql})`, ty: a.ty } : a;
    }
    need(args.length === 2, `operator ${op}`);
    const [l, r] = args.map((a) => this.visit(a));
    switch (op) {
      case "add":
      case "subtract":
        return this.sum(op === "add" ? "+" : "-", l, r);
      case "multiply":
        return this.product(l, r);
      case "divide":
        return this.quotient(l, r);
      case "pow": {
        const a = this.val(l);
        const b = this.val(r);
        need(a.ty.kind === "num" && b.ty.kind === "num", "a power of a quantity");
        return { sql: `POWER(${a.sql}, ${b.sql})`, ty: NUM };
      }
      default:
        throw new NotInSql(`operator ${op} is outside the SQL subset`);
    }
  }

  sum(sign: "+" | "-", l: Gen, r: Gen): Gen {
    const a = this.val(l);
    const b = this.val(r);
    if (a.ty.kind === "num" && b.ty.kind === "num") {
      return { sql: `(${a.sql} ${sign} ${b.sql})`, ty: NUM };
    }
    need(
      a.ty.kind === "qty" && b.ty.kind === "qty" && a.ty.base === b.ty.base,
      "adding a number to a quantity, or quantities of different kinds",
    );
    return { sql: `(${a.sql} ${sign} ${b.sql})`, ty: a.ty };
  }

  product(l: Gen, r: Gen): Gen {
    if (l.ty.kind === "unit" || r.ty.kind === "unit") {
      const [u, x] = l.ty.kind === "unit" ? [l, r] : [r, l];
      need(x.ty.kind === "num" && u.ty.kind === "unit", "a unit times a quantity");
      const ut = u.ty as Extract<Ty, { kind: "unit" }>;
      return {
        sql: this.scaled(x.sql, ut.scale),
        ty: { kind: "qty", unit: ut.unit, base: ut.base },
      };
    }
    need(l.ty.kind === "num" || r.ty.kind === "num", "a quantity times a quantity");
    return { sql: `(${l.sql} * ${r.sql})`, ty: l.ty.kind === "num" ? r.ty : l.ty };
  }

  quotient(l: Gen, r: Gen): Gen {
    const a = this.val(l);
    const b = this.val(r);
    if (b.ty.kind === "num") return { sql: `(${a.sql} / ${b.sql})`, ty: a.ty };
    need(
      a.ty.kind === "qty" && b.ty.kind === "qty" && a.ty.base === b.ty.base,
      "dividing by a quantity of another kind",
    );
    return { sql: `(${a.sql} / ${b.sql})`, ty: NUM };
  }

  /** A value in `unit` (D, deg) from a quantity argument. */
  inUnit(g: Gen, unit: string, what: string): string {
    const u = unitScale(this.lang, unit)!;
    need(g.ty.kind === "qty" && g.ty.base === u.base, `${what} must be in ${unit}`);
    return u.scale === 1 ? g.sql : `(${g.sql} / ${this.num(u.scale)})`;
  }

  args(args: MathNode[]): Gen[] {
    return args.map((a) => this.val(this.visit(a)));
  }

  call(name: string, args: MathNode[]): Gen {
    need(
      !this.scope.has(name) && !this.#byName.has(name),
      `${name} is a value, not a function`,
    );
    if (name in TRIG) {
      need(args.length === 1, `${name} with ${args.length} arguments`);
      const [a] = this.args(args);
      need(
        a.ty.kind === "num" || (a.ty.kind === "qty" && a.ty.base === this.#angle.base),
        `${name} of a quantity`,
      );
      return { sql: `${TRIG[name]}(${a.sql})`, ty: NUM };
    }
    if (name === "atan2" || name === "sqrt" || name === "exp") {
      const arity = name === "atan2" ? 2 : 1;
      need(args.length === arity, `${name} with ${args.length} arguments`);
      const a = this.args(args);
      need(a.every((g) => g.ty.kind === "num"), `${name} of a quantity`);
      return { sql: `${name.toUpperCase()}(${a.map((g) => g.sql).join(", ")})`, ty: NUM };
    }
    if (name === "abs") {
      need(args.length === 1, "abs with more than one argument");
      const [a] = this.args(args);
      return { sql: `ABS(${a.sql})`, ty: a.ty };
    }
    if (name === "vectorM" || name === "vectorJ0" || name === "vectorJ45") {
      return this.powerVector(name, args);
    }
    throw new NotInSql(`function ${name} is outside the SQL subset`);
  }

  /** `vectorM`, `vectorJ0` and `vectorJ45` over refraction columns, in D. */
  powerVector(name: string, args: MathNode[]): Gen {
    need(
      this.lang.catalogue.formulas.has(name) && args.length === 2,
      `${name} with ${args.length} arguments`,
    );
    // Only over columns read and range-checked as refraction columns.
    need(
      args.every((a) =>
        a.type === "SymbolNode" && this.#byName.has((a as unknown as { name: string }).name)
      ),
      `${name} of values that are not table columns`,
    );
    const [a, b] = this.args(args);
    const dioptre = unitScale(this.lang, "D")!;
    const d = (sql: string) => ({
      sql: dioptre.scale === 1 ? sql : `(${sql} * ${this.num(dioptre.scale)})`,
      ty: { kind: "qty", unit: "D", base: dioptre.base } as Ty,
    });
    const num = (x: number) => this.num(x);
    if (name === "vectorM") {
      return d(`(${this.inUnit(a, "D", "sph")} + ${this.inUnit(b, "D", "cyl")} / ${num(2)})`);
    }
    const trig = name === "vectorJ0" ? "COS" : "SIN";
    const axis = this.inUnit(b, "deg", "axis");
    return d(
      `((-${this.inUnit(a, "D", "cyl")} / ${num(2)}) * ${trig}(${num(2)} * ${axis} * ${
        num(Math.PI / 180)
      }))`,
    );
  }
}
