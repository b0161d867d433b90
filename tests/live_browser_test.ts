/// <reference lib="dom" />
import assert from "node:assert/strict";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { browserTest, watchPage } from "./_browser.ts";
import { type LiveServer, startLiveServer } from "../notebook/live/server.ts";

const FIXTURES = new URL("./fixtures/live/", import.meta.url);

async function withServer(fn: (s: LiveServer, dir: string, path: string) => Promise<void>) {
  const dir = await Deno.makeTempDir({ prefix: "lentil-page-" });
  for (const e of Deno.readDirSync(FIXTURES)) {
    if (e.isFile) await Deno.copyFile(new URL(e.name, FIXTURES), join(dir, e.name));
  }
  const path = join(dir, "counter.lentil.md");
  const server = await startLiveServer(path);
  try {
    await fn(server, dir, path);
  } finally {
    await server.shutdown();
    await Deno.remove(dir, { recursive: true });
  }
}

async function open(page: Page, server: LiveServer) {
  await page.goto(server.url);
  await page.waitForSelector("body[data-ready]", { timeout: 10_000 });
}

const valueOf = (page: Page, id: string) => page.locator(`#cell-${id} output`).innerText();
const gridCell = (page: Page, table: string, r: number, c: number) =>
  page.locator(`#table-${table} input[data-r="${r}"][data-c="${c}"]`);

async function setExpr(page: Page, id: string, text: string) {
  const input = page.locator(`#expr-${id}`);
  await input.fill(text);
  await input.press("Enter");
}

browserTest(
  "live page: edit, paste, error and fix, undo, keyboard, new cell, save",
  async (ctx) => {
    await withServer(async (server, _dir, path) => {
      const original = await Deno.readTextFile(path);
      const page = await ctx.newPage();
      const seen = watchPage(page);
      await open(page, server);
      assert.equal(await page.locator("h1").first().innerText(), "Counter check (invented)");
      assert.ok(
        (await page.locator(".lx-prose").first().innerHTML()).includes("<h1>Counter check"),
      );
      assert.ok(await page.locator("figure.lx-plot svg").count() === 1, "the plot is drawn");

      // An input edit updates its dependents, and only those.
      const cornea0 = await valueOf(page, "cornea");
      const other0 = await page.locator("#cell-other").evaluate((n) => n.outerHTML);
      await setExpr(page, "spectacle", "-8.00 D");
      await page.waitForFunction(
        (v) => document.querySelector("#cell-cornea output")?.textContent !== v,
        cornea0,
      );
      assert.match(await valueOf(page, "cornea"), /^-7\.25 D/);
      assert.equal(
        await page.locator("body").getAttribute("data-recomputed"),
        "spectacle cornea steps",
      );
      assert.equal(await page.locator("#cell-other").evaluate((n) => n.outerHTML), other0);

      // Paste two rows (tab-separated) at the last row: one replaced, one added.
      await gridCell(page, "trials", 2, 0).evaluate((input) => {
        const dt = new DataTransfer();
        dt.setData("text/plain", "+0.25\t0.05\r\n0.00\t0.00\r\n");
        input.dispatchEvent(new ClipboardEvent("paste", { clipboardData: dt, bubbles: true }));
      });
      await page.waitForSelector('#table-trials input[data-r="3"][data-c="1"]');
      assert.equal(await gridCell(page, "trials", 3, 1).inputValue(), "0.00");
      assert.equal(await gridCell(page, "trials", 2, 0).inputValue(), "+0.25");
      assert.equal(await valueOf(page, "best"), "0");
      const shifted = await page.locator("#table-trials tbody tr:nth-child(4) td.live-computed")
        .innerText();
      // The unit is in the computed column's header; cells show the number by its rule.
      assert.equal(shifted, "-0.25");

      // Comma-separated paste into a fresh row.
      await page.locator("#table-trials .live-add-row").click();
      await page.waitForSelector('#table-trials input[data-r="4"][data-c="0"]');
      await gridCell(page, "trials", 4, 0).evaluate((input) => {
        const dt = new DataTransfer();
        dt.setData("text/plain", '"-0.25",0.10\n');
        input.dispatchEvent(new ClipboardEvent("paste", { clipboardData: dt, bubbles: true }));
      });
      await page.waitForFunction(() =>
        (document.querySelector('#table-trials input[data-r="4"][data-c="1"]') as HTMLInputElement)
          ?.value === "0.10"
      );

      // Keyboard: arrows move between cells, Enter commits and moves down.
      await gridCell(page, "trials", 0, 1).click();
      await page.keyboard.press("ArrowDown");
      assert.equal(await page.evaluate(() => document.activeElement?.getAttribute("data-r")), "1");
      await page.keyboard.press("Control+a");
      await page.keyboard.type("0.22");
      await page.keyboard.press("Enter");
      assert.equal(await page.evaluate(() => document.activeElement?.getAttribute("data-r")), "2");
      await page.waitForFunction(() =>
        document.querySelector("#lentil-status")?.textContent?.includes("unsaved")
      );
      await page.waitForFunction(() =>
        (document.querySelector('#table-trials input[data-r="1"][data-c="1"]') as HTMLInputElement)
          ?.defaultValue === "0.22"
      );

      // Reorder and delete rows.
      await page.locator('#table-trials button[aria-label="move row up 5"]').click();
      await page.waitForFunction(() =>
        (document.querySelector('#table-trials input[data-r="3"][data-c="0"]') as HTMLInputElement)
          ?.value === "-0.25"
      );
      await page.locator('#table-trials button[aria-label="remove row 5"]').click();
      await page.waitForFunction(() => !document.querySelector('#table-trials input[data-r="4"]'));

      // Cause an error: shown at the cell and on its dependents; what was typed stays.
      await setExpr(page, "vd", "13 mm +");
      await page.waitForSelector("#cell-vd.lx-has-error");
      assert.equal(await page.locator("#expr-vd").inputValue(), "13 mm +");
      assert.match(await page.locator("#cell-vd .live-error").innerText(), /line \d+, column \d+/);
      assert.match(await page.locator("#cell-cornea .live-error").innerText(), /^depends on vd/);
      assert.match(await page.locator("#cell-steps .live-error").innerText(), /^depends on vd/);
      assert.equal(await page.locator("#cell-other .live-error").innerText(), "");
      // Fix it.
      await setExpr(page, "vd", "12 mm");
      await page.waitForSelector("#cell-vd:not(.lx-has-error)");
      await page.waitForSelector("#cell-cornea:not(.lx-has-error)");

      // Undo brings the error back; redo the fix; undo twice more returns to 13 mm.
      await page.locator("#lentil-undo").click();
      await page.waitForSelector("#cell-vd.lx-has-error");
      assert.equal(await page.locator("#expr-vd").inputValue(), "13 mm +");
      await page.keyboard.press("Control+Shift+Z");
      await page.waitForSelector("#cell-vd:not(.lx-has-error)");
      await page.locator("#lentil-undo").click();
      await page.locator("#lentil-undo").click();
      await page.waitForFunction(() =>
        (document.querySelector("#expr-vd") as HTMLInputElement).value === "13 mm"
      );

      // A new cell: a line that is not `name = expression` is refused, the text stays.
      const add = page.locator('.live-new-cell input[aria-label="new cell in block 1"]');
      await add.fill("half of cornea");
      await add.press("Enter");
      await page.waitForSelector(".live-calc[data-block='0'] .live-new-cell .lx-error:not(:empty)");
      assert.equal(await add.inputValue(), "half of cornea");
      await add.fill("half = cornea / 2   # typed in the page");
      await add.press("Enter");
      await page.waitForSelector("#cell-half");
      assert.match(await valueOf(page, "half"), /D/);

      // Save, and check the file on disk.
      await page.locator("#lentil-save").click();
      await page.waitForFunction(() =>
        document.querySelector("#lentil-status")?.textContent?.startsWith("saved")
      );
      const saved = await Deno.readTextFile(path);
      assert.equal(saved, server.session.text);
      const expected = original
        .replace("spectacle = -6.50 D", "spectacle = -8.00 D")
        .replace(
          "+0.75    | 0.20\n+0.50    | 0.10\n",
          "+0.75    | 0.22\n+0.25    | 0.05\n-0.25    | 0.10\n",
        )
        .replace(
          "other = 40 cm                # unrelated to the others\n",
          "other = 40 cm                # unrelated to the others\nhalf = cornea / 2   # typed in the page\n",
        );
      assert.equal(saved, expected);
      assert.deepEqual(seen.pageErrors, []);
      assert.deepEqual(seen.consoleErrors, []);
      assert.ok(seen.requests.every((u) => u.startsWith(server.origin)), "only its own origin");
    });
  },
);

browserTest("live page: a file edited behind the page loses no data", async (ctx) => {
  await withServer(async (server, dir, path) => {
    const page = await ctx.newPage();
    const seen = watchPage(page);
    await open(page, server);
    await setExpr(page, "spectacle", "-7.75 D");
    await page.waitForFunction(() =>
      document.querySelector("#lentil-status")?.textContent === "unsaved changes"
    );
    const behind = (await Deno.readTextFile(path)).replace(
      "The end.",
      "The end, edited elsewhere.",
    );
    await Deno.writeTextFile(path, behind);
    // The page notices by itself…
    await page.waitForSelector("#lentil-banner:not([hidden])", { timeout: 5000 });
    assert.match(
      await page.locator("#lentil-banner").innerText(),
      /counter\.lentil\.md changed on disk/,
    );
    // …and a save does not overwrite.
    await page.locator("#lentil-save").click();
    await page.waitForFunction(() =>
      document.querySelector("#lentil-status")?.textContent?.startsWith("not saved")
    );
    assert.equal(await Deno.readTextFile(path), behind);
    // Keep both: the page's version as a copy, the other edit untouched.
    await page.locator("#lentil-keep-both").click();
    await page.waitForFunction(() =>
      document.querySelector("#lentil-status")?.textContent?.includes("saved as")
    );
    const copies = [...Deno.readDirSync(dir)].map((e) => e.name).filter((n) =>
      n.includes(".edited-")
    );
    assert.equal(copies.length, 1);
    const copy = await Deno.readTextFile(join(dir, copies[0]));
    assert.ok(copy.includes("spectacle = -7.75 D") && copy.includes("The end.\n"));
    assert.equal(await Deno.readTextFile(path), behind);
    assert.ok(await page.locator("#lentil-banner").isHidden());
    assert.equal(await page.locator("#lentil-file").innerText(), copies[0]);
    // Reload path: edit again, change the copy behind the page, reload; undo restores.
    await setExpr(page, "vd", "15 mm");
    await page.waitForFunction(() =>
      document.querySelector("#lentil-status")?.textContent === "unsaved changes"
    );
    await Deno.writeTextFile(join(dir, copies[0]), copy.replace("The end.", "Third version."));
    await page.waitForSelector("#lentil-banner:not([hidden])", { timeout: 5000 });
    await page.locator("#lentil-reload").click();
    await page.waitForFunction(() =>
      (document.querySelector("#expr-vd") as HTMLInputElement).value === "13 mm"
    );
    assert.ok((await page.locator(".lx-prose").last().innerText()).includes("Third version."));
    await page.locator("#lentil-undo").click();
    await page.waitForFunction(() =>
      (document.querySelector("#expr-vd") as HTMLInputElement).value === "15 mm"
    );
    assert.deepEqual(seen.pageErrors, []);
  });
});

browserTest(
  "live page: an edit keeps what it did not change; a plot is redrawn only for its data; End session",
  async (ctx) => {
    await withServer(async (server) => {
      const page = await ctx.newPage();
      const seen = watchPage(page);
      await open(page, server);
      // Probes on nodes that no edit below should replace.
      await page.evaluate(() => {
        for (const sel of ["figure.lx-plot svg", "#table-trials", "#cell-other", ".lx-prose"]) {
          document.querySelector(sel)!.setAttribute("data-probe", "kept");
        }
      });
      const cornea0 = await valueOf(page, "cornea");
      await setExpr(page, "spectacle", "-7.00 D");
      await page.waitForFunction(
        (v) => document.querySelector("#cell-cornea output")?.textContent !== v,
        cornea0,
      );
      assert.equal(await page.locator("[data-probe=kept]").count(), 4, "nothing else redrawn");
      // A row of the plotted table changes: the plot is drawn again, the grid kept.
      await gridCell(page, "trials", 0, 1).fill("0.40");
      await gridCell(page, "trials", 0, 1).press("Enter");
      await page.waitForFunction(() => !document.querySelector("figure.lx-plot svg[data-probe]"));
      assert.equal(await page.locator("#table-trials[data-probe=kept]").count(), 1);
      // The page ends the session: the server stops and the page says so.
      await page.locator("#lentil-end").click();
      await page.waitForSelector("body[data-ended]");
      assert.match(await page.locator("#lentil-status").innerText(), /session ended/);
      assert.equal(server.endedFromPage, true);
      await server.finished;
      assert.deepEqual(seen.consoleErrors, []);
      assert.deepEqual(seen.pageErrors, []);
    });
  },
);

browserTest(
  "live page: a long table is shown a hundred rows at a time, each page editable",
  async (ctx) => {
    const dir = await Deno.makeTempDir({ prefix: "lentil-page-long-" });
    const rows = Array.from({ length: 250 }, (_, i) => `${i} | ${i % 7}`).join("\n");
    const path = join(dir, "long.lentil.md");
    await Deno.writeTextFile(
      path,
      "```lentil table t\nx | y\n" + rows +
        "\n```\n\n```lentil\nt.z = x + y\nlast = max(t.z)\n```\n",
    );
    const server = await startLiveServer(path);
    try {
      const page = await ctx.newPage();
      await open(page, server);
      const pager = page.locator("#table-t .live-pager span");
      assert.equal(await pager.innerText(), "rows 1–100 of 250");
      assert.equal(await page.locator("#table-t tbody tr").count(), 100);
      await page.locator("#table-t .live-later").click();
      assert.equal(await pager.innerText(), "rows 101–200 of 250");
      // Edit a row on the second page: its computed column and the cells below follow.
      await gridCell(page, "t", 150, 1).fill("1000");
      await gridCell(page, "t", 150, 1).press("Enter");
      await page.waitForFunction(() =>
        document.querySelector("#cell-last output")?.textContent?.startsWith("1150")
      );
      assert.equal(await pager.innerText(), "rows 101–200 of 250");
      // Moving down past the page's last row shows the next page.
      await gridCell(page, "t", 199, 0).click();
      await page.keyboard.press("ArrowDown");
      assert.equal(await pager.innerText(), "rows 201–250 of 250");
      assert.equal(
        await page.evaluate(() => document.activeElement?.getAttribute("data-r")),
        "200",
      );
    } finally {
      await server.shutdown();
      await Deno.remove(dir, { recursive: true });
    }
  },
);
