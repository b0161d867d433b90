/**
 * The worker behind {@linkcode EvaluationBudget}: evaluates a notebook's text from scratch
 * and says which cell it starts before each one, so the thread that watches it knows which
 * cell was computing when the budget ran out.
 *
 * @module
 */

/// <reference lib="deno.worker" />

import { Notebook } from "./engine.ts";
import { parseNotebook } from "../format/parse.ts";
import { checkedTableFile } from "./_table_file.ts";
import type { TrialInput } from "./budget.ts";

// The notebook of the last trial: the next one re-evaluates only what changed since, as
// the session does, so a trial costs what the edit itself costs.
let previous: Notebook | undefined;
const csv = new Map<string, string>();

self.onmessage = (e: MessageEvent<TrialInput>) => {
  const input = e.data;
  for (const [rel, text] of input.csv) csv.set(rel, text);
  try {
    const options = {
      host: {
        readText: (rel: string) =>
          csv.get(rel) ?? Deno.readTextFileSync(checkedTableFile(input.dir, rel)),
      },
      overBudget: new Map(input.skip),
      onEvaluate: (id: string, expression: string | undefined) =>
        self.postMessage({ type: "start", id, expression }),
    };
    const doc = parseNotebook(input.text, input.file);
    if (previous && previous.doc.file === input.file) {
      previous = Notebook.reconcile(previous, doc, options).notebook;
    } else {
      previous = new Notebook(doc, options);
      previous.evaluateAll();
    }
  } catch {
    // A failure here is the session's to report when it applies the edit itself.
    previous = undefined;
  }
  self.postMessage({ type: "done" });
};
