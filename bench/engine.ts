/**
 * Engine bench: on a generated 1,000-cell notebook, a full evaluation against an
 * incremental re-evaluation after editing one input that feeds 1% of the cells.
 *
 * @module
 */

import { Notebook } from "../notebook/engine/engine.ts";
import { type Goal, medianMs } from "./goal.ts";

/** A notebook of `n` cells: 10 inputs; one input feeds a chain of n/100 cells, the rest fan out. */
export function generatedNotebook(n = 1000): string {
  const lines: string[] = [];
  const inputs = 10;
  for (let i = 0; i < inputs; i++) lines.push(`in${i} = ${(i + 1) * 0.25} D`);
  const feedCount = n / 100 - 1; // in0 plus its dependents = 1% of cells
  for (let i = 0; i < feedCount; i++) {
    lines.push(`f${i} = ${i === 0 ? "in0" : `f${i - 1}`} * 1.01 + 0.25 D`);
  }
  let k = 0;
  while (lines.length < n) {
    const a = 1 + (k % (inputs - 1));
    const b = 1 + ((k * 7) % (inputs - 1));
    lines.push(`g${k} = vertexPower(in${a} + in${b}, 12 mm, ${k % 13} mm)`);
    k++;
  }
  return "# Generated\n\n```lentil\n" + lines.join("\n") + "\n```\n";
}

/** Measure the goal. */
export function measure(): { goals: Goal[]; lines: string[] } {
  const text = generatedNotebook(1000);
  const nb = Notebook.fromText(text, "generated.lentil.md");
  const cells = nb.results().length;
  let flip = false;
  const full = medianMs(() => nb.evaluateAll(), 15);
  let recomputed = 0;
  const inc = medianMs(
    () => {
      flip = !flip;
      recomputed = nb.update("in0", flip ? "0.50 D" : "0.25 D").length;
    },
    201,
    10,
  );
  const ratio = full / inc;
  return {
    goals: [{
      name: "incremental-speedup",
      value: Math.round(ratio),
      unit: "×",
      op: ">=",
      target: 50,
    }],
    lines: [
      `engine: ${cells} cells; full evaluation ${full.toFixed(2)} ms; ` +
      `edit of one input recomputing ${recomputed} cells ${(inc * 1000).toFixed(0)} µs`,
    ],
  };
}
