/**
 * `deno task bench`: runs every bench module and ends with one line per goal.
 *
 * @module
 */

import { formatGoal, type Goal } from "./goal.ts";
import * as engine from "./engine.ts";
import * as exporting from "./export.ts";
import * as harden from "./harden.ts";
import * as live from "./live.ts";
import * as rowwise from "./rowwise.ts";
import * as start from "./start.ts";
import * as tables from "./tables.ts";
import * as duck from "./duck.ts";

/** A bench module: measures, returns its goals and any lines of detail. */
interface BenchModule {
  measure(): Promise<{ goals: Goal[]; lines: string[] }> | { goals: Goal[]; lines: string[] };
}

const modules: [string, BenchModule][] = [
  ["engine", engine],
  ["export", exporting],
  ["harden", harden],
  ["live", live],
  ["rowwise", rowwise],
  ["start", start],
  ["tables", tables],
  ["duck", duck],
];

const goals: Goal[] = [];
for (const [name, m] of modules) {
  console.log(`# ${name}`);
  const r = await m.measure();
  for (const l of r.lines) console.log(l);
  goals.push(...r.goals);
}
console.log("");
for (const g of goals) console.log(formatGoal(g));
