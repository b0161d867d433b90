import assert from "node:assert/strict";
import { join } from "node:path";
import { startLiveServer } from "../notebook/live/server.ts";
import { checkRequest, newKey } from "../notebook/live/_guard.ts";
import { bareName, insideFolder } from "../notebook/live/_paths.ts";

const FIXTURES = new URL("./fixtures/live/", import.meta.url);

async function fixtureServer() {
  const dir = await Deno.makeTempDir({ prefix: "lentil-sec-" });
  const inner = join(dir, "case");
  await Deno.mkdir(inner);
  for (const e of Deno.readDirSync(FIXTURES)) {
    if (e.isFile) await Deno.copyFile(new URL(e.name, FIXTURES), join(inner, e.name));
  }
  await Deno.writeTextFile(join(dir, "secret.txt"), "not for the page");
  await Deno.symlink(join(dir, "secret.txt"), join(inner, "link.csv"));
  const path = join(inner, "counter.lentil.md");
  const server = await startLiveServer(path);
  return { dir, inner, path, server };
}

/** One raw HTTP/1.1 request over TCP to 127.0.0.1, so the Host header is ours to choose. */
async function rawRequest(port: number, head: string): Promise<string> {
  const conn = await Deno.connect({ hostname: "127.0.0.1", port });
  try {
    await conn.write(new TextEncoder().encode(head));
    const buf = new Uint8Array(65536);
    let out = "";
    const deadline = Date.now() + 3000;
    while (Date.now() < deadline) {
      const n = await conn.read(buf);
      if (n === null) break;
      out += new TextDecoder().decode(buf.subarray(0, n));
      if (/\r\n\r\n/.test(out) && /content-length: (\d+)/i.test(out)) {
        const len = Number(/content-length: (\d+)/i.exec(out)![1]);
        if (out.length - out.indexOf("\r\n\r\n") - 4 >= len) break;
      }
    }
    return out;
  } finally {
    conn.close();
  }
}

Deno.test("keys are long and fresh", () => {
  const a = newKey();
  assert.equal(a.length, 43);
  assert.notEqual(a, newKey());
  assert.match(a, /^[A-Za-z0-9_-]+$/);
});

Deno.test("the guard refuses foreign hosts, origins, cross-site fetches and bad keys", () => {
  const cfg = { port: 4000, key: "tok" };
  const req = (headers: Record<string, string>, url = "http://127.0.0.1:4000/tok/api/state") => {
    const r = checkRequest(new Request(url, { headers }), cfg);
    return "status" in r ? r : undefined;
  };
  assert.equal(req({ host: "127.0.0.1:4000" }), undefined);
  assert.equal(req({ host: "localhost:4000" }), undefined);
  assert.deepEqual(
    checkRequest(
      new Request("http://127.0.0.1:4000/tok/api/state", { headers: { host: "127.0.0.1:4000" } }),
      cfg,
    ),
    { path: "/api/state" },
  );
  assert.equal(req({ host: "127.0.0.1:4001" })?.status, 403);
  assert.equal(req({ host: "rebind.example:4000" })?.status, 403);
  assert.equal(req({})?.status, 403);
  assert.equal(req({ host: "127.0.0.1:4000", origin: "http://evil.example" })?.status, 403);
  assert.equal(req({ host: "127.0.0.1:4000", origin: "null" })?.status, 403);
  assert.equal(req({ host: "127.0.0.1:4000", "sec-fetch-site": "cross-site" })?.status, 403);
  assert.equal(
    req({ host: "127.0.0.1:4000" }, "http://127.0.0.1:4000/tok2/api/state")?.status,
    403,
  );
  assert.equal(req({ host: "127.0.0.1:4000" }, "http://127.0.0.1:4000/api/state")?.status, 403);
  assert.equal(
    req({ host: "127.0.0.1:4000" }, "http://127.0.0.1:4000/api/state?t=tok")?.status,
    403,
    "the key in a query is not the key in the path",
  );
});

Deno.test("file names: no way out of the notebook's folder", async () => {
  const dir = await Deno.makeTempDir();
  try {
    await Deno.writeTextFile(join(dir, "a.csv"), "x\n");
    assert.equal(insideFolder(dir, "a.csv"), join(dir, "a.csv"));
    for (
      const bad of [
        "../a.csv",
        "/etc/passwd",
        "x/../../a.csv",
        "..\\a.csv",
        "C:/x.csv",
        "./a.csv",
        "a\0.csv",
        "",
      ]
    ) {
      assert.throws(() => insideFolder(dir, bad), /refused file name/, bad);
    }
    for (const bad of ["../x.lentil.md", "sub/x.lentil.md", ".hidden.lentil.md", "x.md"]) {
      assert.throws(() => bareName(bad, ".lentil.md"), /refused file name/, bad);
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test({
  name: "the server refuses wrong keys, foreign Origin and Host, and path traversal",
  async fn(t) {
    const { dir, inner, path, server } = await fixtureServer();
    const { origin, key, port } = server;
    const at = (p: string) => `/${key}${p}`;
    const original = await Deno.readTextFile(path);
    const get = (p: string, headers: Record<string, string> = {}) =>
      fetch(origin + p, { headers }).then(async (r) => ({
        status: r.status,
        body: await r.text(),
      }));
    const post = (p: string, body: unknown, headers: Record<string, string> = {}) =>
      fetch(origin + p, {
        method: "POST",
        headers: { "content-type": "application/json", ...headers },
        body: JSON.stringify(body),
      }).then(async (r) => ({ status: r.status, body: await r.text() }));
    try {
      assert.equal(new URL(server.url).hostname, "127.0.0.1");
      await t.step("under the key: allowed", async () => {
        assert.equal(server.url, `${origin}/${key}/`);
        const page = await get(at("/"));
        assert.equal(page.status, 200);
        assert.ok(!page.body.includes(key), "the page's markup does not repeat the key");
        const state = await get(at("/api/state"));
        assert.equal(state.status, 200);
        assert.ok(JSON.parse(state.body).view.cells.cornea);
        const script = await fetch(origin + at("/client/main.js"));
        assert.equal(script.status, 200);
        assert.match(script.headers.get("content-type") ?? "", /javascript/);
        await script.body?.cancel();
        for (const p of ["/client/evil.js", "/client/../_guard.ts", "/client/main.ts"]) {
          assert.equal((await get(at(p))).status, 404, p);
        }
        const bare = await fetch(`${origin}/${key}`, { redirect: "manual" });
        assert.equal(bare.status, 308);
        assert.equal(bare.headers.get("location"), `/${key}/`);
      });
      await t.step("without or with a wrong key: refused", async () => {
        for (const p of ["/", "/client/main.js", "/style.css", "/api/state", "/api/disk"]) {
          assert.equal((await get(p)).status, 403, p);
          assert.equal((await get(`/${key.slice(0, -1)}x${p}`)).status, 403, p);
          assert.equal((await get(`${p}?t=${key}`)).status, 403, p);
          assert.equal((await get(p, { "x-lentil-token": key })).status, 403, p);
        }
        const r = await post(`/guess/api/cell`, { id: "spectacle", expression: "+9 D" });
        assert.equal(r.status, 403);
        assert.equal((await post("/api/save", {})).status, 403);
        assert.equal(await Deno.readTextFile(path), original);
      });
      await t.step("a foreign Origin: refused, nothing changes", async () => {
        const h = { origin: "http://evil.example" };
        assert.equal((await get(at("/api/state"), h)).status, 403);
        const r = await post(at("/api/cell"), { id: "spectacle", expression: "+9 D" }, h);
        assert.equal(r.status, 403);
        assert.equal(server.session.text, original);
        const ok = await get(at("/api/state"), { origin });
        assert.equal(ok.status, 200, "our own origin is fine");
      });
      await t.step("a foreign Host header: refused", async () => {
        for (const host of [`evil.example:${port}`, `127.0.0.1:${port + 1}`, "127.0.0.1"]) {
          const res = await rawRequest(
            port,
            `GET /${key}/api/state HTTP/1.1\r\nHost: ${host}\r\nConnection: close\r\n\r\n`,
          );
          assert.match(res, /^HTTP\/1\.1 403/, host);
          assert.ok(!res.includes("cornea"), host);
        }
        const ok = await rawRequest(
          port,
          `GET /${key}/api/state HTTP/1.1\r\nHost: 127.0.0.1:${port}\r\nConnection: close\r\n\r\n`,
        );
        assert.match(ok, /^HTTP\/1\.1 200/);
      });
      await t.step("path traversal in file parameters: refused, nothing leaks", async () => {
        const h = {};
        for (
          const f of [
            "../secret.txt",
            "..%2Fsecret.txt",
            "%2e%2e/secret.txt",
            "/etc/passwd",
            "visits.csv/../../secret.txt",
            "..\\secret.txt",
            "link.csv",
            "counter.lentil.md",
          ]
        ) {
          const r = await get(at(`/api/source?file=${f}`), h);
          assert.ok(r.status === 403 || r.status === 400, `${f}: ${r.status}`);
          assert.ok(!r.body.includes("not for the page"), f);
          assert.ok(!r.body.includes("root:"), f);
        }
        assert.equal((await get(at("/api/source?file=visits.csv"), h)).status, 200);
        for (const name of ["../escaped.lentil.md", `${dir}/abs.lentil.md`, "sub/x.lentil.md"]) {
          const r = await post(at("/api/keep-both"), { name }, h);
          assert.ok(r.status === 403 || r.status === 400, `${name}: ${r.status}`);
        }
        assert.deepEqual(
          [...Deno.readDirSync(dir)].map((e) => e.name).sort(),
          ["case", "secret.txt"],
          "nothing written outside the folder",
        );
        const raw = await rawRequest(
          port,
          `GET /${key}/../secret.txt HTTP/1.1\r\nHost: 127.0.0.1:${port}\r\nConnection: close\r\n\r\n`,
        );
        assert.ok(!raw.includes("not for the page"));
        assert.ok(
          [...Deno.readDirSync(inner)].every((e) => !e.name.startsWith("escaped")),
        );
      });
      await t.step("bodies are validated", async () => {
        const h = {};
        assert.equal((await post(at("/api/cell"), { id: "vd" }, h)).status, 400);
        assert.equal((await post(at("/api/cell"), { id: "vd", expression: 1 }, h)).status, 400);
        assert.equal(
          (await post(at("/api/cell"), { id: "vd", expression: "1 mm", extra: 1 }, h)).status,
          400,
        );
        assert.equal(
          (await post(at("/api/cell"), { id: "vd", expression: "1 mm\n```" }, h)).status,
          400,
        );
        const text = await fetch(origin + at("/api/save"), {
          method: "POST",
          headers: { ...h, "content-type": "text/plain" },
          body: "{}",
        });
        await text.body?.cancel();
        assert.equal(text.status, 415);
        assert.equal(await Deno.readTextFile(path), original);
      });
      await t.step(
        "the page's socket: own Origin and key only; calls answer as requests",
        async () => {
          const wsUrl = (p: string) => `ws://127.0.0.1:${port}${p}`;
          // Deno's WebSocket takes headers (a browser sends its page's Origin by itself).
          const open = (p: string, headers: Record<string, string>) =>
            new Promise<WebSocket | string>((resolve) => {
              const ws = new WebSocket(wsUrl(p), { headers } as never);
              ws.onopen = () => resolve(ws);
              ws.onerror = () => resolve("refused");
            });
          for (
            const [p, h] of [
              [at("/api/socket"), { origin: "http://evil.example" }],
              [at("/api/socket"), {}],
              ["/api/socket", { origin }],
              [`/${key.slice(0, -1)}x/api/socket`, { origin }],
            ] as const
          ) {
            assert.equal(await open(p, h), "refused", `${p} ${JSON.stringify(h)}`);
          }
          const ws = await open(at("/api/socket"), { origin });
          assert.ok(ws instanceof WebSocket);
          type Answer = { n: number; status: number; body: Record<string, unknown> };
          const next: ((a: Answer) => void)[] = [];
          ws.onmessage = (e) => next.shift()?.(JSON.parse(e.data));
          const ask = (m: unknown) =>
            new Promise<Answer>((resolve) => {
              next.push(resolve);
              ws.send(typeof m === "string" ? m : JSON.stringify(m));
            });
          const state = await ask({ n: 1, path: "/api/state" });
          assert.equal(state.n, 1);
          assert.equal(state.status, 200);
          assert.ok((state.body.view as { cells: object }).cells);
          const bad = await ask({ n: 2, path: "/api/cell", body: { id: "vd" } });
          assert.equal(bad.status, 400, "the request's own validation");
          const edit = await ask({
            n: 3,
            path: "/api/cell",
            body: { id: "vd", expression: "14 mm" },
          });
          assert.equal(edit.status, 200);
          assert.equal(edit.body.ok, true);
          assert.ok((edit.body.recomputed as string[]).includes("cornea"));
          for (
            const m of [{ n: 4, path: "/api/socket" }, { n: 4, path: "/../secret" }, "not json"]
          ) {
            const refused = await ask(m);
            assert.deepEqual(
              [refused.n, refused.status],
              [-1, 400],
              "not a call: " + JSON.stringify(m),
            );
          }
          const undone = await ask({ n: 5, path: "/api/undo", body: {} });
          assert.equal(undone.status, 200);
          assert.equal(server.session.text, original, "undone over the socket");
          const closed = new Promise((resolve) => ws.onclose = resolve);
          ws.close();
          await closed;
        },
      );
    } finally {
      await server.shutdown();
      await Deno.remove(dir, { recursive: true });
    }
  },
});
