import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";

Deno.test("a cell with an error puts no source in the numbered list", () => {
  const nb = Notebook.fromText(
    "~~~lentil\nF = -8 D\nbad = vertexPower(F, nothing)\ngood = vertexPower(F, 12 mm)\n~~~\n",
    "e.lentil.md",
  );
  const report = buildReport(nb);
  const bad = report.cells.find((c) => c.id === "bad")!;
  const good = report.cells.find((c) => c.id === "good")!;
  assert.ok(bad.error);
  assert.deepEqual(bad.notes, []);
  assert.deepEqual(good.notes, [1]);
  assert.deepEqual(report.sources.map((s) => s.id), ["vertex-formula"]);
  const alone = buildReport(
    Notebook.fromText("~~~lentil\nbad = vertexPower(-8 D, nothing)\n~~~\n", "e.lentil.md"),
  );
  assert.deepEqual(alone.sources, [], "no result used a source");
});
