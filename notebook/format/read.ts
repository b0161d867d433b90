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
