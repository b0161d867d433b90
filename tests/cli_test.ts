// CLI: run, check, eval, new, help and usage errors, run in-process.
import assert from "node:assert/strict";
import { join } from "node:path";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";

async function cli(...args: string[]) {
  const io = captureIo();
  const code = await runCli(args, io);
  return { code, out: io.stdout(), err: io.stderr() };
}

async function withDir(fn: (dir: string) => Promise<void>) {
  const dir = await Deno.makeTempDir({ prefix: "lentil-cli-" });
  try {
    await fn(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

const GOOD =
  "---\ntitle: CLI check\ncase: C-1\n---\n```lentil\nvd = 12 mm\ncl = vertexPower(-10 D, vd)  # at the cornea\n```\n";

Deno.test("run prints every cell with its value, sources and cautions", async () => {
  await withDir(async (dir) => {
    const f = join(dir, "a.lentil.md");
    await Deno.writeTextFile(f, GOOD);
    const r = await cli("run", f);
    assert.equal(r.code, 0, r.err);
    assert.match(r.out, /^CLI check \(case C-1\)/);
    // An input shows exactly as typed.
    assert.match(r.out, /vd += 12 mm\n/);
    assert.match(r.out, /cl += -9\.00 D \(exact -8\.93\) {2}\[1\] {2}# at the cornea/);
    assert.match(r.out, /\[1\] Effective power F' = F \/ \(1 − d·F\)/);
    assert.match(r.out, /Cautions\n {2}- These calculations aid professional judgement/);
  });
});

Deno.test("run --json has the documented shape", async () => {
  await withDir(async (dir) => {
    const f = join(dir, "a.lentil.md");
    await Deno.writeTextFile(f, GOOD + "```lentil\nbad = vd + 1 D\n```\n");
    const r = await cli("run", f, "--json");
    assert.equal(r.code, 1);
    const j = JSON.parse(r.out);
    const cl = j.cells.find((c: { name: string }) => c.name === "cl");
    assert.equal(cl.unit, "D");
    assert.ok(Math.abs(cl.value - -8.9286) < 1e-4);
    assert.equal(cl.display, "-9.00 D (exact -8.93)");
    assert.deepEqual(cl.sources, ["vertex-formula"]);
    const bad = j.cells.find((c: { name: string }) => c.name === "bad");
    assert.equal(bad.error.kind, "unit");
    assert.equal(bad.error.line, 10);
  });
});

Deno.test("check prints FILE:LINE:COL for each problem and exits 1; 0 when clean", async () => {
  await withDir(async (dir) => {
    const good = join(dir, "good.lentil.md");
    await Deno.writeTextFile(good, GOOD);
    assert.equal((await cli("check", good)).code, 0);
    const bad = join(dir, "bad.lentil.md");
    await Deno.writeTextFile(
      bad,
      "```lentil\nx = 1\nx = 2\ny = 3 qq\n```\n\n```lentil table t\na | b\n1\n```\n\n```lentil\nz = 1\n",
    );
    const r = await cli("check", bad);
    assert.equal(r.code, 1);
    assert.deepEqual(r.out.trim().split("\n"), [
      `${bad}:3:1: duplicate name "x" (first defined at line 2)`,
      `${bad}:4:7: unknown name or unit "qq"`,
      `${bad}:9:1: row has 1 field, the header has 2`,
      `${bad}:12:1: lentil block opened here is never closed (add a line \`\`\`)`,
    ]);
  });
});

Deno.test("check on a missing file or invalid UTF-8 gives a message, not a stack trace", async () => {
  await withDir(async (dir) => {
    const missing = await cli("check", join(dir, "nope.lentil.md"));
    assert.equal(missing.code, 1);
    assert.match(missing.err, /nope\.lentil\.md: no such file/);
    const f = join(dir, "bin.lentil.md");
    await Deno.writeFile(f, new Uint8Array([0x61, 0x0a, 0xff, 0x0a]));
    const r = await cli("check", f);
    assert.equal(r.code, 1);
    assert.match(r.out, /bin\.lentil\.md:2:1: this line is not valid UTF-8/);
    assert.doesNotMatch(r.err + r.out, /at .*\.ts:\d+/);
  });
});

Deno.test("eval computes a vertex compensation with sources; --json shape", async () => {
  const r = await cli("eval", "vertexPower(+10 D, 12 mm)");
  assert.equal(r.code, 0);
  assert.match(r.out, /^\+11\.25 D \(exact \+11\.36\) {2}\[1\]/);
  const j = JSON.parse((await cli("eval", "vertexPower(-10 D, 12 mm)", "--json")).out);
  assert.deepEqual(Object.keys(j), ["value", "unit", "display", "headline", "sources"]);
  assert.equal(j.unit, "D");
  const bad = await cli("eval", "2 D + 3 mm");
  assert.equal(bad.code, 1);
  assert.match(bad.err, /<eval>:1:5: units do not match: cannot add 3\.00 mm to \+2\.00 D/);
});

Deno.test("new writes from a starter and never overwrites", async () => {
  await withDir(async (dir) => {
    const f = join(dir, "mine.lentil.md");
    const r = await cli("new", f);
    assert.equal(r.code, 0, r.err);
    assert.equal(
      await Deno.readTextFile(f),
      await Deno.readTextFile(new URL("../seeds/blank.lentil.md", import.meta.url)),
    );
    const again = await cli("new", f);
    assert.equal(again.code, 1);
    assert.match(again.err, /already exists/);
    assert.equal((await cli("new", join(dir, "x.lentil.md"), "--from", "nosuch")).code, 2);
    assert.match((await cli("new", "--list")).out, /blank/);
  });
});

Deno.test("help for every command; unknown commands and options exit 2", async () => {
  const top = await cli("--help");
  assert.equal(top.code, 0);
  for (const name of ["run", "check", "eval", "new"]) {
    assert.match(top.out, new RegExp(`\\n  ${name} `));
    const h = await cli(name, "--help");
    assert.equal(h.code, 0);
    assert.match(h.out, new RegExp(`^usage: lentil ${name} `));
  }
  const unknown = await cli("frobnicate");
  assert.equal(unknown.code, 2);
  assert.match(unknown.err, /unknown command "frobnicate"/);
  const opt = await cli("run", "--nope", "x.lentil.md");
  assert.equal(opt.code, 2);
  assert.match(opt.err, /Unknown option '--nope'/);
  assert.equal((await cli("run")).code, 2);
  assert.equal((await cli()).code, 2);
});

Deno.test("check reports a plot block's problems at their line", async () => {
  await withDir(async (dir) => {
    const f = join(dir, "p.lentil.md");
    await Deno.writeTextFile(
      f,
      "```lentil table t\nx | y\n1 | 2\n```\n\n```lentil plot\nfigure: pie\ntable: t\n```\n",
    );
    const r = await cli("check", f);
    assert.equal(r.code, 1);
    assert.match(r.out, /p\.lentil\.md:7:9: .*figure "pie" is not one of curve/);
    await Deno.writeTextFile(
      f,
      "```lentil table t\nx | y\n1 | 2\n```\n\n```lentil plot\nfigure: scatter\ntable: t\n" +
        "horizontal: x\nvertical: y\ny-label: why\n```\n",
    );
    const old = await cli("check", f);
    assert.equal(old.code, 1);
    assert.match(old.out, /p\.lentil\.md:11:\d+: .*unknown key "y-label" \(valid keys: figure, /);
  });
});

Deno.test("run --json gives a computed column's values and a table's shape", async () => {
  await withDir(async (dir) => {
    const f = join(dir, "t.lentil.md");
    await Deno.writeTextFile(
      f,
      "```lentil table t\nx [mm]\n1\n2\n```\n\n```lentil\nt.y = x * 2\n```\n",
    );
    const j = JSON.parse((await cli("run", f, "--json")).out);
    const t = j.cells.find((c: { name: string }) => c.name === "t");
    assert.deepEqual(t.value.columns.map((c: { name: string }) => c.name), ["x", "y"]);
    assert.equal(t.value.rows, 2);
    const y = j.cells.find((c: { name: string }) => c.name === "t.y");
    assert.deepEqual([y.value, y.unit], [[2, 4], "mm"]);
  });
});
