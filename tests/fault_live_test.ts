// Fault injection and extreme input for the live server: oversized request bodies, refused
// by their declared length or cut off at the limit, without a trace or a large resident copy.
import assert from "node:assert/strict";
import { join } from "node:path";
import { startLiveServer } from "../notebook/live/server.ts";

const F = "```";

async function liveOn(text: string) {
  const dir = await Deno.makeTempDir({ prefix: "lentil-fault-live-" });
  const path = join(dir, "a.lentil.md");
  await Deno.writeTextFile(path, text);
  const server = await startLiveServer(path);
  const close = async () => {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  };
  return { dir, path, server, close };
}

/** Send raw bytes over TCP and read the answer's status line. */
async function rawStatus(port: number, head: string, body: Uint8Array): Promise<string> {
  const conn = await Deno.connect({ hostname: "127.0.0.1", port });
  try {
    await conn.write(new TextEncoder().encode(head));
    await conn.write(body).catch(() => 0);
    const buf = new Uint8Array(4096);
    const n = await conn.read(buf);
    return new TextDecoder().decode(buf.subarray(0, n ?? 0)).split("\r\n")[0];
  } finally {
    conn.close();
  }
}

Deno.test("a body declared larger than the limit is refused before it is read", async () => {
  const { server, close } = await liveOn(`${F}lentil\nx = 1\n${F}\n`);
  try {
    const head = `POST /${server.key}/api/cell HTTP/1.1\r\nHost: 127.0.0.1:${server.port}\r\n` +
      `Content-Type: application/json\r\nContent-Length: 1073741824\r\n\r\n`;
    const t0 = performance.now();
    const status = await rawStatus(server.port, head, new Uint8Array(1024));
    assert.match(status, / 413 /);
    assert.ok(performance.now() - t0 < 2000, "answered at once");
  } finally {
    await close();
  }
});

Deno.test("a streamed body without a length is cut off at the limit (413), and the server goes on", async () => {
  const { server, close } = await liveOn(`${F}lentil\nx = 1\n${F}\n`);
  try {
    const chunk = new Uint8Array(1024 * 1024).fill(0x20);
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        // Up to 64 MB offered; the server stops reading after 8 MB.
        if (sent++ >= 64) c.close();
        else c.enqueue(chunk);
      },
    });
    const r = await fetch(`${server.url}api/cell`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body,
    });
    assert.equal(r.status, 413);
    assert.match((await r.json()).error, /too large/);
    assert.ok(sent < 40, `the server stopped reading (${sent} MB offered)`);
    const state = await fetch(`${server.url}api/state`);
    assert.equal(state.status, 200);
    await state.body?.cancel();
  } finally {
    await close();
  }
});

/** A table of `n` rows and a computed column that takes about 10 ms a row (row-wise sums). */
function stuckNotebook(n: number, slow: boolean): string {
  const rows = Array.from({ length: n }, (_, i) => `${i}`).join("\n");
  const column = slow ? "x + sum(1:100000)" : "x";
  return `${F}lentil table t\nx\n${rows}\n${F}\n\n${F}lentil\nt.y = ${column}\nz = 1\nw = z + 1\n${F}\n`;
}

Deno.test("a cell over the time budget is stopped in the worker; the server answers and saves meanwhile", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-fault-budget-" });
  const path = join(dir, "a.lentil.md");
  await Deno.writeTextFile(path, stuckNotebook(300, false));
  const server = await startLiveServer(path, { budget: { timeMs: 400 } });
  const headers = { "content-type": "application/json" };
  try {
    const stuck = fetch(`${server.url}api/cell`, {
      method: "POST",
      headers,
      body: JSON.stringify({ id: "t.y", expression: "x + sum(1:100000)" }),
    }).then((r) => r.json());
    await new Promise((r) => setTimeout(r, 150));
    const t0 = performance.now();
    const state = await fetch(`${server.url}api/state`, { headers });
    assert.equal(state.status, 200);
    await state.json();
    assert.ok(performance.now() - t0 < 1000, "state answered while the cell computes");
    const save = await fetch(`${server.url}api/save`, { method: "POST", headers, body: "{}" });
    assert.equal((await save.json()).ok, true, "save works while the cell computes");
    const r = await stuck;
    assert.equal(r.ok, true);
    const y = r.patch.cells.find((c: { id: string }) => c.id === "t.y");
    assert.match(y.error.message, /computed for more than 0\.4 s/);
    assert.equal(server.session.notebook.value("w") !== undefined, true, "other cells evaluated");
    assert.match(server.session.text, /t\.y = x \+ sum\(1:100000\)/, "the text as typed is kept");
  } finally {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("a notebook opened with a cell over budget opens, with that cell marked", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-fault-budget-" });
  const path = join(dir, "a.lentil.md");
  await Deno.writeTextFile(path, stuckNotebook(300, true));
  const t0 = performance.now();
  const server = await startLiveServer(path, { budget: { timeMs: 400 } });
  try {
    assert.ok(performance.now() - t0 < 20_000);
    const nb = server.session.notebook;
    assert.match(nb.result("t.y")?.error?.message ?? "", /stopped: this cell computed/);
    assert.equal(String(nb.value("w")), "2");
  } finally {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("an input's new value skips the worker only when no cell it feeds builds a range", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-fault-quick-" });
  const path = join(dir, "q.lentil.md");
  await Deno.writeTextFile(
    path,
    `${F}lentil\nn = 10\nm = 2 mm\ns = sum(1:n)\nd = m * 2\n${F}\n`,
  );
  const server = await startLiveServer(path, { budget: { timeMs: 2000 } });
  try {
    const { session } = server;
    // One edit through the worker first: the session then knows the notebook evaluates quickly.
    await session.guarded(() => session.setExpression("m", "2.5 mm"));
    // A literal feeding a range decides an amount of work: the worker tries it first.
    assert.equal(session.isQuickEdit("n", "100000"), false);
    // A literal feeding only arithmetic runs here at once.
    assert.equal(session.isQuickEdit("m", "3 mm"), true);
    const r = await session.guarded(() => session.setExpression("m", "3 mm"), true);
    assert.equal(r.ok, true);
    assert.equal(server.session.notebook.result("d")?.error, undefined);
    // A formula is never quick.
    assert.equal(session.isQuickEdit("d", "m * 3"), false);
  } finally {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
});
