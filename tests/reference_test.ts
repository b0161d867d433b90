// The README's formula reference is generated from the catalogue; it must be current.
import assert from "node:assert/strict";
import { referenceData, withReference } from "../notebook/reference.ts";
import { getLanguage } from "../cells/language.ts";

Deno.test("the README's formula reference is current (run deno task formulas)", async () => {
  const readme = await Deno.readTextFile(new URL("../README.md", import.meta.url));
  assert.equal(
    withReference(readme),
    readme,
    "README.md formula reference is stale: run `deno task formulas`",
  );
});

Deno.test("every catalogue example evaluates without error", () => {
  const lang = getLanguage();
  for (const f of referenceData().formulas) {
    assert.doesNotThrow(
      () => lang.compile(lang.parse(f.example)).evaluate(new Map(Object.entries(lang.constants))),
      f.name,
    );
  }
});
