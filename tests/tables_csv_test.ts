import assert from "node:assert/strict";
import type { Column } from "../cells/table.ts";
import { tableInfo } from "../cells/table.ts";
import { bothWays, csvNotebook, diagLines } from "./_csv_helpers.ts";

const col = (v: unknown) => Array.from((v as Column).data as ArrayLike<unknown>);

Deno.test("a declared column missing from the CSV is named with the header it has", async () => {
  // common practice, no source
  const text = "~~~lentil table eyes\nfile: eyes.csv\nsph [D] | cyl [D] | axis [deg]\n~~~\n";
  const { whole, streamed } = await bothWays(text, { "eyes.csv": "sph,cyl\n-1,-0.5\n" });
  for (const nb of [whole, streamed]) {
    const lines = diagLines(nb);
    assert.ok(
      lines.some((l) =>
        /study\.lentil\.md:3:\d+: column axis is declared but eyes\.csv has no such column \(its header has: sph, cyl\)/
          .test(l)
      ),
      lines.join("\n"),
    );
  }
});

Deno.test("a refraction column without a unit is refused at its header cell", async () => {
  // common practice, no source: sphere and cylinder in D, axis in degrees
  const { whole, streamed } = await bothWays(csvNotebook(), {
    "eyes.csv": "id,sph,cyl [D]\n1,-1.00,-0.50\n",
  });
  for (const nb of [whole, streamed]) {
    const lines = diagLines(nb);
    assert.equal(lines.length, 1, lines.join("\n"));
    assert.match(
      lines[0],
      /^error eyes\.csv:1:2: column sph: a refraction column needs its unit: write sph \[D\]/,
    );
  }
});

Deno.test("values out of range are bad rows with their line and column", async () => {
  // ISO 13666 axis notation (from memory): axis 0–180
  const csv = "sph [D],cyl [D],axis [deg]\n-1.00,-0.50,90\n-2.00,-0.75,200\n-55,-0.25,10\n";
  const { whole, streamed } = await bothWays(csvNotebook(), { "eyes.csv": csv });
  for (const nb of [whole, streamed]) {
    assert.deepEqual(diagLines(nb), [
      "error eyes.csv:3:3: column axis: 200 deg is outside the accepted range 0 to 180 deg",
      "error eyes.csv:4:1: column sph: -55 D is outside the accepted range -40 to 40 D",
    ]);
    assert.match(nb.result("eyes")!.error!.message, /^table eyes: row 2: column axis: 200 deg/);
  }
});

Deno.test("bad rows: skip excludes and counts them, and says which rows", async () => {
  // common practice, no source
  const csv = "sph [D],cyl [D],axis [deg]\n-1.00,-0.50,90\nabc,-0.75,20\n-2.00,-0.25\n-3,0,180\n";
  const { whole, streamed } = await bothWays(csvNotebook(["bad rows: skip"]), { "eyes.csv": csv });
  for (const nb of [whole, streamed]) {
    const t = nb.value("eyes");
    assert.equal(tableInfo(t)!.rowCount, 2);
    assert.equal(tableInfo(t)!.excluded, 2);
    assert.match(
      nb.language.describe(t).display,
      /2 rows, 3 columns.*; 2 unreadable rows left out/,
    );
    const lines = diagLines(nb);
    assert.ok(lines.includes('warning eyes.csv:3:1: column sph: "abc" is not a number (in D)'));
    assert.ok(lines.includes("warning eyes.csv:4:1: row has 2 fields, the header has 3"));
    assert.ok(
      lines.includes("warning study.lentil.md:1:17: table eyes: 2 bad rows (row 2, 3) of 4"),
    );
  }
});

Deno.test("mixed cylinder signs are accepted, transposed to the first row's form, and noted", async () => {
  // common practice, no source: transposition S/C×α ↔ (S+C)/−C×(α±90) describes the same lens
  const csv = "sph [D],cyl [D],axis [deg]\n-1.00,-0.50,90\n-3.00,+0.75,80\n-1.25,0,180\n";
  const { whole, streamed } = await bothWays(csvNotebook(), { "eyes.csv": csv });
  for (const nb of [whole, streamed]) {
    const t = nb.value("eyes") as Record<string, Column>;
    assert.deepEqual(col(t.sph), [-1, -2.25, -1.25]);
    assert.deepEqual(col(t.cyl), [-0.5, -0.75, 0]);
    assert.deepEqual(col(t.axis), [90, 170, 180]);
    assert.deepEqual(diagLines(nb), [
      "warning study.lentil.md:1:17: table eyes: column cyl mixes cylinder signs; 1 row in plus-cylinder form (row 2) was transposed to minus-cylinder form, the form of row 1 (the same lenses)",
    ]);
  }
});

Deno.test("unbracketed columns are numbers when their first rows are numbers, else text", async () => {
  // common practice, no source
  const { streamed } = await bothWays(csvNotebook(), { "eyes.csv": "id,eye\n1,R\n2,L\n" });
  const t = streamed.value("eyes") as Record<string, Column>;
  assert.equal(t.id.type, "number");
  assert.equal(t.eye.type, "text");
});

Deno.test("computed columns and the rest of the notebook work over a streamed table", async () => {
  // Thibos et al. 1997: M = S + C/2
  const csv = "sph [D],cyl [D],axis [deg]\n-1.00,-0.50,90\n-2.00,-1.00,180\n";
  const { whole, streamed } = await bothWays(csvNotebook([], ["eyes.M = sph + cyl / 2"]), {
    "eyes.csv": csv,
  });
  for (const nb of [whole, streamed]) {
    assert.deepEqual(col(nb.value("eyes.M")), [-1.25, -2.5]);
    assert.equal(nb.columnPath("eyes.M")?.path, "compiled");
  }
});

Deno.test("a missing CSV file is reported at the file option", async () => {
  // common practice, no source
  const { streamed } = await bothWays(csvNotebook(), {});
  assert.deepEqual(diagLines(streamed), [
    'error study.lentil.md:2:7: cannot read table file "eyes.csv": no such file',
  ]);
});
