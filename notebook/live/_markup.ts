/**
 * Minimal renderers for prose and plots, used until the export's section renderers can be
 * passed in: prose as escaped paragraphs and headings, a plot as a captioned placeholder
 * listing its options.
 *
 * @module
 */

import type { Notebook } from "../engine/engine.ts";
import type { Block } from "../format/parse.ts";
import type { Renderers } from "./_views.ts";

/** Escape text for HTML. */
export function esc(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!,
  );
}

function prose(text: string): string {
  return text.split(/\r?\n\s*\r?\n/).map((para) => para.trim()).filter(Boolean).map((para) => {
    const h = /^(#{1,6})\s+(.*)$/s.exec(para);
    return h ? `<h${h[1].length}>${esc(h[2])}</h${h[1].length}>` : `<p>${esc(para)}</p>`;
  }).join("\n");
}

function plot(_nb: Notebook, block: Block & { kind: "plot" }): string {
  const opts = Object.entries(block.options).map(([k, o]) => `${k}: ${o.value}`).join(", ");
  return `<figure class="plot"><figcaption>${esc(block.name ?? "plot")} (${
    esc(opts)
  })</figcaption></figure>`;
}

/** The minimal renderers. */
export const PLAIN_RENDERERS: Renderers = { prose, plot };
