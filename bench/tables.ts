/**
 * Tables bench: power vectors (M, J0, J45 from sph/cyl/axis) over 1,000,000 in-memory rows
 * with compiled column formulas against a hand-written loop doing the same arithmetic (and
 * the row-wise figure through the formula language for comparison); then streaming a
 * generated CSV of two sizes through power vectors to an output CSV, each in its own
 * process, with throughput and peak resident memory sampled during the run.
 *
 * All data is generated here with a seeded generator; nothing large is kept.
 *
 * @module
 */

import { join } from "node:path";
import { getLanguage } from "../cells/language.ts";
import { Column } from "../cells/table.ts";
import { evaluateRowWise, planColumn } from "../notebook/engine/_columns.ts";
import { streamNotebook } from "../notebook/table/stream.ts";
import { type Goal, medianMs } from "./goal.ts";
import { seeded } from "../lib/seeded.ts";

/** Invented refractions: sphere −8…+4 D and cylinder −3…0 D in 0.25 D steps, axis 1–180. */
export function refractions(n: number, seed = 42) {
  const g = seeded(seed);
  const sph = new Float64Array(n);
  const cyl = new Float64Array(n);
  const axis = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    sph[i] = Math.round((-8 + 12 * g()) * 4) / 4;
    cyl[i] = -Math.round(12 * g()) / 4;
    axis[i] = 1 + Math.floor(180 * g());
  }
  return { sph, cyl, axis };
}

const FORMULAS = {
  M: "sph + cyl / 2",
  J0: "-(cyl / 2) * cos(2 * axis)",
  J45: "-(cyl / 2) * sin(2 * axis)",
};

function compiledVsLoop(n: number): { goal: Goal; lines: string[] } {
  const lang = getLanguage();
  const r = refractions(n);
  const columns = [
    new Column("sph", "quantity", "D", r.sph),
    new Column("cyl", "quantity", "D", r.cyl),
    new Column("axis", "quantity", "deg", r.axis),
  ];
  const scope = new Map<string, unknown>();
  const plans = Object.entries(FORMULAS).map(([name, expr]) => {
    const node = lang.parse(expr);
    return planColumn(name, node, lang.compile(node), columns, scope, lang);
  });
  if (!plans.every((p) => p.compiled)) throw new Error("power-vector formulas did not compile");
  let sink = 0;
  const compiled = medianMs(
    () => {
      for (const p of plans) sink += (p.run(columns, n).column.data as Float64Array)[n - 1];
    },
    9,
    2,
  );
  const RAD = Math.PI / 180;
  const hand = medianMs(
    () => {
      const m = new Float64Array(n);
      const j0 = new Float64Array(n);
      const j45 = new Float64Array(n);
      const { sph, cyl, axis } = r;
      for (let i = 0; i < n; i++) {
        const half = cyl[i] / 2;
        const a = 2 * axis[i] * RAD;
        m[i] = sph[i] + half;
        j0[i] = -half * Math.cos(a);
        j45[i] = -half * Math.sin(a);
      }
      sink += m[n - 1] + j0[n - 1] + j45[n - 1];
    },
    9,
    2,
  );
  // Row-wise through the formula language: measured on a slice, reported per row.
  const slice = 20000;
  const small = columns.map((c) =>
    new Column(c.name, c.type, c.unit, (c.data as Float64Array).subarray(0, slice))
  );
  const rowPlans = Object.values(FORMULAS).map((expr) => {
    const node = lang.parse(expr);
    return { ev: lang.compile(node) };
  });
  const t0 = performance.now();
  for (const p of rowPlans) evaluateRowWise("x", p.ev, small, slice, scope, lang);
  const rowMs = performance.now() - t0;
  const rowPerRowUs = rowMs * 1000 / slice;
  const ratio = compiled / hand;
  if (sink === 0.123456) console.log(sink);
  return {
    goal: { name: "compiled-vs-loop", value: ratio, unit: "×", op: "<=", target: 2 },
    lines: [
      `power vectors over ${n.toLocaleString("en")} rows: compiled ${compiled.toFixed(1)} ms, ` +
      `hand-written loop ${hand.toFixed(1)} ms (ratio ${ratio.toFixed(2)} ×)`,
      `row-wise through the formula language: ${rowPerRowUs.toFixed(1)} µs a row ` +
      `(${Math.round(1e6 / rowPerRowUs).toLocaleString("en")} rows/s; measured on ${
        slice.toLocaleString("en")
      } rows, ${((rowPerRowUs * n) / 1000 / compiled).toFixed(0)} × the compiled time for ${
        n.toLocaleString("en")
      })`,
    ],
  };
}

const NOTEBOOK = [
  "---",
  "title: Streaming bench (invented data)",
  "---",
  "~~~lentil table eyes",
  "file: eyes.csv",
  "~~~",
  "",
  "~~~lentil",
  `eyes.M = ${FORMULAS.M}`,
  `eyes.J0 = ${FORMULAS.J0}`,
  `eyes.J45 = ${FORMULAS.J45}`,
  "avg = meanRx(eyes.sph, eyes.cyl, eyes.axis)",
  "stats = vectorStats(eyes.sph, eyes.cyl, eyes.axis)",
  "~~~",
  "",
].join("\n");

async function writeCsv(path: string, n: number): Promise<void> {
  const f = await Deno.open(path, { write: true, create: true, truncate: true });
  const w = f.writable.getWriter();
  const enc = new TextEncoder();
  await w.write(enc.encode("sph [D],cyl [D],axis [deg]\n"));
  const step = 50000;
  for (let start = 0; start < n; start += step) {
    const k = Math.min(step, n - start);
    const r = refractions(k, 1000 + start);
    let s = "";
    for (let i = 0; i < k; i++) s += `${r.sph[i]},${r.cyl[i]},${r.axis[i]}\n`;
    await w.write(enc.encode(s));
  }
  await w.close();
}

let lastRows = 0;

/** Child: stream one notebook, sampling RSS; prints one JSON line. */
async function child(notebook: string, out: string): Promise<void> {
  let peak = Deno.memoryUsage().rss;
  const sample = () => {
    const rss = Deno.memoryUsage().rss;
    if (rss > peak) peak = rss;
  };
  const timer = setInterval(sample, 10);
  const t0 = performance.now();
  const r = await streamNotebook(notebook, { out, overwrite: true, onChunk: sample });
  const seconds = (performance.now() - t0) / 1000;
  clearInterval(timer);
  sample();
  console.log(JSON.stringify({ ok: r.ok, rows: r.rowsRead, seconds, peak, stopped: r.stopped }));
}

/** The V8 heap bound the streaming runs are measured with (see `lentil help stream`). */
export const STREAM_HEAP_FLAG = "--max-old-space-size=128";

async function streamRun(dir: string, n: number, heapFlag?: string) {
  const csv = join(dir, "eyes.csv");
  if ((await Deno.stat(csv).catch(() => undefined))?.isFile !== true || lastRows !== n) {
    await writeCsv(csv, n);
    lastRows = n;
  }
  const size = (await Deno.stat(csv)).size;
  const cmd = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      ...(heapFlag ? [`--v8-flags=${heapFlag}`] : []),
      "--allow-read",
      "--allow-write",
      "--allow-env",
      new URL(import.meta.url).pathname,
      "--child",
      join(dir, "bench.lentil.md"),
      join(dir, "out.csv"),
    ],
    stdout: "piped",
    stderr: "piped",
  });
  const o = await cmd.output();
  const text = new TextDecoder().decode(o.stdout).trim().split("\n").pop() ?? "";
  if (!o.success || !text.startsWith("{")) {
    throw new Error(`stream child failed: ${new TextDecoder().decode(o.stderr)}`);
  }
  const r = JSON.parse(text) as { ok: boolean; rows: number; seconds: number; peak: number };
  if (!r.ok || r.rows !== n) throw new Error(`stream child read ${r.rows} of ${n} rows`);
  return { ...r, size };
}

/** Measure the goals. */
export async function measure(): Promise<{ goals: Goal[]; lines: string[] }> {
  const c = compiledVsLoop(1_000_000);
  const dir = await Deno.makeTempDir({ prefix: "lentil-bench-" });
  const lines = [...c.lines];
  let peak = 0;
  try {
    await Deno.writeTextFile(join(dir, "bench.lentil.md"), NOTEBOOK);
    const line = (n: number, r: Awaited<ReturnType<typeof streamRun>>, how: string) =>
      `stream ${n.toLocaleString("en")} rows (${(r.size / 1e6).toFixed(0)} MB CSV) → power ` +
      `vectors → CSV, ${how}: ${r.seconds.toFixed(1)} s, ${
        Math.round(r.rows / r.seconds).toLocaleString("en")
      } rows/s, peak RSS ${(r.peak / 1e6).toFixed(0)} MB`;
    for (const n of [500_000, 2_000_000]) {
      const r = await streamRun(dir, n, STREAM_HEAP_FLAG);
      peak = Math.max(peak, r.peak);
      lines.push(line(n, r, `V8 ${STREAM_HEAP_FLAG}`));
    }
    const free = await streamRun(dir, 2_000_000);
    lines.push(
      line(2_000_000, free, "default V8 heap") +
        " (the live heap stays flat; the default heap collects lazily)",
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
  return {
    goals: [
      c.goal,
      { name: "stream-peak-rss", value: Math.round(peak / 1e6), unit: "MB", op: "<", target: 300 },
    ],
    lines,
  };
}

if (import.meta.main && Deno.args[0] === "--child") {
  await child(Deno.args[1], Deno.args[2]);
}
