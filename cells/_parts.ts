/**
 * `cell.part` in a formula: a later cell reads one part of an earlier result (the
 * endpoint of `mpmva`, the mean M of a summary, a column of a table). Value types name
 * their parts in `parts` (`cells/types.ts`); plain records by their fields; tables by their
 * columns. A part that does not exist is refused with the list of those that do.
 *
 * @module
 */

import type { MathNode } from "mathjs";
import { isTable, tableInfo } from "./table.ts";
import { DEFAULT_DISPLAY, typeOfValue, type ValuePart } from "./types.ts";
import { shownValue } from "./_arguments.ts";
import { isQuantity } from "./quantity.ts";

/** A part asked of a value that has no such part. */
export class PartError extends Error {
  /** @param message what was asked and which parts there are. */
  constructor(message: string) {
    super(message);
    this.name = "PartError";
  }
}

/** The parts a value of a registered type declares (none when it declares none). */
function declaredParts(x: unknown): readonly ValuePart[] | undefined {
  const t = typeOfValue(x);
  return t?.parts?.(x, DEFAULT_DISPLAY);
}

/**
 * The names of the parts of a value, in order: a typed value's declared parts, a record's
 * fields, a table's columns.
 *
 * @example
 * ```ts
 * import { partNames } from "./_parts.ts";
 * partNames({ add: 1, needed: 2 }); // ["add", "needed"]
 * ```
 */
export function partNames(x: unknown): string[] {
  const info = tableInfo(x);
  if (info) return info.columns.map((c) => c.name);
  const keys = (declaredParts(x) ?? []).map((p) => p.key);
  if (plainObject(x)) { for (const k of Object.keys(x)) if (!keys.includes(k)) keys.push(k); }
  return keys;
}

/** A record kept as a plain object (typed or not), whose fields are its parts. */
function plainObject(x: unknown): x is Record<string, unknown> {
  if (x === null || typeof x !== "object" || Array.isArray(x)) return false;
  const proto = Object.getPrototypeOf(x);
  return proto === Object.prototype || proto === null;
}

/**
 * Read part `key` of `x` as `x.key` in a formula does.
 *
 * @example
 * ```ts
 * import { readPart } from "./_parts.ts";
 * readPart({ add: 1.5 }, "add"); // 1.5
 * ```
 * @throws {PartError} when `x` has no part of that name, saying which it has.
 */
export function readPart(x: unknown, key: string): unknown {
  const info = tableInfo(x);
  if (info) {
    const c = info.columns.find((c) => c.name === key);
    if (c) return c;
    throw new PartError(
      `table ${info.name} has no column "${key}" (columns: ${
        info.columns.map((c) => c.name).join(", ") || "none"
      })`,
    );
  }
  const p = declaredParts(x)?.find((p) => p.key === key);
  if (p) return p.value;
  if (plainObject(x) && Object.hasOwn(x, key)) return x[key];
  const names = partNames(x);
  const what = shownValue(x);
  if (names.length) {
    throw new PartError(`${what} has no part "${key}"; its parts are ${names.join(", ")}`);
  }
  if (isQuantity(x) || typeof x === "number") {
    throw new PartError(`${what} is a single value with no parts, so it has no "${key}"`);
  }
  throw new PartError(`${what} has no parts to read, so it has no "${key}"`);
}

interface NodeFactories {
  FunctionNode: new (fn: MathNode, args: MathNode[]) => MathNode;
  ConstantNode: new (value: unknown) => MathNode;
}

/**
 * The expression with every `a.b` turned into a call that reads the part through
 * {@linkcode readPart}, so typed values and tables answer `a.b` as plain records do. The
 * tree given is not changed.
 *
 * @example
 * ```ts ignore
 * const node = withPartAccess(math.parse("mpmva.endpoint"), math);
 * ```
 */
export function withPartAccess(node: MathNode, math: NodeFactories): MathNode {
  const reader = new math.ConstantNode(readPart);
  const rewrite = (n: MathNode): MathNode =>
    n.transform((m) => {
      if (m.type !== "AccessorNode") return m;
      const acc = m as unknown as {
        object: MathNode;
        index: { isObjectProperty(): boolean; getObjectProperty(): string };
      };
      if (!acc.index.isObjectProperty()) return m;
      const key = acc.index.getObjectProperty();
      return new math.FunctionNode(reader, [rewrite(acc.object), new math.ConstantNode(key)]);
    });
  return rewrite(node);
}

/**
 * Whether a value can be read with `.part` (has parts, fields or columns).
 *
 * @example
 * ```ts
 * import { hasParts } from "./_parts.ts";
 * hasParts(3); // false
 * ```
 */
export function hasParts(x: unknown): boolean {
  return isTable(x) || partNames(x).length > 0;
}
