// Fault injection for the live session and saving: a failing edit, a change on disk that
// size and time cannot see, a disk that fills during the backup, a read-only folder, and
// files mixing line endings. Inputs are generated here; nothing large is committed.
import assert from "node:assert/strict";
import { join } from "node:path";
import { LiveSession } from "../notebook/live/session.ts";
import { backupPath, changedOnDisk, fingerprint, writeAtomic } from "../notebook/live/save.ts";
import { EXPORT_RENDERERS } from "../notebook/live/_markup.ts";
import type { PlotBlock } from "../notebook/format/parse.ts";

const F = "```";
const enc = (s: string) => new TextEncoder().encode(s);

async function inTemp(fn: (dir: string) => Promise<void>): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-fault-" });
  try {
    await fn(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

/** Replace `Deno.open` while `fn` runs, so writes of files opened for writing fail. */
async function withFailingWrites(
  fail: (path: string, written: number) => Error | undefined,
  fn: () => Promise<void>,
): Promise<void> {
  const original = Deno.open;
  const patched = async (path: string | URL, options?: Deno.OpenOptions) => {
    const file = await original(path, options);
    if (!options?.write) return file;
    let written = 0;
    const write = file.write.bind(file);
    file.write = (p: Uint8Array) => {
      const e = fail(String(path), written);
      if (e) return Promise.reject(e);
      written += p.length;
      return write(p);
    };
    return file;
  };
  (Deno as { open: unknown }).open = patched;
  try {
    await fn();
  } finally {
    (Deno as { open: unknown }).open = original;
  }
}

Deno.test("a rejected edit is neither shown, kept for undo, nor saved", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "a.lentil.md");
    // A plot whose data x feeds: drawing the page again after an edit of x draws it again.
    const text = `# A\n\nSome prose.\n\n${F}lentil table t\na [D]\n1\n2\n${F}\n\n` +
      `${F}lentil\nx = 1\ny = x + 1\nt.b = a * x\n${F}\n\n` +
      `${F}lentil plot\nfigure: scatter\ntable: t\nhorizontal: a\nvertical: b\n${F}\n`;
    await Deno.writeTextFile(path, text);
    let fail = false;
    const renderers = {
      ...EXPORT_RENDERERS,
      plot: (nb: Parameters<typeof EXPORT_RENDERERS.plot>[0], b: PlotBlock) => {
        if (fail) throw new Error("injected fault");
        return EXPORT_RENDERERS.plot(nb, b);
      },
    };
    const s = await LiveSession.open(path, { renderers });
    fail = true;
    const r = s.setExpression("x", "5");
    fail = false;
    assert.equal(r.ok, false);
    assert.match(r.error!, /not applied/);
    assert.equal(s.text, text, "the text is as before");
    assert.equal(s.status().dirty, false);
    assert.equal(s.status().canUndo, false, "nothing to undo");
    assert.equal(String(s.notebook.value("x")), "1");
    const saved = await s.save();
    assert.ok(saved.ok);
    assert.equal(await Deno.readTextFile(path), text, "save writes what the page shows");
    // The next edit works as usual.
    assert.equal(s.setExpression("x", "5").ok, true);
    assert.equal(String(s.notebook.value("y")), "6");
    // A failing undo leaves the edit in place, and the undo still possible.
    fail = true;
    assert.equal(s.undo().ok, false);
    fail = false;
    assert.equal(String(s.notebook.value("y")), "6");
    assert.equal(s.status().canUndo, true);
    assert.equal(s.undo().ok, true);
    assert.equal(String(s.notebook.value("y")), "2");
  });
});

Deno.test("a formula of 5,000 unary minuses is one error at its cell, and save writes what is shown", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, `${F}lentil\nx = 1\ny = x + 1\n${F}\n`);
    const s = await LiveSession.open(path);
    const long = "-".repeat(5000) + "1";
    const r = s.setExpression("x", long);
    if (r.ok) {
      assert.ok(s.notebook.result("x")?.error, "the cell shows an error");
      assert.ok(s.text.includes(long));
    } else {
      assert.ok(!s.text.includes(long), "a refused edit is not in the text");
    }
    await s.save();
    assert.equal(await Deno.readTextFile(path), s.text);
  });
});

Deno.test("a change on disk of the same size and the same time is a conflict", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, `${F}lentil\nx = 1\n${F}\n`);
    const s = await LiveSession.open(path);
    const { mtime } = await Deno.stat(path);
    await Deno.writeTextFile(path, `${F}lentil\nx = 2\n${F}\n`);
    await Deno.utime(path, mtime!, mtime!);
    const known = await fingerprint(path);
    assert.equal((await Deno.stat(path)).size, known!.size);
    s.setExpression("x", "3");
    const r = await s.save();
    assert.equal(r.ok, false);
    assert.deepEqual(!r.ok && r.conflict, ["a.lentil.md"]);
    assert.match(await Deno.readTextFile(path), /x = 2/, "the other change is kept");
    assert.equal(await changedOnDisk(path, known), false);
  });
});

Deno.test("a disk that fills while the backup is written keeps the last good backup and the file", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, "first\n");
    await writeAtomic(path, enc("second\n"));
    assert.equal(await Deno.readTextFile(backupPath(path)), "first\n");
    const full = () =>
      Object.assign(new Error("No space left on device (os error 28)"), {
        code: "ENOSPC",
      });
    await withFailingWrites((p) => (p.includes(".bak.") ? full() : undefined), async () => {
      await assert.rejects(writeAtomic(path, enc("third\n")), /the disk is full/);
    });
    assert.equal(await Deno.readTextFile(path), "second\n");
    assert.equal(await Deno.readTextFile(backupPath(path)), "first\n", "backup intact");
    assert.deepEqual(
      [...Deno.readDirSync(dir)].map((e) => e.name).sort(),
      ["a.lentil.md", "a.lentil.md.bak"],
      "no temporary file left",
    );
    // A write that fails half-way through the new file leaves everything as it was too.
    await withFailingWrites(
      (p) => (p.includes(".bak.") ? undefined : full()),
      () => assert.rejects(writeAtomic(path, enc("x".repeat(70_000))), /the disk is full/),
    );
    assert.equal(await Deno.readTextFile(path), "second\n");
  });
});

Deno.test("save into a read-only folder or onto a full disk says so in words, and keeps the edits", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, `${F}lentil\nx = 1\n${F}\n`);
    const s = await LiveSession.open(path);
    s.setExpression("x", "2");
    const cases: [Error, RegExp][] = [
      [new Deno.errors.PermissionDenied("Permission denied (os error 13)"), /read-only/],
      [
        Object.assign(new Error("No space left on device (os error 28)"), { code: "ENOSPC" }),
        /full/,
      ],
    ];
    for (const [error, words] of cases) {
      await withFailingWrites(() => error, async () => {
        const r = await s.save();
        assert.equal(r.ok, false);
        assert.ok(!r.ok && "error" in r);
        assert.match(r.error, words);
        assert.match(r.error, /^cannot save: .*; your edits are kept in the page$/);
      });
      assert.equal(s.status().dirty, true, "the edits stay");
      assert.match(await Deno.readTextFile(path), /x = 1/);
    }
    assert.ok((await s.save()).ok, "once the fault is gone, save works");
    assert.match(await Deno.readTextFile(path), /x = 2/);
  });
});

Deno.test("mixed line endings: a table edit keeps every row's ending; new lines take their neighbours'", async () => {
  await inTemp(async (dir) => {
    const path = join(dir, "m.lentil.md");
    const block = [
      `${F}lentil table t`,
      "x | y",
      "1 | 2",
      "3 | 4",
      "5 | 6",
      F,
    ].join("\r\n");
    const calc = [`${F}lentil`, "a = 1", F].join("\r\n");
    const text = `# Mixed\n\nProse with LF.\n\n${block}\r\n\n${calc}\r\n\nMore prose.\n`;
    await Deno.writeTextFile(path, text);
    const s = await LiveSession.open(path);
    assert.ok(s.setRows("t", [["1", "2"], ["30", "4"], ["5", "6"], ["7", "8"]]).ok);
    assert.ok(s.addCell(0, "b = a + 1").ok);
    const out = s.text;
    assert.ok(out.includes("1 | 2\r\n"), "untouched row keeps CRLF");
    assert.ok(out.includes("5 | 6\r\n"), "untouched row keeps CRLF");
    assert.match(out, /30 +\| 4\r\n/, "a changed row keeps its row's ending");
    assert.match(out, /7 +\| 8\r\n/, "a new row takes its neighbour's ending");
    assert.ok(out.includes("a = 1\r\nb = a + 1\r\n```"), "a new cell takes the block's ending");
    assert.ok(out.startsWith("# Mixed\n\nProse with LF.\n\n"), "prose keeps LF");
    assert.ok(out.endsWith("\r\n\nMore prose.\n"));
    // Reordering and removing rows keeps each moved row's own ending.
    assert.ok(s.setRows("t", [["5", "6"], ["1", "2"]]).ok);
    assert.ok(s.text.includes("5 | 6\r\n1 | 2\r\n```"));
    assert.ok(s.setRows("t", []).ok);
    assert.ok(s.text.includes("x | y\r\n```"));
  });
});
