// Named options of formulas: settings go by name in a record after the arguments, a
// misspelt name lists the valid ones, and mode words by position are refused.

import assert from "node:assert/strict";
import { getLanguage } from "../cells/language.ts";
import { Column, makeTable } from "../cells/table.ts";
import { defineFormula } from "../cells/catalogue.ts";
import { referenceData, referenceMarkdown } from "../notebook/reference.ts";
import { Notebook } from "../notebook/engine/engine.ts";

const lang = getLanguage();
// Trial lenses and logMAR readings of a young eye (invented): best acuity −0.10 from
// +0.25 D down to −0.50 D; +0.50 D reads −0.06 (two letters worse).
const trials = makeTable("trials", [
  new Column("lens", "quantity", "D", new Float64Array([1, 0.75, 0.5, 0.25, 0, -0.25, -0.5])),
  new Column("va", "number", "", new Float64Array([0.2, 0.06, -0.06, -0.1, -0.1, -0.1, -0.1])),
]);
const run = (expr: string) =>
  lang.compile(lang.parse(expr)).evaluate({ ...lang.constants, trials });
const endpointOf = (expr: string) =>
  (lang.describe(run(expr)).value as { endpoint: number }).endpoint;

Deno.test("endpoint takes its settings by name", () => {
  // Most plus lens with the best acuity: within 0.02 logMAR of the best (one letter, the
  // default) that is +0.25 D; within 0.05 logMAR, +0.50 D (-0.06 is 0.04 from -0.10).
  // Method: the most-plus endpoint rule (common practice, no source).
  assert.equal(endpointOf("endpoint(trials)"), 0.25);
  assert.equal(endpointOf('endpoint(trials, "lens", "va", {tolerance: 0.05})'), 0.5);
  assert.equal(endpointOf("endpoint(trials, {tolerance: 0.05})"), 0.5);
  assert.equal(
    endpointOf('endpoint(trials, {tolerance: 0.02, model: "hinge", age: 22 years})'),
    0.25,
  );
});

Deno.test("a misspelt option is refused with the valid ones", () => {
  assert.throws(
    () => run("endpoint(trials, {tolerence: 0.05})"),
    /endpoint: no option "tolerence" \(did you mean tolerance\?\); the options are tolerance, repeats, model, age, chart/,
  );
  assert.throws(
    () => run('endpoint(trials, {model: "curved"})'),
    /option model: "curved" is not one of "auto", "peak", "hinge"/,
  );
  assert.throws(
    () => run("endpoint(trials, {age: 22})"),
    /option age \(.*\) needs a unit, e.g. 22 years/,
  );
});

Deno.test("mode words by position are refused, with the named form", () => {
  assert.throws(
    () => run('endpoint(trials, "lens", "va", 0.02, "report", "auto")'),
    /endpoint: takes at most 3 arguments before its options, got 6; give settings by name .*\{tolerance: 0.02\}/,
  );
});

Deno.test("a record of options anywhere but last, or for a formula without options, is explained", () => {
  assert.throws(
    () => run("vertexPower(-10 D, {from: 12 mm})"),
    /vertexPower: from: expected a length in mm .*got a record \(vertexPower takes no named options\)/,
  );
});

Deno.test("the reference documents each option", () => {
  const md = referenceMarkdown();
  assert.match(
    md,
    /#### `endpoint\(trials, powerColumn\?, acuityColumn\?, \{tolerance, repeats, model, age, chart\}\)`/,
  );
  assert.match(md, /\| model \| text: "auto", "peak", "hinge" \(default "auto"\) \|/);
  const ep = referenceData().formulas.find((f) => f.name === "endpoint")!;
  assert.deepEqual(ep.options.map((o) => o.name), [
    "tolerance",
    "repeats",
    "model",
    "age",
    "chart",
  ]);
});

Deno.test("the catalogue refuses a malformed option", () => {
  const base = {
    name: "twiceOver",
    group: "example",
    summary: "x",
    params: [],
    returns: { type: "number", doc: "x" },
    sources: ["common-practice"],
    example: "twiceOver()",
    fn: () => 1,
  };
  assert.throws(
    () =>
      defineFormula({
        ...base,
        options: [{ name: "a", type: "number", doc: "" }, { name: "a", type: "number", doc: "" }],
      }),
    /declared twice/,
  );
  assert.throws(
    () =>
      defineFormula({ ...base, options: [{ name: "w", type: "number", choices: ["x"], doc: "" }] }),
    /choices but is not text/,
  );
});

Deno.test("every formula's settings go by name; by position they are refused", () => {
  // Rounding a power to the 0.25 D step toward plus (common practice, no source).
  const r = run('roundToStep(rx("-4.10 DS"), {step: 0.25 D, rule: "plus"})');
  assert.match(lang.describe(r).display, /^-4.00 DS/);
  for (
    const expr of [
      'roundToStep(rx("-4.10 DS"), 0.25 D)',
      "airyDisc(3 mm, 555 nm)",
      "throughFocus(-1 D, 4 mm, 1 D)",
      "logMARChart(1.0, 14)",
      "tentativeAdd(55 years, 40 cm, 0.5)",
      'centreThickness(rx("-4.00"), 1.5, 50 mm, 2 mm, 4 D)',
    ]
  ) {
    assert.throws(() => run(expr), /before its options, got \d+; give settings by name/, expr);
  }
  const withOptions = [...lang.catalogue.formulas.values()].filter((f) => f.options?.length);
  assert.ok(withOptions.length >= 20, `${withOptions.length} formulas with options`);
});

Deno.test("an option error points at the option", () => {
  const nb = Notebook.fromText(
    "~~~lentil table trials\nlens [D] | va\n+0.25 | 0.00\n0.00 | 0.00\n~~~\n" +
      "~~~lentil\nep = endpoint(trials, {tolerence: 0.05})\n~~~\n",
    "o.lentil.md",
  );
  const e = nb.result("ep")!.error!;
  assert.equal(e.kind, "argument");
  // "ep = endpoint(trials, {" is 23 characters: the misspelt name starts at column 24.
  assert.equal(e.col, 24);
});
