// Seeded fuzzing of the reader and the engine over mutated starters: every mutation must
// read, evaluate and render (as `run` prints it) without an exception, and quickly. The
// mutations are generated from a fixed seed, so a failure names a case that reproduces.
import assert from "node:assert/strict";
import { seeded } from "../lib/seeded.ts";
import { parseNotebook } from "../notebook/format/parse.ts";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import { renderReportText } from "../notebook/cli/commands/run.ts";

const SEEDS = new URL("../seeds/", import.meta.url);
const STARTERS = ["blank", "clinical-case", "dispense-check", "refraction-study"].map((n) =>
  Deno.readTextFileSync(new URL(`${n}.lentil.md`, SEEDS))
);
// The study's CSV, cut to its first rows: enough for every column kind, fast to evaluate.
const CSV = Deno.readTextFileSync(new URL("refraction-study.csv", SEEDS)).split("\n").slice(0, 40)
  .join("\n") + "\n";

const PIECES = [
  "(",
  ")",
  "[",
  "]",
  "|",
  "\\|",
  '"',
  "'",
  "#",
  "=",
  "+",
  "-",
  "*",
  "/",
  "^",
  ".",
  ",",
  ";",
  " to D",
  " D",
  " mm",
  "1e308",
  "-0",
  "NaN",
  "Infinity",
  "08123",
  "\r\n",
  "\n",
  "\t",
  "```",
  "```lentil\n",
  "```lentil table t\n",
  "~~~",
  "---\n",
  "file: x.csv",
  "bad rows: skip",
  "\u0000",
  "\u001b[2J",
  "\u202e",
  "é",
  "𝔸",
  "\uFEFF",
  "x = ",
  "not ",
  "[1]",
  ".a",
  "sum(",
  'rx("-1.00 DS")',
  "vertexPower(",
  "mean(",
  "1:100000",
];

/** One mutation of `text`, chosen by `rand`. */
function mutate(text: string, rand: () => number): string {
  const at = Math.floor(rand() * (text.length + 1));
  const len = Math.floor(rand() * 40);
  switch (Math.floor(rand() * 6)) {
    case 0: // delete a span
      return text.slice(0, at) + text.slice(at + len);
    case 1: // duplicate a span
      return text.slice(0, at + len) + text.slice(at, at + len) + text.slice(at + len);
    case 2: // insert a piece
      return text.slice(0, at) + PIECES[Math.floor(rand() * PIECES.length)] + text.slice(at);
    case 3: { // swap two lines
      const lines = text.split("\n");
      const i = Math.floor(rand() * lines.length);
      const j = Math.floor(rand() * lines.length);
      [lines[i], lines[j]] = [lines[j], lines[i]];
      return lines.join("\n");
    }
    case 4: // repeat a piece many times (long and deep formulas)
      return text.slice(0, at) + PIECES[Math.floor(rand() * PIECES.length)].repeat(1 + len * 20) +
        text.slice(at);
    default: // replace a character by a random one
      return text.slice(0, at) + String.fromCharCode(Math.floor(rand() * 0x3000)) +
        text.slice(at + 1);
  }
}

Deno.test("fuzz: 300 mutated starters read, evaluate and render without an exception", () => {
  const rand = seeded(20261202);
  const host = { readText: () => CSV };
  const t0 = performance.now();
  let cells = 0;
  for (let n = 0; n < 300; n++) {
    let text = STARTERS[n % STARTERS.length];
    const steps = 1 + Math.floor(rand() * 4);
    for (let k = 0; k < steps; k++) text = mutate(text, rand);
    try {
      parseNotebook(text, "fuzz.lentil.md");
      const nb = Notebook.fromText(text, "fuzz.lentil.md", { host });
      const report = buildReport(nb);
      renderReportText(report, "fuzz");
      nb.diagnostics();
      cells += report.cells.length;
    } catch (e) {
      assert.fail(
        `case ${n} threw ${(e as Error).stack?.slice(0, 600)}\n--- text:\n${text.slice(0, 2000)}`,
      );
    }
  }
  assert.ok(cells > 300, "the mutations still hold cells");
  assert.ok(performance.now() - t0 < 60_000, "within the test time budget");
});
