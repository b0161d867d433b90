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

const usingSph = (file: string, skip = false) =>
  `${F}lentil table t\nfile: ${file}\n${
    skip ? "bad rows: skip\n" : ""
  }${F}\n\n${F}lentil\nsm = mean(t.sph)\n${F}\n`;

Deno.test("a CSV that cannot be read: cells using it show the table's own error, positioned", () => {
  const big = "x".repeat(5000);
  const cases: [string, string, RegExp, number][] = [
    [
      "unclosed quote",
      'sph [D],cyl [D]\n1,2\n"3,4\n5,6\n7,8\n',
      /never closed: it opens on line 3/,
      3,
    ],
    ["empty", "", /is empty/, 1],
    ["blank lines only", "\n\n  \n\n", /only blank lines/, 1],
    ["wrong separator", "sph [D];cyl [D]\n1;2\n", /separated by ";"/, 1],
    ["misplaced quote", 'sph [D],cyl [D]\n1,2\n3,x"y"\n', /field 2 of line 3/, 3],
    ["huge bad field", `sph [D],cyl [D]\n1,2\n3,${big}\n`, /"x{40}…" \(5,000 characters\)/, 3],
  ];
  for (const [label, csv, why, line] of cases) {
    const nb = Notebook.fromText(usingSph("a.csv"), "a.lentil.md", {
      host: { readText: () => csv },
    });
    const t = nb.result("t")!.error!;
    assert.match(t.message, why, label);
    assert.equal(t.line, line, `${label}: at the line`);
    assert.ok(t.message.length < 300, `${label}: shortened (${t.message.length})`);
    assert.equal(t.message.split("xxxxxxxxxx").length <= 5, true, `${label}: once`);
    const sm = nb.result("sm")!.error!;
    assert.equal(sm.kind, "dependency", label);
    assert.ok(!/has no column/.test(sm.message), `${label}: not "no column"`);
    assert.ok(sm.message.includes(t.message), `${label}: the table's own error`);
  }
});

Deno.test("bad rows: skip also skips rows with a misplaced quote, and counts them", () => {
  const csv = 'sph [D],cyl [D]\n1,2\n3,x"y"\n5,"6"z\n7,8\n';
  const nb = Notebook.fromText(usingSph("a.csv", true), "a.lentil.md", {
    host: { readText: () => csv },
  });
  assert.equal(nb.result("t")?.error, undefined);
  assert.equal(String(nb.value("sm")), "4 D", "rows 1 and 7 kept (mean 4)");
  assert.ok(nb.diagnostics().some((d) => /2 bad rows/.test(d.message)));
});

Deno.test("stream: an unclosed quote is reported where it opens", async () => {
  await inTemp(async (dir) => {
    const rows = Array.from({ length: 50 }, (_, i) => `${i},1`);
    rows.splice(20, 0, '"20,1');
    await Deno.writeTextFile(join(dir, "a.csv"), "sph [D],cyl [D]\n" + rows.join("\n") + "\n");
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, usingSph("a.csv"));
    const r = await streamNotebook(path, {});
    assert.equal(r.ok, false);
    assert.match(r.stopped!, /never closed: it opens on line 22/);
  });
});
