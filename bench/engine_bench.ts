/**
 * `deno bench` view of the engine goal: on the generated 1,000-cell notebook, a full
 * evaluation (the baseline) against an incremental re-evaluation after editing one input that
 * feeds 1% of the cells. Deno.bench prints the ratio; `bench/main.ts` prints the goal line.
 *
 * @module
 */

import { Notebook } from "../notebook/engine/engine.ts";
import { generatedNotebook } from "./engine.ts";

const nb = Notebook.fromText(generatedNotebook(1000), "generated.lentil.md");
let flip = false;

Deno.bench("full evaluation of 1,000 cells", { group: "engine", baseline: true }, () => {
  nb.evaluateAll();
});

Deno.bench("edit one input feeding 1% of the cells", { group: "engine" }, () => {
  flip = !flip;
  nb.update("in0", flip ? "0.50 D" : "0.25 D");
});
