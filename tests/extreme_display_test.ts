// Extreme values on display: powers near the largest double, lists holding infinity, and
// control characters from a notebook on the terminal.
import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import { renderReportText } from "../notebook/cli/commands/run.ts";
import { terminalSafe } from "../notebook/cli/command.ts";
import { formatPower, signed } from "../cells/display.ts";

const F = "```";

Deno.test("a power near the largest double shows its digits, never +Infinity D", () => {
  assert.equal(signed(1e308), "+1.00e+308");
  assert.equal(formatPower(-1e308, 0.25), "-1.00e+308 D");
  const nb = Notebook.fromText(`${F}lentil\na = 1e308 D\nk = a + 0 D\n${F}\n`, "a.lentil.md");
  const out = renderReportText(buildReport(nb), "t");
  assert.ok(!out.includes("Infinity"), out);
  assert.match(out, /k +=.*e\+308 D/);
});

Deno.test("a list or matrix holding infinity is an error, as a single infinity is", () => {
  const nb = Notebook.fromText(
    `${F}lentil\nf = [Infinity, 1]\ng = [1e308 D * 10]\nh = [[1, 2], [3, -Infinity]]\nok = [1, 2]\n${F}\n`,
    "a.lentil.md",
  );
  for (const id of ["f", "g", "h"]) {
    assert.match(nb.result(id)?.error?.message ?? "", /infinite/, id);
  }
  assert.equal(nb.result("ok")?.error, undefined);
});

Deno.test("control characters from a notebook are shown escaped on the terminal, never acted on", () => {
  const nb = Notebook.fromText(
    `${F}lentil\ns = "x\u001b[2Jy\u0007z\u202e"\nq = 1 # note \u001b]0;title\u0007\n${F}\n`,
    "a.lentil.md",
  );
  const shown = terminalSafe(renderReportText(buildReport(nb), "t"));
  // deno-lint-ignore no-control-regex
  assert.ok(!/[\u0000-\u0008\u000b-\u001f\u007f\u202e]/.test(shown), shown);
  assert.ok(shown.includes("\\u001b[2J"));
  assert.equal(terminalSafe("line\n\tnext"), "line\n\tnext", "line breaks and tabs stay");
});
