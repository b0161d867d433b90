// @ts-check
/// <reference lib="dom" />
/**
 * The live page's script, loaded as a module from the server: plain DOM code, no framework,
 * talking only to its own origin, under the page's own address (which holds the session's
 * key). It draws the page, sends each edit, applies what comes back, watches the files on
 * disk, and ends the session when asked.
 *
 * @module
 */

import { button, byId, el } from "./dom.js";
import { api, live, openSocket, queue, say } from "./state.js";
import { applyPatch, applyResult, renderAll, showStatus } from "./page.js";

live.apply = applyResult;

const banner = byId("lentil-banner");
let noticeShown = "";
/** @type {ReturnType<typeof setInterval> | undefined} */
let polling;

/**
 * Say which files changed on disk, with the two ways forward; nothing when none did.
 *
 * @param {readonly string[]} files
 */
function notice(files) {
  const key = files.join(",");
  if (!files.length) {
    banner.hidden = true;
    noticeShown = "";
    return;
  }
  if (key === noticeShown && !banner.hidden) return;
  noticeShown = key;
  banner.replaceChildren();
  banner.append(
    el(
      "span",
      "",
      files.join(", ") + " changed on disk since this page read " +
        (files.length > 1 ? "them" : "it") + ". Nothing was overwritten.",
    ),
  );
  const reload = button(
    "Reload from disk",
    "Show the file as it is on disk; Undo brings the page's edits back",
    () => {
      queue(() =>
        api("api/reload", {}).then((r) => {
          applyResult(r);
          notice([]);
          say("reloaded from disk; Undo brings your edits back");
        })
      );
    },
  );
  reload.id = "lentil-reload";
  const both = button(
    "Keep both",
    "Write the page's version as a new file beside the original",
    () => {
      queue(() =>
        api("api/keep-both", {}).then((r) => {
          applyPatch(r.patch);
          notice([]);
          say(
            "your version is saved as " + r.written.join(", ") +
              "; the original stays as it is on disk",
          );
        })
      );
    },
  );
  both.id = "lentil-keep-both";
  banner.append(reload, both);
  banner.hidden = false;
}

function save() {
  queue(() => {
    say("saving…");
    return api("api/save", {}).then((r) => {
      showStatus(r.status);
      if (r.ok) {
        notice([]);
        say("saved " + r.written.join(", "));
      } else if (r.conflict) {
        notice(r.conflict);
        say("not saved: changed on disk", true);
      } else say("not saved: " + (r.error || "the file could not be written"), true);
    });
  });
}

function pollDisk() {
  if (document.hidden) return;
  api("api/disk").then((r) => {
    if (r.changed.length || !banner.hidden) notice(r.changed);
  }).catch(() => {});
}

/** @param {"undo" | "redo"} which */
function step(which) {
  queue(() => api("api/" + which, {}).then(applyResult));
}

function end() {
  queue(() =>
    api("api/end", {}).then((r) => {
      if (polling !== undefined) clearInterval(polling);
      document.body.dataset.ended = "1";
      for (const b of document.querySelectorAll("button, input")) {
        /** @type {HTMLInputElement} */ (b).disabled = true;
      }
      say(
        r.unsaved
          ? "session ended; the unsaved changes were not written. You may close this tab."
          : "session ended. You may close this tab.",
        !!r.unsaved,
      );
    })
  );
}

byId("lentil-undo").addEventListener("click", () => step("undo"));
byId("lentil-redo").addEventListener("click", () => step("redo"));
byId("lentil-save").addEventListener("click", save);
byId("lentil-end").addEventListener("click", end);
document.addEventListener("keydown", (e) => {
  if (!(e.ctrlKey || e.metaKey)) return;
  const k = e.key.toLowerCase();
  const a = /** @type {HTMLInputElement | null} */ (document.activeElement);
  const typing = !!a && a.tagName === "INPUT" &&
    (a.dataset.committed !== undefined
      ? a.value !== a.dataset.committed
      : a.value !== a.defaultValue);
  if (k === "s") {
    e.preventDefault();
    if (a && a.blur) a.blur();
    save();
  } else if ((k === "z" && e.shiftKey) || k === "y") {
    if (!typing) {
      e.preventDefault();
      step("redo");
    }
  } else if (k === "z") {
    if (!typing) {
      e.preventDefault();
      step("undo");
    }
  }
});

/**
 * Draw the page once the notebook is open; until then, say how far opening has come (the
 * reading of a large table file) and ask again.
 *
 * @returns {Promise<void>}
 */
function whenOpen() {
  return api("api/state").then((r) => {
    if (r.opening) {
      say(r.opening);
      return new Promise((again) => setTimeout(again, 250)).then(whenOpen);
    }
    live.view = r.view;
    renderAll();
    showStatus(r.status);
    document.body.dataset.ready = "1";
    polling = setInterval(pollDisk, 1500);
  });
}

queue(whenOpen);
queue(openSocket);
