// A cell or table wrongly named like a unit, function or constant is reported at its line, and
// the word keeps its meaning in every other formula.
import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";

Deno.test("a cell named like a unit or constant does not capture that word elsewhere", () => {
  const nb = Notebook.fromText(
    "```lentil\nmm = 5\npi = 3\na = 1 mm\nb = pi * 2\n```\n\n```lentil table deg\nx [mm]\n1\n```\n\n" +
      "```lentil\nd = 30 deg\n```\n",
    "names.lentil.md",
  );
  assert.match(nb.result("mm")!.error!.message, /"mm" is a unit/);
  assert.match(nb.result("pi")!.error!.message, /"pi" is a unit/);
  assert.match(nb.result("deg")!.error!.message, /choose another table name/);
  assert.equal(nb.result("a")!.error, undefined);
  assert.equal(nb.language.describe(nb.value("a")).display, "1.00 mm");
  assert.ok(Math.abs((nb.value("b") as number) - 2 * Math.PI) < 1e-12);
  assert.equal(nb.result("d")!.error, undefined);
  assert.deepEqual(nb.update("a", "2 mm"), ["a"]);
});
