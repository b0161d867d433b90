/**
 * Prose and plots as the export renders them: Markdown through the export's renderer, plot
 * blocks through its plot renderer and its figure markup.
 *
 * @module
 */

import type { Notebook } from "../engine/engine.ts";
import type { PlotBlock } from "../format/parse.ts";
import { renderMarkdown } from "../export/markdown.ts";
import { renderPlot } from "../export/plot.ts";
import { escapeHtml, plotFigure } from "../export/html.ts";
import type { Renderers } from "./_views.ts";

/** Escape text for HTML, as the export does. */
export const esc: (text: string) => string = escapeHtml;

function plot(nb: Notebook, block: PlotBlock): string {
  return plotFigure(renderPlot(block, nb));
}

/** The export's renderers for prose and plots. */
export const EXPORT_RENDERERS: Renderers = { prose: renderMarkdown, plot };
