/** Test helpers: notebooks whose CSV files live in memory, read whole or streamed. */

import { Notebook } from "../notebook/engine/engine.ts";
import type { TableHost } from "../notebook/engine/_tables.ts";

/** A host over in-memory files; `open` streams them in small chunks to cross record edges. */
export function memoryHost(files: Record<string, string>, chunk = 7): TableHost {
  return {
    readText: (p) => {
      if (!(p in files)) throw new Deno.errors.NotFound(p);
      return files[p];
    },
    open: (p) => {
      if (!(p in files)) throw new Deno.errors.NotFound(p);
      const bytes = new TextEncoder().encode(files[p]);
      return (async function* () {
        for (let i = 0; i < bytes.length; i += chunk) yield bytes.slice(i, i + chunk);
      })();
    },
  };
}

/** Build the notebook both ways: whole-file (sync) and streamed (`Notebook.load`). */
export async function bothWays(
  text: string,
  files: Record<string, string>,
): Promise<{ whole: Notebook; streamed: Notebook }> {
  const host = memoryHost(files);
  const whole = Notebook.fromText(text, "study.lentil.md", { host: { readText: host.readText } });
  const streamed = await Notebook.load(text, "study.lentil.md", { host });
  return { whole, streamed };
}

/** Diagnostics as `file:line:col: message` lines. */
export function diagLines(nb: Notebook): string[] {
  return nb.diagnostics().map((d) => `${d.severity} ${d.file}:${d.line}:${d.col}: ${d.message}`);
}

/** A notebook with one CSV table and optional table options and calc lines. */
export function csvNotebook(options: string[] = [], calc: string[] = []): string {
  const table = ["~~~lentil table eyes", "file: eyes.csv", ...options, "~~~"].join("\n");
  return table + "\n\n" + (calc.length ? ["~~~lentil", ...calc, "~~~", ""].join("\n") : "");
}
