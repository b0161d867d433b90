// The exported page as text: structure, escaping, sources, cautions, tables, footer.
import assert from "node:assert/strict";
import { loadNotebook } from "../notebook/load.ts";
import { Notebook } from "../notebook/engine/engine.ts";
import { buildReport } from "../notebook/report.ts";
import {
  EXPORT_CSP,
  renderNotebookBody,
  renderNotebookHtml,
  renderNotebookPage,
  sha256Hex,
} from "../notebook/export/html.ts";
import { renderMarkdown } from "../notebook/export/markdown.ts";
import { VERSION } from "../notebook/version.ts";
import { CAUTIONS } from "../shared/cautions.ts";
import { parseHTML } from "linkedom";

const FIXTURE = new URL("./fixtures/export-plots.lentil.md", import.meta.url).pathname;
const HOSTILE = new URL("./fixtures/hostile.lentil.md", import.meta.url).pathname;

async function load(path: string) {
  const r = await loadNotebook(path);
  if (!r.ok) throw new Error(r.diagnostic.message);
  return r;
}

Deno.test("markdown: raw HTML is shown as text", () => {
  const html = renderMarkdown("a <script>alert(1)</script> <img src=x onerror=alert(2)>");
  assert.ok(!html.includes("<script"));
  assert.ok(!html.includes("<img"));
  assert.ok(html.includes("&lt;script&gt;"));
});

Deno.test("markdown: javascript:, vbscript: and data: links are not links", () => {
  for (
    const href of ["javascript:alert(1)", "JavaScript:alert(1)", "vbscript:x", "data:text/html,x"]
  ) {
    const html = renderMarkdown(`[x](${href})`);
    assert.ok(!html.includes("<a"), `${href} became a link: ${html}`);
  }
  assert.ok(!renderMarkdown("<javascript:alert(1)>").includes("<a"));
  assert.ok(!renderMarkdown("[e](&#106;avascript:alert(1))").includes("<a"));
});

Deno.test("markdown: ordinary links work, remote images become text", () => {
  const html = renderMarkdown("[ok](https://example.org/) ![p](http://203.0.113.9/p.png)");
  assert.match(html, /<a href="https:\/\/example.org\/" rel="noopener noreferrer">ok<\/a>/);
  assert.ok(!html.includes("<img"));
  assert.ok(html.includes("[image: p — http://203.0.113.9/p.png]"));
  assert.ok(
    renderMarkdown("![d](data:image/png;base64,AAAA)").includes('<img src="data:image/png'),
  );
});

Deno.test("page: head has the CSP, no script, no external reference", async () => {
  const { notebook, bytes } = await load(FIXTURE);
  const html = await renderNotebookHtml(notebook, { bytes });
  assert.ok(html.startsWith("<!doctype html>"));
  assert.ok(html.includes(`<meta http-equiv="Content-Security-Policy" content="${EXPORT_CSP}">`));
  assert.match(EXPORT_CSP, /default-src 'none'; style-src 'unsafe-inline'; img-src data:/);
  assert.ok(!/<script/i.test(html));
  assert.ok(!/<link\b/i.test(html));
  assert.ok(!/\bsrc="(?!data:)/i.test(html), "no src other than data:");
  assert.ok(!/url\(/i.test(html), "no url() in CSS");
  assert.ok(!/@import/i.test(html));
  assert.ok(html.includes("@media print"));
});

Deno.test("page: every source used is listed once, numbered, with its mark", async () => {
  const { notebook } = await load(FIXTURE);
  const report = buildReport(notebook);
  assert.ok(report.sources.length >= 2);
  const { html } = renderNotebookBody(notebook);
  for (const s of report.sources) {
    const li = new RegExp(`<li id="src-${s.n}" value="${s.n}" data-source="${s.id}">([^]*?)</li>`);
    const m = li.exec(html);
    assert.ok(m, `source ${s.id} listed`);
    if (s.mark) assert.ok(m[1].includes(`<span class="lx-mark">${s.mark}</span>`));
  }
  assert.equal((html.match(/<li id="src-/g) ?? []).length, report.sources.length);
  // Footnotes point at listed sources.
  for (const m of html.matchAll(/href="#src-(\d+)"/g)) {
    assert.ok(Number(m[1]) >= 1 && Number(m[1]) <= report.sources.length);
  }
});

Deno.test("page: the cautions are one section, linked from each result they apply to", () => {
  const nb = Notebook.fromText(
    "```lentil\nx = 2 mm\n```\n\n```lentil\ncl = vertexPower(-10 D, 12 mm)\n" +
      "cl2 = vertexPower(-8 D, 12 mm)\n```\n",
    "c.lentil.md",
  );
  const { html } = renderNotebookBody(nb);
  const sections = html.split('<section class="lx-calc"').slice(1);
  assert.equal(sections.length, 2);
  assert.ok(!sections[0].includes("lx-flag"));
  assert.ok(!html.includes("<aside"));
  assert.equal((html.match(/class="lx-cautions"/g) ?? []).length, 1);
  assert.equal((html.match(/id="cautions"/g) ?? []).length, 1);
  for (const c of CAUTIONS) assert.ok(html.includes(c.replaceAll("'", "&#39;")));
  // A marker at each result links to the section, and the section links back.
  for (const id of ["cl", "cl2"]) {
    assert.ok(html.includes(`id="caution-at-${id}" href="#cautions"`), id);
    assert.ok(html.includes(`href="#caution-at-${id}"`), id);
  }
  const plain = renderNotebookBody(Notebook.fromText("```lentil\nx = 2 mm\n```\n", "p.lentil.md"));
  assert.ok(!plain.html.includes("lx-cautions"));
});

Deno.test("page: calc cells show formula, result, unit and footnote numbers", () => {
  const nb = Notebook.fromText(
    "```lentil\nF = -10 D   # spectacle\ncl = vertexPower(F, 12 mm) * 1\n```\n",
    "f.lentil.md",
  );
  const { html } = renderNotebookBody(nb);
  assert.match(html, /data-cell="cl"/);
  assert.ok(html.includes("vertexPower(F, 12 mm) × 1"));
  assert.ok(html.includes("(exact -8.93)"));
  assert.match(html, /<sup class="lx-fn"><a href="#src-1">1<\/a><\/sup>/);
  assert.ok(html.includes('<span class="lx-note">spectacle</span>'));
});

Deno.test("page: a long table is cut with its row count stated; CSV embedded on request", async () => {
  const { notebook } = await load(FIXTURE);
  const { html } = renderNotebookBody(notebook, { maxRows: 10 });
  const survey =
    /<section class="lx-table-block" id="table-survey" data-rows="240">([^]*?)<\/section>/
      .exec(html);
  assert.ok(survey);
  assert.ok(!survey[1].includes("rows ×"));
  assert.match(
    survey[1],
    /240 rows, 10 columns \(\d+ from export-survey\.csv, \d+ computed\)|240 rows, 10 columns \(all from export-survey\.csv\)/,
  );
  assert.ok(survey[1].includes("rows 1–10 shown"));
  const tbody = /<tbody>([^]*?)<\/tbody>/.exec(survey[1])![1];
  assert.equal((tbody.match(/<tr>/g) ?? []).length, 10);
  assert.ok(!html.includes("lx-csv"));
  const full = renderNotebookBody(notebook, { maxRows: 10, embedData: true }).html;
  const csv = /id="table-survey"[^]*?<pre class="lx-csv">([^]*?)<\/pre>/.exec(full);
  assert.ok(csv);
  assert.equal(csv[1].trim().split("\n").length, 241);
  assert.ok(csv[1].startsWith("eye,sph [D],cyl [D],axis [deg],autoM [D],subjM [D],j0 [D],j45 [D]"));
  assert.ok(full.includes('download="survey.csv" href="data:text/csv;charset=utf-8,'));
});

Deno.test("page: footer has title, evaluation time, version and the file's SHA-256", async () => {
  const { notebook, bytes } = await load(FIXTURE);
  const when = new Date("2026-05-06T07:08:09Z");
  const page = await renderNotebookPage(notebook, { bytes, evaluatedAt: when });
  const expected = await sha256Hex(bytes);
  assert.equal(page.sha256, expected);
  // Independent check of the digest: the same bytes through node:crypto.
  const { createHash } = await import("node:crypto");
  assert.equal(expected, createHash("sha256").update(bytes).digest("hex"));
  const foot = /<footer class="lx-foot">([^]*?)<\/footer>/.exec(page.html)![1];
  assert.ok(foot.includes("Export fixture — through focus, vectors and agreement"));
  assert.ok(foot.includes('<time datetime="2026-05-06T07:08:09Z">'));
  assert.ok(foot.includes(`version ${VERSION}`));
  assert.ok(foot.includes(expected));
  assert.ok(page.html.includes(`<meta name="lentil-sha256" content="${expected}">`));
  const deno = JSON.parse(await Deno.readTextFile(new URL("../deno.json", import.meta.url)));
  assert.equal(VERSION, deno.version);
});

Deno.test("hostile notebook: nothing the user wrote becomes markup", async () => {
  const { notebook, bytes } = await load(HOSTILE);
  const page = await renderNotebookPage(notebook, { bytes, embedData: true });
  const html = page.html;
  assert.ok(!/<script/i.test(html), "no script element");
  assert.ok(!/<(iframe|object|embed|img|link|meta http-equiv="refresh")/i.test(html));
  // Parsed as a browser would: no handler attribute, no script-bearing URL anywhere.
  interface El {
    tagName: string;
    attributes: ArrayLike<{ name: string; value: string }>;
  }
  const { document } = parseHTML(html) as unknown as {
    document: { querySelectorAll(s: string): El[] };
  };
  for (const el of document.querySelectorAll("*")) {
    for (const a of Array.from(el.attributes)) {
      assert.ok(!a.name.toLowerCase().startsWith("on"), `${el.tagName} has ${a.name}`);
      assert.ok(!/^\s*(javascript|vbscript):/i.test(a.value), `${el.tagName} ${a.name}=${a.value}`);
    }
  }
  assert.equal(document.querySelectorAll("script, iframe, object, embed, img").length, 0);
  assert.ok(!/href="\s*(javascript|vbscript|data:text\/html)/i.test(html));
  assert.ok(html.includes("&lt;/title&gt;&lt;script&gt;"), "title escaped");
  assert.ok(html.includes("&lt;script&gt;alert(&#39;note&#39;)&lt;/script&gt;"), "note escaped");
  assert.ok(page.problems.some((p) => p.message.includes('figure "<script>')));
});
