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

/**
 * Call the server. Addresses are relative to the page's own, which holds the session's key.
 *
 * @param {string} path
 * @param {unknown} [body]
 * @returns {Promise<any>}
 */
export function api(path, body) {
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
    res.json().catch(() => ({ error: res.statusText })).then((data) => {
      if (!res.ok && res.status !== 409) throw new Error(data.error || res.statusText);
      return data;
    })
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
