/**
 * `lentil formulas`: the formula reference generated from the catalogue, as text, JSON or
 * Markdown; `--write-readme` refreshes the README's copy.
 *
 * @module
 */

import type { Command } from "../command.ts";
import { referenceData, referenceMarkdown, withReference } from "../../reference.ts";

/** The `formulas` command. */
export const formulasCommand: Command = {
  name: "formulas",
  summary: "list every formula with its parameters, units and sources",
  usage: "[NAME] [--json | --markdown] [--write-readme FILE]",
  help:
    "Prints the formula reference generated from the catalogue. With NAME, only that formula.\n" +
    "--write-readme FILE replaces the reference between the marker lines in FILE.",
  options: {
    json: { type: "boolean", doc: "print the reference as JSON" },
    markdown: { type: "boolean", doc: "print the reference as Markdown" },
    "write-readme": {
      type: "string",
      doc: "refresh the reference inside this README",
      value: "FILE",
    },
  },
  positionals: [0, 1],
  async run([name], options, io) {
    if (options["write-readme"]) {
      const file = options["write-readme"] as string;
      const before = await Deno.readTextFile(file);
      const after = withReference(before);
      if (after !== before) await Deno.writeTextFile(file, after);
      io.out(
        after === before ? `${file}: reference already current` : `${file}: reference refreshed`,
      );
      return 0;
    }
    const data = referenceData();
    const formulas = name ? data.formulas.filter((f) => f.name === name) : data.formulas;
    if (name && !formulas.length) {
      io.err(`no formula named "${name}" (run lentil formulas for the list)`);
      return 1;
    }
    if (options.json) {
      io.out(JSON.stringify(name ? { formulas } : data, null, 2));
    } else if (options.markdown) {
      io.out(referenceMarkdown());
    } else {
      for (const f of formulas) {
        const params = f.params.map((p) =>
          `${p.name}${p.unit ? ` [${p.unit}]` : p.type !== "quantity" ? ` [${p.type}]` : ""}`
        );
        const gives = f.returns.unit ?? (f.returns.type === "any" ? "value" : f.returns.type);
        io.out(`${f.name}(${params.join(", ")}) → ${gives}`);
        io.out(`    ${f.summary}`);
        if (name) {
          for (const p of f.params) io.out(`    ${p.name}: ${p.doc}`);
          for (const s of f.sources) {
            io.out(`    source: ${s.citation}${s.mark ? ` (${s.mark})` : ""}`);
          }
          io.out(`    example: ${f.example}`);
        }
      }
    }
    return 0;
  },
};
