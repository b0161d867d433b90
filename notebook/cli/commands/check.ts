/**
 * `lentil check FILE`: parse, validate and evaluate; print `FILE:LINE:COL: message` for
 * each problem and exit 1, or exit 0 when clean.
 *
 * @module
 */

import type { Command } from "../command.ts";
import { formatDiagnostic } from "../../format/diagnostic.ts";
import { openNotebook } from "./_open.ts";

/** The `check` command. */
export const checkCommand: Command = {
  name: "check",
  summary: "validate a notebook and list every problem with its position",
  usage: "FILE",
  help: "Parses and evaluates FILE, checks its plot blocks, and prints one line\n" +
    "FILE:LINE:COL: message for each problem.\n" +
    "Exit status: 0 when clean (warnings allowed), 1 when any error was found.",
  options: {
    "follow-links": {
      type: "boolean",
      doc: "let file: tables follow symbolic links (to regular files only)",
    },
  },
  positionals: [1, 1],
  async run([file], options, io) {
    const nb = await openNotebook(file, io, { followLinks: !!options["follow-links"] });
    if (!nb) return 1;
    // Plot blocks are checked too: their columns, cells and options are validated as the
    // export would draw them.
    // The plotting modules load only for a notebook that has plot blocks.
    const plotBlocks = nb.doc.blocks.filter((b) => b.kind === "plot");
    const { plotProblems } = plotBlocks.length
      ? await import("../../export/plot.ts")
      : { plotProblems: () => [] };
    const plots = plotBlocks.flatMap((b) => plotProblems(b, nb));
    const diags = [...nb.diagnostics(), ...plots].sort((a, b) =>
      a.file === b.file ? a.line - b.line || a.col - b.col : a.file < b.file ? -1 : 1
    );
    for (const d of diags) io.out(formatDiagnostic(d));
    const errors = diags.filter((d) => d.severity === "error").length;
    if (errors === 0) io.err(`${file}: ok${diags.length ? ` (${diags.length} warnings)` : ""}`);
    return errors ? 1 : 0;
  },
};
