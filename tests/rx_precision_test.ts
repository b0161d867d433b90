// Instrument precision and the decimal comma in prescriptions and [rx] columns.
import assert from "node:assert/strict";
import { parsePrescription } from "../lib/prescription.ts";
import { formatPrescription, signedPower } from "../lib/prescription_format.ts";
import { LentilParseError } from "../lib/errors.ts";
import { getLanguage } from "../cells/language.ts";
import { Notebook } from "../notebook/engine/engine.ts";

const lang = getLanguage();
const show = (expr: string) =>
  lang.describe(lang.compile(lang.parse(expr)).evaluate({ ...lang.constants })).display;

Deno.test("eighth-dioptre powers, as instruments write them, are read to three decimals", () => {
  // Autorefractors and focimeters print 0.125 D steps with three decimals (common practice,
  // no source)
  assert.deepEqual(parsePrescription("-3.375 / -0.125 x 90"), {
    sphere: -3.375,
    cylinder: -0.125,
    axis: 90,
  });
  assert.equal(parsePrescription("+0.875 DS").sphere, 0.875);
  assert.equal(parsePrescription("-1.12 / -0.37 x 10").cylinder, -0.37);
  assert.throws(() => parsePrescription("-3.3755 DS"), /at most three decimals/);
  // written back with its third decimal, and only then
  assert.equal(
    formatPrescription(parsePrescription("-3.375 / -0.125 x 90")),
    "-3.375 / -0.125 × 90",
  );
  assert.equal(signedPower(-2.25), "-2.25");
  assert.equal(signedPower(1 / 3), "+0.33");
  // in the notebook: in the power step, with the exact figure beside it
  assert.equal(
    show('rx("-3.375 / -0.125 x 90")'),
    "-3.25 / -0.25 × 90 (exact -3.375 / -0.125 × 90)",
  );
});

Deno.test("decimal comma: read where unambiguous, a clear message where not", () => {
  // The decimal comma is the usual mark in much of Europe (common practice, no source)
  assert.deepEqual(parsePrescription("-2,00 / -0,50 x 90"), {
    sphere: -2,
    cylinder: -0.5,
    axis: 90,
  });
  assert.deepEqual(parsePrescription("R: +1,25 DS add +2,00 1,5 BU"), {
    sphere: 1.25,
    cylinder: 0,
    axis: 180,
    add: 2,
    prism: { horizontal: 0, vertical: 1.5 },
    eye: "R",
  });
  // a comma that separates, with a space, is still a separator
  assert.equal(parsePrescription("-2.00, -0.50 x 90").cylinder, -0.5);
  // both marks in one text: a comma between digits could be either
  for (const text of ["-2.00,0.50 x 90", "-2.00 / -0,50 x 90"]) {
    assert.throws(
      () => parsePrescription(text),
      (e: unknown) =>
        e instanceof LentilParseError &&
        /both decimal points and a comma between digits/.test(e.message) &&
        /write one decimal mark throughout/.test(e.message),
      text,
    );
  }
});

Deno.test("[rx] columns take instrument precision; repeated row problems collapse into one", () => {
  const rows = Array.from({ length: 40 }, (_, i) => `S${i} | -3.375 / -0.125 x ${i + 1}`);
  const good = Notebook.fromText(
    "```lentil table auto\nsubject | rx [rx]\n" + rows.join("\n") + "\n```\n\n" +
      "```lentil\naverage = meanRx(auto.rx)\n```\n",
    "a.lentil.md",
  );
  assert.equal(good.diagnostics().filter((d) => d.severity === "error").length, 0);
  // forty cells with four decimals: one message with the count and the first rows
  const bad = Notebook.fromText(
    "```lentil table auto\nsubject | rx [rx]\n" +
      rows.map((r) => r.replace("-3.375", "-3.3755")).join("\n") + "\n```\n",
    "b.lentil.md",
  );
  const problems = bad.diagnostics().filter((d) => /at most three decimals/.test(d.message));
  assert.equal(problems.length, 1, problems.map((d) => d.message).join("\n"));
  assert.match(problems[0].message, /40 rows with this problem, the first rows 1, 2, 3, 4, 5/);
});
