/**
 * Prose and plots as the export renders them: Markdown through the export's renderer, plot
 * blocks through its plot renderer, wrapped in the same figure markup.
 *
 * @module
 */

import type { Notebook } from "../engine/engine.ts";
import type { PlotBlock } from "../format/parse.ts";
import { renderMarkdown } from "../export/markdown.ts";
import { renderPlot } from "../export/plot.ts";
import type { Renderers } from "./_views.ts";

/**
 * Escape text for HTML.
 *
 * @example
 * ```ts
 * import { esc } from "./_markup.ts";
 * esc("<b>"); // "&lt;b&gt;"
 * ```
 */
export function esc(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!,
  );
}

function plot(nb: Notebook, block: PlotBlock): string {
  const p = renderPlot(block, nb);
  const id = `plot-${esc(p.name)}`;
  const title = p.title ? `<div class="lx-plot-title">${esc(p.title)}</div>` : "";
  if (!p.svg) {
    const msgs = p.problems.map((d) => `<p>${esc(d.message)} (line ${d.line})</p>`).join("");
    return `<figure class="lx-plot lx-problem" id="${id}">${title}${msgs}</figure>`;
  }
  const cap = p.caption ? `<figcaption>${esc(p.caption)}</figcaption>` : "";
  return `<figure class="lx-plot" id="${id}" data-plot="${
    esc(p.name)
  }">${title}${p.svg}${cap}</figure>`;
}

/** The export's renderers for prose and plots. */
export const EXPORT_RENDERERS: Renderers = { prose: renderMarkdown, plot };
