// Parts of a result are usable by later cells: `cell.part` reads a typed value's declared
// parts, a record's fields and a table's columns, and names the parts when one is missing.

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { getLanguage } from "../cells/language.ts";
import { partNames } from "../cells/_parts.ts";

const lang = getLanguage();
const TRIALS = "~~~lentil table trials\nlens [D] | va\n" +
  "+1.00 | 0.20\n+0.75 | 0.06\n+0.50 | -0.06\n+0.25 | -0.10\n0.00 | -0.10\n-0.25 | -0.10\n~~~\n";

Deno.test("the endpoint of an endpoint cell is usable by the next cell", () => {
  // Most plus lens with the best acuity within one letter: +0.25 D (most-plus endpoint
  // rule, common practice, no source; invented readings).
  const nb = Notebook.fromText(
    TRIALS + "~~~lentil\nmpmva = endpoint(trials)\nfinal = mpmva.endpoint\n" +
      "near = mpmva.endpoint + 2.00 D\nwide = mpmva.plateauWidth\n~~~\n",
    "p.lentil.md",
  );
  assert.equal(nb.result("final")!.error, undefined);
  assert.deepEqual(lang.quantityParts(nb.value("final")), { value: 0.25, unit: "D" });
  assert.deepEqual(lang.quantityParts(nb.value("near")), { value: 2.25, unit: "D" });
  assert.deepEqual(lang.quantityParts(nb.value("wide")), { value: 0.5, unit: "D" });
});

Deno.test("a missing part is refused with the parts there are", () => {
  const nb = Notebook.fromText(
    TRIALS +
      "~~~lentil\nmpmva = endpoint(trials)\nx = mpmva.best\nnear = tentativeAdd(55 years, 40 cm)\ny = near.adds\n~~~\n",
    "q.lentil.md",
  );
  assert.match(
    nb.result("x")!.error!.message,
    /has no part "best"; its parts are endpoint, endpointLogMAR, bestLogMAR/,
  );
  assert.equal(nb.result("x")!.error!.kind, "name");
  assert.match(
    nb.result("y")!.error!.message,
    /has no part "adds"; its parts are add, needed, demand/,
  );
});

/** The part names a formula's reference line lists for its record result. */
function listedParts(doc: string): string[] {
  const m = /^(?:a )?record(?: of)?[: ]\s*(.*)$/.exec(doc);
  if (!m) return [];
  return m[1].replace(/\([^)]*\)/g, "").split(/,|\band\b/).map((s) => s.trim())
    .filter((s) => /^[A-Za-z][A-Za-z0-9]*$/.test(s));
}

Deno.test("every record part listed in the reference is reachable as cell.part", () => {
  let checked = 0;
  for (const f of lang.catalogue.formulas.values()) {
    const listed = listedParts(f.returns.doc);
    const probe = Notebook.fromText(`~~~lentil\nr = ${f.example}\n~~~\n`, "r.lentil.md");
    const value = probe.value("r");
    if (value === undefined) continue;
    // Every part a later cell can name (a table column named in words, "mean ± SD", is
    // read as a column of the table, not with a dot).
    const keys = [...new Set([...listed, ...partNames(value)])]
      .filter((k) => /^[A-Za-z_][A-Za-z0-9_]*$/.test(k));
    if (!keys.length) continue;
    const text = `~~~lentil\nr = ${f.example}\n${
      keys.map((k, i) => `p${i} = r.${k}`).join("\n")
    }\n~~~\n`;
    const nb = Notebook.fromText(text, "r.lentil.md");
    keys.forEach((k, i) => {
      const res = nb.result(`p${i}`)!;
      assert.equal(res.error, undefined, `${f.name}: r.${k}: ${res.error?.message}`);
      checked++;
    });
  }
  assert.ok(checked > 30, `${checked} parts read`);
});
