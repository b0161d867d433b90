/**
 * Settings of the study statistics, given by name in a record written as the last
 * argument (`ellipse95(study.subjective, {eyes: "right"})`). A misspelt name or a word
 * that is not one of the choices is refused with the list of valid ones.
 *
 * @module
 */

import { LentilInputError } from "../lib/errors.ts";
import { isTable } from "./table.ts";
import { typeOfValue } from "./types.ts";

/** One setting: its name, what it takes, and the words it accepts. */
export interface SettingSpec {
  /** Name written in the record. */
  readonly name: string;
  /** One line: what it sets. */
  readonly doc: string;
  /** For a word: the words accepted. */
  readonly choices?: readonly string[];
}

/**
 * Whether `x` is a settings record: a plain object written in a formula, neither a table
 * nor a value of a registered type.
 */
export function isSettings(x: unknown): x is Record<string, unknown> {
  return x !== null && typeof x === "object" && !Array.isArray(x) && !isTable(x) &&
    !typeOfValue(x) && Object.getPrototypeOf(x) === Object.prototype;
}

/**
 * Read a settings record against its declaration; `undefined` gives no settings.
 *
 * @throws {LentilInputError} on a name not declared or a word not among the choices.
 */
export function readSettings(
  formula: string,
  x: unknown,
  specs: readonly SettingSpec[],
): Record<string, unknown> {
  if (x === undefined) return {};
  if (!isSettings(x)) {
    throw new LentilInputError(
      `${formula}: the last argument holds settings by name, e.g. {${specs[0].name}: …}`,
    );
  }
  const names = specs.map((s) => s.name);
  for (const [k, v] of Object.entries(x)) {
    const spec = specs.find((s) => s.name === k);
    if (!spec) {
      throw new LentilInputError(
        `${formula}: no setting "${k}" (valid: ${names.join(", ")})`,
      );
    }
    if (spec.choices && !spec.choices.includes(String(v))) {
      throw new LentilInputError(
        `${formula}: ${k} is one of ${spec.choices.map((c) => `"${c}"`).join(", ")}, not "${v}"`,
      );
    }
  }
  return x;
}
