/// <reference lib="dom" />
/**
 * Live-page bench: the time from an input edit in the browser to the updated page, measured
 * in headless Chromium with `performance.now()` (the edit is typed into the input, sent to
 * the server, recomputed by the reactive engine, and the patch applied to the DOM), on:
 *
 * - the clinical starter, an input whose edit redraws no plot (`goal edit-to-dom`);
 * - the clinical starter, an input whose edit redraws a plot (`goal edit-to-dom-plot`);
 * - the refraction starter (2,000 rows), with an input added that feeds computed columns and
 *   a plot (`goal edit-to-dom-large`).
 *
 * Each line of detail says how long the server took of it. Run alone with
 * `deno run --allow-read --allow-write --allow-net=127.0.0.1 --allow-env --allow-sys=homedir,osRelease --allow-run bench/live.ts`.
 *
 * @module
 */

import { basename, join } from "node:path";
import { launchChromium } from "../tests/_browser.ts";
import { type LiveServer, startLiveServer } from "../notebook/live/server.ts";
import { formatGoal, type Goal } from "./goal.ts";

const SEEDS = new URL("../seeds/", import.meta.url).pathname;

/** A different literal of the same kind: the first number moved by one. */
function nudge(expr: string): string | undefined {
  const m = /^([+-]?)(\d+\.?\d*|\.\d+)(.*)$/.exec(expr.trim());
  if (!m) return undefined;
  const n = Number(m[1] + m[2]) + 1;
  const digits = (m[2].split(".")[1] ?? "").length;
  return `${n >= 0 && m[1] === "+" ? "+" : ""}${n.toFixed(digits)}${m[3]}`;
}

/** A copy of starter files in a fresh folder; the notebook's path in it. */
async function copyStarter(files: readonly string[]): Promise<{ dir: string; path: string }> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-bench-live-" });
  for (const f of files) await Deno.copyFile(join(SEEDS, f), join(dir, f));
  return { dir, path: join(dir, files[0]) };
}

/** The input with the most dependents whose edit does (or does not) redraw a plot. */
function pickInput(server: LiveServer, redrawsPlot: boolean) {
  const s = server.session;
  const nb = s.notebook;
  const found = nb.results().filter((r) => r.kind === "cell" && r.input && !r.error)
    .map((r) => ({ r, down: nb.graph.downstream(new Set([r.id])).length }))
    .filter((x) => nudge(x.r.expression ?? "") !== undefined)
    .sort((a, b) => b.down - a.down)
    .find(({ r }) => {
      // A trial edit, undone at once, says whether a plot is drawn again.
      const plots = s.setExpression(r.id, nudge(r.expression!)!).patch.plots.length;
      s.undo();
      return (plots > 0) === redrawsPlot;
    });
  if (!found) throw new Error(`no input whose edit ${redrawsPlot ? "redraws" : "spares"} plots`);
  return { id: found.r.id, expression: found.r.expression!, down: found.down };
}

interface Timing {
  readonly median: number;
  readonly p90: number;
  readonly serverMedian: number;
}

/** Edit `id` back and forth in the page `runs` times; times to the updated DOM. */
async function timeEdits(
  server: LiveServer,
  browser: Awaited<ReturnType<typeof launchChromium>>,
  id: string,
  values: readonly string[],
  runs: number,
): Promise<Timing> {
  const page = await browser.context.newPage();
  await page.goto(server.url);
  await page.waitForSelector("body[data-ready]", { timeout: 30_000 });
  // Server time of each edit, measured around the session's own work.
  const session = server.session;
  const original = session.setExpression.bind(session);
  const serverTimes: number[] = [];
  session.setExpression = (i: string, e: string) => {
    const t0 = performance.now();
    try {
      return original(i, e);
    } finally {
      serverTimes.push(performance.now() - t0);
    }
  };
  try {
    const times = await page.evaluate(async ({ id, values, runs }) => {
      const field = document.getElementById(`expr-${id}`) as HTMLInputElement;
      const out: number[] = [];
      for (let i = 0; i < runs + 3; i++) {
        const done = new Promise<void>((resolve) => {
          const obs = new MutationObserver(() => {
            obs.disconnect();
            resolve();
          });
          obs.observe(document.body, { attributes: true, attributeFilter: ["data-recomputed"] });
        });
        const t0 = performance.now();
        field.value = values[i % 2];
        field.dispatchEvent(new Event("change", { bubbles: true }));
        await done;
        if (i >= 3) out.push(performance.now() - t0);
      }
      return out;
    }, { id, values, runs });
    times.sort((a, b) => a - b);
    const st = serverTimes.slice(3).sort((a, b) => a - b);
    return {
      median: times[Math.floor(times.length / 2)],
      p90: times[Math.floor(times.length * 0.9)],
      serverMedian: st[Math.floor(st.length / 2)],
    };
  } finally {
    session.setExpression = original;
    await page.close();
  }
}

const f1 = (v: number) => v.toFixed(1);

/** Measure the goals. */
export async function measure(): Promise<{ goals: Goal[]; lines: string[] }> {
  const browser = await launchChromium();
  const goals: Goal[] = [];
  const lines: string[] = [];
  const runs = 61;
  try {
    const clinical = await copyStarter(["clinical-case.lentil.md"]);
    const server = await startLiveServer(clinical.path);
    try {
      for (
        const [plot, name, target] of [[false, "edit-to-dom", 10], [
          true,
          "edit-to-dom-plot",
          25,
        ]] as const
      ) {
        const input = pickInput(server, plot);
        const t = await timeEdits(
          server,
          browser,
          input.id,
          [nudge(input.expression)!, input.expression],
          runs,
        );
        goals.push({ name, value: Number(f1(t.p90)), unit: "ms p90", op: "<=", target });
        lines.push(
          `live: ${basename(clinical.path)}, editing ${input.id} (${input.down} depend on it; ` +
            `${plot ? "a plot is redrawn" : "no plot redrawn"}): to the updated page median ` +
            `${f1(t.median)} ms, p90 ${f1(t.p90)} ms over ${runs} edits; server median ` +
            `${f1(t.serverMedian)} ms`,
        );
      }
    } finally {
      await server.shutdown();
      await Deno.remove(clinical.dir, { recursive: true });
    }

    const study = await copyStarter(["refraction-study.lentil.md", "refraction-study.csv"]);
    const large = await startLiveServer(study.path);
    try {
      // An input of our own that feeds computed columns and the agreement plot.
      const s = large.session;
      const added = s.addCell(0, "offset = 0.00 D  # a known offset of the objective method");
      if (!added.ok) throw new Error(`cannot add the bench's input: ${added.error}`);
      const fed = s.setExpression("study.objectiveM", "powerM(objective) + offset");
      if (!fed.ok) throw new Error(`cannot feed the input: ${fed.error}`);
      const t = await timeEdits(large, browser, "offset", ["0.25 D", "0.00 D"], 15);
      goals.push({
        name: "edit-to-dom-large",
        value: Number(f1(t.p90)),
        unit: "ms p90",
        op: "<=",
        target: 100,
      });
      lines.push(
        `live: ${basename(study.path)} (2,000 rows), editing an input feeding 3 computed ` +
          `columns and a plot: to the updated page median ${f1(t.median)} ms, p90 ` +
          `${f1(t.p90)} ms over 15 edits; server median ${f1(t.serverMedian)} ms`,
      );
    } finally {
      await large.shutdown();
      await Deno.remove(study.dir, { recursive: true });
    }
  } finally {
    await browser.close();
  }
  return { goals, lines };
}

if (import.meta.main) {
  const r = await measure();
  for (const l of r.lines) console.log(l);
  for (const g of r.goals) console.log(formatGoal(g));
}
