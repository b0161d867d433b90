// Messages in the user's words: no message shows the expression library's function names
// or types; each says what is wrong in the notebook's terms and how to fix it, with numbers
// shown by the display rules.

import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";
import { plainMathMessage } from "../cells/language.ts";

/** Library words that must never reach a user. */
const LIBRARY_WORDS =
  /addScalar|multiplyScalar|subtractScalar|divideScalar|unaryMinus|DenseMatrix|Matrix|BigNumber|Complex|Cannot clone|\bUnit\b|identifier|RxValue|typed-function/;

const errorOf = (lines: string) => {
  const nb = Notebook.fromText(
    "~~~lentil table t\nsph [D] | r [rx]\n-2 | -2.00 / -0.50 x 90\n-1 | -1.00 DS\n~~~\n" +
      `~~~lentil\n${lines}\n~~~\n`,
    "m.lentil.md",
  );
  return (id: string) => {
    const e = nb.result(id)!.error;
    assert.ok(e, `${id} should fail`);
    assert.doesNotMatch(e.message, LIBRARY_WORDS, e.message);
    return e;
  };
};

Deno.test("the cases seen: a number plus a power, a mean of a list of prescriptions, to of a prescription", () => {
  const err = errorOf(
    'va = toLogMAR(acuity("6/12"))\nx = va + 1 D\n' +
      'avg = meanRx([rx("-1.00 DS"), rx("-2.00 DS")])\n' +
      'y = rx("-2.00 / -0.50 x 90") to D',
  );
  const x = err("x");
  // logMAR of 6/12 is log10(2) = 0.30 (Bailey & Lovie 1976 notation).
  assert.match(
    x.message,
    /cannot add \+1\.00 D to 0\.30\d*: 0\.30\d* is a number without a unit; give it one/,
  );
  assert.equal(x.kind, "unit");
  assert.equal(x.col, "x = va ".length + 1); // at the +
  const y = err("y");
  assert.match(
    y.message,
    /^to gives a quantity in another unit, and -2\.00 \/ -0\.50 × 90 is not a quantity: .*sphericalEquivalent/,
  );
});

Deno.test("a mean prescription of a list of prescriptions works", () => {
  const nb = Notebook.fromText(
    '~~~lentil\navg = meanRx([rx("-1.00 DS"), rx("-2.00 DS")])\nse = avg.M\n~~~\n',
    "l.lentil.md",
  );
  // Mean of −1.00 and −2.00 DS: M = −1.50 D (Thibos 1997, mean of power vectors).
  assert.equal(nb.result("avg")!.error, undefined, nb.result("avg")!.error?.message);
  assert.deepEqual(nb.language.quantityParts(nb.value("se")), { value: -1.5, unit: "D" });
});

Deno.test("arithmetic on values of other kinds says how to get a number", () => {
  const err = errorOf(
    'a = rx("-1.00 DS") + rx("-2.00 DS")\nb = acuity("6/12") + 1\nc = sqrt(rx("-1.00 DS"))\n' +
      'd = mean(t.r)\ntxt = "abc" * 2\nf = 1 D > 2 mm\ng = 1 mm + 2\n' +
      "near = tentativeAdd(55 years, 40 cm) + 1 D\nh = vertexPower(-2 D, 38.73592452822642 mm)",
  );
  assert.match(
    err("a").message,
    /cannot add -2\.00 DS to -1\.00 DS: combine prescriptions with combine/,
  );
  assert.match(
    err("b").message,
    /cannot add 1 to 6\/12: take a number from it first with toLogMAR/,
  );
  assert.match(err("c").message, /^sqrt cannot take -1\.00 DS/);
  assert.match(
    err("d").message,
    /mean cannot take a column of prescriptions \(r\): for prescriptions use meanRx\(t\.r\)/,
  );
  assert.match(err("txt").message, /text "abc".*write the number without quotes/);
  assert.match(
    err("f").message,
    /cannot compare \+1\.00 D with 2(\.00)? mm: a power and a length are different kinds/,
  );
  assert.match(
    err("g").message,
    /cannot add 2 to 1(\.00)? mm: 2 is a number without a unit; give it one \(2 mm\)/,
  );
  assert.match(err("near").message, /read one of its parts, e\.g\. .*\.add \(parts: add, needed/);
  // Numbers in messages follow the display rules, never a raw float.
  assert.match(err("h").message, /38\.74 mm is outside the accepted range 0–25 mm/);
});

Deno.test("the library's refusals are put in words when no operation can be blamed", () => {
  const m = plainMathMessage(
    "Unexpected type of argument in function addScalar (expected: number or Complex or BigNumber, actual: Unit, index: 1)",
  );
  assert.doesNotMatch(m, LIBRARY_WORDS);
  assert.match(m, /^\+ cannot take a quantity as its 2nd operand/);
  const t = plainMathMessage(
    "Unexpected type of argument in function to (expected: Array or DenseMatrix or Matrix, actual: Unit | identifier, index: 1)",
  );
  assert.doesNotMatch(t, LIBRARY_WORDS);
  assert.doesNotMatch(
    plainMathMessage("Cannot clone: unknown type of value (value: -1.00 DS)"),
    LIBRARY_WORDS,
  );
});

Deno.test("a logMAR tolerance written with the word is explained: logMAR values are numbers", () => {
  const nb = Notebook.fromText("~~~lentil\ntol = 0.02 logMAR\n~~~\n", "w.lentil.md");
  const e = nb.result("tol")!.error!;
  assert.match(e.message, /"logMAR" is not a unit: logMAR values are plain numbers/);
  assert.equal(e.col, "tol = 0.02 ".length + 1);
});

Deno.test("a list of prescriptions or acuities is shown, indexed and summarised", () => {
  const nb = Notebook.fromText(
    '~~~lentil\nlist = [rx("-1.00 DS"), rx("-2.00 DS")]\nsecond = list[2]\n' +
      'spread = vectorStats(list)\nvas = [acuity("6/6"), acuity("6/12")]\n~~~\n',
    "list.lentil.md",
  );
  for (const id of ["list", "second", "spread", "vas"]) {
    assert.equal(nb.result(id)!.error, undefined, `${id}: ${nb.result(id)!.error?.message}`);
    nb.language.describe(nb.value(id), nb.display);
  }
  assert.equal(nb.language.describe(nb.value("second")).display, "-2.00 DS");
});
