import assert from "node:assert/strict";
import { join } from "node:path";
import { DuckDBInstance } from "@duckdb/node-api";
import { getLanguage } from "../cells/language.ts";
import { loadNotebook } from "../notebook/load.ts";
import { buildReport } from "../notebook/report.ts";
import { runCli } from "../notebook/cli/main.ts";
import { captureIo } from "../notebook/cli/command.ts";
import { parseNotebook } from "../notebook/format/parse.ts";
import { tableInputs } from "../notebook/duck/table.ts";
import {
  finishStatistic,
  momentsFromRow,
  planTableWork,
  type TableWork,
} from "../notebook/sql/work.ts";
import { sqlNumber, writeSql } from "../notebook/sql/statements.ts";
import { startPostgres } from "./_postgres.ts";
import { seeded } from "../lib/seeded.ts";

const lang = getLanguage();

/** Invented refractions by two methods, some cells empty (seeded, common practice, no source). */
function csv(n: number): string {
  const r = seeded(12345);
  const q = (x: number) => Math.round(x * 4) / 4;
  const lines = [
    "code [text],age [number],sph [D],cyl [D],axis [deg],sph2 [D],cyl2 [D],axis2 [deg]",
  ];
  for (let i = 0; i < n; i++) {
    const s = q(-6 + 9 * r());
    const c = -q(3 * r());
    lines.push(
      `K${i},${20 + (i % 50)},${i % 31 === 4 ? "" : s},${c},${1 + Math.floor(179 * r())},${
        q(s + r() - 0.5)
      },${-q(3 * r())},${1 + Math.floor(179 * r())}`,
    );
  }
  return lines.join("\n") + "\n";
}

const NOTEBOOK = [
  "~~~lentil table eyes",
  "file: eyes.csv",
  "engine: in-process",
  "~~~",
  "",
  "~~~lentil",
  "shift = 0.25 D",
  "eyes.M = sph + cyl / 2 + shift",
  "eyes.M2 = vectorM(sph2, cyl2)",
  "eyes.J0 = vectorJ0(cyl, axis)",
  "eyes.dd = (M - M2) * 2",
  "n = countOf(eyes.sph)",
  "avgM = meanOf(eyes.M)",
  "sdM = sdOf(eyes.dd)",
  "avg = meanRx(eyes.sph, eyes.cyl, eyes.axis)",
  "vs = vectorStats(eyes.sph2, eyes.cyl2, eyes.axis2)",
  "ag = agreement(eyes.M, eyes.M2)",
  "~~~",
  "",
].join("\n");

function closeDeep(a: unknown, b: unknown, path: string): void {
  if (typeof b === "number") {
    const x = a as number;
    assert.ok(Math.abs(x - b) <= 1e-9 * Math.max(1, Math.abs(b)), `${path}: ${x} vs ${b}`);
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

async function setUp() {
  const dir = await Deno.makeTempDir({ prefix: "lentil-sql-" });
  const data = csv(4000);
  await Deno.writeTextFile(join(dir, "eyes.csv"), data);
  const path = join(dir, "s.lentil.md");
  await Deno.writeTextFile(path, NOTEBOOK);
  const loaded = await loadNotebook(path);
  assert.ok(loaded.ok);
  const expected = new Map(buildReport(loaded.notebook).cells.map((c) => [c.id, c.value]));
  const doc = parseNotebook(NOTEBOOK, path);
  const inputs = await tableInputs(doc.tables[0], path, dir, lang);
  const work = planTableWork(doc, doc.tables[0], inputs, lang, sqlNumber) as TableWork;
  assert.equal(typeof work, "object", String(work));
  return { dir, data, path, expected, work, sql: writeSql(work, { notebook: "s.lentil.md" }) };
}

/** Compare the database's totals, finished as Lentil finishes them, with the in-process values. */
function compare(
  work: TableWork,
  rows: Map<string, Record<string, unknown>>,
  expected: Map<string, unknown>,
) {
  assert.equal(rows.size, work.statistics.length);
  for (const st of work.statistics) {
    const r = momentsFromRow(st.variables.length, rows.get(st.cell)!);
    const value = lang.describe(finishStatistic(st.fn, [r], st.unit, lang)).value;
    closeDeep(value, expected.get(st.cell), st.cell);
  }
}

const CREATE =
  `CREATE TABLE "eyes" ("code" TEXT, "age" DOUBLE PRECISION, "sph" DOUBLE PRECISION, ` +
  `"cyl" DOUBLE PRECISION, "axis" DOUBLE PRECISION, "sph2" DOUBLE PRECISION, ` +
  `"cyl2" DOUBLE PRECISION, "axis2" DOUBLE PRECISION);`;

Deno.test("lentil sql writes views and one query per statistic; the help and a bad table are clear", async () => {
  const { path } = await setUp();
  const io = captureIo();
  assert.equal(await runCli(["sql", path], io), 0, io.stderr());
  const text = io.stdout();
  assert.match(text, /CREATE VIEW "eyes_set1" AS/);
  assert.match(text, /CREATE VIEW "eyes_set2" AS/); // dd reads M and M2
  assert.equal(text.match(/^SELECT\n {2}COUNT\(\*\)/gm)?.length, 6);
  assert.doesNotMatch(text, /0\.25 D|shift/); // numbers from numbers, never notebook text
  const bad = captureIo();
  await Deno.writeTextFile(
    path,
    NOTEBOOK.replace("ag = agreement(eyes.M, eyes.M2)", "q = medianOf(eyes.M)"),
  );
  assert.equal(await runCli(["sql", path], bad), 1);
  assert.match(bad.stderr(), /cell q \(line 17\) reads table eyes other than by one call of/);
});

Deno.test("the SQL run on DuckDB gives the in-process numbers (1e-9)", async () => {
  const { dir, work, sql, expected } = await setUp();
  const db = await (await DuckDBInstance.create(":memory:")).connect();
  await db.run(CREATE);
  await db.run(`COPY "eyes" FROM '${join(dir, "eyes.csv").replaceAll("'", "''")}' (HEADER)`);
  for (const v of sql.views) await db.run(v.sql);
  const rows = new Map<string, Record<string, unknown>>();
  for (const q of sql.queries) {
    rows.set(q.cell, (await db.runAndReadAll(q.sql)).getRowObjects()[0] as Record<string, unknown>);
  }
  const bad = (await db.runAndReadAll(sql.badRows)).getRowObjects()[0];
  assert.equal(Number(bad.bad_rows), 0);
  db.closeSync();
  compare(work, rows, expected);
});

Deno.test("the SQL run on a real PostgreSQL server gives the in-process numbers (1e-9)", async (t) => {
  const pg = await startPostgres();
  if (typeof pg === "string") {
    console.warn(`skipped: ${pg}`);
    t.step({ name: `skipped: ${pg}`, ignore: true, fn: () => {} });
    return;
  }
  try {
    const { work, sql, expected, data } = await setUp();
    const wrapped = sql.queries.map((q) => `SELECT row_to_json(t) FROM (\n${q.sql}\n) AS t;`);
    const script = [
      CREATE,
      'COPY "eyes" FROM STDIN WITH (FORMAT csv, HEADER true);',
      data.trimEnd(),
      "\\.",
      ...sql.views.map((v) => `${v.sql};`),
      ...wrapped,
    ].join("\n");
    const out = (await pg.sql(script)).trim().split("\n");
    assert.equal(out.length, sql.queries.length);
    const rows = new Map(sql.queries.map((q, i) => [q.cell, JSON.parse(out[i])]));
    compare(work, rows, expected);
    // The whole text as written runs too.
    await pg.sql(`DROP VIEW "eyes_set2"; DROP VIEW "eyes_set1";\n${sql.text}`);
  } finally {
    await pg.stop();
  }
});
