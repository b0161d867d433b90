// `run` never hides a problem that `check` reports, in text and in --json.
import assert from "node:assert/strict";
import { join } from "node:path";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";

async function runOn(text: string, ...flags: string[]) {
  const dir = await Deno.makeTempDir();
  try {
    const f = join(dir, "p.lentil.md");
    await Deno.writeTextFile(f, text);
    const io = captureIo();
    const code = await runCli(["run", f, ...flags], io);
    return { code, out: io.stdout(), err: io.stderr() };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test("run lists an unterminated block under Problems and exits 1", async () => {
  const r = await runOn("```lentil\na = 1 mm\nb = a * 2\n");
  assert.equal(r.code, 1);
  assert.match(r.out, /b += 2\.00 mm/);
  assert.match(
    r.out,
    /\nProblems\n {2}.*p\.lentil\.md:1:1: lentil block opened here is never closed/,
  );
  const j = await runOn("```lentil\na = 1 mm\n", "--json");
  assert.equal(j.code, 1);
  const json = JSON.parse(j.out);
  assert.equal(json.cells[0].display, "1 mm");
  assert.equal(json.problems.length, 1);
  assert.equal(json.problems[0].line, 1);
});

Deno.test("run does not repeat under Problems what a cell already shows", async () => {
  const r = await runOn("```lentil\na = 1 mm\na = 2 mm\n```\n");
  assert.equal(r.code, 1);
  assert.match(r.out, /a@3 +! duplicate name "a"/);
  assert.doesNotMatch(r.out, /Problems/);
});
