// @ts-check
/// <reference lib="dom" />
/**
 * Small DOM helpers for the live page's script: elements, buttons, a brief highlight.
 *
 * @module
 */

/**
 * A new element with a class and text.
 *
 * @template {keyof HTMLElementTagNameMap} K
 * @param {K} tag
 * @param {string} [cls]
 * @param {string | null} [text]
 * @returns {HTMLElementTagNameMap[K]}
 */
export function el(tag, cls, text) {
  const e = document.createElement(tag);
  if (cls) e.className = cls;
  if (text !== undefined && text !== null) e.textContent = text;
  return e;
}

/**
 * A button that runs `onClick`.
 *
 * @param {string} text
 * @param {string} title
 * @param {() => void} onClick
 * @param {string} [cls]
 * @returns {HTMLButtonElement}
 */
export function button(text, title, onClick, cls) {
  const b = el("button", cls || "", text);
  b.type = "button";
  b.title = title;
  b.addEventListener("click", onClick);
  return b;
}

/**
 * The element with this id, which the page shell always has.
 *
 * @param {string} id
 * @returns {HTMLElement}
 */
export function byId(id) {
  const e = document.getElementById(id);
  if (!e) throw new Error(`the page has no #${id}`);
  return e;
}

/**
 * The first element under `root` matching `selector`, which the markup always has.
 *
 * @template {Element} T
 * @param {ParentNode} root
 * @param {string} selector
 * @returns {T}
 */
export function find(root, selector) {
  const e = root.querySelector(selector);
  if (!e) throw new Error(`missing ${selector}`);
  return /** @type {T} */ (e);
}

/** @type {string | undefined} */
let highlight;

/**
 * Highlight a node briefly: it was just updated. An animation of its own, so nothing on the
 * page is laid out again to start it.
 *
 * @param {HTMLElement} node
 */
export function flash(node) {
  highlight ??= getComputedStyle(document.documentElement).getPropertyValue("--warn-bg").trim() ||
    "#fbf1d9";
  node.animate([{ backgroundColor: highlight }, { backgroundColor: "transparent" }], {
    duration: 800,
    easing: "ease-out",
  });
}
