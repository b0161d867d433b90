// Numbers without units: a parameter declared with a unit takes a quantity only; a bare
// number is refused at the cell, with the fix written out. Unitless parameters take numbers.

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";

const cell = (expr: string) => {
  const nb = Notebook.fromText(`~~~lentil\nx = ${expr}\n~~~\n`, "u.lentil.md");
  return { result: nb.result("x")!, nb };
};

Deno.test("a bare number for a parameter with a unit is an error that shows the unit", () => {
  const a = cell("vertexPower(-10 D, 12)").result;
  assert.equal(a.error?.kind, "argument");
  assert.match(
    a.error!.message,
    /^vertexPower: from \(vertex distance[^)]*\) needs a unit, e\.g\. 12 mm$/,
  );
  assert.equal(a.error!.line, 2);
  // At the argument to fix: "x = vertexPower(-10 D, " is 23 characters.
  assert.equal(a.error!.col, 24);
  // 1.2 would have been read as 1.2 mm: refused, never silently taken.
  assert.match(
    cell("vertexPower(-10 D, 1.2)").result.error!.message,
    /needs a unit, e\.g\. 1\.2 mm/,
  );
  assert.match(
    cell("vertexPower(-10, 12 mm)").result.error!.message,
    /power \(.*\) needs a unit, e\.g\. -10 D/,
  );
  assert.match(
    cell("spheroCylinder(-2 D, -0.5 D, 90)").result.error!.message,
    /axis .* e\.g\. 90 deg/,
  );
});

Deno.test("the same call with units works, and converts compatible units", () => {
  // Vertex formula F' = F / (1 − dF): −10 D at 12 mm is −8.93 D at the cornea
  // (source: vertex-formula, hand computation −10 / 1.12).
  const { result, nb } = cell("vertexPower(-10 D, 1.2 cm)");
  const v = nb.language.quantityParts(result.value)!;
  assert.ok(Math.abs(v.value - -8.9286) < 1e-4);
});

Deno.test("parameters declared unitless take bare numbers", () => {
  // Index 1.5 is a pure number: accepted (lens thickness takes index, then lengths).
  const { result } = cell('centreThickness(rx("-4.00"), 1.5, 50 mm, 2 mm)');
  assert.equal(result.error, undefined);
  assert.match(
    cell('centreThickness(rx("-4.00"), 1.5, 50, 2 mm)').result.error!.message,
    /diameter .* needs a unit, e\.g\. 50 mm/,
  );
});

Deno.test("a computed column passing a bare number is refused row by row with the fix", () => {
  const nb = Notebook.fromText(
    "~~~lentil table t\nF [D] | d\n-10 | 12\n~~~\n~~~lentil\nt.cl = vertexPower(F, d)\n~~~\n",
    "c.lentil.md",
  );
  assert.match(
    nb.result("t.cl")!.error!.message,
    /needs a unit, e\.g\. 12 mm; column d of table t has no unit: declare it in the header, d \[mm\]/,
  );
});
