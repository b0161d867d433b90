/**
 * `lentil eval "EXPR"`: evaluate one expression, for quick work at the counter.
 *
 * @module
 */

import type { Command } from "../command.ts";
import { Notebook } from "../../engine/engine.ts";
import { buildReport } from "../../report.ts";
import { resultBelow, terminalWidth, wrap } from "../_result_text.ts";

/** The `eval` command. */
export const evalCommand: Command = {
  name: "eval",
  summary: "evaluate one expression, e.g. a vertex compensation",
  usage: '"EXPR" [--json]',
  help: "Evaluates one expression of the formula language and prints the result with its unit\n" +
    'and sources, e.g.  lentil eval "vertexPower(-10 D, 12 mm)"',
  options: { json: { type: "boolean", doc: "print {value, unit, display, sources} as JSON" } },
  positionals: [1, 1],
  run([expr], options, io) {
    if (!expr.trim()) {
      io.err('lentil eval: give an expression, e.g. lentil eval "vertexPower(-10 D, 12 mm)"');
      return Promise.resolve(2);
    }
    if (expr.includes("\n")) {
      io.err("eval takes one expression on one line");
      return Promise.resolve(2);
    }
    const nb = Notebook.fromText("```lentil\nresult = " + expr + "\n```\n", "<eval>");
    const report = buildReport(nb);
    const cell = report.cells[0];
    if (!cell) {
      io.err(`cannot read the expression: ${expr}`);
      return Promise.resolve(1);
    }
    if (cell.error) {
      const col = Math.max(1, cell.error.col - "result = ".length);
      if (options.json) io.out(JSON.stringify({ error: { ...cell.error, line: 1, col } }));
      else io.err(`<eval>:1:${col}: ${cell.error.message}`);
      return Promise.resolve(1);
    }
    if (options.json) {
      io.out(
        JSON.stringify({
          value: cell.value,
          unit: cell.unit,
          display: cell.display,
          headline: cell.headline,
          ...(cell.parts ? { parts: cell.parts } : {}),
          ...(cell.checks ? { checks: cell.checks } : {}),
          ...(cell.table ? { table: cell.table } : {}),
          sources: report.sources,
        }),
      );
    } else {
      const width = terminalWidth();
      const below = resultBelow(cell, width, 2);
      const head = below.length ? cell.headline : cell.display;
      const notes = cell.notes.length ? `  [${cell.notes.join(", ")}]` : "";
      for (const l of wrap(head + notes, width)) io.out(l);
      for (const l of below) io.out(l);
      for (const s of report.sources) {
        io.out(`  [${s.n}] ${s.citation}${s.mark ? ` (${s.mark})` : ""}`);
      }
      for (const c of report.cautions) io.out(`  caution: ${c}`);
    }
    return Promise.resolve(0);
  },
};
