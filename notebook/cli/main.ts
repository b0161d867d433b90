/**
 * The `lentil` command line: `lentil COMMAND [ARGS] [OPTIONS]`.
 *
 * @example
 * ```ts ignore
 * import { runCli } from "./main.ts";
 * import { captureIo } from "./command.ts";
 * const io = captureIo();
 * await runCli(["eval", "vertexPower(-10 D, 12 mm)"], io);
 * ```
 *
 * @module
 */

import { parseArgs } from "node:util";
import { type CliIo, type Command, consoleIo } from "./command.ts";
import { COMMANDS } from "./commands/mod.ts";

const VERSION = "0.1.0";

function usage(): string {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  return [
    "lentil: a calculation notebook for lens and acuity work",
    "",
    "usage: lentil COMMAND [ARGS] [OPTIONS]",
    "",
    "commands:",
    ...COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    `  ${"help".padEnd(width)}  show help for a command (lentil help COMMAND)`,
    "",
    "options: --help, --version",
  ].join("\n");
}

function commandHelp(c: Command): string {
  const opts = Object.entries(c.options).map(([name, o]) => {
    const flag = `--${name}${o.value ? ` ${o.value}` : ""}${o.short ? `, -${o.short}` : ""}`;
    return `  ${flag.padEnd(22)} ${o.doc}`;
  });
  return [
    `usage: lentil ${c.name} ${c.usage}`,
    "",
    c.help,
    "",
    "options:",
    ...opts,
    `  ${"--help".padEnd(22)} show this help`,
  ].join("\n");
}

/**
 * Run the CLI with `args`; returns the exit code.
 *
 * @example
 * ```ts ignore
 * const code = await runCli(["check", "case.lentil.md"]);
 * ```
 */
export async function runCli(args: string[], io: CliIo = consoleIo()): Promise<number> {
  const [name, ...rest] = args;
  if (!name || name === "--help" || name === "-h") {
    io.out(usage());
    return name ? 0 : 2;
  }
  if (name === "--version") {
    io.out(`lentil ${VERSION}`);
    return 0;
  }
  if (name === "help") {
    if (rest[0] === "--help" || rest[0] === "-h") {
      io.out("usage: lentil help [COMMAND]\n\nShows the list of commands, or one command's help.");
      return 0;
    }
    const c = COMMANDS.find((c) => c.name === rest[0]);
    if (rest[0] && !c) {
      io.err(`lentil: unknown command "${rest[0]}"\n\n${usage()}`);
      return 2;
    }
    io.out(c ? commandHelp(c) : usage());
    return 0;
  }
  const command = COMMANDS.find((c) => c.name === name);
  if (!command) {
    io.err(`lentil: unknown command "${name}" (run lentil --help for the list)`);
    return 2;
  }
  // A leading minus that is not an option letter starts a value, e.g. `lentil eval "-10 D"`.
  const values = new Map<string, string>();
  const argv = rest.map((a) => {
    if (!/^-(?![-A-Za-z])/.test(a)) return a;
    const key = `\u0000${values.size}`;
    values.set(key, a);
    return key;
  });
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      strict: true,
      options: {
        help: { type: "boolean", short: "h" },
        ...Object.fromEntries(
          Object.entries(command.options).map((
            [k, o],
          ) => [k, { type: o.type, ...(o.short ? { short: o.short } : {}) }]),
        ),
      },
    });
  } catch (e) {
    const msg = (e as Error).message.replace(/\. To specify a positional.*$/s, "");
    io.err(`lentil ${command.name}: ${msg}\n\nusage: lentil ${command.name} ${command.usage}`);
    return 2;
  }
  const restore = (v: unknown) => typeof v === "string" ? values.get(v) ?? v : v;
  parsed = {
    positionals: parsed.positionals.map((p) => restore(p) as string),
    values: Object.fromEntries(Object.entries(parsed.values).map(([k, v]) => [k, restore(v)])),
  };
  if (parsed.values.help) {
    io.out(commandHelp(command));
    return 0;
  }
  const [min, max] = command.positionals;
  if (parsed.positionals.length < min || parsed.positionals.length > max) {
    io.err(
      `lentil ${command.name}: expected ${min === max ? min : `${min} to ${max}`} argument${
        max === 1 ? "" : "s"
      }, got ${parsed.positionals.length}\n\nusage: lentil ${command.name} ${command.usage}`,
    );
    return 2;
  }
  return await command.run(
    parsed.positionals,
    parsed.values as Record<string, string | boolean | undefined>,
    io,
  );
}

if (import.meta.main) {
  Deno.exit(await runCli(Deno.args));
}
