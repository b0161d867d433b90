/**
 * Research-scale bench: a two-method refraction job over a generated CSV (power vectors for
 * both methods, mean and SD of M, J0 and J45, Bland–Altman limits on M) through `lentil run`
 * with the table worked in DuckDB, against the same job written by hand in SQL through the
 * same DuckDB in the same process, and against the in-process path (`engine: in-process`,
 * today's `lentil run`). Each run is its own process, with its peak resident memory sampled.
 * In the DuckDB process the library is loaded before either timing; each then opens its own
 * database, so both pay the same start.
 *
 * All data is generated here with the seeded generator; nothing large is kept.
 *
 * @module
 */

import { join } from "node:path";
import { seeded } from "../lib/seeded.ts";
import { loadNotebook } from "../notebook/load.ts";
import { buildReport } from "../notebook/report.ts";
import { openDuck } from "../notebook/duck/_open.ts";
import type { Goal } from "./goal.ts";
import { agreementRecord } from "../cells/stats.ts";
import { readRxColumn } from "../cells/_rx_column.ts";

const HEADER =
  "record [text],age [number],sph1 [D],cyl1 [D],axis1 [deg],sph2 [D],cyl2 [D],axis2 [deg]\n";

/** Write `n` invented rows: two refractions of the same eye by two methods. */
async function writeCsv(path: string, n: number): Promise<number> {
  const f = await Deno.open(path, { write: true, create: true, truncate: true });
  const enc = new TextEncoder();
  f.writeSync(enc.encode(HEADER));
  const g = seeded(2026);
  const q = (x: number) => Math.round(x * 4) / 4;
  const step = 100_000;
  for (let start = 0; start < n; start += step) {
    const parts: string[] = [];
    for (let i = start; i < Math.min(n, start + step); i++) {
      const s = q(-8 + 12 * g());
      const c = -q(3 * g());
      const a = 1 + Math.floor(180 * g());
      const s2 = q(s + (g() - 0.5) * 0.75);
      const c2 = Math.min(0, q(c + (g() - 0.5) * 0.5));
      const a2 = 1 + ((a - 1 + Math.floor((g() - 0.5) * 10) + 180) % 180);
      parts.push(`R${i},${20 + (i % 60)},${s},${c},${a},${s2},${c2},${a2}\n`);
    }
    const bytes = enc.encode(parts.join(""));
    for (let off = 0; off < bytes.length;) off += f.writeSync(bytes.subarray(off));
  }
  f.close();
  return (await Deno.stat(path)).size;
}

function notebook(engine: string): string {
  return [
    "~~~lentil table eyes",
    "file: eyes.csv",
    `engine: ${engine}`,
    "~~~",
    "",
    "~~~lentil",
    "eyes.M1 = vectorM(sph1, cyl1)",
    "eyes.J01 = vectorJ0(cyl1, axis1)",
    "eyes.J451 = vectorJ45(cyl1, axis1)",
    "eyes.M2 = vectorM(sph2, cyl2)",
    "eyes.J02 = vectorJ0(cyl2, axis2)",
    "eyes.J452 = vectorJ45(cyl2, axis2)",
    "meanM1 = meanOf(eyes.M1)",
    "sdM1 = sdOf(eyes.M1)",
    "meanJ01 = meanOf(eyes.J01)",
    "sdJ01 = sdOf(eyes.J01)",
    "meanJ451 = meanOf(eyes.J451)",
    "sdJ451 = sdOf(eyes.J451)",
    "meanM2 = meanOf(eyes.M2)",
    "sdM2 = sdOf(eyes.M2)",
    "meanJ02 = meanOf(eyes.J02)",
    "sdJ02 = sdOf(eyes.J02)",
    "meanJ452 = meanOf(eyes.J452)",
    "sdJ452 = sdOf(eyes.J452)",
    "limitsM = agreement(eyes.M1, eyes.M2)",
    "~~~",
    "",
  ].join("\n");
}

/** The same job as one hand-written query (what a researcher would type). */
const HAND_SQL = `
WITH v AS (
  SELECT sph1 + cyl1 / 2 AS m1, -(cyl1 / 2) * cos(radians(2 * axis1)) AS j01,
         -(cyl1 / 2) * sin(radians(2 * axis1)) AS j451,
         sph2 + cyl2 / 2 AS m2, -(cyl2 / 2) * cos(radians(2 * axis2)) AS j02,
         -(cyl2 / 2) * sin(radians(2 * axis2)) AS j452
  FROM read_csv($1, header = true, names = ['record', 'age', 'sph1', 'cyl1', 'axis1', 'sph2', 'cyl2', 'axis2'])
)
SELECT avg(m1), stddev_samp(m1), avg(j01), stddev_samp(j01), avg(j451), stddev_samp(j451),
       avg(m2), stddev_samp(m2), avg(j02), stddev_samp(j02), avg(j452), stddev_samp(j452),
       avg(m1 - m2) AS bias, stddev_samp(m1 - m2) AS sd,
       avg(m1 - m2) - 1.96 * stddev_samp(m1 - m2) AS lower, avg(m1 - m2) + 1.96 * stddev_samp(m1 - m2) AS upper
FROM v`;

/** Child: one measured run; prints one JSON line. */
async function child(kind: string, dir: string): Promise<void> {
  let peak = Deno.memoryUsage().rss;
  const timer = setInterval(() => {
    peak = Math.max(peak, Deno.memoryUsage().rss);
  }, 5);
  const out: Record<string, number | string> = {};
  const time = async (name: string, fn: () => Promise<unknown>) => {
    const t0 = performance.now();
    await fn();
    out[name] = (performance.now() - t0) / 1000;
  };
  // The library is loaded once before either timing (a script that runs SQL by hand loads it
  // too); each timing then opens its own database, runs its work and closes it.
  if (kind === "duckdb") await import("@duckdb/node-api");
  if (kind === "duckdb" || kind === "in-process") {
    await time("seconds", async () => {
      const r = await loadNotebook(join(dir, `${kind}.lentil.md`), { database: true });
      if (!r.ok) throw new Error("notebook did not load");
      const rep = buildReport(r.notebook);
      const bad = rep.cells.find((c) => c.error);
      if (bad) throw new Error(`${bad.id}: ${bad.error!.message}`);
      out.limits = rep.cells.find((c) => c.id === "limitsM")!.display;
    });
    // Lentil's own peak, before the hand-written query runs in the same process.
    out.peak = Math.max(peak, Deno.memoryUsage().rss);
  }
  if (kind === "duckdb") {
    // The same job by hand through the same DuckDB in the same process.
    await time("hand", async () => {
      const db = await openDuck(dir);
      await db.rows(HAND_SQL, [join(dir, "eyes.csv")]);
      db.close();
    });
  }
  clearInterval(timer);
  out.peakAll = Math.max(peak, Deno.memoryUsage().rss);
  console.log(JSON.stringify(out));
}

async function run(kind: string, dir: string): Promise<Record<string, number>> {
  const o = await new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-ffi",
      "--allow-env",
      new URL(import.meta.url).pathname,
      "--child",
      kind,
      dir,
    ],
    stdout: "piped",
    stderr: "piped",
  }).output();
  const text = new TextDecoder().decode(o.stdout).trim().split("\n").pop() ?? "";
  if (!o.success || !text.startsWith("{")) {
    throw new Error(`duck bench child failed: ${new TextDecoder().decode(o.stderr)}`);
  }
  return JSON.parse(text);
}

/** An `[rx]` text column of 1,000,000 rows to power vectors, through the column parser. */
function rxColumn(): { goal: Goal; line: string } {
  const n = 1_000_000;
  const g = seeded(7);
  const texts: string[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const s = (Math.round((-8 + 12 * g()) * 4) / 4).toFixed(2);
    const c = (-Math.round(12 * g()) / 4).toFixed(2);
    texts[i] = `${s.startsWith("-") ? "" : "+"}${s} / ${c} x ${1 + Math.floor(180 * g())}`;
  }
  const RAD = Math.PI / 180;
  let sink = 0;
  const once = () => {
    const r = readRxColumn(texts);
    const m = new Float64Array(n);
    const j0 = new Float64Array(n);
    const j45 = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const half = r.cyl[i] / 2;
      const a = 2 * r.axis[i] * RAD;
      m[i] = r.sph[i] + half;
      j0[i] = -half * Math.cos(a);
      j45[i] = -half * Math.sin(a);
    }
    sink += m[n - 1] + j0[n - 1] + j45[n - 1];
  };
  once();
  const times: number[] = [];
  for (let k = 0; k < 3; k++) {
    const t0 = performance.now();
    once();
    times.push((performance.now() - t0) / 1000);
  }
  times.sort((a, b) => a - b);
  const rate = n / times[1];
  if (sink === 0.123456) console.log(sink);
  return {
    goal: {
      name: "rx-column-vectors",
      value: Math.round(rate),
      unit: "rows/s",
      op: ">=",
      target: 1e6,
    },
    line: `[rx] text column of 1,000,000 rows to M, J0, J45 through the column parser: ${
      (times[1] * 1000).toFixed(0)
    } ms (${Math.round(rate).toLocaleString("en")} rows/s)`,
  };
}

/** Measure the goals. */
export async function measure(): Promise<{ goals: Goal[]; lines: string[] }> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-bench-duck-" });
  const rx = rxColumn();
  const lines: string[] = [rx.line];
  const goals: Goal[] = [rx.goal];
  try {
    await Deno.writeTextFile(join(dir, "duckdb.lentil.md"), notebook("duckdb"));
    await Deno.writeTextFile(join(dir, "in-process.lentil.md"), notebook("in-process"));
    const mb = (x: number) => `${(x / 1e6).toFixed(0)} MB`;
    let size = await writeCsv(join(dir, "eyes.csv"), 1_000_000);
    // Three processes, each timing both paths; the run with the median ratio is reported.
    const runs: Record<string, number>[] = [];
    for (let k = 0; k < 3; k++) runs.push(await run("duckdb", dir));
    runs.sort((a, b) => a.seconds / a.hand - b.seconds / b.hand);
    const d1 = runs[1];
    const today = await run("in-process", dir);
    lines.push(
      `two-method job, 1,000,000 rows (${mb(size)} CSV), median of 3 processes: lentil run in ` +
        `DuckDB ${d1.seconds.toFixed(2)} s, the same SQL by hand ${d1.hand.toFixed(2)} s, ` +
        `in-process (today's run) ${today.seconds.toFixed(2)} s; peak RSS ${
          mb(Math.max(...runs.map((r) => r.peak)))
        } (with the hand query after it in the same process ${mb(d1.peakAll)}; in-process ${
          mb(today.peak)
        })`,
    );
    // The limits' exact confidence intervals (non-central t) are finished in-process on both
    // paths; their share of the time is shown on its own.
    const t0 = performance.now();
    agreementRecord(
      { n: 1_000_000, missing: 0, bias: 0.01, sd: 0.3, lower: -0.58, upper: 0.6 },
      "D",
    );
    const ci = (performance.now() - t0) / 1000;
    lines.push(
      `  of which the exact confidence intervals of the limits of agreement (n = 1,000,000, in-process on both paths): ${
        ci.toFixed(2)
      } s`,
    );
    const ratio = d1.seconds / d1.hand;
    goals.push(
      { name: "lentil-vs-duckdb", value: ratio, unit: "×", op: "<=", target: 1.5 },
      {
        name: "duckdb-vs-in-process",
        value: today.seconds / d1.seconds,
        unit: "× faster",
        op: ">=",
        target: 8,
      },
    );
    size = await writeCsv(join(dir, "eyes.csv"), 10_000_000);
    const d10 = await run("duckdb", dir);
    lines.push(
      `two-method job, 10,000,000 rows (${mb(size)} CSV): lentil run in DuckDB ${
        d10.seconds.toFixed(2)
      } s, by hand ${d10.hand.toFixed(2)} s; peak RSS ${mb(d10.peak)} (with the hand query ${
        mb(d10.peakAll)
      })`,
    );
    goals.push({
      name: "duckdb-peak-rss",
      value: Math.round(Math.max(...runs.map((r) => r.peak), d10.peak) / 1e6),
      unit: "MB",
      op: "<",
      target: 200,
    });
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
  return { goals, lines };
}

if (import.meta.main && Deno.args[0] === "--child") {
  await child(Deno.args[1], Deno.args[2]);
} else if (import.meta.main) {
  const r = await measure();
  for (const l of r.lines) console.log(l);
  const { formatGoal } = await import("./goal.ts");
  for (const g of r.goals) console.log(formatGoal(g));
}
