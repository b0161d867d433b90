import assert from "node:assert/strict";
import type { Column } from "../cells/table.ts";
import { bothWays, csvNotebook, diagLines } from "./_csv_helpers.ts";

const col = (v: unknown) => Array.from((v as Column).data as ArrayLike<unknown>);

Deno.test("quoted fields, embedded commas, quotes and newlines, CRLF line ends", async () => {
  // RFC 4180 §2: fields may be enclosed in double quotes (rule 5); fields containing commas,
  // double quotes or line breaks must be quoted (rule 6); a double quote inside is doubled
  // (rule 7); lines end in CRLF (rule 1).
  const csv = "sph [D],note [text],eye\r\n" +
    '-1.00,"plain",R\r\n' +
    '"-2.25","with, comma",L\r\n' +
    '+0.50,"two\r\nlines",R\r\n' +
    '-0.75,"say ""yes""",L\r\n';
  const { whole, streamed } = await bothWays(csvNotebook(), { "eyes.csv": csv });
  for (const nb of [whole, streamed]) {
    assert.deepEqual(diagLines(nb), []);
    const t = nb.value("eyes") as Record<string, Column>;
    assert.deepEqual(col(t.sph), [-1, -2.25, 0.5, -0.75]);
    assert.deepEqual(col(t.note), ["plain", "with, comma", "two\r\nlines", 'say "yes"']);
    assert.deepEqual(col(t.eye), ["R", "L", "R", "L"]);
    assert.equal(t.sph.unit, "D");
  }
});

Deno.test("the last record may end without a line break; LF-only files read the same", async () => {
  // RFC 4180 §2 rule 2: the last record may or may not have an ending line break
  const { whole, streamed } = await bothWays(csvNotebook(), {
    "eyes.csv": "sph [D],cyl [D]\n-1.00,-0.50\n-2.00,-0.25",
  });
  for (const nb of [whole, streamed]) {
    const t = nb.value("eyes") as Record<string, Column>;
    assert.deepEqual(col(t.cyl), [-0.5, -0.25]);
  }
});

Deno.test("a byte-order mark before the header is not part of the first name", async () => {
  // common practice, no source: spreadsheet exports often begin with a UTF-8 BOM
  const { streamed } = await bothWays(csvNotebook(), { "eyes.csv": "\uFEFFsph [D]\n-1.00\n" });
  assert.deepEqual(col((streamed.value("eyes") as Record<string, Column>).sph), [-1]);
});

Deno.test("a CSV that ends inside quotes is a clear error with its line", async () => {
  // RFC 4180 §2 rule 6: a quoted field must be closed
  const csv = 'sph [D],note [text]\n-1.00,"fine"\n-2.00,"never closed\n';
  const { whole, streamed } = await bothWays(csvNotebook(), { "eyes.csv": csv });
  for (const nb of [whole, streamed]) {
    const lines = diagLines(nb);
    assert.equal(lines.length, 1, lines.join("\n"));
    assert.match(
      lines[0],
      /^error eyes\.csv:\d+:1: CSV cannot be read: a quoted field is never closed/,
    );
    assert.equal(nb.result("eyes")?.error?.kind, "data");
  }
});
