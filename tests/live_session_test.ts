import assert from "node:assert/strict";
import { basename, join } from "node:path";
import { EditRefused, LiveSession } from "../notebook/live/session.ts";
import { backupPath } from "../notebook/live/save.ts";

const FIXTURES = new URL("./fixtures/live/", import.meta.url);
const SEEDS = new URL("../seeds/", import.meta.url);

/** Run `fn` on a copy of the live fixtures in a fresh folder, removed afterwards. */
async function withCopy(
  name: string,
  fn: (dir: string, path: string) => Promise<void> | void,
): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-live-" });
  try {
    for (const e of Deno.readDirSync(FIXTURES)) {
      if (e.isFile) await Deno.copyFile(new URL(e.name, FIXTURES), join(dir, e.name));
    }
    await fn(dir, join(dir, name));
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

function notebooksIn(url: URL): URL[] {
  try {
    return [...Deno.readDirSync(url)].filter((e) => e.isFile && e.name.endsWith(".lentil.md"))
      .map((e) => new URL(e.name, url));
  } catch {
    return [];
  }
}

Deno.test("round trip: every starter and fixture opened and saved without edits is byte-identical", async () => {
  const files = [...notebooksIn(SEEDS), ...notebooksIn(FIXTURES)];
  assert.ok(files.length >= 4, "expected seeds and fixtures");
  for (const url of files) {
    const dir = await Deno.makeTempDir({ prefix: "lentil-rt-" });
    try {
      const src = url.pathname.replace(/[^/]+$/, "");
      for (const e of Deno.readDirSync(src)) {
        if (e.isFile) await Deno.copyFile(join(src, e.name), join(dir, e.name));
      }
      const path = join(dir, basename(url.pathname));
      const before = await Deno.readFile(path);
      const csvBefore = new Map(
        [...Deno.readDirSync(dir)].filter((e) => e.name.endsWith(".csv"))
          .map((e) => [e.name, Deno.readFileSync(join(dir, e.name))]),
      );
      const s = await LiveSession.open(path);
      assert.equal(s.status().dirty, false, basename(path));
      const r = await s.save();
      assert.ok(r.ok, basename(path));
      assert.deepEqual(r.written, [basename(path)], "no CSV written without an edit");
      assert.deepEqual(await Deno.readFile(path), before, `${basename(path)} changed on save`);
      for (const [name, bytes] of csvBefore) {
        assert.deepEqual(Deno.readFileSync(join(dir, name)), bytes, `${name} changed on save`);
      }
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  }
});

Deno.test("an input edit recomputes only its dependents and splices only the expression", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const original = await Deno.readTextFile(path);
    const s = await LiveSession.open(path);
    const r = s.setExpression("spectacle", "-8.00 D");
    assert.deepEqual([...r.recomputed].sort(), ["cornea", "spectacle", "steps"]);
    assert.deepEqual(r.patch.cells.map((c) => c.id).sort(), ["cornea", "spectacle", "steps"]);
    assert.equal(r.patch.full, undefined);
    assert.equal(s.text, original.replace("spectacle = -6.50 D", "spectacle = -8.00 D"));
    assert.ok(s.status().dirty);
    await s.save();
    assert.equal(await Deno.readTextFile(path), s.text);
    assert.equal(await Deno.readTextFile(backupPath(path)), original);
  });
});

Deno.test("a formula holding # outside quotes is refused, since # would start the note", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const s = await LiveSession.open(path);
    const before = s.text;
    assert.throws(() => s.setExpression("vd", "12 mm # oops"), EditRefused);
    assert.equal(s.text, before);
  });
});

Deno.test("a table edit recomputes only the table and what reads it", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const s = await LiveSession.open(path);
    const r = s.setRows("trials", [["+1.00", "0.30"], ["+0.25", "0.00"]]);
    assert.ok(r.ok);
    assert.ok(r.recomputed.includes("trials") && r.recomputed.includes("best"));
    for (const unrelated of ["spectacle", "vd", "cornea", "visits"]) {
      assert.ok(!r.recomputed.includes(unrelated), `${unrelated} was recomputed`);
    }
  });
});

Deno.test("an error shows at its cell and on dependents, and a fix clears both", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const s = await LiveSession.open(path);
    s.setExpression("vd", "13 mm +");
    const v = s.view.cells;
    assert.equal(v.vd.error?.kind, "syntax");
    assert.equal(v.vd.expression, "13 mm +", "what was typed is kept");
    assert.equal(v.cornea.error?.kind, "dependency");
    assert.equal(v.cornea.error?.cause, "vd");
    assert.equal(v.other.error, undefined);
    s.setExpression("vd", "12 mm");
    assert.equal(s.view.cells.cornea.error, undefined);
  });
});

Deno.test("undo and redo step through exact text states", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const s = await LiveSession.open(path);
    const t0 = s.text;
    s.setExpression("vd", "14 mm");
    const t1 = s.text;
    s.setRows("trials", [["+1.00", "0.30"], ["+0.25", "0.00"]]);
    const t2 = s.text;
    s.addCell(0, "near = 1 / (40 cm)");
    assert.ok(s.view.cells.near);
    s.undo();
    assert.equal(s.text, t2);
    s.undo();
    assert.equal(s.text, t1);
    s.undo();
    assert.equal(s.text, t0);
    assert.equal(s.status().canUndo, false);
    assert.equal(s.undo().ok, false);
    s.redo();
    s.redo();
    assert.equal(s.text, t2);
    s.setExpression("other", "50 cm");
    assert.equal(s.status().canRedo, false, "a new edit clears redo");
  });
});

Deno.test("a new cell that is not `name = expression` is refused and nothing changes", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const s = await LiveSession.open(path);
    const t0 = s.text;
    const r = s.addCell(0, "just words");
    assert.equal(r.ok, false);
    assert.match(r.error!, /name = expression/);
    assert.equal(s.text, t0);
    const ok = s.addCell(1, "worst = max(trials.va)   # typed in the page");
    assert.ok(ok.ok);
    assert.ok(
      s.text.includes("best = min(trials.va)\nworst = max(trials.va)   # typed in the page\n```"),
    );
    assert.ok(ok.patch.full, "a new cell changes the page's structure");
  });
});

Deno.test("a CSV table is written to its file only when its rows were edited", async () => {
  await withCopy("counter.lentil.md", async (dir, path) => {
    const csv = join(dir, "visits.csv");
    const before = await Deno.readTextFile(csv);
    const notebookBefore = await Deno.readTextFile(path);
    const s = await LiveSession.open(path);
    s.setExpression("other", "41 cm");
    let r = await s.save();
    assert.ok(r.ok);
    assert.deepEqual(r.written, ["counter.lentil.md"]);
    assert.equal(await Deno.readTextFile(csv), before);
    s.setRows("visits", [...s.view.tables.visits.rows, ["4", "62.5"]]);
    assert.deepEqual(s.status().dirtyFiles, ["visits.csv"]);
    r = await s.save();
    assert.ok(r.ok);
    assert.deepEqual(r.written, ["counter.lentil.md", "visits.csv"]);
    assert.equal(await Deno.readTextFile(csv), before + "4,62.5\n");
    assert.equal(await Deno.readTextFile(backupPath(csv)), before);
    assert.equal(
      await Deno.readTextFile(path),
      notebookBefore.replace("other = 40 cm", "other = 41 cm"),
      "the notebook text is untouched by a CSV edit",
    );
  });
});

Deno.test("a file changed on disk is never overwritten: save refuses; keep both writes a copy", async () => {
  await withCopy("counter.lentil.md", async (dir, path) => {
    const s = await LiveSession.open(path);
    s.setExpression("spectacle", "-7.25 D");
    const behind = (await Deno.readTextFile(path)).replace(
      "The end.",
      "The end, edited elsewhere.",
    );
    await Deno.writeTextFile(path, behind);
    assert.deepEqual(await s.changedFiles(), ["counter.lentil.md"]);
    const r = await s.save();
    assert.equal(r.ok, false);
    assert.equal(await Deno.readTextFile(path), behind, "nothing overwritten");
    const kept = await s.keepBoth();
    assert.match(kept.file, /^counter\.edited-\d{8}-\d{6}\.lentil\.md$/);
    assert.equal(await Deno.readTextFile(path), behind);
    const copy = await Deno.readTextFile(join(dir, kept.file));
    assert.ok(copy.includes("spectacle = -7.25 D"));
    assert.equal(s.path, join(dir, kept.file));
    assert.equal((await s.save()).ok, true, "the session goes on with the copy");
  });
});

Deno.test("reload takes the disk's version and undo brings the page's edits back", async () => {
  await withCopy("counter.lentil.md", async (_dir, path) => {
    const s = await LiveSession.open(path);
    s.setExpression("spectacle", "-7.25 D");
    const mine = s.text;
    const behind = mine.replace("-7.25 D", "-3.00 D").replace("The end.", "Changed.");
    await Deno.writeTextFile(path, behind);
    await s.reload();
    assert.equal(s.text, behind);
    assert.deepEqual(await s.changedFiles(), []);
    s.undo();
    assert.equal(s.text, mine);
  });
});

Deno.test("a byte-order mark, CRLF line endings and no final newline survive an edit", async () => {
  await withCopy("bom.lentil.md", async (dir, path) => {
    const s = await LiveSession.open(path);
    s.setExpression("z", "3 mm");
    await s.save();
    const bytes = await Deno.readFile(path);
    assert.deepEqual([...bytes.subarray(0, 3)], [0xef, 0xbb, 0xbf]);
    assert.ok(new TextDecoder().decode(bytes).endsWith("no newline at end"));
    const crlf = await LiveSession.open(join(dir, "crlf.lentil.md"));
    crlf.setRows("t", [["1", "2"], ["3", "4"]]);
    crlf.addCell(0, "w = y * 2");
    await crlf.save();
    const text = await Deno.readTextFile(join(dir, "crlf.lentil.md"));
    assert.equal(text.replace(/\r\n/g, "").includes("\n"), false, "only CRLF line endings");
    assert.ok(text.includes("1 | 2\r\n3 | 4\r\n```"));
    assert.ok(text.includes("y = x + 1 D # note\r\nw = y * 2\r\n```"));
  });
});

Deno.test("lentil live: usage errors exit without serving", async () => {
  const { liveCommand } = await import("../notebook/cli/commands/live.ts");
  const { captureIo } = await import("../notebook/cli/command.ts");
  let io = captureIo();
  assert.equal(await liveCommand.run(["x.lentil.md"], { port: "99999" }, io), 2);
  assert.match(io.stderr(), /--port expects a number/);
  io = captureIo();
  assert.equal(await liveCommand.run(["notes.txt"], {}, io), 2);
  assert.match(io.stderr(), /end in \.lentil\.md/);
  io = captureIo();
  assert.equal(await liveCommand.run(["/nonexistent/none.lentil.md"], {}, io), 1);
  assert.match(io.stderr(), /no such file/);
});
