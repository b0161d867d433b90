import assert from "node:assert/strict";
import { join } from "node:path";
import { startLiveServer } from "../notebook/live/server.ts";
import type { ProgressEvent } from "../notebook/progress.ts";

const F = "~~~";

Deno.test("the live page is served while a large table file is read, and says how far it is", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-opening-" });
  try {
    // Invented notes: few rows, many bytes, so reading takes many chunks and evaluating little.
    const rows = Array.from({ length: 24 }, (_, i) => `N${i},${"x".repeat(1024 * 1024)}`);
    await Deno.writeTextFile(
      join(dir, "notes.csv"),
      `code [text],note [text]\n${rows.join("\n")}\n`,
    );
    const path = join(dir, "big.lentil.md");
    await Deno.writeTextFile(
      path,
      `# Notes\n\n${F}lentil table notes\nfile: notes.csv\n${F}\n\n${F}lentil\nn = countOf(notes.code)\n${F}\n`,
    );
    const events: ProgressEvent[] = [];
    let early: Promise<{ state: Record<string, unknown>; page: number; edit: number }> | undefined;
    const server = await startLiveServer(path, {
      budget: false,
      onProgress: (e) => events.push(e),
      onListening: (url) => {
        // Asked before the notebook has opened: the page, and where opening has come.
        early = (async () => {
          const page = await fetch(url);
          await page.body?.cancel();
          const state = await (await fetch(`${url}api/state`)).json();
          const edit = await fetch(`${url}api/cell`, {
            method: "POST",
            headers: { "content-type": "application/json" },
            body: JSON.stringify({ id: "n", expression: "1" }),
          });
          await edit.body?.cancel();
          return { state, page: page.status, edit: edit.status };
        })();
      },
    });
    try {
      const seen = await early!;
      assert.equal(seen.page, 200, "the page is served at once");
      assert.equal(typeof seen.state.opening, "string");
      assert.match(String(seen.state.opening), /big\.lentil\.md|notes\.csv/);
      assert.equal(seen.edit, 503, "no edit before the notebook is open");
      assert.ok(events.length > 1, "progress while reading");
      assert.equal(events.at(-1)!.done, true);
      assert.equal(events.at(-1)!.fraction, 1);
      assert.equal(events.at(-1)!.rows, 24);
      const ready = await (await fetch(`${server.url}api/state`)).json();
      assert.equal(ready.opening, undefined);
      assert.ok(ready.view.cells.n.display.startsWith("24"));
    } finally {
      await server.shutdown();
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
