/**
 * Every `lentil` command, in the order help lists them. Add a command's module here.
 *
 * @module
 */

import type { Command } from "../command.ts";
import { runCommand } from "./run.ts";
import { checkCommand } from "./check.ts";
import { evalCommand } from "./eval.ts";
import { newCommand } from "./new.ts";
import { liveCommand } from "./live.ts";
import { exportCommand } from "./export.ts";
import { formulasCommand } from "./formulas.ts";
import { streamCommand } from "./stream.ts";
import { sqlCommand } from "./sql.ts";

/** The commands. */
export const COMMANDS: readonly Command[] = [
  runCommand,
  checkCommand,
  evalCommand,
  newCommand,
  exportCommand,
  liveCommand,
  formulasCommand,
  streamCommand,
  sqlCommand,
];
