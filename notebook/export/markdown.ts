/**
 * Prose of a notebook rendered from Markdown with `markdown-it`, raw HTML disabled. Links
 * with a dangerous scheme (`javascript:`, `vbscript:`, `file:`, most `data:`) are left as
 * text by markdown-it's link validation; images that are not inline `data:` pictures are
 * shown as their text and address, so the page never asks the network for anything.
 *
 * @example
 * ```ts
 * import { renderMarkdown } from "./markdown.ts";
 * renderMarkdown("Hello *there* <script>x</script>");
 * // "<p>Hello <em>there</em> &lt;script&gt;x&lt;/script&gt;</p>\n"
 * ```
 *
 * @module
 */

// @ts-types="@types/markdown-it"
import MarkdownIt from "markdown-it";
import { escapeHtml } from "./_escape.ts";

function makeRenderer(): MarkdownIt {
  const md = new MarkdownIt({ html: false, linkify: false, typographer: true });
  const defaultImage = md.renderer.rules.image!;
  md.renderer.rules.image = (tokens, idx, options, env, self) => {
    const token = tokens[idx];
    const src = token.attrGet("src") ?? "";
    if (/^data:image\/(?:png|gif|jpeg|webp);/i.test(src)) {
      return defaultImage(tokens, idx, options, env, self);
    }
    const alt = self.renderInlineAsText(token.children ?? [], options, env);
    return `<span class="lx-image-ref">[image: ${escapeHtml(alt)} — ${escapeHtml(src)}]</span>`;
  };
  const defaultLinkOpen = md.renderer.rules.link_open ??
    ((tokens, idx, options, _env, self) => self.renderToken(tokens, idx, options));
  md.renderer.rules.link_open = (tokens, idx, options, env, self) => {
    const href = tokens[idx].attrGet("href") ?? "";
    if (!href.startsWith("#")) tokens[idx].attrSet("rel", "noopener noreferrer");
    return defaultLinkOpen(tokens, idx, options, env, self);
  };
  return md;
}

let renderer: MarkdownIt | undefined;

/**
 * Render Markdown prose to HTML. Raw HTML in the input is shown as text.
 *
 * @example
 * ```ts
 * import { renderMarkdown } from "./markdown.ts";
 * renderMarkdown("[x](javascript:alert(1))"); // "<p>[x](javascript:alert(1))</p>\n"
 * ```
 */
export function renderMarkdown(text: string): string {
  renderer ??= makeRenderer();
  return renderer.render(text);
}
