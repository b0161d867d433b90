// @ts-check
/// <reference lib="dom" />
/**
 * What the live page's script shares between its parts: the view the page shows, the
 * session's status, the request queue, and the hook that applies an edit's result.
 *
 * @module
 */

import { byId } from "./dom.js";

/** @typedef {import("../_views.ts").PageView} PageView */
/** @typedef {import("../_views.ts").CellView} CellView */
/** @typedef {import("../_views.ts").TableView} TableView */
/** @typedef {import("../_views.ts").PlotView} PlotView */
/** @typedef {import("../_views.ts").ErrorView} ErrorView */
/** @typedef {import("../session.ts").SessionStatus} SessionStatus */
/** @typedef {import("../session.ts").Patch} Patch */
/** @typedef {import("../session.ts").EditResult} EditResult */

/**
 * The page's state. `view` is the page as last drawn; `apply` is set by the page module.
 *
 * @type {{
 *   view: { -readonly [K in keyof PageView]: PageView[K] } & {
 *     cells: Record<string, CellView>, tables: Record<string, TableView>,
 *     plots: Record<string, PlotView>,
 *   },
 *   apply: (r: EditResult) => EditResult,
 * }}
 */
export const live = {
  view: /** @type {never} */ (null),
  apply: (r) => r,
};

let chain = Promise.resolve();

/**
 * Show a line in the status bar.
 *
 * @param {string} text
 * @param {boolean} [bad]
 */
export function say(text, bad) {
  const status = byId("lentil-status");
  status.textContent = text;
  status.classList.toggle("dirty", !!bad);
}

/** @type {WebSocket | undefined} */
let socket;
let calls = 0;
/** @type {Map<number, { done: (status: number, body: any) => void, fail: (e: Error) => void }>} */
const waiting = new Map();

/**
 * Open the quick line to the server (a WebSocket under the page's address); settles either
 * way: while it is closed, calls go as plain requests.
 *
 * @returns {Promise<void>}
 */
export function openSocket() {
  return new Promise((resolve) => {
    /** @type {WebSocket} */
    let ws;
    try {
      ws = new WebSocket(new URL("api/socket", location.href).href.replace(/^http/, "ws"));
    } catch {
      resolve();
      return;
    }
    ws.onopen = () => {
      socket = ws;
      resolve();
    };
    ws.onclose = () => {
      if (socket === ws) socket = undefined;
      // A call in flight may or may not have been applied: say so rather than send it again.
      for (const w of waiting.values()) w.fail(new Error("the connection to the server closed"));
      waiting.clear();
      resolve();
    };
    ws.onmessage = (e) => {
      const m = JSON.parse(e.data);
      const w = waiting.get(m.n);
      if (!w) return;
      waiting.delete(m.n);
      w.done(m.status, m.body);
    };
  });
}

/**
 * An answer as the page reads it: its data, or an error (a conflict, 409, is data too).
 *
 * @param {boolean} ok
 * @param {number} status
 * @param {any} data
 * @param {string} statusText
 */
function answered(ok, status, data, statusText) {
  if (!ok && status !== 409) throw new Error((data && data.error) || statusText);
  return data;
}

/**
 * Call the server: over the socket when it is open, else as a request. Addresses are
 * relative to the page's own, which holds the session's key.
 *
 * @param {string} path
 * @param {unknown} [body]
 * @returns {Promise<any>}
 */
export function api(path, body) {
  const ws = socket;
  if (ws && ws.readyState === WebSocket.OPEN && !path.includes("?")) {
    const n = ++calls;
    return new Promise((resolve, reject) => {
      waiting.set(n, {
        done: (status, data) => {
          try {
            resolve(answered(status >= 200 && status < 300, status, data, "error " + status));
          } catch (e) {
            reject(e);
          }
        },
        fail: reject,
      });
      ws.send(
        JSON.stringify(
          body === undefined ? { n, path: "/" + path } : { n, path: "/" + path, body },
        ),
      );
    });
  }
  /** @type {RequestInit & { headers: Record<string, string> }} */
  const init = {
    method: body === undefined ? "GET" : "POST",
    headers: {},
    cache: "no-store",
    credentials: "omit",
  };
  if (body !== undefined) {
    init.headers["content-type"] = "application/json";
    init.body = JSON.stringify(body);
  }
  return fetch(path, init).then((res) =>
    res.json().catch(() => ({ error: res.statusText })).then((data) =>
      answered(res.ok, res.status, data, res.statusText)
    )
  );
}

/**
 * Run one request after another, so edits reach the server in the order made.
 *
 * @param {() => unknown} fn
 * @returns {Promise<void>}
 */
export function queue(fn) {
  chain = chain.then(fn).catch((e) => say("error: " + e.message, true)).then(() => {});
  return chain;
}

/**
 * An error in words, with where it is in the file.
 *
 * @param {ErrorView} err
 * @returns {string}
 */
export function errorText(err) {
  if (err.kind === "dependency") {
    return "depends on " + (err.cause || "a cell") + ", which has an error: " +
      err.message.replace(/^depends on [^,]*, which has an error: /, "");
  }
  return err.message + " (line " + err.line + ", column " + err.col + ")";
}
