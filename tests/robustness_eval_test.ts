// eval and the engine at the edges: a leading minus, empty input, `;`, and results that are
// not finite real numbers.
import assert from "node:assert/strict";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";
import { Notebook } from "../notebook/engine/engine.ts";

async function cli(...args: string[]) {
  const io = captureIo();
  const code = await runCli(args, io);
  return { code, out: io.stdout(), err: io.stderr() };
}

Deno.test("eval takes an expression that starts with a minus", async () => {
  const r = await cli("eval", "-10 D + 0.25 D");
  assert.equal(r.code, 0, r.err);
  assert.equal(r.out, "-9.75 D\n");
  const j = await cli("eval", "-4 D", "--json");
  assert.equal(JSON.parse(j.out).value, -4);
  const bad = await cli("eval", "-x");
  assert.equal(bad.code, 2);
  assert.match(bad.err, /Unknown option '-x'/);
});

Deno.test("eval with nothing to evaluate is a usage error", async () => {
  for (const e of ["", "   "]) {
    const r = await cli("eval", e);
    assert.equal(r.code, 2);
    assert.match(r.err, /give an expression/);
  }
});

Deno.test("two formulas in one cell are an error at the `;`", async () => {
  const r = await cli("eval", "1 mm; 2 mm");
  assert.equal(r.code, 1);
  assert.match(r.err, /^<eval>:1:5: one formula a cell/);
});

Deno.test("a result that is infinite, not a number or complex is an error at the cell", () => {
  const nb = Notebook.fromText(
    "```lentil\na = 1 D / 0\nb = 0 / 0\nc = sqrt(-4)\nd = a * 2\nok = sqrt(4)\n```\n",
    "f.lentil.md",
  );
  assert.match(nb.result("a")!.error!.message, /the result is infinite/);
  assert.match(nb.result("b")!.error!.message, /not a number/);
  assert.match(nb.result("c")!.error!.message, /not a real number/);
  assert.equal(nb.result("d")!.error!.kind, "dependency");
  assert.equal(nb.value("ok"), 2);
});

Deno.test("help --help shows help's own usage", async () => {
  const r = await cli("help", "--help");
  assert.equal(r.code, 0);
  assert.match(r.out, /^usage: lentil help \[COMMAND\]/);
});
