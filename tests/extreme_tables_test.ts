// Extreme and hostile table input: identifiers a number would change, symbolic links and
// special files named by `file:`. Every input is generated in a fresh folder.
import assert from "node:assert/strict";
import { join } from "node:path";
import { loadNotebook } from "../notebook/load.ts";
import { streamNotebook } from "../notebook/table/stream.ts";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import type { Column } from "../cells/table.ts";

const F = "```";

async function inTemp(fn: (dir: string) => Promise<void>): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-extreme-" });
  try {
    await fn(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

const reading = (file: string) =>
  `${F}lentil table t\nfile: ${file}\n${F}\n\n${F}lentil\nn = t\n${F}\n`;

Deno.test("identifiers with leading zeros keep their text; a declared [text] column is never converted", () => {
  const csv = "id,zip [text],va [logMAR]\n08123,01234,0.1\n012,00501,0.2\n12,10001,0.3\n";
  const text = `${F}lentil table t\nfile: a.csv\n${F}\n${F}lentil\nn = t.id\nz = t.zip\n${F}\n`;
  const nb = Notebook.fromText(text, "a.lentil.md", { host: { readText: () => csv } });
  const id = nb.value("n") as Column;
  assert.equal(id.type, "text");
  assert.deepEqual([...id.data], ["08123", "012", "12"], "012 and 12 stay two subjects");
  assert.deepEqual([...(nb.value("z") as Column).data], ["01234", "00501", "10001"]);
  // Numbers past a double's digits are identifiers too (record numbers).
  const long = Notebook.fromText(text.replace("z = t.zip\n", ""), "a.lentil.md", {
    host: { readText: () => "id\n12345678901234567890\n2\n" },
  });
  assert.deepEqual([...(long.value("n") as Column).data], ["12345678901234567890", "2"]);
  // Plain decimals are still numbers.
  const plain = Notebook.fromText(text.replace("z = t.zip\n", ""), "a.lentil.md", {
    host: { readText: () => "id\n0.5\n-1.25\n10\n" },
  });
  assert.equal((plain.value("n") as Column).type, "number");
});

Deno.test("streaming: an identifier with a leading zero after the first rows is a bad row, not a changed number", async () => {
  await inTemp(async (dir) => {
    const rows = Array.from({ length: 5000 }, (_, i) => `${i + 1}`);
    rows.push("007");
    await Deno.writeTextFile(join(dir, "a.csv"), "id\n" + rows.join("\n") + "\n");
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, reading("a.csv"));
    const r = await streamNotebook(path, {});
    assert.equal(r.ok, false);
    assert.match(r.stopped!, /"007" would lose its digits.*\[text\]/);
  });
});

Deno.test("file: tables: a symbolic link, a device and a folder are refused by run, export and stream", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, reading("link.csv"));
    await Deno.writeTextFile(join(dir, "outside.txt"), "secret line\nmore\n");
    const cases: [string, () => Promise<void>, RegExp][] = [
      [
        "a link to a file",
        () => Deno.symlink(join(dir, "outside.txt"), join(dir, "link.csv")),
        /symbolic link/,
      ],
      [
        "a link to /dev/zero",
        () => Deno.symlink("/dev/zero", join(dir, "link.csv")),
        /symbolic link/,
      ],
      ["a folder", () => Deno.mkdir(join(dir, "link.csv")), /folder/],
    ];
    for (const [label, make, why] of cases) {
      await Deno.remove(join(dir, "link.csv"), { recursive: true }).catch(() => {});
      await make();
      const t0 = performance.now();
      const loaded = await loadNotebook(path);
      assert.ok(loaded.ok);
      const report = buildReport(loaded.notebook);
      const t = report.cells.find((c) => c.id === "t")!;
      assert.match(t.error?.message ?? "", why, label);
      assert.ok(!JSON.stringify(report).includes("secret line"), `${label}: nothing of it shown`);
      await assert.rejects(streamNotebook(path, {}), why, label);
      assert.ok(performance.now() - t0 < 5000, `${label}: no hang`);
    }
    // With links allowed, a link to a regular file is read; to a device it is still refused.
    await Deno.remove(join(dir, "link.csv"));
    await Deno.writeTextFile(join(dir, "data.csv"), "x\n1\n");
    await Deno.symlink(join(dir, "data.csv"), join(dir, "link.csv"));
    const followed = await loadNotebook(path, { followLinks: true });
    assert.ok(followed.ok && !followed.notebook.result("t")?.error);
    await Deno.remove(join(dir, "link.csv"));
    await Deno.symlink("/dev/zero", join(dir, "link.csv"));
    const device = await loadNotebook(path, { followLinks: true });
    assert.ok(device.ok);
    assert.match(device.notebook.result("t")?.error?.message ?? "", /not a regular file/);
  });
});
