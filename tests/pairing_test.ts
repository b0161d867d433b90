// Pairing two tables on key columns for paired analyses (two methods, two visits).
import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";

const NB = (second: string) =>
  "```lentil table visit1\nsubject | eye | rx [rx]\nA | R | -1.00 / -0.50 x 180\nA | L | -1.25 DS\n" +
  "B | R | +0.50 / -0.25 x 90\n```\n\n" +
  "```lentil table visit2\nsubject | eye | rx [rx]\n" + second + "```\n\n" +
  '```lentil\npaired = pairRows(visit1, visit2, "subject", "eye")\n' +
  "change = rxAgreement(paired.rx1, paired.rx2)\n```\n";

Deno.test("pairRows pairs on the keys whatever the row order, and counts rows without a partner", () => {
  const nb = Notebook.fromText(
    NB("B | R | +0.50 / -0.25 x 90\nA | R | -1.25 / -0.50 x 180\nC | L | plano\n"),
    "p.lentil.md",
  );
  const shown = nb.language.describe(nb.value("paired")).display;
  // A/L has no partner in visit2 and C/L none in visit1: two rows left out.
  assert.match(shown, /2 rows, 4 columns; 2 unreadable rows left out/);
  // Bland & Altman 1986, differences first − second on M: A/R −1.25 − (−1.50) = +0.25 and
  // B/R 0, so the bias is +0.125 D.
  const m = (nb.value("change") as Record<string, Record<string, unknown>>).M;
  assert.ok(Math.abs(nb.language.toNumberIn(m.bias, "D") - 0.125) < 1e-12);
});

Deno.test("a key that repeats within a table is an error naming it and its rows", () => {
  const nb = Notebook.fromText(NB("A | R | -1.00 DS\nA | R | -1.25 DS\n"), "d.lentil.md");
  assert.match(
    nb.result("paired")!.error!.message,
    /key subject = A, eye = R appears twice in table visit2 \(rows 1 and 2\)/,
  );
});
