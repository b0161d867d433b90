/**
 * Shared by commands: load a notebook, or print why it cannot be loaded.
 *
 * @module
 */

import type { CliIo } from "../command.ts";
import type { Notebook } from "../../engine/engine.ts";
import { loadNotebook, type LoadOptions, NotebookFileError } from "../../load.ts";
import { formatDiagnostic } from "../../format/diagnostic.ts";
import { type ProgressListener, progressPrinter } from "../../progress.ts";

/** Load `file`; on failure print a one-line message and return undefined. */
export async function openNotebook(
  file: string,
  io: CliIo,
  options: LoadOptions = {},
): Promise<Notebook | undefined> {
  try {
    const r = await loadNotebook(file, options);
    if (!r.ok) {
      io.err(formatDiagnostic(r.diagnostic));
      return undefined;
    }
    return r.notebook;
  } catch (e) {
    if (e instanceof NotebookFileError) {
      io.err(e.message);
      return undefined;
    }
    throw e;
  }
}

/**
 * Progress lines for a command: rewritten in place when stderr is a terminal, else plain
 * lines through the command's error stream.
 */
export function cliProgress(io: CliIo): ProgressListener {
  const terminal = Deno.stderr.isTerminal();
  return progressPrinter(terminal ? { terminal } : { terminal, write: (s) => io.err(s.trimEnd()) });
}
