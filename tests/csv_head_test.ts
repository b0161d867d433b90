import assert from "node:assert/strict";
import { join } from "node:path";
import { parseNotebook } from "../notebook/format/parse.ts";
import { getLanguage } from "../cells/language.ts";
import { openCsvTable, readCsvHead } from "../notebook/engine/_tables.ts";

const F = "~~~";

/** The first rows' start by the stream reader, as the head reader must give it. */
async function streamed(path: string, block: ReturnType<typeof blockFor>, rows: number) {
  const file = await Deno.open(path);
  const o = await openCsvTable(block, "n.lentil.md", file.readable, getLanguage(), rows);
  if ("problem" in o) throw new Error(o.problem.message);
  await o.rest.return?.();
  return o.start;
}

function blockFor(options = "") {
  const doc = parseNotebook(`${F}lentil table t\nfile: t.csv\n${options}${F}\n`, "n.lentil.md");
  return doc.tables[0];
}

function shape(s: { columns: { name: string; spec: string }[]; builder: { kinds: unknown } }) {
  return JSON.stringify([s.columns.map((c) => [c.name, c.spec]), s.builder.kinds]);
}

Deno.test("the head of a CSV gives the stream's header and kinds, or nothing when unsure", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-head-" });
  try {
    const path = join(dir, "t.csv");
    const block = blockFor();
    // Invented rows; "va" has no bracket, so its kind is inferred from the first rows.
    const rows = Array.from({ length: 5000 }, (_, i) => `${-i / 4},${i % 3 ? "6/6" : "6/9"}`);
    await Deno.writeTextFile(path, `sph [D],va\n${rows.join("\n")}\n`);
    for (const n of [64, 4096]) {
      const head = readCsvHead(block, "n.lentil.md", path, getLanguage(), n);
      assert.ok(head);
      assert.equal(shape(head), shape(await streamed(path, block, n)), `${n} rows`);
    }
    // A table that skips bad rows is read by the stream (it counts what it skips).
    assert.equal(
      readCsvHead(blockFor("bad rows: skip\n"), "n.lentil.md", path, getLanguage(), 64),
      undefined,
    );
    // A quoted line break across the 1 MB cut: the head cannot say.
    const long = "x".repeat(1024 * 1024 - 20);
    await Deno.writeTextFile(path, `note [text]\n"${long}\nstill the same cell"\n`);
    assert.equal(readCsvHead(block, "n.lentil.md", path, getLanguage(), 64), undefined);
    // Fewer rows than asked in a file longer than the head: the stream reads them.
    await Deno.writeTextFile(
      path,
      `note [text]\n${Array(3).fill("y".repeat(600_000)).join("\n")}\n`,
    );
    assert.equal(readCsvHead(block, "n.lentil.md", path, getLanguage(), 64), undefined);
    // A short file is read whole, even without a final line break.
    await Deno.writeTextFile(path, "sph [D]\n-1.25\n+0.50");
    const whole = readCsvHead(block, "n.lentil.md", path, getLanguage(), 64)!;
    assert.equal(whole.builder.rowsSeen, 2);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
