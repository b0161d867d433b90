// Bytes that are not UTF-8 are reported line by line; the rest of the notebook still evaluates.
import assert from "node:assert/strict";
import { join } from "node:path";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";
import { notebookFromBytes } from "../notebook/load.ts";

const bytes = (...parts: (string | number[])[]) => {
  const enc = new TextEncoder();
  const chunks = parts.map((p) => typeof p === "string" ? enc.encode(p) : new Uint8Array(p));
  const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  let at = 0;
  for (const c of chunks) out.set(c, (at += c.length) - c.length);
  return out;
};

const BAD = bytes(
  '```lentil\na = 1 mm\nb = "',
  [0xff, 0xfe],
  ' bad"\nc = a + 1 mm\n```\n\n```lentil table t\nx [mm] | y [text]\n1 | ok\n2 | ',
  [0xc3],
  "(\n```\n",
);

Deno.test("invalid UTF-8: each bad line is an error, every other cell evaluates", async () => {
  const r = await notebookFromBytes(BAD, "bad.lentil.md");
  assert.ok(r.ok);
  const nb = r.notebook;
  assert.deepEqual(
    nb.diagnostics().map((d) => `${d.line}:${d.col}`),
    ["3:6", "10:5"],
  );
  assert.match(nb.result("b")!.error!.message, /line is not valid UTF-8 \(byte 0xff/);
  assert.match(nb.result("t")!.error!.message, /byte 0xc3/);
  assert.equal(nb.language.describe(nb.value("c")).display, "2.00 mm");
});

Deno.test("invalid UTF-8: run --json still prints the documented JSON", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const f = join(dir, "bad.lentil.md");
    await Deno.writeFile(f, BAD);
    const io = captureIo();
    assert.equal(await runCli(["run", f, "--json"], io), 1);
    const json = JSON.parse(io.stdout());
    assert.deepEqual(json.cells.map((c: { name: string }) => c.name), ["a", "b", "c", "t"]);
    assert.equal(json.cells[2].display, "2.00 mm");
    assert.equal(json.cells[1].error.line, 3);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
