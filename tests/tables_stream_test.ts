import assert from "node:assert/strict";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { streamNotebook, StreamSetupError } from "../notebook/table/stream.ts";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";
import { Notebook } from "../notebook/engine/engine.ts";
import { getLanguage } from "../cells/language.ts";
import { memoryHost } from "./_csv_helpers.ts";

const lang = getLanguage();

const NOTEBOOK = (opts = "") =>
  [
    "~~~lentil table eyes",
    "file: eyes.csv",
    ...(opts ? [opts] : []),
    "~~~",
    "",
    "~~~lentil",
    "shift = 0.25 D",
    "eyes.M = sph + cyl / 2 + shift",
    "eyes.J0 = -(cyl / 2) * cos(2 * axis)",
    "eyes.J45 = vectorJ45(cyl, axis)",
    "eyes.tag = eye",
    "avg = meanRx(eyes.sph, eyes.cyl, eyes.axis)",
    "stats = vectorStats(eyes.sph, eyes.cyl, eyes.axis)",
    "ell = ellipse95(eyes.sph, eyes.cyl, eyes.axis)",
    "sphSummary = sampleStats(eyes.sph)",
    "mid = medianOf(eyes.sph)",
    "rows = countOf(eyes.sph)",
    "~~~",
    "",
  ].join("\n");

function csv(n: number, bad: number[] = []): string {
  const lines = ["eye [text],sph [D],cyl [D],axis [deg]"];
  for (let i = 0; i < n; i++) {
    if (bad.includes(i)) lines.push(`R,abc,-0.50,90`);
    else {lines.push(
        `${i % 2 ? "L" : "R"},${-3 + (i % 13) * 0.25},${-(i % 5) * 0.25},${1 + (i * 37) % 180}`,
      );}
  }
  return lines.join("\n") + "\n";
}

async function folder(files: Record<string, string>): Promise<string> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-stream-" });
  for (const [k, v] of Object.entries(files)) await Deno.writeTextFile(join(dir, k), v);
  return dir;
}

/** Numbers equal to 1e-9 (relative), through nested records such as a mean prescription. */
function closeDeep(a: unknown, b: unknown, path: string): void {
  if (typeof b === "number") {
    const x = a as number;
    assert.ok(Math.abs(x - b) <= 1e-9 * Math.max(1, Math.abs(b)), `${path}: ${x} vs ${b}`);
  } else if (b !== null && typeof b === "object") {
    for (const k of Object.keys(b)) {
      closeDeep(
        (a as Record<string, unknown>)[k],
        (b as Record<string, unknown>)[k],
        `${path}.${k}`,
      );
    }
  } else assert.equal(a, b, path);
}

Deno.test("streaming gives the same columns and aggregates as the in-memory notebook", async () => {
  // Thibos et al. 1997 (power vectors); Welford 1962 (running moments): one pass, same result
  const data = csv(5000);
  const dir = await folder({ "s.lentil.md": NOTEBOOK(), "eyes.csv": data });
  const out = join(dir, "out.csv");
  const r = await streamNotebook(join(dir, "s.lentil.md"), { out, chunkRows: 700 });
  assert.equal(r.ok, true, r.stopped);
  assert.equal(r.rowsRead, 5000);
  assert.equal(r.rowsKept, 5000);
  assert.deepEqual(r.columns.map((c) => [c.name, c.path]), [
    ["M", "compiled"],
    ["J0", "compiled"],
    ["J45", "compiled"],
    ["tag", "compiled"],
  ]);
  const nb = Notebook.fromText(NOTEBOOK(), "s.lentil.md", {
    host: memoryHost({ "eyes.csv": data }),
  });
  const cell = (name: string) => r.cells.find((c) => c.name === name)!;
  for (const name of ["avg", "stats", "ell", "rows"]) {
    const a = lang.describe(cell(name).value).value as Record<string, number> | number;
    const b = lang.describe(nb.value(name)).value as Record<string, number> | number;
    if (typeof a === "number") assert.equal(a, b);
    else closeDeep(a, b, name);
  }
  assert.match(cell("sphSummary").display!, /quartiles and median are not available/);
  assert.match(cell("mid").unavailable!, /needs every value/);
  assert.equal(cell("shift").display, "+0.25 D");
  // The output reads back with its units and the same computed values.
  const rows = parse(await Deno.readTextFile(out), { columns: true }) as Record<string, string>[];
  assert.equal(rows.length, 5000);
  assert.deepEqual(Object.keys(rows[0]), [
    "eye",
    "sph [D]",
    "cyl [D]",
    "axis [deg]",
    "M [D]",
    "J0 [D]",
    "J45 [D]",
    "tag",
  ]);
  const m = nb.value("eyes.M") as { data: Float64Array };
  // Written to 12 significant digits: the value, without the binary noise of arithmetic.
  assert.ok(Math.abs(Number(rows[4321]["M [D]"]) - m.data[4321]) < 1e-9);
  for (const r of rows.slice(0, 500)) {
    for (const k of ["M [D]", "J0 [D]", "J45 [D]"]) {
      assert.equal(r[k], String(Number(Number(r[k]).toPrecision(12)))); // at most 12 digits
    }
  }
});

Deno.test("streaming refuses to write over the input or an existing file", async () => {
  // common practice, no source
  const dir = await folder({ "s.lentil.md": NOTEBOOK(), "eyes.csv": csv(10), "old.csv": "x\n" });
  const nbPath = join(dir, "s.lentil.md");
  await assert.rejects(
    () => streamNotebook(nbPath, { out: join(dir, "eyes.csv") }),
    (e: Error) =>
      e instanceof StreamSetupError && /refusing to write over the input/.test(e.message),
  );
  await assert.rejects(
    () => streamNotebook(nbPath, { out: join(dir, "old.csv") }),
    /exists; add --overwrite/,
  );
  const r = await streamNotebook(nbPath, { out: join(dir, "old.csv"), overwrite: true });
  assert.equal(r.ok, true);
});

Deno.test("a bad row stops the stream by default; with skip it is excluded and counted", async () => {
  // common practice, no source
  const data = csv(3000, [17, 2500]);
  const dir = await folder({
    "stop.lentil.md": NOTEBOOK(),
    "skip.lentil.md": NOTEBOOK("bad rows: skip"),
    "eyes.csv": data,
  });
  const stop = await streamNotebook(join(dir, "stop.lentil.md"), { out: join(dir, "a.csv") });
  assert.equal(stop.ok, false);
  assert.match(stop.stopped!, /^bad row 18: column sph: "abc" is not a number/);
  await assert.rejects(() => Deno.stat(join(dir, "a.csv")), Deno.errors.NotFound);
  assert.deepEqual((await Array.fromAsync(Deno.readDir(dir))).map((e) => e.name).sort(), [
    "eyes.csv",
    "skip.lentil.md",
    "stop.lentil.md",
  ]); // no temporary file left behind
  const skip = await streamNotebook(join(dir, "skip.lentil.md"), { out: join(dir, "b.csv") });
  assert.equal(skip.ok, true);
  assert.equal(skip.excluded, 2);
  assert.equal(skip.rowsKept, 2998);
  assert.deepEqual(skip.problems.map((p) => p.row), [17, 2500]);
  assert.match(skip.notes[0].message, /2 bad rows \(row 18, 2501\) of 3000/);
});

Deno.test("lentil stream prints the counts, columns and aggregates", async () => {
  // common practice, no source
  const dir = await folder({
    "s.lentil.md": NOTEBOOK(),
    "eyes.csv":
      'eye [text],sph [D],cyl [D],axis [deg]\nR,-1,-0.5,"90"\nL,-2,-1,180\nR,-1.5,-0.25,45\n',
  });
  const io = captureIo();
  const code = await runCli(["stream", join(dir, "s.lentil.md"), "--out", join(dir, "r.csv")], io);
  assert.equal(code, 0, io.stderr());
  const text = io.stdout();
  assert.match(text, /rows read 3, kept 3, bad rows excluded 0/);
  assert.match(text, /column M \[D\]: compiled/);
  assert.match(text, /^avg = /m);
  const unfinished = captureIo();
  const broken = await folder({
    "s.lentil.md": NOTEBOOK(),
    "eyes.csv": 'eye [text],sph [D],cyl [D],axis [deg]\nR,-1,-0.5,"90\n',
  });
  assert.equal(await runCli(["stream", join(broken, "s.lentil.md")], unfinished), 1);
  assert.match(unfinished.stderr(), /a quoted field is never closed/);
});

Deno.test("a computed column that fails on the data stops the stream with its reason; cautions shown", async () => {
  const dir = await folder({
    "s.lentil.md":
      "```lentil table cohort\nfile: c.csv\n```\n\n```lentil\ncohort.r = round(sph * 4) / 4\n" +
      "cl = vertexPower(-6 D, 12 mm)\n```\n",
    "c.csv": "sph [D],cyl [D]\n-1.30,-0.5\n",
  });
  const r = await streamNotebook(join(dir, "s.lentil.md"), {});
  assert.equal(r.ok, false);
  assert.match(r.stopped!, /computed column cohort\.r: row 1: round of a quantity needs the unit/);
  assert.ok(r.cautions.length > 0); // vertexPower can feed the fitting of a lens
});

Deno.test("the temporary output never replaces an input named like it (res.part and --out res)", async () => {
  // common practice, no source: an output is written to a temporary file and renamed
  const data = csv(3000);
  const nb = NOTEBOOK().replace("file: eyes.csv", "file: res.part") +
    "~~~lentil table other\nfile: other.part\n~~~\n";
  const dir = await folder({ "s.lentil.md": nb, "res.part": data, "other.part": data });
  const r = await streamNotebook(join(dir, "s.lentil.md"), {
    out: join(dir, "res"),
    table: "eyes",
    chunkRows: 500,
  });
  assert.equal(r.ok, true, r.stopped);
  assert.equal(await Deno.readTextFile(join(dir, "res.part")), data); // the input is untouched
  assert.equal(await Deno.readTextFile(join(dir, "other.part")), data);
  const written = parse(await Deno.readTextFile(join(dir, "res")), { columns: true });
  assert.equal(written.length, 3000);
  const names = (await Array.fromAsync(Deno.readDir(dir))).map((e) => e.name).sort();
  assert.deepEqual(names, ["other.part", "res", "res.part", "s.lentil.md"]);
  // An output that is another table's file is refused too.
  await assert.rejects(
    () => streamNotebook(join(dir, "s.lentil.md"), { out: join(dir, "other.part"), table: "eyes" }),
    /refusing to write over the input/,
  );
});
