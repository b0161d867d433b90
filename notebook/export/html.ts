/**
 * A notebook as one self-contained HTML page: the prose from Markdown, each calc block as
 * formulas with results (headline, parts, check tables, table rows), units and footnote
 * numbers, tables (long ones cut, with the row count), plots as inline SVG, the cautions in
 * one section that every result they apply to links to, the numbered sources, and a footer that ties the page to the notebook file
 * by its SHA-256. The page has a strict Content-Security-Policy, no script and no external
 * resource of any kind.
 *
 * {@linkcode renderNotebookBody} gives the sections alone, for a page that supplies its own
 * head (the live editor); {@linkcode renderNotebookHtml} gives the whole document.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { renderNotebookHtml } from "./html.ts";
 * const nb = Notebook.fromText("# Case\n\n~~~lentil\nx = 2 mm\n~~~\n", "case.lentil.md");
 * const html = await renderNotebookHtml(nb, { evaluatedAt: new Date("2026-01-02T03:04:05Z") });
 * html.startsWith("<!doctype html>"); // true
 * ```
 *
 * @module
 */

import type { Notebook } from "../engine/engine.ts";
import type { Diagnostic } from "../format/diagnostic.ts";
import { buildReport, type ReportCell } from "../report.ts";
import { VERSION } from "../version.ts";
import { escapeHtml } from "./_escape.ts";
import { renderMarkdown } from "./markdown.ts";
import { renderPlot } from "./plot.ts";
import {
  calcSection,
  cautionsPart,
  plotFigure,
  sourcesSection,
  tableSection,
} from "./_sections.ts";

// The figure and escaping the page uses, for other views of a notebook (the live page).
export { plotFigure } from "./_sections.ts";
export { escapeHtml } from "./_escape.ts";
import { EXPORT_CSS } from "./style.ts";

/** The page's Content-Security-Policy: nothing may load; inline styles and data: images only. */
export const EXPORT_CSP =
  "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'";

/** How the body is rendered. */
export interface BodyOptions {
  /** Rows of a table shown before it is cut (default 25; a table up to 5 longer is whole). */
  readonly maxRows?: number;
  /** Embed every table's full data as CSV (default false). */
  readonly embedData?: boolean;
}

/** Options of the whole page. */
export interface PageOptions extends BodyOptions {
  /** The notebook file's bytes, for the SHA-256 (default: its text as UTF-8). */
  readonly bytes?: Uint8Array;
  /** When the notebook was evaluated (default: now). */
  readonly evaluatedAt?: Date;
}

/** The body's markup and the problems found while rendering it (plot blocks). */
export interface RenderedBody {
  /** Markup of the header, every block in order, and the sources. */
  readonly html: string;
  /** Problems with plot blocks (their place in the page shows them too). */
  readonly problems: readonly Diagnostic[];
}

/** A whole exported page. */
export interface ExportedPage extends RenderedBody {
  /** SHA-256 of the notebook bytes, hex. */
  readonly sha256: string;
}

/** The title a notebook goes by: its front matter's, else its file name. */
export function notebookTitle(nb: Notebook): string {
  return nb.doc.front.title ?? nb.doc.file.split(/[\\/]/).pop() ?? nb.doc.file;
}

/**
 * The SHA-256 of bytes, as lowercase hex.
 *
 * @example
 * ```ts
 * import { sha256Hex } from "./html.ts";
 * await sha256Hex(new TextEncoder().encode("abc"));
 * // "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
 * ```
 */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", bytes as Uint8Array<ArrayBuffer>);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

function header(nb: Notebook): string {
  const f = nb.doc.front;
  const meta = [
    f.author ? `<span>${escapeHtml(f.author)}</span>` : "",
    f.date ? `<span>${escapeHtml(f.date)}</span>` : "",
    f.case ? `<span>case ${escapeHtml(f.case)}</span>` : "",
    `<span>${escapeHtml(nb.doc.file.split(/[\\/]/).pop() ?? "")}</span>`,
  ].filter(Boolean).join("");
  return `<header class="lx-head"><h1>${escapeHtml(notebookTitle(nb))}</h1>` +
    `<p class="lx-meta">${meta}</p></header>`;
}

/**
 * Render the notebook's sections (header, blocks, sources) as markup for a `<body>`.
 * Every cell row carries `data-cell="ID"`, every plot `data-plot="NAME"`, so a live page can
 * find them.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { renderNotebookBody } from "./html.ts";
 * const nb = Notebook.fromText("~~~lentil\ncl = vertexPower(-10 D, 12 mm)\n~~~\n", "a.lentil.md");
 * renderNotebookBody(nb).html.includes('id="src-1"'); // true
 * ```
 */
export function renderNotebookBody(nb: Notebook, options: BodyOptions = {}): RenderedBody {
  const report = buildReport(nb, { maxRows: options.maxRows });
  const cellsByLine = new Map<number, ReportCell>();
  const tablesByLine = new Map<number, ReportCell>();
  for (const c of report.cells) (c.kind === "table" ? tablesByLine : cellsByLine).set(c.line, c);
  const tableOptions = { maxRows: options.maxRows ?? 25, embedData: options.embedData ?? false };
  const problems: Diagnostic[] = [];
  const parts: string[] = [header(nb)];
  for (const b of nb.doc.blocks) {
    if (b.kind === "prose") {
      if (b.text.trim()) parts.push(`<div class="lx-prose">${renderMarkdown(b.text)}</div>`);
    } else if (b.kind === "calc") {
      parts.push(calcSection(b, cellsByLine));
    } else if (b.kind === "table") {
      parts.push(tableSection(nb, b, tablesByLine.get(b.line), tableOptions));
    } else {
      const p = renderPlot(b, nb);
      problems.push(...p.problems);
      parts.push(plotFigure(p));
    }
  }
  parts.push(cautionsPart(report));
  parts.push(sourcesSection(report));
  return { html: `<main class="lx-notebook">\n${parts.join("\n")}\n</main>`, problems };
}

/** The footer facts that match a page to its notebook file. */
export interface FooterFacts {
  /** Notebook title. */
  readonly title: string;
  /** Evaluation time. */
  readonly evaluatedAt: Date;
  /** SHA-256 of the file, hex. */
  readonly sha256: string;
  /** File name. */
  readonly file: string;
}

/**
 * The footer: title, evaluation time, Lentil's version and the file's SHA-256.
 *
 * @example
 * ```ts
 * import { renderFooter } from "./html.ts";
 * renderFooter({ title: "T", evaluatedAt: new Date(0), sha256: "ab", file: "t.lentil.md" })
 *   .includes("1970-01-01"); // true
 * ```
 */
export function renderFooter(f: FooterFacts): string {
  const when = f.evaluatedAt.toISOString().replace(/\.\d{3}Z$/, "Z");
  return `<footer class="lx-foot"><dl>` +
    `<dt>Notebook</dt><dd>${escapeHtml(f.title)} (${escapeHtml(f.file)})</dd>` +
    `<dt>Evaluated</dt><dd><time datetime="${when}">${when.replace("T", " ")}</time></dd>` +
    `<dt>Lentil</dt><dd>version ${escapeHtml(VERSION)}</dd>` +
    `<dt>SHA-256</dt><dd><code class="lx-sha">${escapeHtml(f.sha256)}</code></dd>` +
    `</dl></footer>`;
}

/**
 * Render the whole page and say what went wrong on the way (plot problems).
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { renderNotebookPage } from "./html.ts";
 * const page = await renderNotebookPage(Notebook.fromText("hi\n", "a.lentil.md"));
 * page.sha256.length; // 64
 * ```
 */
export async function renderNotebookPage(
  nb: Notebook,
  options: PageOptions = {},
): Promise<ExportedPage> {
  const body = renderNotebookBody(nb, options);
  const bytes = options.bytes ?? new TextEncoder().encode(nb.doc.text);
  const sha256 = await sha256Hex(bytes);
  const title = notebookTitle(nb);
  const file = nb.doc.file.split(/[\\/]/).pop() ?? nb.doc.file;
  const footer = renderFooter({
    title,
    evaluatedAt: options.evaluatedAt ?? new Date(),
    sha256,
    file,
  });
  const html = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${EXPORT_CSP}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="referrer" content="no-referrer">
<meta name="generator" content="Lentil ${escapeHtml(VERSION)}">
<meta name="lentil-sha256" content="${sha256}">
<title>${escapeHtml(title)}</title>
<style>${EXPORT_CSS}</style>
</head>
<body>
${body.html}
${footer}
</body>
</html>
`;
  return { html, problems: body.problems, sha256 };
}

/**
 * Render a notebook to a full, self-contained HTML document.
 *
 * @example
 * ```ts
 * import { Notebook } from "../engine/engine.ts";
 * import { renderNotebookHtml } from "./html.ts";
 * const html = await renderNotebookHtml(Notebook.fromText("<script>x</script>\n", "a.lentil.md"));
 * html.includes("<script>"); // false
 * ```
 */
export async function renderNotebookHtml(nb: Notebook, options: PageOptions = {}): Promise<string> {
  return (await renderNotebookPage(nb, options)).html;
}
