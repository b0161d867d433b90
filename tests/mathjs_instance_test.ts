/**
 * The formula language's own expression-library instance: built from the chosen factories
 * only, with the same results as the library in full, and refusing what a notebook should
 * never call.
 *
 * @module
 */

import assert from "node:assert/strict";
import { all, create } from "mathjs";
import { MATHJS_FACTORIES } from "../cells/_mathjs_files.ts";
import { getLanguage } from "../cells/language.ts";
import { formulaMath, quantity, toNumberIn, USABLE_UNITS } from "../cells/quantity.ts";
import { Notebook } from "../notebook/engine/engine.ts";
import { factoryFiles, filesModule } from "./_mathjs_files.ts";

Deno.test("the committed factory list is the one the function set needs", async () => {
  const expected = await factoryFiles();
  assert.deepEqual(
    MATHJS_FACTORIES,
    expected,
    "cells/_mathjs_files.ts is stale: run\n" +
      "deno run --allow-read --allow-write=cells/_mathjs_files.ts tests/_mathjs_files.ts\n" +
      filesModule(expected).slice(0, 200),
  );
});

Deno.test("results agree with the expression library in full (general-purpose reference)", () => {
  // Reference: mathjs 15 built from all its factories, the library's default.
  const ref = create(all, {});
  const lang = getLanguage();
  const cases = [
    "2 + 3 * 4",
    "2 ^ 10",
    "[1, 2; 3, 4] ^ 3",
    "[1, 2; 3, 4] ^ -1",
    "(2 mm) ^ 2",
    "sqrt(4 m^2)",
    "round(2.56789 mm, 2, mm)",
    "fix(2.7 mm, mm)",
    "1 mm == 0.1 cm",
    "7 mod 3",
    "sqrt(2) * cbrt(27)",
    "log(100, 10) + log10(1000) + log2(8) + exp(1)",
    "hypot(3, 4)",
    "round(2.5675, 2) + floor(-2.5) + ceil(2.1) + fix(-2.7)",
    "sin(30 deg) + cos(pi / 3) + tan(pi / 4) + atan2(1, 1)",
    "asin(0.5) + acos(0.5) + atan(1) + cot(1) + sec(1) + csc(1)",
    "(12 mm) to m",
    'number(25 cm, "mm")',
    "mean([1, 2, 3, 4]) + median([3, 1, 2]) + std([1, 2, 3]) + variance([1, 2, 3, 4])",
    "min(3, 1, 2) + max([1, 5, 2]) + sum([1, 2, 3]) + prod([2, 3])",
    "det([1, 2; 3, 4])",
    "inv([1, 2; 3, 4])",
    "dot([1, 2, 3], [4, 5, 6])",
    "cross([1, 0, 0], [0, 1, 0])",
    "size([1, 2; 3, 4])",
    "1:2:9",
    "[1, 2, 3] .* [4, 5, 6]",
    "[4, 6] ./ [2, 3]",
    "1 < 2 and not (3 <= 2) or 1 == 2 xor 1 != 2",
    "abs(-3) * sign(-2) + square(3) + cube(2)",
  ];
  for (const expr of cases) {
    const ours = lang.compile(lang.parse(expr)).evaluate({});
    const theirs = ref.evaluate(expr);
    assert.equal(String(ours), String(theirs), expr);
  }
});

Deno.test("functions a notebook does not need are refused at the cell, in words", () => {
  const nb = Notebook.fromText(
    [
      "```lentil",
      "a = bellNumbers(20000)",
      "b = zeros(20000, 20000)",
      "c = 1:1e9",
      "d = sum(1:10)",
      "r = random()",
      "```",
      "",
    ].join("\n"),
    "f.lentil.md",
  );
  assert.match(nb.result("a")!.error!.message, /unknown function "bellNumbers"/);
  assert.match(nb.result("b")!.error!.message, /unknown function "zeros"/);
  assert.match(nb.result("c")!.error!.message, /at most 100,000/);
  assert.equal(nb.result("d")!.error, undefined);
  assert.match(nb.result("r")!.error!.message, /unknown function "random"/);
});

Deno.test("quantities built from a unit read once are the library's own, and convert alike", () => {
  // Reference: the library's unit(value, text) and toNumber(text) on the same instance.
  const math = formulaMath();
  const values = [0, -0, 1, -2.5, 0.1, 1 / 3, 12.75, -1e-9, 1e12, 179.99999999999997];
  for (const unit of USABLE_UNITS) {
    for (const v of values) {
      const ours = quantity(v, unit);
      const theirs = math.unit(v + 0, unit);
      assert.deepStrictEqual(ours, theirs, `${v} ${unit}`);
      for (const to of USABLE_UNITS) {
        if (!theirs.equalBase(math.unit(1, to))) continue;
        assert.equal(toNumberIn(ours, to), theirs.toNumber(to), `${v} ${unit} → ${to}`);
      }
    }
  }
});
