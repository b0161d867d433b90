/**
 * The shape of a CLI command, and the small I/O surface commands write through so tests can
 * run them in-process.
 *
 * @example
 * ```ts
 * import { captureIo } from "./command.ts";
 * const io = captureIo();
 * io.out("hello");
 * io.stdout(); // "hello\n"
 * ```
 *
 * @module
 */

/** Where a command writes. */
export interface CliIo {
  /** Write one line to standard output. */
  out(line: string): void;
  /** Write one line to standard error. */
  err(line: string): void;
}

/** An option a command accepts. */
export interface OptionSpec {
  /** Takes a value (`--out FILE`) or is a switch (`--json`). */
  readonly type: "string" | "boolean";
  /** One-letter alias. */
  readonly short?: string;
  /** Help text. */
  readonly doc: string;
  /** Placeholder for the value in help (`FILE`). */
  readonly value?: string;
}

/** One command of `lentil`. */
export interface Command {
  /** The word after `lentil`. */
  readonly name: string;
  /** One line for the command list. */
  readonly summary: string;
  /** Usage line after `lentil NAME`, e.g. `FILE [--json]`. */
  readonly usage: string;
  /** Longer help. */
  readonly help: string;
  /** Options by long name. */
  readonly options: Readonly<Record<string, OptionSpec>>;
  /** Positional arguments: [min, max]. */
  readonly positionals: readonly [number, number];
  /** Run; returns the exit code (0 ok, 1 problems found, 2 usage error). */
  run(
    positionals: string[],
    options: Record<string, string | boolean | undefined>,
    io: CliIo,
  ): Promise<number>;
}

/**
 * An I/O surface that writes to the process's stdout and stderr.
 *
 * @example
 * ```ts ignore
 * consoleIo().out("ready");
 * ```
 */
export function consoleIo(): CliIo {
  const enc = new TextEncoder();
  return {
    out: (line) => writeAll(Deno.stdout, enc.encode(terminalSafe(line) + "\n")),
    err: (line) => writeAll(Deno.stderr, enc.encode(terminalSafe(line) + "\n")),
  };
}

/**
 * Text safe to print on a terminal: control characters (escape sequences, bells, carriage
 * returns) and direction overrides from a notebook are shown as `\u001b`-style escapes,
 * never acted on; line breaks and tabs stay.
 *
 * @example
 * ```ts
 * import { terminalSafe } from "./command.ts";
 * terminalSafe("a\u001b[2Jb"); // "a\\u001b[2Jb"
 * ```
 */
export function terminalSafe(text: string): string {
  return text.replace(
    UNSAFE_ON_TERMINAL,
    (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`,
  );
}

/** Control characters and direction overrides, which a terminal would act on. */
// deno-lint-ignore no-control-regex
const UNSAFE_ON_TERMINAL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/g;

/**
 * Write every byte: a pipe may take fewer than asked at once. When the reader has gone (a
 * pipe into `head`), the rest of the output is dropped quietly and the program exits: nobody
 * is left to read it, and a trace would only alarm.
 */
function writeAll(w: { writeSync(p: Uint8Array): number }, bytes: Uint8Array): void {
  let done = 0;
  try {
    while (done < bytes.length) done += w.writeSync(bytes.subarray(done));
  } catch (e) {
    if (e instanceof Deno.errors.BrokenPipe) Deno.exit(0);
    throw e;
  }
}

/** An I/O surface that keeps what was written, for tests. */
export interface CapturedIo extends CliIo {
  /** Everything written to stdout. */
  stdout(): string;
  /** Everything written to stderr. */
  stderr(): string;
}

/**
 * Capture output in memory.
 *
 * @example
 * ```ts
 * import { captureIo } from "./command.ts";
 * const io = captureIo();
 * io.err("oops");
 * io.stderr(); // "oops\n"
 * ```
 */
export function captureIo(): CapturedIo {
  let out = "";
  let err = "";
  return {
    out: (line) => void (out += line + "\n"),
    err: (line) => void (err += line + "\n"),
    stdout: () => out,
    stderr: () => err,
  };
}
