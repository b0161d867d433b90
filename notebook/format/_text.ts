/**
 * Text helpers of the notebook reader: lines with their offsets, `|`-separated rows, notes
 * after `#`, option values, literal inputs, and the context every block reader reports to.
 *
 * @module
 */

import type { Diagnostic } from "./diagnostic.ts";

/** One line of the source, without its line ending. */
export interface Line {
  /** The text, without `\n` or `\r\n`. */
  readonly text: string;
  /** Offset of the first character. */
  readonly start: number;
  /** Offset of the line ending (or the end of the text). */
  readonly end: number;
  /** 1-based line number. */
  readonly no: number;
}

/** What a block reader reports to: problems, and names claimed so far. */
export interface ReadContext {
  /** The file name, for diagnostics. */
  readonly file: string;
  /** Report a problem at a 1-based line and column. */
  diag(line: number, col: number, message: string, severity?: Diagnostic["severity"]): void;
  /** Claim a name for a cell, column or table; a second claim is a problem. */
  claim(name: string, line: number, col: number): void;
}

/** Names: a letter or underscore, then letters, digits, underscores. */
export const NAME_PATTERN = /^[A-Za-z_][A-Za-z0-9_]*$/;

/** A `key: value` option line inside a table or plot block. */
export const OPTION_LINE = /^\s*([a-z][a-z -]*[a-z]):\s*(.*)$/i;

/**
 * The source's lines with their offsets; a final empty line after the last newline is
 * dropped.
 *
 * @example
 * ```ts
 * import { splitLines } from "./_text.ts";
 * splitLines("a\r\nb\n").map((l) => l.text); // ["a", "b"]
 * ```
 */
export function splitLines(text: string): Line[] {
  const out: Line[] = [];
  let start = 0;
  let no = 1;
  while (start <= text.length) {
    const nl = text.indexOf("\n", start);
    const end = nl === -1 ? text.length : nl;
    const raw = text.slice(start, end);
    out.push({ text: raw.endsWith("\r") ? raw.slice(0, -1) : raw, start, end, no });
    if (nl === -1) break;
    start = nl + 1;
    no++;
  }
  if (out.length && out[out.length - 1].text === "" && out[out.length - 1].start === text.length) {
    out.pop();
  }
  return out;
}

/**
 * Split a table row at `|` (`\|` is a bar inside a field): trimmed fields and the 1-based
 * column where each starts.
 *
 * @example
 * ```ts
 * import { splitRow } from "./_text.ts";
 * splitRow("a | b \\| c").cells; // ["a", "b | c"]
 * ```
 */
export function splitRow(text: string): { cells: string[]; cols: number[] } {
  const cells: string[] = [];
  const cols: number[] = [];
  let cur = "";
  let curStart = 0;
  for (let i = 0; i <= text.length; i++) {
    const c = text[i];
    if (c === "\\" && text[i + 1] === "|") {
      cur += "|";
      i++;
      continue;
    }
    if (c === "|" || i === text.length) {
      const lead = cur.length - cur.trimStart().length;
      cells.push(cur.trim());
      cols.push(curStart + lead + 1);
      cur = "";
      curStart = i + 1;
      continue;
    }
    cur += c;
  }
  return { cells, cols };
}

/**
 * Find where a `#` note starts in a formula line, outside string literals; -1 when none.
 *
 * @example
 * ```ts
 * import { noteStart } from "./_text.ts";
 * noteStart('x = rx("-1.00 # odd") # note'); // 21
 * ```
 */
export function noteStart(line: string): number {
  let quote = "";
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quote) {
      if (c === "\\") i++;
      else if (c === quote) quote = "";
    } else if (c === '"' || c === "'") quote = c;
    else if (c === "#") return i;
  }
  return -1;
}

/**
 * Whether an expression is a literal input: a signed number with an optional unit, text in
 * quotes, true/false, a list of such, or a value read from text by one call
 * (`rx("-2.25 / -0.75 x 170")`, `acuity("6/9")`).
 *
 * @example
 * ```ts
 * import { isLiteral } from "./_text.ts";
 * isLiteral("-2.25 D"); // true
 * isLiteral('rx("+1.00 DS")'); // true
 * isLiteral("a + 1"); // false
 * ```
 */
export function isLiteral(expr: string): boolean {
  const e = expr.trim();
  // A literal is short; a very long text is left to the formula reader, which refuses it.
  if (e.length > 100_000) return false;
  const num = String.raw`[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?(?:\s*[A-Za-z]+(?:\^-?\d+)?)?`;
  const str = String.raw`"(?:[^"\\]|\\.)*"|'(?:[^'\\]|\\.)*'`;
  const one = `(?:${num}|${str}|true|false)`;
  const fromText = `[A-Za-z_][A-Za-z0-9_]*\\(\\s*(?:${str})\\s*\\)`;
  return new RegExp(`^(?:${one}|${fromText}|\\[\\s*${one}(?:\\s*,\\s*${one})*\\s*\\])$`).test(e);
}

/**
 * The value of a `key: value` option line: trimmed, without a trailing note — a `#` after
 * white space, as in `figure: curve   # the line kind` (a `#` inside a word, as in
 * `heading: Case #3`, stays).
 *
 * @example
 * ```ts
 * import { optionValue } from "./_text.ts";
 * optionValue("curve   # the line kind"); // "curve"
 * optionValue("Case #3"); // "Case #3"
 * ```
 */
export function optionValue(text: string): string {
  const m = /(^|\s)#(\s|$)/.exec(text);
  return (m ? text.slice(0, m.index) : text).trim();
}

/**
 * Whether a line inside a block is blank or a whole-line `#` comment.
 *
 * @example
 * ```ts
 * import { isBlankOrComment } from "./_text.ts";
 * isBlankOrComment("  # a comment"); // true
 * ```
 */
export function isBlankOrComment(text: string): boolean {
  return text.trim() === "" || text.trimStart().startsWith("#");
}
