// Extreme formulas and notebooks: long and deeply nested formulas, a huge string, a huge
// inline table, an endless table line and a long cycle. Each must give a positioned error
// at its own cell (also in `check`), leave every other cell evaluated, and stay fast.
import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import { renderReportText } from "../notebook/cli/commands/run.ts";

const F = "```";

const LONG: Record<string, string> = {
  "a sum of 2,000 terms": Array.from({ length: 2000 }, (_, i) => `${i}`).join(" + "),
  "2,000 unary minuses": "-".repeat(2000) + "1",
  "5,000 unary minuses": "-".repeat(5000) + "1",
  "3,000 of not": "not ".repeat(3000) + "1",
  "3,000 transposes": "[1]" + "'".repeat(3000),
  "3,000 conversions": "1 D" + " to D".repeat(3000),
  "3,000 indexes": "[1]" + "[1]".repeat(3000),
  "3,000 property reads": "ok1" + ".a".repeat(3000),
  "3,000 brackets": "(".repeat(3000) + "1" + ")".repeat(3000),
  "3,000 nested calls": "abs(".repeat(3000) + "1" + ")".repeat(3000),
  "a 10 MB string literal": `"${"a".repeat(10_000_000)}"`,
};

for (const [label, expression] of Object.entries(LONG)) {
  Deno.test(`${label}: an error at its cell, every other cell evaluated, check reports it`, () => {
    const text = `${F}lentil\nok1 = 1 D\nx = ${expression}\nok2 = ok1 + 1 D\n${F}\n`;
    const t0 = performance.now();
    const nb = Notebook.fromText(text, "long.lentil.md");
    const report = buildReport(nb);
    renderReportText(report, "long");
    const x = nb.result("x")!;
    assert.ok(x.error, "x is an error");
    assert.equal(x.error.line, 3);
    assert.ok(x.error.message.length < 400, "the message is short");
    assert.ok(!/Maximum call stack/.test(x.error.message), "in words, not the engine's");
    assert.equal(nb.result("ok1")?.error, undefined);
    assert.equal(nb.result("ok2")?.error, undefined);
    assert.ok(
      nb.diagnostics().some((d) => d.line === 3 && d.severity === "error"),
      "check sees it",
    );
    assert.ok(performance.now() - t0 < 5000, "within seconds");
  });
}

Deno.test("an inline table of 130,000 rows is read", () => {
  const rows = Array.from({ length: 130_000 }, (_, i) => `${i} | ${i % 7}`).join("\n");
  const nb = Notebook.fromText(
    `${F}lentil table t\nx | y\n${rows}\n${F}\n${F}lentil\nn = t\n${F}\n`,
    "rows.lentil.md",
  );
  assert.equal(nb.result("t")?.error, undefined);
  assert.match(buildReport(nb).cells[0].display, /130,000 rows/);
});

Deno.test("a table line of 1,000,000 fields is cut and reported at once", () => {
  const wide = Array.from({ length: 1_000_000 }, (_, i) => `c${i}`).join(" | ");
  for (
    const text of [
      `${F}lentil table t\n${wide}\n1\n${F}\n`,
      `${F}lentil table t\nx\n${wide}\n${F}\n`,
    ]
  ) {
    const t0 = performance.now();
    const nb = Notebook.fromText(`${text}${F}lentil\nn = 1\n${F}\n`, "wide.lentil.md");
    assert.ok(nb.diagnostics().some((d) => /1000000 fields; at most 1000/.test(d.message)));
    assert.equal(nb.result("n")?.error, undefined);
    assert.ok(performance.now() - t0 < 5000, "bounded quickly");
  }
});

Deno.test("a cycle of 5,000 cells is reported once: output grows with its length, not its square", () => {
  const N = 5000;
  const cyc = Array.from({ length: N }, (_, i) => `c${i} = c${(i + 1) % N} + 1`).join("\n");
  const nb = Notebook.fromText(`${F}lentil\nok = 1\n${cyc}\n${F}\n`, "cycle.lentil.md");
  assert.equal(nb.result("ok")?.error, undefined);
  const out = renderReportText(buildReport(nb), "cycle");
  assert.ok(out.length < 400 * N, `linear output (${out.length} characters)`);
  const full = nb.results().filter((r) => r.error?.message.includes(" → "));
  assert.equal(full.length, 1, "the whole path once");
  assert.match(nb.result("c7")!.error!.message, /one of the 5000 cells of the cycle through c0/);
  // A short cycle is still written out at every member.
  const small = Notebook.fromText(`${F}lentil\na = b\nb = a\n${F}\n`, "s.lentil.md");
  assert.match(small.result("b")!.error!.message, /^cycle: a → b → a/);
});
