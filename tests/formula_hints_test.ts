// A value of the wrong kind is refused with the formula that takes it (declared as a
// parameter's hints), and an error cell in the terminal reads aligned with the others.

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import { renderReportText } from "../notebook/cli/commands/run.ts";

const calc = (body: string) => "```lentil\n" + body + "\n```\n";

Deno.test("a prescription given for a single power names vertexRx, and the other way round", () => {
  const nb = Notebook.fromText(
    calc(
      'cornea = vertexPower(rx("-6.25 / -0.75 x 175"), 12 mm)\n' +
        'typed = vertexPower("-6.25 / -0.75 x 175", 12 mm)\n' +
        "single = vertexRx(-6.25 D, 12 mm)\nplain = vertexPower(-6.25 D, 12 mm)",
    ),
    "h.lentil.md",
  );
  const msg = (id: string) => nb.result(id)!.error?.message ?? "";
  assert.match(msg("cornea"), /got -6\.25 \/ -0\.75 × 175; a prescription moves with vertexRx\(/);
  assert.match(msg("typed"), /a prescription moves with vertexRx\(/);
  assert.match(msg("single"), /a single power moves with vertexPower\(/);
  assert.equal(nb.result("plain")!.error, undefined);
});

Deno.test("terminal: an error cell is padded like the others, its place under the message", () => {
  const nb = Notebook.fromText(
    calc('distance = 12 mm\ncornea = vertexPower(rx("-6.25 / -0.75 x 175"), distance)'),
    "h.lentil.md",
  );
  const lines = renderReportText(buildReport(nb), "T", 60).split("\n");
  const at = lines.findIndex((l) => l.startsWith("cornea"));
  assert.match(lines[at - 1], /^distance = 12 mm/);
  // The name padded to the same width, `!` where `=` is.
  assert.match(lines[at], /^cornea {3}! vertexPower: power: expected a power/);
  const rest = lines.slice(at + 1, lines.indexOf("", at));
  assert.ok(rest.length >= 2);
  // Continuation and place indented under the message, never at column 0.
  for (const l of rest) assert.match(l, /^ {11}\S/);
  assert.match(rest[rest.length - 1], /^ {11}at h\.lentil\.md:3:22$/);
  // The cells' part of the report ends where the cautions begin (no result used a source).
  const end = lines.findIndex((l) => l === "Sources" || l === "Cautions");
  for (const l of lines.slice(0, end)) assert.ok([...l].length <= 60, l);
});
