/// <reference lib="dom" />
/**
 * Live-page bench: on the largest starter notebook (or the largest live fixture when the
 * starters are smaller), the time from an input edit in the browser to the updated page,
 * measured in headless Chromium with `performance.now()`: the edit is typed into the input,
 * sent to the server, re-evaluated through the reactive engine, and the patch applied to
 * the DOM.
 *
 * @module
 */

import { basename, dirname, join } from "node:path";
import { launchChromium } from "../tests/_browser.ts";
import { startLiveServer } from "../notebook/live/server.ts";
import type { Goal } from "./goal.ts";

const ROOT = new URL("../", import.meta.url);

/** The largest `*.lentil.md` among the starters and the live fixtures. */
export function largestNotebook(): string {
  const found: { path: string; size: number }[] = [];
  for (const folder of ["seeds/", "tests/fixtures/live/"]) {
    const dir = new URL(folder, ROOT).pathname;
    try {
      for (const e of Deno.readDirSync(dir)) {
        if (!e.isFile || !e.name.endsWith(".lentil.md")) continue;
        found.push({ path: join(dir, e.name), size: Deno.statSync(join(dir, e.name)).size });
      }
    } catch {
      // A missing folder has no candidates.
    }
  }
  found.sort((a, b) => b.size - a.size);
  if (!found.length) throw new Error("no notebook to measure");
  return found[0].path;
}

/** A different literal of the same kind: the first number moved by one. */
function nudge(expr: string): string | undefined {
  const m = /^([+-]?)(\d+\.?\d*|\.\d+)(.*)$/.exec(expr.trim());
  if (!m) return undefined;
  const n = Number(m[1] + m[2]) + 1;
  const digits = (m[2].split(".")[1] ?? "").length;
  return `${n >= 0 && m[1] === "+" ? "+" : ""}${n.toFixed(digits)}${m[3]}`;
}

/** Measure the goal. */
export async function measure(): Promise<{ goals: Goal[]; lines: string[] }> {
  const source = largestNotebook();
  const dir = await Deno.makeTempDir({ prefix: "lentil-bench-live-" });
  for (const e of Deno.readDirSync(dirname(source))) {
    if (e.isFile) await Deno.copyFile(join(dirname(source), e.name), join(dir, e.name));
  }
  const server = await startLiveServer(join(dir, basename(source)));
  const browser = await launchChromium();
  try {
    const nb = server.session.notebook;
    // The input with the most dependents.
    const inputs = nb.results().filter((r) => r.kind === "cell" && r.input && !r.error)
      .map((r) => ({ r, down: nb.graph.downstream(new Set([r.id])).length }))
      .filter((x) => nudge(x.r.expression ?? "") !== undefined)
      .sort((a, b) => b.down - a.down);
    if (!inputs.length) throw new Error(`${basename(source)} has no numeric input to edit`);
    const { r: input, down } = inputs[0];
    const values = [nudge(input.expression!)!, input.expression!];
    const page = await browser.context.newPage();
    await page.goto(server.url);
    await page.waitForSelector("body[data-ready]", { timeout: 10_000 });
    const runs = 31;
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
    }, { id: input.id, values, runs });
    times.sort((a, b) => a - b);
    const median = times[Math.floor(times.length / 2)];
    const p90 = times[Math.floor(times.length * 0.9)];
    return {
      goals: [{
        name: "edit-to-dom",
        value: Number(median.toFixed(1)),
        unit: "ms",
        op: "<",
        target: 50,
      }],
      lines: [
        `live: ${basename(source)} (${nb.results().length} nodes); editing ${input.id} ` +
        `(${down} recomputed) to the updated page in Chromium: median ${median.toFixed(1)} ms, ` +
        `p90 ${p90.toFixed(1)} ms over ${runs} edits`,
      ],
    };
  } finally {
    await browser.close();
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
}
