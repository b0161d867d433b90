/// <reference lib="dom" />
// Accessibility of the pages, checked with axe-core (an accessibility engine from the npm
// registry, run in Debian's Chromium): no serious or critical WCAG 2 A/AA finding on the
// three exported starters, nor on the live page of one.
import assert from "node:assert/strict";
import { basename, join } from "node:path";
import { loadNotebook } from "../notebook/load.ts";
import { renderNotebookPage } from "../notebook/export/html.ts";
import { startLiveServer } from "../notebook/live/server.ts";
import { axeFindings, browserTest } from "./_browser.ts";

const SEEDS = new URL("../seeds/", import.meta.url).pathname;
const STARTERS = ["clinical-case", "dispense-check", "refraction-study"];

browserTest(
  "axe-core: no serious or critical WCAG 2 AA finding on the exported starters",
  async (ctx) => {
    const dir = await Deno.makeTempDir({ prefix: "lentil-a11y-" });
    try {
      // The check itself finds what it should: an image without a text alternative.
      const probe = await ctx.newPage();
      await probe.setContent('<!doctype html><html lang="en"><title>t</title><img src="data:,">');
      assert.ok((await axeFindings(probe)).some((f) => f.id === "image-alt"));
      await probe.close();
      for (const name of STARTERS) {
        const r = await loadNotebook(join(SEEDS, `${name}.lentil.md`));
        if (!r.ok) throw new Error(r.diagnostic.message);
        const out = join(dir, `${name}.html`);
        await Deno.writeTextFile(
          out,
          (await renderNotebookPage(r.notebook, { bytes: r.bytes })).html,
        );
        const page = await ctx.newPage();
        await page.goto(`file://${out}`, { waitUntil: "load" });
        assert.deepEqual(await axeFindings(page), [], basename(out));
        await page.close();
      }
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  },
);

browserTest("axe-core: no serious or critical WCAG 2 AA finding on the live page", async (ctx) => {
  const dir = await Deno.makeTempDir({ prefix: "lentil-a11y-live-" });
  const path = join(dir, "clinical-case.lentil.md");
  await Deno.copyFile(join(SEEDS, "clinical-case.lentil.md"), path);
  const server = await startLiveServer(path);
  try {
    const page = await ctx.newPage();
    await page.goto(server.url);
    await page.waitForSelector("body[data-ready]", { timeout: 30_000 });
    assert.deepEqual(await axeFindings(page), []);
  } finally {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
});
