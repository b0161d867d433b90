/**
 * Export bench: the largest starter notebook (by file size, its CSV tables included) is
 * exported to HTML with Deno warm; goals on the median time and on the page's size.
 * Until starter notebooks with data exist, the export test fixture stands in.
 *
 * @module
 */

import { join } from "node:path";
import { loadNotebook } from "../notebook/load.ts";
import { renderNotebookPage } from "../notebook/export/html.ts";
import type { Goal } from "./goal.ts";

async function sizeWithTables(path: string): Promise<number> {
  let size = (await Deno.stat(path)).size;
  const text = await Deno.readTextFile(path);
  for (const m of text.matchAll(/^file:\s*(.+?)\s*$/gm)) {
    size += await Deno.stat(join(path, "..", m[1])).then((s) => s.size, () => 0);
  }
  return size;
}

/** The notebook to export: the largest of seeds/*.lentil.md, else the test fixture. */
export async function largestNotebook(): Promise<string> {
  const seeds: string[] = [];
  for await (const e of Deno.readDir("seeds")) {
    if (e.isFile && e.name.endsWith(".lentil.md")) seeds.push(join("seeds", e.name));
  }
  const candidates = [...seeds, "tests/fixtures/export-plots.lentil.md"];
  let best = candidates[0];
  let bestSize = -1;
  for (const c of candidates) {
    const s = await sizeWithTables(c);
    if (s > bestSize) [best, bestSize] = [c, s];
  }
  return best;
}

/** Measure the goals. */
export async function measure(): Promise<{ goals: Goal[]; lines: string[] }> {
  const file = await largestNotebook();
  const bytes = await Deno.readFile(file);
  const once = async () => {
    const r = await loadNotebook(file);
    if (!r.ok) throw new Error(r.diagnostic.message);
    return await renderNotebookPage(r.notebook, { bytes });
  };
  for (let i = 0; i < 3; i++) await once();
  const times: number[] = [];
  let html = "";
  for (let i = 0; i < 9; i++) {
    const t = performance.now();
    html = (await once()).html;
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  const ms = times[Math.floor(times.length / 2)];
  const kb = new TextEncoder().encode(html).length / 1024;
  const svgs = (html.match(/<svg/g) ?? []).length;
  return {
    goals: [
      { name: "export-time", value: Math.round(ms * 10) / 10, unit: "ms", op: "<", target: 1000 },
      { name: "export-size", value: Math.round(kb * 10) / 10, unit: "KB", op: "<", target: 1024 },
    ],
    lines: [
      `export: ${file} (load, evaluate, render) median ${ms.toFixed(1)} ms; ` +
      `page ${kb.toFixed(1)} KB with ${svgs} svg elements`,
    ],
  };
}
