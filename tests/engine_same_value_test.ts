import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { sameValue } from "../notebook/engine/_same.ts";

const F = "~~~";

Deno.test("a cell computed again to the same value keeps it; a changed value or text does not", () => {
  const nb = Notebook.fromText(
    `${F}lentil\nage = 62 years\nband = {low: 1, high: 2}\nolder = {over60: age > 60 years}\nnext = age + 1 year\n${F}\n`,
    "s.lentil.md",
  );
  nb.evaluateAll();
  const band = nb.value("band");
  const next = nb.value("next");
  const older = nb.value("older");
  const recomputed = nb.update("age", "63 years");
  assert.ok(recomputed.includes("older"));
  assert.equal(nb.value("older"), older, "recomputed to the same record: the record it had");
  assert.equal(nb.value("band"), band, "not recomputed: the same object");
  assert.notEqual(nb.value("next"), next, "a new value");
  assert.equal(String(nb.value("next")), "64 years");
  nb.update("band", "{low: 1, high: 2}");
  assert.equal(nb.value("band"), band, "the same text and value: the value kept");
  nb.update("band", "{low: 1, high: 3}");
  assert.notEqual(nb.value("band"), band);
  assert.deepEqual(nb.value("band"), { low: 1, high: 3 });
});

Deno.test("sameValue compares by JSON within one prototype, tables and big arrays by identity", () => {
  assert.ok(sameValue(2, 2));
  assert.ok(sameValue(NaN, NaN));
  assert.ok(!sameValue(2, "2"));
  assert.ok(sameValue([1, { a: "x" }], [1, { a: "x" }]));
  assert.ok(!sameValue([1, 2], [1, 2, 3]));
  assert.ok(!sameValue({ a: 1 }, Object.assign(Object.create({ kind: "other" }), { a: 1 })));
  const big = Array.from({ length: 5000 }, (_, i) => i);
  assert.ok(!sameValue(big, [...big]), "too long to compare: treated as new");
  assert.ok(!sameValue(new Float64Array([1]), new Float64Array([1])));
});
