/// <reference lib="dom" />
// Exported pages in Debian's headless Chromium: no console error, no request but the page,
// every plot drawn, the sources complete, the hostile notebook inert, print to PDF, and a
// screenshot of each starter notebook in out/screens/ for a person to look at.
import assert from "node:assert/strict";
import { basename, dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import type { BrowserContext, Page } from "playwright-core";
import { loadNotebook } from "../notebook/load.ts";
import { buildReport } from "../notebook/report.ts";
import { renderNotebookPage } from "../notebook/export/html.ts";
import { browserTest, watchPage } from "./_browser.ts";

const ROOT = dirname(dirname(fileURLToPath(import.meta.url)));
const FIXTURES = join(ROOT, "tests", "fixtures");
const SCREENS = join(ROOT, "out", "screens");
const TOUR = join(ROOT, "docs", "screens");

async function exportTo(path: string, dir: string, embedData = false) {
  const r = await loadNotebook(path);
  if (!r.ok) throw new Error(r.diagnostic.message);
  const page = await renderNotebookPage(r.notebook, { bytes: r.bytes, embedData });
  const out = join(dir, basename(path).replace(/\.lentil\.md$/, ".html"));
  await Deno.writeTextFile(out, page.html);
  return { out, html: page.html, notebook: r.notebook };
}

async function open(context: BrowserContext, file: string) {
  const page = await context.newPage();
  const seen = watchPage(page);
  await page.goto(`file://${file}`, { waitUntil: "load" });
  return { page, seen };
}

function pdfPages(pdf: Uint8Array): number {
  const text = new TextDecoder("latin1").decode(pdf);
  return (text.match(/\/Type\s*\/Page(?![s\w])/g) ?? []).length;
}

async function withTemp<T>(fn: (dir: string) => Promise<T>): Promise<T> {
  const dir = await Deno.makeTempDir({ prefix: "lentil-browser-export-" });
  try {
    return await fn(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

async function plotFacts(page: Page) {
  return await page.$$eval("figure.lx-plot", (figs) =>
    figs.map((f) => ({
      id: f.id,
      problem: f.classList.contains("lx-problem"),
      svg: f.querySelectorAll("svg").length,
      // Each mark (or class bar) is one `M…z` subpath of its series' path.
      marks: [...f.querySelectorAll('svg [data-part="rows"] path, svg [data-part="classes"]')]
        .reduce((n, p) => n + (p.getAttribute("d")?.match(/M/g) ?? []).length, 0),
      width: Math.max(
        0,
        ...[...f.querySelectorAll("svg")].map((s) => s.getBoundingClientRect().width),
      ),
    })));
}

browserTest(
  "export in the browser: no console error, no request but the page, plots drawn",
  async (context) => {
    await withTemp(async (dir) => {
      const { out, notebook } = await exportTo(join(FIXTURES, "export-plots.lentil.md"), dir, true);
      const { page, seen } = await open(context, out);
      assert.deepEqual(seen.consoleErrors, []);
      assert.deepEqual(seen.pageErrors, []);
      assert.deepEqual(seen.requests, [`file://${out}`]);
      const plots = await plotFacts(page);
      assert.deepEqual(plots.map((p) => p.id).sort(), [
        "plot-fellow",
        "plot-focus",
        "plot-methods",
        "plot-retest",
        "plot-spread_j0",
        "plot-vectors",
      ]);
      for (const p of plots) {
        assert.equal(p.problem, false, p.id);
        assert.ok(p.svg >= 1, `${p.id} has an svg`);
        assert.ok(p.marks >= 10, `${p.id} has marks (${p.marks})`);
        assert.ok(p.width > 200, `${p.id} is laid out (${p.width}px)`);
      }
      // The sources list is complete and each footnote resolves to an item of it.
      const report = buildReport(notebook);
      const items = await page.$$eval(
        "section.lx-sources li",
        (lis) => lis.map((li) => ({ id: li.getAttribute("data-source"), text: li.textContent })),
      );
      assert.deepEqual(items.map((i) => i.id), report.sources.map((s) => s.id));
      for (const [i, s] of report.sources.entries()) {
        assert.ok(items[i].text!.includes(s.citation.slice(0, 40)));
        if (s.mark) assert.ok(items[i].text!.includes(s.mark), `${s.id} mark`);
      }
      const dangling = await page.$$eval(
        "sup.lx-fn a",
        (as) => as.filter((a) => !document.querySelector(a.getAttribute("href")!)).length,
      );
      assert.equal(dangling, 0);
      // The cautions are one section; each marker at a result links to it.
      assert.equal(await page.locator("section.lx-cautions#cautions").count(), 1);
      const marks = await page.$$eval("a.lx-flag", (as) => as.map((a) => a.getAttribute("href")));
      assert.ok(marks.length >= 1);
      assert.ok(marks.every((h) => h === "#cautions"));
      assert.equal(await page.locator("footer.lx-foot code.lx-sha").count(), 1);
      // No script ran and none could: the page has none, and JavaScript is on in this browser.
      assert.equal(await page.evaluate(() => document.scripts.length), 0);
    });
  },
);

browserTest(
  "export in the browser: prints to a sane number of A4 and Letter pages",
  async (context) => {
    await withTemp(async (dir) => {
      const { out } = await exportTo(join(FIXTURES, "export-plots.lentil.md"), dir);
      const { page, seen } = await open(context, out);
      await page.emulateMedia({ media: "print" });
      for (const format of ["A4", "Letter"] as const) {
        const pdf = await page.pdf({ format, printBackground: true });
        const n = pdfPages(pdf);
        assert.ok(n >= 2 && n <= 12, `${format}: ${n} pages`);
        // Nothing wider than the printable width.
        const overflow = await page.evaluate(() =>
          document.documentElement.scrollWidth - document.documentElement.clientWidth
        );
        assert.ok(overflow <= 1, `${format}: ${overflow}px overflow`);
      }
      assert.deepEqual(seen.consoleErrors, []);
      assert.deepEqual(seen.requests, [`file://${out}`]);
    });
  },
);

browserTest(
  "hostile notebook: nothing executes, nothing loads, nothing becomes a handler",
  async (context) => {
    await withTemp(async (dir) => {
      const { out, html } = await exportTo(join(FIXTURES, "hostile.lentil.md"), dir, true);
      // The detector works: an unescaped handler in a page without a CSP is caught.
      const control = join(dir, "control.html");
      await Deno.writeTextFile(control, "<!doctype html><svg onload=\"alert('control')\"></svg>");
      const probe = await open(context, control);
      await probe.page.waitForTimeout(100);
      assert.deepEqual(probe.seen.dialogs, ["alert: control"]);
      await probe.page.close();
      // The page as exported, and again with its CSP removed: escaping alone must hold.
      const bare = join(dir, "hostile-no-csp.html");
      await Deno.writeTextFile(
        bare,
        html.replace(/<meta http-equiv="Content-Security-Policy"[^>]*>/, ""),
      );
      for (const file of [out, bare]) {
        const { page, seen } = await open(context, file);
        // Hover and click everything a handler could hang on.
        for (const sel of ["svg circle", "a", "b", "td", "text"]) {
          for (const el of (await page.$$(sel)).slice(0, 20)) {
            await el.hover({ force: true, timeout: 500 }).catch(() => {});
          }
        }
        const facts = await page.evaluate(() => {
          const all = [...document.querySelectorAll("*")];
          return {
            scripts: document.scripts.length,
            frames: document.querySelectorAll("iframe, object, embed, img").length,
            handlers: all.flatMap((el) =>
              [...el.attributes].filter((a) => a.name.toLowerCase().startsWith("on")).map((a) =>
                `${el.tagName}.${a.name}`
              )
            ),
            badLinks: [...document.querySelectorAll("[href], [src], [action], [formaction]")]
              .map((el) =>
                el.getAttribute("href") ?? el.getAttribute("src") ?? el.getAttribute("action") ?? ""
              )
              .filter((v) => /^\s*(javascript|vbscript|data:text\/html)/i.test(v)),
            title: document.title,
          };
        });
        assert.equal(facts.scripts, 0, file);
        assert.equal(facts.frames, 0, file);
        assert.deepEqual(facts.handlers, [], file);
        assert.deepEqual(facts.badLinks, [], file);
        assert.ok(facts.title.includes("<script>"), "the title is shown as text");
        assert.deepEqual(seen.dialogs, [], `${file}: no alert ran`);
        assert.deepEqual(seen.pageErrors, [], file);
        assert.deepEqual(seen.consoleErrors, [], `${file}: no blocked load or script`);
        assert.deepEqual(seen.requests, [`file://${file}`], `${file}: no request`);
        // Clicking a neutralised link does nothing either.
        const links = await page.$$("a");
        for (const a of links) await a.click({ timeout: 500, noWaitAfter: true }).catch(() => {});
        assert.deepEqual(seen.dialogs, []);
        await page.close();
      }
    });
  },
);

browserTest(
  "starter notebooks: each exports cleanly and is saved as a screenshot",
  async (context) => {
    const seeds: string[] = [];
    for await (const e of Deno.readDir(join(ROOT, "seeds"))) {
      if (e.isFile && e.name.endsWith(".lentil.md")) seeds.push(join(ROOT, "seeds", e.name));
    }
    seeds.sort();
    const files = [...seeds, join(FIXTURES, "export-plots.lentil.md")];
    await Deno.mkdir(SCREENS, { recursive: true });
    await Deno.mkdir(TOUR, { recursive: true });
    await withTemp(async (dir) => {
      for (const file of files) {
        const { out } = await exportTo(file, dir);
        const { page, seen } = await open(context, out);
        assert.deepEqual(seen.consoleErrors, [], file);
        assert.deepEqual(seen.requests, [`file://${out}`], file);
        for (const p of await plotFacts(page)) {
          assert.ok(p.svg >= 1 && p.marks > 0, `${file}: plot ${p.id} drawn`);
        }
        const png = join(SCREENS, basename(file).replace(/\.lentil\.md$/, ".png"));
        await page.screenshot({ path: png, fullPage: true });
        assert.ok((await Deno.stat(png)).size > 5000, png);
        if (seeds.includes(file) && !file.endsWith("blank.lentil.md")) {
          // The README's tour shows the top of each starter's page, as the browser draws it.
          await page.setViewportSize({ width: 960, height: 1200 });
          const tour = join(TOUR, basename(file).replace(/\.lentil\.md$/, ".png"));
          await page.screenshot({ path: tour });
          // And the first figure of each starter that has one, in Lentil's plot theme.
          const figure = page.locator("figure.lx-plot:not(.lx-problem)").first();
          if (await figure.count()) {
            await figure.screenshot({
              path: join(TOUR, basename(file).replace(/\.lentil\.md$/, "-figure.png")),
            });
          }
        }
        await page.close();
      }
    });
  },
);

browserTest(
  "starters in the browser: one cautions section, results as headline and parts, wide tables scroll and print whole",
  async (context) => {
    await withTemp(async (dir) => {
      for (const name of ["dispense-check", "clinical-case", "refraction-study"]) {
        const { out, notebook } = await exportTo(join(ROOT, "seeds", `${name}.lentil.md`), dir);
        const { page, seen } = await open(context, out);
        await page.setViewportSize({ width: 800, height: 1000 });
        assert.deepEqual(seen.consoleErrors, [], name);
        const facts = await page.evaluate(() => ({
          cautions: document.querySelectorAll("section.lx-cautions").length,
          asides: document.querySelectorAll("aside").length,
          text: document.body.innerText,
          // Every marker links to the section, and the section links back to it.
          marks: [...document.querySelectorAll("a.lx-flag")].map((a) => ({
            href: a.getAttribute("href"),
            back: !!document.querySelector(`a[href="#${a.id}"]`),
          })),
          below: [...document.querySelectorAll("tr.lx-below")].map((tr) => ({
            id: tr.getAttribute("data-below"),
            headline: !!tr.previousElementSibling?.querySelector(".lx-headline"),
            table: !!tr.querySelector("table"),
          })),
          scrollers: [...document.querySelectorAll(".lx-scroll")].map((s) => ({
            tabindex: s.getAttribute("tabindex"),
            role: s.getAttribute("role"),
            label: s.getAttribute("aria-label") ?? "",
          })),
          overflow: document.documentElement.scrollWidth - document.documentElement.clientWidth,
        }));
        const report = buildReport(notebook);
        assert.equal(facts.cautions, report.cautions.length ? 1 : 0, name);
        assert.equal(facts.asides, 0, name);
        assert.ok(!facts.text.includes("rows ×"), name);
        for (const m of facts.marks) {
          assert.equal(m.href, "#cautions", name);
          assert.ok(m.back, `${name}: the cautions link back`);
        }
        // Each record result: its headline beside the cell and its parts as a table under it.
        const withParts = report.cells.filter((c) =>
          !c.error && c.kind === "cell" && (c.parts?.length || c.checks?.length)
        );
        for (const c of withParts) {
          const b = facts.below.find((x) => x.id === c.id);
          assert.ok(b?.headline && b.table, `${name}: ${c.id} reads as headline and parts`);
        }
        // Wide tables scroll inside the page, by keyboard too; the page itself never does.
        for (const s of facts.scrollers) {
          assert.equal(s.tabindex, "0");
          assert.equal(s.role, "region");
          assert.ok(s.label.length > 0);
        }
        assert.ok(facts.overflow <= 1, `${name}: ${facts.overflow}px page overflow on screen`);
        await page.emulateMedia({ media: "print" });
        const cut = await page.evaluate(() =>
          [...document.querySelectorAll(".lx-scroll")].filter((s) =>
            s.scrollWidth > s.clientWidth + 1
          ).length
        );
        assert.equal(cut, 0, `${name}: a table is cut in print`);
        await page.close();
      }
    });
  },
);
