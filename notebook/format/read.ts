/**
 * Reading notebook bytes as UTF-8 text, with the position of the first invalid byte when the
 * file is not valid UTF-8. Nothing is changed: the text is exactly what the file holds.
 *
 * @example
 * ```ts
 * import { decodeNotebook } from "./read.ts";
 * const r = decodeNotebook(new TextEncoder().encode("# Title\n"), "a.lentil.md");
 * r.ok; // true
 * ```
 *
 * @module
 */

import type { Diagnostic } from "./diagnostic.ts";

/** The outcome of decoding: the text, or a positioned diagnostic. */
export type DecodeResult =
  | { readonly ok: true; readonly text: string }
  | { readonly ok: false; readonly diagnostic: Diagnostic };

/**
 * Decode bytes as strict UTF-8. On failure the diagnostic names the line and column of the
 * first byte that is not valid UTF-8.
 *
 * @example
 * ```ts
 * import { decodeNotebook } from "./read.ts";
 * const r = decodeNotebook(new Uint8Array([0x61, 0x0a, 0x62, 0xff]), "bad.lentil.md");
 * r.ok ? "" : `${r.diagnostic.line}:${r.diagnostic.col}`; // "2:2"
 * ```
 */
export function decodeNotebook(bytes: Uint8Array, file: string): DecodeResult {
  try {
    let text = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true }).decode(bytes);
    if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    return { ok: true, text };
  } catch {
    const bad = firstInvalidUtf8(bytes);
    const before = new TextDecoder("utf-8").decode(bytes.subarray(0, bad));
    const lines = before.split("\n");
    return {
      ok: false,
      diagnostic: {
        file,
        line: lines.length,
        col: lines[lines.length - 1].length + 1,
        message: `the file is not valid UTF-8 (byte 0x${
          bytes[bad].toString(16).padStart(2, "0")
        } at offset ${bad}); save it as UTF-8 and try again`,
        severity: "error",
      },
    };
  }
}

/** Text decoded with every invalid sequence shown as U+FFFD, and one diagnostic a line. */
export interface LenientDecode {
  /** The text (exactly the file's when `diagnostics` is empty). */
  readonly text: string;
  /** One error for each line that holds bytes that are not UTF-8 (at the first such byte). */
  readonly diagnostics: readonly Diagnostic[];
}

/**
 * Decode bytes as UTF-8 so that the rest of a notebook can still be read and evaluated when
 * some bytes are not UTF-8: each such line gets a positioned error, and the text shows the
 * bad bytes as U+FFFD (for reading only: it is never written back).
 *
 * @example
 * ```ts
 * import { decodeNotebookLenient } from "./read.ts";
 * const r = decodeNotebookLenient(new Uint8Array([0x61, 0x0a, 0x62, 0xff, 0x0a]), "bad.lentil.md");
 * r.diagnostics.map((d) => `${d.line}:${d.col}`); // ["2:2"]
 * ```
 */
export function decodeNotebookLenient(bytes: Uint8Array, file: string): LenientDecode {
  const strict = decodeNotebook(bytes, file);
  if (strict.ok) return { text: strict.text, diagnostics: [] };
  const bom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes.subarray(bom));
  const diagnostics: Diagnostic[] = [];
  const lines = new Set<number>();
  let at = 0;
  while (at < bytes.length && diagnostics.length < 50) {
    const bad = at + firstInvalidUtf8(bytes.subarray(at));
    if (bad >= bytes.length) break;
    const before = new TextDecoder("utf-8").decode(bytes.subarray(bom, bad)).split("\n");
    if (!lines.has(before.length)) {
      lines.add(before.length);
      diagnostics.push({
        file,
        line: before.length,
        col: before[before.length - 1].length + 1,
        message: `this line is not valid UTF-8 (byte 0x${
          bytes[bad].toString(16).padStart(2, "0")
        } at offset ${bad}); save the file as UTF-8`,
        severity: "error",
      });
    }
    at = bad + 1;
  }
  return { text, diagnostics };
}

/** Offset of the first byte that breaks UTF-8, or `bytes.length` when all are valid. */
function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i];
    let need = 0;
    let min = 0;
    if (b < 0x80) {
      i++;
      continue;
    } else if (b >= 0xc2 && b <= 0xdf) {
      need = 1;
      min = 0x80;
    } else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      min = 0x800;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      min = 0x10000;
    } else return i;
    let cp = b & (0x3f >> need);
    for (let k = 1; k <= need; k++) {
      const c = bytes[i + k];
      if (c === undefined || (c & 0xc0) !== 0x80) return i;
      cp = (cp << 6) | (c & 0x3f);
    }
    if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) return i;
    i += need + 1;
  }
  return bytes.length;
}
