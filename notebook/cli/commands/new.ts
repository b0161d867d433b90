/**
 * `lentil new FILE [--from STARTER]`: write a new notebook from a starter in `seeds/`.
 * Never overwrites an existing file; CSV files the starter reads are copied beside it.
 *
 * @module
 */

import { basename, dirname, join } from "node:path";
import type { Command } from "../command.ts";
import { parseNotebook } from "../../format/parse.ts";

const SEEDS = new URL("../../../seeds/", import.meta.url);

/**
 * Names of the starters in `seeds/` (file names without `.lentil.md`).
 *
 * @example
 * ```ts ignore
 * listStarters(); // ["blank", "clinical-case", ...]
 * ```
 */
export function listStarters(): string[] {
  const out: string[] = [];
  for (const e of Deno.readDirSync(SEEDS)) {
    if (e.isFile && e.name.endsWith(".lentil.md")) out.push(e.name.slice(0, -".lentil.md".length));
  }
  return out.sort();
}

async function exists(path: string): Promise<boolean> {
  try {
    await Deno.lstat(path);
    return true;
  } catch {
    return false;
  }
}

/** The `new` command. */
export const newCommand: Command = {
  name: "new",
  summary: "start a notebook from a starter",
  usage: "FILE [--from STARTER]",
  get help() {
    let names = "run `lentil new --list`";
    try {
      names = listStarters().join(", ");
    } catch {
      // Without read access to seeds/ the list comes from --list.
    }
    return "Writes FILE (name it *.lentil.md) from a starter notebook, copying any CSV files it\n" +
      `reads. Refuses to overwrite. Starters: ${names}.`;
  },
  options: {
    from: { type: "string", doc: "starter to copy (default: blank)", value: "STARTER" },
    list: { type: "boolean", doc: "list the starters and exit" },
  },
  positionals: [0, 1],
  async run([file], options, io) {
    const starters = listStarters();
    if (options.list) {
      for (const s of starters) io.out(s);
      return 0;
    }
    if (!file) {
      io.err("new needs a FILE to write (e.g. lentil new case.lentil.md)");
      return 2;
    }
    const from = (options.from as string | undefined) ?? "blank";
    if (!starters.includes(from)) {
      io.err(`no starter named "${from}" (starters: ${starters.join(", ")})`);
      return 2;
    }
    if (!file.endsWith(".lentil.md")) {
      io.err(`${file}: notebook files end in .lentil.md`);
      return 2;
    }
    if (await exists(file)) {
      io.err(`${file} already exists; choose another name (nothing was written)`);
      return 1;
    }
    const src = new URL(`${from}.lentil.md`, SEEDS);
    const text = await Deno.readTextFile(src);
    const extras = parseNotebook(text, basename(src.pathname)).tables
      .map((t) => t.options.file?.value).filter((f): f is string => !!f);
    for (const f of extras) {
      if (await exists(join(dirname(file), f))) {
        io.err(`${join(dirname(file), f)} already exists; nothing was written`);
        return 1;
      }
    }
    await Deno.writeTextFile(file, text, { createNew: true });
    for (const f of extras) await Deno.copyFile(new URL(f, SEEDS), join(dirname(file), f));
    io.out(
      `wrote ${file} from starter ${from}${extras.length ? ` (with ${extras.join(", ")})` : ""}`,
    );
    return 0;
  },
};
