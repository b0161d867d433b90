// `lentil export`: writes the page, names problems, exit codes.
import assert from "node:assert/strict";
import { captureIo } from "../notebook/cli/command.ts";
import { runCli } from "../notebook/cli/main.ts";
import { defaultOutput } from "../notebook/cli/commands/export.ts";

const FIXTURE = new URL("./fixtures/export-plots.lentil.md", import.meta.url).pathname;
const HOSTILE = new URL("./fixtures/hostile.lentil.md", import.meta.url).pathname;

Deno.test("lentil export: writes one page and says where", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-export-" });
  try {
    const out = `${dir}/page.html`;
    const io = captureIo();
    const code = await runCli(["export", FIXTURE, "-o", out], io);
    assert.equal(code, 0, io.stderr());
    assert.match(io.stdout(), /^wrote .*page\.html \(\d+\.\d KB, sha256 [0-9a-f]{12}…\)\n$/);
    const html = await Deno.readTextFile(out);
    assert.ok(html.includes("<svg"));
    assert.ok(html.length < 1024 * 1024);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("lentil export: problems are listed and the exit status is 1, the page still written", async () => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-export-" });
  try {
    const out = `${dir}/h.html`;
    const io = captureIo();
    const code = await runCli(["export", HOSTILE, "--out", out, "--data"], io);
    assert.equal(code, 1);
    assert.match(io.stderr(), /hostile\.lentil\.md:\d+:\d+: .*plot broken: figure/);
    assert.match(io.stderr(), /unknown name or unit "nosuch"/);
    assert.ok((await Deno.stat(out)).size > 0);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("lentil export: a missing file and a bad --rows are reported plainly", async () => {
  let io = captureIo();
  assert.equal(await runCli(["export", "no/such.lentil.md"], io), 1);
  assert.match(io.stderr(), /no\/such\.lentil\.md: no such file/);
  io = captureIo();
  assert.equal(await runCli(["export", FIXTURE, "--rows", "many"], io), 2);
  assert.match(io.stderr(), /--rows: expected a whole number/);
});

Deno.test("lentil export: default output name", () => {
  assert.equal(defaultOutput("a/case.lentil.md"), "a/case.html");
  assert.equal(defaultOutput("notes.md"), "notes.html");
});
