/**
 * `deno task demo`: runs every starter notebook in `seeds/` and, where the export command is
 * available, writes each as a static page under `out/`, printing where the files are.
 *
 * @module
 */

import { runCli } from "./main.ts";
import { COMMANDS } from "./commands/mod.ts";
import { listStarters } from "./commands/new.ts";

const seeds = new URL("../../seeds/", import.meta.url);
const canExport = COMMANDS.some((c) => c.name === "export");
let worst = 0;
const written: string[] = [];
await Deno.mkdir("out", { recursive: true });
for (const name of listStarters().filter((s) => s !== "blank")) {
  const file = decodeURIComponent(new URL(`${name}.lentil.md`, seeds).pathname);
  console.log(`\n=== ${name} ===`);
  worst = Math.max(worst, await runCli(["run", file]));
  if (canExport) {
    const code = await runCli(["export", file, "-o", `out/${name}.html`]);
    worst = Math.max(worst, code);
    if (code === 0) written.push(`${Deno.cwd()}/out/${name}.html`);
  }
}
if (written.length) {
  console.log(`\nThe exported pages (open them in any browser):`);
  for (const w of written) console.log(`  ${w}`);
}
Deno.exit(worst);
