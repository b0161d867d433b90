/**
 * Hardening bench: how the live server answers while a cell is stuck computing. A
 * notebook's computed column is changed to a formula that takes seconds a row; while the
 * budget's worker computes it, plain state requests are timed (their slowest answer is the
 * goal), and a save is asked for and must succeed.
 *
 * @module
 */

import { join } from "node:path";
import { startLiveServer } from "../notebook/live/server.ts";
import type { Goal } from "./goal.ts";

const F = "```";

/** Measure the live server's answers while another cell computes. */
export async function measure(): Promise<{ goals: Goal[]; lines: string[] }> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-bench-harden-" });
  const path = join(dir, "stuck.lentil.md");
  const rows = Array.from({ length: 600 }, (_, i) => `${i}`).join("\n");
  await Deno.writeTextFile(
    path,
    `${F}lentil table t\nx\n${rows}\n${F}\n\n${F}lentil\nt.y = x\nz = 1\n${F}\n`,
  );
  const server = await startLiveServer(path, { budget: { timeMs: 4000 } });
  const headers = { "content-type": "application/json" };
  const lines: string[] = [];
  try {
    const t0 = performance.now();
    const stuck = fetch(`${server.url}api/cell`, {
      method: "POST",
      headers,
      body: JSON.stringify({ id: "t.y", expression: "x + sum(1:100000)" }),
    }).then((r) => r.json());
    await new Promise((r) => setTimeout(r, 500));
    const times: number[] = [];
    for (let i = 0; i < 20; i++) {
      const s = performance.now();
      const r = await fetch(`${server.url}api/state`, { headers });
      await r.json();
      times.push(performance.now() - s);
      await new Promise((r) => setTimeout(r, 50));
    }
    const save = await fetch(`${server.url}api/save`, { method: "POST", headers, body: "{}" });
    const saved = (await save.json()).ok === true;
    const r = await stuck;
    const slowest = Math.max(...times);
    lines.push(
      `state answers while a cell computes: slowest ${slowest.toFixed(1)} ms of ${times.length} (${
        times.map((t) => t.toFixed(0)).join(" ")
      })`,
      `save while a cell computes: ${saved ? "written" : "failed"}`,
      `the stuck cell was stopped after ${((performance.now() - t0) / 1000).toFixed(1)} s: ${
        r.patch?.cells?.[0]?.error?.message ?? "(no error?)"
      }`,
    );
    return {
      goals: [{
        name: "live-responsive-under-load",
        value: saved ? Math.round(slowest * 10) / 10 : 1e9,
        unit: "ms",
        op: "<",
        target: 100,
      }],
      lines,
    };
  } finally {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
}
