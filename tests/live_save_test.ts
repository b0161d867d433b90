import assert from "node:assert/strict";
import { join } from "node:path";
import {
  backupPath,
  changedOnDisk,
  fingerprint,
  sha256Hex,
  writeAtomic,
} from "../notebook/live/save.ts";

const enc = (s: string) => new TextEncoder().encode(s);

Deno.test("atomic write: new content in place, the old one as backup, no temporary left", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, "old\n");
    await Deno.chmod(path, 0o640);
    const fp = await writeAtomic(path, enc("new\n"));
    assert.equal(await Deno.readTextFile(path), "new\n");
    assert.equal(await Deno.readTextFile(backupPath(path)), "old\n");
    assert.equal((await Deno.stat(path)).mode! & 0o777, 0o640, "permission bits kept");
    assert.equal(fp.hash, await sha256Hex(enc("new\n")));
    assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name).sort(), [
      "a.lentil.md",
      "a.lentil.md.bak",
    ]);
    // A first save of a new file has nothing to back up.
    await writeAtomic(join(dir, "b.csv"), enc("x\n"));
    assert.equal(await Deno.readTextFile(join(dir, "b.csv")), "x\n");
    await assert.rejects(Deno.stat(join(dir, "b.csv.bak")), Deno.errors.NotFound);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("change detection: other bytes are a change; the same bytes with a new time are not", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const path = join(dir, "a.lentil.md");
    await Deno.writeTextFile(path, "one\n");
    const known = await fingerprint(path);
    assert.equal(await changedOnDisk(path, known), false);
    await Deno.utime(path, new Date(2001, 1, 1), new Date(2001, 1, 1));
    assert.equal(await changedOnDisk(path, known), false, "a touch alone is no change");
    await Deno.writeTextFile(path, "two\n");
    assert.equal(await changedOnDisk(path, known), true);
    await Deno.remove(path);
    assert.equal(await changedOnDisk(path, known), true, "a removed file changed");
    assert.equal(await fingerprint(path), undefined);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
