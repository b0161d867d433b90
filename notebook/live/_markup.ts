/**
 * Prose and plots as the export renders them: Markdown through the export's renderer, plot
 * blocks through its plot renderer and its figure markup.
 *
 * @module
 */

import type { Notebook } from "../engine/engine.ts";
import type { PlotBlock } from "../format/parse.ts";
import { renderMarkdown } from "../export/markdown.ts";
import { plotDependencies, renderPlot } from "../export/plot.ts";
import { escapeHtml, plotFigure } from "../export/html.ts";
import type { Renderers } from "./_views.ts";

/** Escape text for HTML, as the export does. */
export const esc: (text: string) => string = escapeHtml;

function plot(nb: Notebook, block: PlotBlock): string {
  return plotFigure(renderPlot(block, nb));
}

/** The export's renderers for prose and plots. */
export const EXPORT_RENDERERS: Renderers = { prose: renderMarkdown, plot };

/**
 * Renderers that render a prose block once per text, and draw a plot again only when what it
 * depends on changed (its keys, the columns and cells it reads). One per session.
 *
 * @example
 * ```ts
 * import { EXPORT_RENDERERS, remembering } from "./_markup.ts";
 * const r = remembering(EXPORT_RENDERERS);
 * r.prose("*a*"); // "<p><em>a</em></p>\n"
 * ```
 */
export function remembering(renderers: Renderers): Renderers {
  const plots = new Map<string, { deps: unknown[]; html: string }>();
  const prose = new Map<string, string>();
  return {
    prose(text) {
      let html = prose.get(text);
      if (html === undefined) {
        html = renderers.prose(text);
        prose.set(text, html);
        if (prose.size > 500) prose.delete(prose.keys().next().value!);
      }
      return html;
    },
    plot(nb, block) {
      const key = `${block.line}:${block.name ?? ""}`;
      const deps = plotDependencies(block, nb);
      const hit = plots.get(key);
      if (hit && hit.deps.length === deps.length && hit.deps.every((d, i) => d === deps[i])) {
        return hit.html;
      }
      const html = renderers.plot(nb, block);
      plots.set(key, { deps, html });
      if (plots.size > 200) plots.delete(plots.keys().next().value!);
      return html;
    },
  };
}
