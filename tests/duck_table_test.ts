import assert from "node:assert/strict";
import { join } from "node:path";
import { DuckDBInstance } from "@duckdb/node-api";
import { loadNotebook } from "../notebook/load.ts";
import { buildReport } from "../notebook/report.ts";
import { openDuck } from "../notebook/duck/_open.ts";
import { quoteName, SqlNameError } from "../notebook/sql/_names.ts";
import { type ProgressEvent, progressPrinter } from "../notebook/progress.ts";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";
import { seeded as rng } from "../lib/seeded.ts";

function csv(n: number, opts: { mixed?: boolean; gaps?: boolean } = {}): string {
  const r = rng(7);
  const q = (x: number) => Math.round(x * 4) / 4;
  const lines = [
    "code [text],age [number],sph [D],cyl [D],axis [deg],sph2 [D],cyl2 [D],axis2 [deg]",
  ];
  for (let i = 0; i < n; i++) {
    const s = q(-6 + 9 * r());
    let c = -q(3 * r());
    const a = 1 + Math.floor(179 * r());
    if (opts.mixed && i % 17 === 5 && c !== 0) c = -c;
    const gap = opts.gaps && i % 23 === 3;
    lines.push(
      `P${String(i).padStart(5, "0")},${20 + (i % 60)},${gap ? "" : s},${c},${a},${
        q(s + 0.5 * r())
      },${-q(3 * r())},${1 + Math.floor(179 * r())}`,
    );
  }
  return lines.join("\n") + "\n";
}

const CELLS = [
  "shift = 0.25 D",
  "eyes.M = sph + cyl / 2 + shift",
  "eyes.J0 = vectorJ0(cyl, axis)",
  "eyes.M2 = vectorM(sph2, cyl2)",
  "eyes.d = (M - M2) * 2",
  "n = countOf(eyes.sph)",
  "avgM = meanOf(eyes.M)",
  "sdM = sdOf(eyes.M)",
  "avg = meanRx(eyes.sph, eyes.cyl, eyes.axis)",
  "vs = vectorStats(eyes.sph, eyes.cyl, eyes.axis)",
  "ag = agreement(eyes.M, eyes.M2)",
  "twice = n * 2",
];

/** Statistics that need every value or the persons: computed in-process. */
const IN_PROCESS = [
  "ell = ellipse95(eyes.sph, eyes.cyl, eyes.axis)",
  "sp = spread95(eyes.sph, eyes.cyl, eyes.axis)",
  "rag = rxAgreement(eyes.sph, eyes.cyl, eyes.axis, eyes.sph2, eyes.cyl2, eyes.axis2)",
];

function notebook(engine: string, extra = "", file = "eyes.csv", cells = CELLS): string {
  return `~~~lentil table eyes\nfile: ${file}\nengine: ${engine}\n${extra}~~~\n\n~~~lentil\n${
    cells.join("\n")
  }\n~~~\n`;
}

async function folder(files: Record<string, string>): Promise<string> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-duck-" });
  for (const [k, v] of Object.entries(files)) await Deno.writeTextFile(join(dir, k), v);
  return dir;
}

function closeDeep(a: unknown, b: unknown, path: string): void {
  if (typeof b === "number") {
    const x = a as number;
    assert.ok(Math.abs(x - b) <= 1e-9 * Math.max(1, Math.abs(b)), `${path}: ${x} vs ${b}`);
  } else if (Array.isArray(b) && b.length > 50) {
    // a column's values stay in the database: only its shape is compared
  } else if (b !== null && typeof b === "object") {
    for (const k of Object.keys(b)) {
      closeDeep(
        (a as Record<string, unknown>)?.[k],
        (b as Record<string, unknown>)[k],
        `${path}.${k}`,
      );
    }
  } else assert.equal(a, b, path);
}

async function both(files: Record<string, string>, extra = "", cells = CELLS) {
  const dir = await folder({
    ...files,
    "d.lentil.md": notebook("duckdb", extra, "eyes.csv", cells),
    "p.lentil.md": notebook("in-process", extra, "eyes.csv", cells),
  });
  const d = await loadNotebook(join(dir, "d.lentil.md"), { database: true });
  const p = await loadNotebook(join(dir, "p.lentil.md"), { database: true });
  assert.ok(d.ok && p.ok);
  return { dir, d: buildReport(d.notebook), p: buildReport(p.notebook) };
}

Deno.test("DuckDB and the in-process path give the same statistics to 1e-9", async () => {
  // Thibos et al. 1997 (power vectors) and Bland & Altman 1986 (limits): same formulas, two engines
  const { d, p } = await both({ "eyes.csv": csv(20000, { mixed: true, gaps: true }) });
  assert.deepEqual(d.cells.map((c) => c.id), p.cells.map((c) => c.id));
  for (let i = 0; i < p.cells.length; i++) {
    const a = d.cells[i];
    const b = p.cells[i];
    assert.equal(a.error?.message, b.error?.message, a.id);
    if (a.kind === "column") assert.equal(a.display, b.display, a.id);
    else closeDeep(a.value, b.value, a.id);
  }
  const n = p.cells.find((c) => c.id === "n")!;
  assert.equal(n.value, 20000 - Math.ceil((20000 - 3) / 23)); // empty sphere cells left out
  // The computed columns stayed in the database: only their shape came back.
  assert.deepEqual(d.cells.find((c) => c.id === "eyes.M")!.value, []);
  assert.equal((p.cells.find((c) => c.id === "eyes.M")!.value as unknown[]).length, 20000);
});

Deno.test("DuckDB: statistics that need every value or the persons fall back to the in-process path", async () => {
  const { d, p } = await both(
    { "eyes.csv": csv(3000, { mixed: true }) },
    "",
    [...CELLS, ...IN_PROCESS],
  );
  for (let i = 0; i < p.cells.length; i++) {
    closeDeep(d.cells[i].value, p.cells[i].value, d.cells[i].id);
  }
  assert.equal((d.cells.find((c) => c.id === "eyes.M")!.value as unknown[]).length, 3000);
});

Deno.test("DuckDB: a unit column holding text stops the table naming file, line and column; skip counts it", async () => {
  const data = csv(300).split("\n");
  const f = data[42].split(",");
  f[2] = "abc";
  data[42] = f.join(","); // data row 42, line 43
  const files = { "eyes.csv": data.join("\n") };
  const { d, p } = await both(files);
  const de = d.cells.find((c) => c.id === "eyes")!;
  const pe = p.cells.find((c) => c.id === "eyes")!;
  assert.match(de.error!.message, /column sph: "abc" is not a number \(in D\)/);
  assert.equal(de.error!.file, "eyes.csv");
  assert.equal(de.error!.line, 43);
  assert.equal(pe.error!.line, 43);
  const skip = await both(files, "bad rows: skip\n");
  const t = skip.d.cells.find((c) => c.id === "eyes")!;
  assert.match(t.display, /299 rows/);
  assert.match(t.display, /1 unreadable row left out|1 bad row/);
  closeDeep(
    skip.d.cells.find((c) => c.id === "vs")!.value,
    skip.p.cells.find((c) => c.id === "vs")!.value,
    "vs",
  );
});

Deno.test("DuckDB: ragged rows are bad rows with their line; a declared column missing from the file is named", async () => {
  const data = csv(100).split("\n");
  data[10] += ",7";
  const dir = await folder({
    "eyes.csv": data.join("\n"),
    "d.lentil.md": notebook("duckdb"),
    "m.lentil.md": notebook("duckdb", "lens [D]\n"),
  });
  const r = await loadNotebook(join(dir, "d.lentil.md"), { database: true });
  assert.ok(r.ok);
  const e = buildReport(r.notebook).cells.find((c) => c.id === "eyes")!;
  assert.match(e.error!.message, /row has 9 fields, the header has 8/);
  assert.equal(e.error!.line, 11);
  const m = await loadNotebook(join(dir, "m.lentil.md"), { database: true });
  assert.ok(m.ok);
  const me = buildReport(m.notebook).cells.find((c) => c.id === "eyes")!;
  assert.match(me.error!.message, /column lens is declared but eyes.csv has no such column/);
});

Deno.test("DuckDB: a Parquet file is read; one with text where numbers are expected is refused by column", async () => {
  const dir = await folder({ "eyes.csv": csv(500) });
  const db = await (await DuckDBInstance.create(":memory:")).connect();
  const src = join(dir, "eyes.csv").replaceAll("'", "''");
  await db.run(
    `COPY (SELECT * FROM read_csv('${src}', header = true)) TO '${
      join(dir, "eyes.parquet").replaceAll("'", "''")
    }' (FORMAT parquet)`,
  );
  await db.run(
    `COPY (SELECT "code [text]" AS "sph [D]", 1.0 AS "cyl [D]", 90.0 AS "axis [deg]" FROM read_csv('${src}', header = true)) TO '${
      join(dir, "bad.parquet").replaceAll("'", "''")
    }' (FORMAT parquet)`,
  );
  db.closeSync();
  await Deno.writeTextFile(join(dir, "q.lentil.md"), notebook("auto", "", "eyes.parquet"));
  await Deno.writeTextFile(join(dir, "p.lentil.md"), notebook("in-process"));
  const q = await loadNotebook(join(dir, "q.lentil.md"), { database: true });
  const p = await loadNotebook(join(dir, "p.lentil.md"), { database: true });
  assert.ok(q.ok && p.ok);
  const qr = buildReport(q.notebook);
  const pr = buildReport(p.notebook);
  for (const id of ["n", "vs", "ag"]) {
    closeDeep(
      qr.cells.find((c) => c.id === id)!.value,
      pr.cells.find((c) => c.id === id)!.value,
      id,
    );
  }
  await Deno.writeTextFile(
    join(dir, "b.lentil.md"),
    "~~~lentil table t\nfile: bad.parquet\n~~~\n\n~~~lentil\nm = meanOf(t.sph)\n~~~\n",
  );
  const b = await loadNotebook(join(dir, "b.lentil.md"), { database: true });
  assert.ok(b.ok);
  const be = buildReport(b.notebook).cells.find((c) => c.id === "t")!;
  assert.match(
    be.error!.message,
    /column sph: the Parquet file stores VARCHAR values, the notebook expects numbers in D/,
  );
});

Deno.test("DuckDB: a file that is gone is named; the database reads nothing outside the notebook's folder", async () => {
  const dir = await folder({ "d.lentil.md": notebook("duckdb") });
  const r = await loadNotebook(join(dir, "d.lentil.md"), { database: true });
  assert.ok(r.ok);
  const e = buildReport(r.notebook).cells.find((c) => c.id === "eyes")!;
  assert.match(e.error!.message, /eyes\.csv.*no such file/);
  const db = await openDuck(dir);
  await assert.rejects(
    () => db.rows("SELECT * FROM read_csv('/etc/passwd')"),
    /disabled by configuration/,
  );
  await assert.rejects(() => db.rows("SET enable_external_access = true"), /locked/);
  db.close();
  assert.throws(() => quoteName('x"; DROP TABLE t; --'), SqlNameError);
  assert.equal(quoteName("sph2"), '"sph2"');
});

Deno.test("DuckDB: a file: table that is a symbolic link is refused as by the in-process reader", async () => {
  const dir = await folder({ "d.lentil.md": notebook("duckdb") });
  await Deno.symlink("/etc/passwd", join(dir, "eyes.csv"));
  const r = await loadNotebook(join(dir, "d.lentil.md"), { database: true });
  assert.ok(r.ok);
  const e = buildReport(r.notebook).cells.find((c) => c.id === "eyes")!;
  assert.match(e.error!.message, /cannot read table file "eyes.csv": .*link/);
  assert.doesNotMatch(JSON.stringify(buildReport(r.notebook)), /root:/);
});

Deno.test("progress: both paths report rows and the part of the file; --quiet and --json print none", async () => {
  const dir = await folder({
    "eyes.csv": csv(30000),
    "d.lentil.md": notebook("duckdb"),
    "p.lentil.md": notebook("in-process"),
  });
  for (const name of ["d", "p"]) {
    const events: ProgressEvent[] = [];
    const r = await loadNotebook(join(dir, `${name}.lentil.md`), {
      database: true,
      onProgress: (e) => events.push(e),
    });
    assert.ok(r.ok);
    const last = events.at(-1)!;
    assert.equal(last.done, true, name);
    assert.equal(last.fraction, 1, name);
    assert.ok(last.rows >= 30000, `${name}: ${last.rows}`);
  }
  const lines: string[] = [];
  const p = progressPrinter({ write: (s) => lines.push(s), terminal: false, after: 0, every: 0 });
  p({ table: "eyes", file: "eyes.csv", rows: 250000, fraction: 0.25 });
  assert.match(lines[0], /^reading eyes\.csv \(table eyes\): 250,000 rows, [\d,]+ rows\/s, 25%/);
  for (const flag of ["--quiet", "--json"]) {
    const io = captureIo();
    await runCli(["run", join(dir, "d.lentil.md"), flag], io);
    assert.doesNotMatch(io.stderr(), /reading eyes\.csv/, flag);
  }
});

Deno.test("stream writes Parquet when --out ends in .parquet; it reads back with its units and values", async () => {
  const dir = await folder({
    "eyes.csv": csv(2000),
    "s.lentil.md": notebook("in-process", "", "eyes.csv", ["eyes.M = sph + cyl / 2"]),
  });
  const { streamNotebook } = await import("../notebook/table/stream.ts");
  const r = await streamNotebook(join(dir, "s.lentil.md"), { out: join(dir, "out.parquet") });
  assert.equal(r.ok, true, r.stopped);
  await Deno.writeTextFile(
    join(dir, "back.lentil.md"),
    "~~~lentil table t\nfile: out.parquet\n~~~\n\n~~~lentil\nn = countOf(t.M)\navg = meanOf(t.M)\n~~~\n",
  );
  await Deno.writeTextFile(
    join(dir, "ref.lentil.md"),
    notebook("in-process", "", "eyes.csv", ["eyes.M = sph + cyl / 2", "avg = meanOf(eyes.M)"]),
  );
  const back = await loadNotebook(join(dir, "back.lentil.md"), { database: true });
  const ref = await loadNotebook(join(dir, "ref.lentil.md"), { database: true });
  assert.ok(back.ok && ref.ok);
  const b = buildReport(back.notebook);
  assert.equal(b.cells.find((c) => c.id === "n")!.value, 2000);
  closeDeep(
    b.cells.find((c) => c.id === "avg")!.value,
    buildReport(ref.notebook).cells.find((c) => c.id === "avg")!.value,
    "avg",
  );
  const names = (await Array.fromAsync(Deno.readDir(dir))).map((e) => e.name).sort();
  assert.deepEqual(names, [
    "back.lentil.md",
    "eyes.csv",
    "out.parquet",
    "ref.lentil.md",
    "s.lentil.md",
  ]);
});
