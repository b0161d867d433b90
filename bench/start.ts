/**
 * Start-up bench: `lentil eval "1+1"` as a spawned process of the `deno` binary, against a
 * script that only imports the expression library in full, measured side by side (runs
 * interleaved, medians compared) so the machine's load falls on both alike.
 *
 * @module
 */

import { fileURLToPath as fromFileUrl } from "node:url";
import type { Goal } from "./goal.ts";

const ROOT = fromFileUrl(new URL("../", import.meta.url));
const MAIN = fromFileUrl(new URL("../notebook/cli/main.ts", import.meta.url));
const CONFIG = fromFileUrl(new URL("../deno.json", import.meta.url));

/** What `deno task lentil` runs, with the eval command. */
const EVAL_ARGS = [
  "run",
  "--allow-read",
  "--allow-write",
  "--allow-net=127.0.0.1",
  "--allow-env=NO_COLOR",
  MAIN,
  "eval",
  "1+1",
];

/** A script that imports the library in full and uses it once, so nothing is left out. */
const FULL_IMPORT =
  'import * as m from "mathjs"; if (typeof m.evaluate !== "function") Deno.exit(1);';

async function wallMs(args: string[]): Promise<number> {
  const t0 = performance.now();
  const o = await new Deno.Command(Deno.execPath(), {
    args,
    cwd: ROOT,
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const ms = performance.now() - t0;
  if (!o.success) {
    throw new Error(`${args.join(" ")} failed: ${new TextDecoder().decode(o.stderr)}`);
  }
  return ms;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** Measure the goal. */
export async function measure(runs = 9): Promise<{ goals: Goal[]; lines: string[] }> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-start-" });
  try {
    const script = `${dir}/full-import.ts`;
    await Deno.writeTextFile(script, FULL_IMPORT);
    const fullArgs = ["run", "--config", CONFIG, "--allow-read", script];
    // Warm both (the module caches), then interleave.
    await wallMs(EVAL_ARGS);
    await wallMs(fullArgs);
    const ev: number[] = [];
    const full: number[] = [];
    for (let i = 0; i < runs; i++) {
      ev.push(await wallMs(EVAL_ARGS));
      full.push(await wallMs(fullArgs));
    }
    const e = median(ev);
    const f = median(full);
    const ratio = e / f;
    return {
      goals: [{ name: "eval-start", value: ratio, unit: "×", op: "<=", target: 0.5 }],
      lines: [
        `lentil eval "1+1" (spawned deno): ${e.toFixed(0)} ms median of ${runs}; ` +
        `importing the expression library in full: ${f.toFixed(0)} ms (ratio ${
          ratio.toFixed(2)
        } ×)`,
      ],
    };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) {
  const r = await measure();
  for (const l of r.lines) console.log(l);
  const { formatGoal } = await import("./goal.ts");
  for (const g of r.goals) console.log(formatGoal(g));
}
