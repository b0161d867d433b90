/**
 * Shared test helper: drive Debian's headless Chromium (`/usr/bin/chromium`) through
 * `playwright-core`, with a fresh user-data folder each time and no browser download ever.
 * When the browser is missing, browser tests are skipped with a clear message on a
 * developer's machine and fail under CI (`CI=true`), where `.ci/run` installs it.
 *
 * Permissions: `--allow-run=/usr/bin/chromium`, `--allow-read`, `--allow-write` (the
 * profile folder), `--allow-env`, and `--allow-sys=homedir,osRelease`, which
 * `playwright-core` reads when it loads (it is imported only when a browser is launched,
 * so importing this helper needs none of them).
 *
 * @example
 * ```ts ignore
 * import { browserTest, watchPage } from "./_browser.ts";
 * browserTest("page loads", async (context) => {
 *   const page = await context.newPage();
 *   const seen = watchPage(page);
 *   await page.setContent("<p>hi</p>");
 *   if (seen.consoleErrors.length) throw new Error(seen.consoleErrors.join("\n"));
 * });
 * ```
 *
 * @module
 */

import type { BrowserContext, Page } from "playwright-core";

/** Where Debian installs Chromium (`apt-get install -y chromium`). */
export const CHROMIUM_PATH = "/usr/bin/chromium";

/** Flags for a quiet, network-silent headless run. */
export const CHROMIUM_ARGS: readonly string[] = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];

/**
 * Whether Chromium is installed at {@linkcode CHROMIUM_PATH}.
 *
 * @example
 * ```ts ignore
 * import { hasChromium } from "./_browser.ts";
 * if (!hasChromium()) console.log("apt-get install -y chromium");
 * ```
 */
export function hasChromium(): boolean {
  try {
    return Deno.statSync(CHROMIUM_PATH).isFile;
  } catch {
    return false;
  }
}

/** The sys permissions `playwright-core` needs when it loads. */
export const PLAYWRIGHT_SYS: readonly ("homedir" | "osRelease")[] = ["homedir", "osRelease"];

/**
 * Why a browser cannot be launched with this process's permissions, or undefined when it can.
 *
 * @example
 * ```ts ignore
 * import { missingPermission } from "./_browser.ts";
 * missingPermission(); // e.g. "run with --allow-sys=homedir,osRelease"
 * ```
 */
export function missingPermission(): string | undefined {
  const lacks = PLAYWRIGHT_SYS.filter((kind) =>
    Deno.permissions.querySync({ name: "sys", kind }).state !== "granted"
  );
  if (lacks.length) return `playwright-core needs --allow-sys=${PLAYWRIGHT_SYS.join(",")}`;
  if (Deno.permissions.querySync({ name: "run", command: CHROMIUM_PATH }).state !== "granted") {
    return `launching the browser needs --allow-run=${CHROMIUM_PATH}`;
  }
  return undefined;
}

/** A running browser: its context, and how to shut it down and remove its profile. */
export interface BrowserSession {
  /** The persistent context on the fresh profile. */
  readonly context: BrowserContext;
  /** The temporary user-data folder. */
  readonly userDataDir: string;
  /** Close the browser and delete the folder. */
  close(): Promise<void>;
}

/**
 * Launch headless Chromium on a fresh temporary profile.
 *
 * @example
 * ```ts ignore
 * import { launchChromium } from "./_browser.ts";
 * const session = await launchChromium();
 * try {
 *   const page = await session.context.newPage();
 *   await page.setContent("<title>x</title>");
 * } finally {
 *   await session.close();
 * }
 * ```
 * @throws {Error} when Chromium is not installed.
 */
export async function launchChromium(
  options: { viewport?: { width: number; height: number } } = {},
): Promise<BrowserSession> {
  if (!hasChromium()) {
    throw new Error(`${CHROMIUM_PATH} is missing: install it with \`apt-get install -y chromium\``);
  }
  const lacking = missingPermission();
  if (lacking) throw new Error(lacking);
  const { chromium } = await import("playwright-core");
  const userDataDir = await Deno.makeTempDir({ prefix: "lentil-chromium-" });
  let context: BrowserContext;
  try {
    context = await chromium.launchPersistentContext(userDataDir, {
      executablePath: CHROMIUM_PATH,
      headless: true,
      args: [...CHROMIUM_ARGS],
      viewport: options.viewport ?? { width: 1100, height: 900 },
      offline: false,
    });
  } catch (e) {
    await Deno.remove(userDataDir, { recursive: true }).catch(() => {});
    throw e;
  }
  return {
    context,
    userDataDir,
    async close() {
      await context.close().catch(() => {});
      await Deno.remove(userDataDir, { recursive: true }).catch(() => {});
    },
  };
}

/** What a page did while a test watched it. */
export interface PageWatch {
  /** Text of every console message of type "error". */
  readonly consoleErrors: string[];
  /** Text of every console message, any type. */
  readonly consoleAll: string[];
  /** Uncaught exceptions thrown in the page. */
  readonly pageErrors: string[];
  /** URL of every request the page made. */
  readonly requests: string[];
  /** Every dialog (alert, confirm, prompt) the page opened; each is dismissed. */
  readonly dialogs: string[];
}

/**
 * Record console messages, errors, requests and dialogs of a page.
 *
 * @example
 * ```ts ignore
 * import { watchPage } from "./_browser.ts";
 * const seen = watchPage(page);
 * await page.goto("file:///tmp/x.html");
 * seen.requests; // ["file:///tmp/x.html"]
 * ```
 */
export function watchPage(page: Page): PageWatch {
  const w: PageWatch = {
    consoleErrors: [],
    consoleAll: [],
    pageErrors: [],
    requests: [],
    dialogs: [],
  };
  page.on("console", (m) => {
    w.consoleAll.push(`${m.type()}: ${m.text()}`);
    if (m.type() === "error") w.consoleErrors.push(m.text());
  });
  page.on("pageerror", (e) => w.pageErrors.push(String(e)));
  page.on("request", (r) => w.requests.push(r.url()));
  page.on("dialog", (d) => {
    w.dialogs.push(`${d.type()}: ${d.message()}`);
    d.dismiss().catch(() => {});
  });
  return w;
}

/**
 * Register a `Deno.test` that runs with a fresh browser. Skipped (with the reason in its
 * name) when Chromium is missing, except under CI, where the missing browser fails the test.
 *
 * @example
 * ```ts ignore
 * import { browserTest } from "./_browser.ts";
 * browserTest("title shows", async (context) => {
 *   const page = await context.newPage();
 *   await page.setContent("<title>t</title>");
 * });
 * ```
 */
export function browserTest(
  name: string,
  fn: (context: BrowserContext) => Promise<void>,
  options: { viewport?: { width: number; height: number } } = {},
): void {
  const present = hasChromium();
  const ci = Deno.env.get("CI") === "true";
  Deno.test({
    name: present || ci ? name : `${name} (skipped: ${CHROMIUM_PATH} is missing)`,
    ignore: !present && !ci,
    // Playwright keeps a pipe and timers to the browser process between steps.
    sanitizeOps: false,
    sanitizeResources: false,
    async fn() {
      const session = await launchChromium(options);
      try {
        await fn(session.context);
      } finally {
        await session.close();
      }
    },
  });
}

/** One accessibility finding of axe-core on a page. */
export interface AxeFinding {
  /** The axe-core rule (e.g. `color-contrast`). */
  readonly id: string;
  /** minor, moderate, serious or critical. */
  readonly impact: string;
  /** What the rule asks for. */
  readonly help: string;
  /** Selectors of the first few offending nodes. */
  readonly nodes: readonly string[];
}

/**
 * The serious and critical WCAG 2 A and AA findings of axe-core (an accessibility engine
 * from the npm registry) on the page as it stands. Its source is evaluated in the page, so a
 * content security policy that forbids inline scripts does not stop it.
 *
 * @example
 * ```ts ignore
 * import { axeFindings } from "./_browser.ts";
 * assert.deepEqual(await axeFindings(page), []);
 * ```
 */
export async function axeFindings(page: Page): Promise<AxeFinding[]> {
  const { default: axe } = await import("axe-core");
  await page.evaluate(axe.source);
  return await page.evaluate(async () => {
    const run = (globalThis as unknown as {
      axe: {
        run(
          context: unknown,
          options: unknown,
        ): Promise<
          {
            violations: {
              id: string;
              impact?: string | null;
              help: string;
              nodes: { target: unknown[] }[];
            }[];
          }
        >;
      };
    }).axe.run;
    const r = await run(document, {
      runOnly: { type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] },
      resultTypes: ["violations"],
    });
    return r.violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => ({
        id: v.id,
        impact: v.impact ?? "",
        help: v.help,
        nodes: v.nodes.slice(0, 5).map((n) => n.target.map(String).join(" ")),
      }));
  });
}
