/**
 * The live server: one notebook, one page, on 127.0.0.1 only, on a free port, under an
 * address that holds an unguessable key: `http://127.0.0.1:PORT/KEY/`. Every request is
 * checked for our own Host, no foreign Origin and the key as the first part of its path; JSON
 * bodies are validated with zod; requests are handled one at a time so edits never
 * interleave.
 *
 * HTTP API (every path below `/KEY`; POST bodies are JSON):
 *
 * | method | path | body | answer |
 * | --- | --- | --- | --- |
 * | GET | `/` | | the page |
 * | GET | `/client/NAME.js`, `/style.css` | | the page's script modules and style |
 * | GET | `/api/state` | | `{view, status}`; `{opening: text}` while the notebook opens |
 * | GET | `/api/disk` | | `{changed: [file…]}`: files changed on disk since read |
 * | GET | `/api/source?file=NAME` | | text of a CSV file a table reads |
 * | POST | `/api/cell` | `{id, expression}` | `{ok, recomputed, patch}` |
 * | POST | `/api/cell/new` | `{block, line}` | same; `ok: false` with `error` when refused |
 * | POST | `/api/cell/delete` | `{id}` | same |
 * | POST | `/api/table` | `{name, rows: string[][]}` | same |
 * | POST | `/api/undo`, `/api/redo` | `{}` | same |
 * | POST | `/api/save` | `{}` | `{ok: true, written}` or 409 `{ok: false, conflict}` |
 * | POST | `/api/reload` | `{}` | `{ok, patch}` (the page's edits stay on the undo stack) |
 * | POST | `/api/keep-both` | `{name?}` | `{file, written, patch}` |
 * | POST | `/api/end` | `{}` | `{ok: true, unsaved}`, then the server stops |
 * | GET | `/api/socket` | | a WebSocket carrying the calls above as messages (`_socket.ts`) |
 *
 * @example
 * ```ts ignore
 * import { startLiveServer } from "./server.ts";
 * const server = await startLiveServer("case.lentil.md");
 * console.log(server.url); // http://127.0.0.1:PORT/KEY/
 * await server.shutdown();
 * ```
 *
 * @module
 */

import { z } from "zod";
import { checkRequest, newKey, ownOrigins } from "./_guard.ts";
import { UnsafePathError } from "./_paths.ts";
import { clientFiles } from "./_assets.ts";
import { SOCKET_PATH, Sockets } from "./_socket.ts";
import { progressLine, type ProgressListener } from "../progress.ts";
import { basename } from "node:path";
import { pageHtml, STYLE_CSS } from "./_page.ts";
import { EditRefused, type EditResult, LiveSession } from "./session.ts";
import { SaveError } from "./save.ts";
import type { BudgetLimits } from "../engine/budget.ts";
import type { Renderers } from "./_views.ts";

/** A running live server. */
export interface LiveServer {
  /** The page's address, which holds the key. */
  readonly url: string;
  /** `http://127.0.0.1:PORT`. */
  readonly origin: string;
  /** The port. */
  readonly port: number;
  /** The session's key (the first part of every path). */
  readonly key: string;
  /** Whether the page ended the session (its End button). */
  readonly endedFromPage: boolean;
  /** The editing session. */
  readonly session: LiveSession;
  /** Stop serving. */
  shutdown(): Promise<void>;
  /** Settles when the server has stopped. */
  readonly finished: Promise<void>;
}

/** Options for {@linkcode startLiveServer}. */
export interface LiveServerOptions {
  /** Port (default 0: a free one). */
  readonly port?: number;
  /** Renderers for prose and plots (default: the export's). */
  readonly renderers?: Renderers;
  /**
   * Time and memory per cell (default 3 s and 1 GiB); a cell over budget is stopped in a
   * worker and shown as an error. `false` evaluates in the server's own thread, unguarded.
   */
  readonly budget?: BudgetLimits | false;
  /**
   * Called with the page's address as soon as the server listens, before the notebook has
   * opened (the page then shows how far opening has come).
   */
  readonly onListening?: (url: string) => void;
  /** Told how far the reading of the notebook's table files has come while it opens. */
  readonly onProgress?: ProgressListener;
}

const MAX_BODY = 8 * 1024 * 1024;
const Id = z.string().min(1).max(300);
const Line = z.string().max(20_000);
const Empty = z.object({}).strict();
const CellEdit = z.object({ id: Id, expression: Line }).strict();
const NewCell = z.object({ block: z.number().int().min(0).max(10_000), line: Line }).strict();
const DeleteCell = z.object({ id: Id }).strict();
const Rows = z.object({
  name: Id,
  rows: z.array(z.array(z.string().max(2_000)).max(500)).max(100_000),
}).strict();
const KeepBoth = z.object({ name: z.string().min(1).max(200).optional() }).strict();

const SECURITY_HEADERS: Record<string, string> = {
  "content-security-policy":
    "default-src 'none'; script-src 'self'; style-src 'self' 'unsafe-inline'; img-src 'self' data:; connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
  "referrer-policy": "no-referrer",
  "x-content-type-options": "nosniff",
  "cross-origin-resource-policy": "same-origin",
  "cache-control": "no-store",
};

function respond(body: string, type: string, status = 200): Response {
  return new Response(body, { status, headers: { ...SECURITY_HEADERS, "content-type": type } });
}

function json(data: unknown, status = 200): Response {
  return respond(JSON.stringify(data), "application/json; charset=utf-8", status);
}

class BadRequest extends Error {}

/** The method and path of a request below the key (never the key), for the terminal. */
function key(req: Request): string {
  return `${req.method} ${new URL(req.url).pathname.replace(/^\/[^/]*/, "") || "/"}`;
}

/** An error as one line of printable text. */
function oneLine(e: unknown): string {
  const text = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
  // deno-lint-ignore no-control-regex
  return text.replace(/[\u0000-\u001f\u007f-\u009f]+/g, " ").slice(0, 300);
}

/** A request body over the limit: refused without reading further. */
class TooLarge extends Error {
  constructor() {
    super(`request too large (at most ${MAX_BODY / 1024 / 1024} MB)`);
  }
}

/**
 * The body as text, refused by its declared `Content-Length` before any of it is read, and
 * cut off at the limit when it declares none (or declares less than it sends).
 */
async function readBody(req: Request): Promise<string> {
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (!(declared <= MAX_BODY)) throw new TooLarge();
  if (!req.body) return "";
  const reader = req.body.getReader();
  const parts: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.length;
    if (size > MAX_BODY) {
      await reader.cancel().catch(() => {});
      throw new TooLarge();
    }
    parts.push(value);
  }
  const all = new Uint8Array(size);
  let at = 0;
  for (const p of parts) {
    all.set(p, at);
    at += p.length;
  }
  return new TextDecoder().decode(all);
}

async function readJson<T>(req: Request, schema: z.ZodType<T>): Promise<T> {
  const text = await readBody(req);
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    throw new BadRequest("the body is not JSON");
  }
  const parsed = schema.safeParse(data);
  if (!parsed.success) {
    throw new BadRequest(
      parsed.error.issues.map((i) => `${i.path.join(".") || "body"}: ${i.message}`).join("; "),
    );
  }
  return parsed.data;
}

/** A queue: each function given runs once the one before it has settled. */
function oneAtATime(): <T>(fn: () => Promise<T>) => Promise<T> {
  let queue: Promise<unknown> = Promise.resolve();
  return <T>(fn: () => Promise<T>): Promise<T> => {
    const run = queue.then(fn, fn);
    queue = run.catch(() => {});
    return run;
  };
}

/** What the routes serve from: the session, the page's script files, ending from the page. */
interface Served {
  readonly session: LiveSession;
  readonly client: ReadonlyMap<string, string>;
  /** Marks the session as ended from the page. */
  endFromPage(): void;
  /** Stops the server shortly (after the reply has gone). */
  stopSoon(): void;
}

/** The response to one checked request: reading routes, then editing routes. */
function route(served: Served, req: Request, path: string): Promise<Response> {
  const key = `${req.method} ${path}`;
  return req.method === "GET" ? readRoute(served, req, key) : editRoute(served, req, key);
}

/** The page's shell, style and script files, the same while opening and after. */
function shellRoute(
  client: ReadonlyMap<string, string>,
  title: string,
  key: string,
): Response | undefined {
  if (key === "GET /") return respond(pageHtml(title), "text/html; charset=utf-8");
  if (key === "GET /style.css") return respond(STYLE_CSS, "text/css; charset=utf-8");
  const m = /^GET \/client\/([a-z]+\.js)$/.exec(key);
  const file = m ? client.get(m[1]) : undefined;
  return file === undefined ? undefined : respond(file, "text/javascript; charset=utf-8");
}

/**
 * While the notebook opens: the shell, and a state that says how far the reading of its
 * table files has come (the page asks again until it is ready); nothing else yet.
 */
function openingRoute(
  client: ReadonlyMap<string, string>,
  title: string,
  req: Request,
  path: string,
  line: string,
): Response {
  const key = `${req.method} ${path}`;
  const shell = shellRoute(client, title, key);
  if (shell) return shell;
  if (key === "GET /api/state") return json({ opening: line });
  return json({ error: `the notebook is still opening (${line})` }, 503);
}

/** The page, its style and script, and what it reads: state, disk changes, table files. */
async function readRoute(served: Served, req: Request, key: string): Promise<Response> {
  const { session, client } = served;
  const shell = shellRoute(client, session.view.title, key);
  if (shell) return shell;
  switch (key) {
    case "GET /api/state":
      return json({ view: session.view, status: session.status() });
    case "GET /api/disk":
      return json({ changed: await session.changedFiles() });
    case "GET /api/source": {
      const file = new URL(req.url).searchParams.get("file") ?? "";
      return respond(session.tableFile(file), "text/plain; charset=utf-8");
    }
    default:
      return json({ error: "not found" }, 404);
  }
}

/** Edits, undo and redo, saving, reloading, keeping both versions, ending the session. */
async function editRoute(served: Served, req: Request, key: string): Promise<Response> {
  const { session } = served;
  const edit = async (op: () => EditResult, quick = false) =>
    json(await session.guarded(op, quick));
  switch (key) {
    case "POST /api/cell": {
      const b = await readJson(req, CellEdit);
      const quick = session.isQuickEdit(b.id, b.expression);
      return edit(() => session.setExpression(b.id, b.expression), quick);
    }
    case "POST /api/cell/new": {
      const b = await readJson(req, NewCell);
      return edit(() => session.addCell(b.block, b.line));
    }
    case "POST /api/cell/delete": {
      const b = await readJson(req, DeleteCell);
      return edit(() => session.deleteCell(b.id));
    }
    case "POST /api/table": {
      const b = await readJson(req, Rows);
      return edit(() => session.setRows(b.name, b.rows));
    }
    case "POST /api/undo":
      await readJson(req, Empty);
      return edit(() => session.undo());
    case "POST /api/redo":
      await readJson(req, Empty);
      return edit(() => session.redo());
    case "POST /api/save": {
      await readJson(req, Empty);
      const r = await session.save();
      if (!r.ok && "error" in r) return json(r, r.reason === "disk-full" ? 507 : 503);
      return json(r, r.ok ? 200 : 409);
    }
    case "POST /api/reload":
      await readJson(req, Empty);
      return json(await session.reload());
    case "POST /api/keep-both": {
      const b = await readJson(req, KeepBoth);
      return json(await session.keepBoth(b.name));
    }
    case "POST /api/end": {
      await readJson(req, Empty);
      served.endFromPage();
      const unsaved = session.status().dirty;
      served.stopSoon();
      return json({ ok: true, unsaved });
    }
    default:
      return json({ error: "not found" }, 404);
  }
}

/** A request that failed: the status its error deserves, and one line in the terminal. */
function failure(req: Request, e: unknown): Response {
  if (e instanceof TooLarge) return json({ error: e.message }, 413);
  if (e instanceof BadRequest || e instanceof EditRefused) {
    return json({ error: e.message }, 400);
  }
  if (e instanceof UnsafePathError) return json({ error: e.message }, 403);
  if (e instanceof SaveError) {
    return json({ error: `${e.message}; your edits are kept in the page` }, 503);
  }
  // One line in the terminal, never a trace: the page keeps its state.
  console.error(`lentil live: ${key(req)} failed: ${oneLine(e)}`);
  return json({ error: "internal error (see the terminal)" }, 500);
}

/**
 * Open `path` and serve its live page on 127.0.0.1.
 *
 * @example
 * ```ts ignore
 * import { startLiveServer } from "./server.ts";
 * const s = await startLiveServer("case.lentil.md");
 * const r = await fetch(`${s.url}api/state`);
 * await r.json();
 * await s.shutdown();
 * ```
 * @throws {Error} when the notebook cannot be read.
 */
export async function startLiveServer(
  path: string,
  options: LiveServerOptions = {},
): Promise<LiveServer> {
  const sessionKey = newKey();
  const client = await clientFiles();
  let endedFromPage = false;
  let stop = () => {};
  let port = 0;
  let origin = "";
  const sockets = new Sockets();
  const serial = oneAtATime();
  // Saving has its own queue: it writes the state the page shows, even while an edit's
  // cell is still being computed in the budget's worker.
  const oneSave = oneAtATime();
  // Set once the notebook is open; until then the page is told how far opening has come.
  let served: Served | undefined = undefined;
  const file = basename(path);
  let opening = `opening ${file}`;

  const handler = (req: Request): Promise<Response> | Response => {
    const checked = checkRequest(req, { port, key: sessionKey });
    if ("status" in checked) return json({ error: checked.reason }, checked.status);
    if (new URL(req.url).pathname === `/${sessionKey}`) {
      return new Response(null, {
        status: 308,
        headers: { ...SECURITY_HEADERS, location: `/${sessionKey}/` },
      });
    }
    const path = checked.path;
    const open = served;
    if (!open) return openingRoute(client, file, req, path, opening);
    if (path === SOCKET_PATH && req.method === "GET") {
      return sockets.accept(req, {
        origin,
        key: sessionKey,
        maxMessage: MAX_BODY,
        handle: handler,
      });
    }
    // Reading the page's state never waits for an edit being computed; saving waits only
    // for another save; edits and everything else run one at a time.
    const queue = req.method === "GET" && path !== "/api/source"
      ? (fn: () => Promise<Response>) => fn()
      : path === "/api/save"
      ? oneSave
      : serial;
    return queue(async () => {
      try {
        return await route(open, req, path);
      } catch (e) {
        return failure(req, e);
      }
    });
  };
  const server = Deno.serve({
    hostname: "127.0.0.1",
    port: options.port ?? 0,
    onListen: () => {},
  }, handler);
  port = server.addr.port;
  origin = ownOrigins(port)[0];
  stop = () => {
    sockets.closeAll();
    void server.shutdown();
  };
  options.onListening?.(`${origin}/${sessionKey}/`);
  // Every new state is evaluated in a worker first, under a time and memory budget per cell.
  let session: LiveSession;
  try {
    const started = performance.now();
    session = await LiveSession.open(path, {
      renderers: options.renderers,
      budget: options.budget === false ? undefined : options.budget ?? {},
      onProgress: (e) => {
        opening = progressLine(e, (performance.now() - started) / 1000);
        if (e.done) opening = `computing ${file}`;
        options.onProgress?.(e);
      },
    });
  } catch (e) {
    await server.shutdown();
    throw e;
  }
  served = {
    session,
    client,
    endFromPage: () => {
      endedFromPage = true;
    },
    stopSoon: () => void setTimeout(stop, 20),
  };
  return {
    url: `${origin}/${sessionKey}/`,
    origin,
    port,
    key: sessionKey,
    get endedFromPage() {
      return endedFromPage;
    },
    session,
    shutdown: async () => {
      session.close();
      sockets.closeAll();
      await server.shutdown();
    },
    finished: server.finished,
  };
}
