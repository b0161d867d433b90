/**
 * Measures every function in a folder of TypeScript and JavaScript modules and lists the ones
 * longer than a limit, so a long function is noticed before the next person gets lost in it.
 *
 * A light scanner rather than a parser: comments, strings, template literals and regular
 * expressions are blanked first, then every `{` that opens a function body (a `function`, a
 * method, an arrow with a block body) is matched to its `}`. A function's length runs from the
 * line of its parameter list to the line of its closing brace, nested functions included.
 *
 * Run as a script: `deno run --allow-read tests/_function_length.ts notebook 120`;
 * `tests/function_length_test.ts` runs it over `notebook/` in the gate.
 *
 * @module
 */

/** One function longer than the limit. */
export interface LongFunction {
  /** The module's path. */
  file: string;
  /** 1-based line of the function's parameter list. */
  line: number;
  /** The name before the parameter list, or `(arrow)`. */
  name: string;
  /** Lines from the parameter list to the closing brace. */
  lines: number;
}

const CONTROL = new Set(["if", "for", "while", "switch", "catch", "with", "return"]);
const REGEX_BEFORE = /(^|[(,=:[!&|?{};+\-*%<>~^]|\breturn|\btypeof|\bcase|\bof|\bin)\s*$/;

/** Blanks comments, strings, template literal text and regex literals, keeping newlines. */
export function blank(source: string): string {
  const out: string[] = [];
  const n = source.length;
  let i = 0;
  // A stack of brace depths at which a template literal's `${` was opened.
  const templates: number[] = [];
  let depth = 0;
  const keep = (ch: string) => out.push(ch);
  const hide = (ch: string) => out.push(ch === "\n" ? "\n" : " ");
  const readTemplate = () => {
    // At the character after a backtick or after the `}` closing a substitution.
    while (i < n) {
      const ch = source[i];
      if (ch === "\\") {
        hide(ch);
        hide(source[i + 1] ?? "");
        i += 2;
      } else if (ch === "`") {
        keep("`");
        i++;
        return;
      } else if (ch === "$" && source[i + 1] === "{") {
        keep("$");
        keep("{");
        i += 2;
        templates.push(depth);
        depth++;
        return;
      } else {
        hide(ch);
        i++;
      }
    }
  };
  while (i < n) {
    const ch = source[i];
    const next = source[i + 1];
    if (ch === "/" && next === "/") {
      while (i < n && source[i] !== "\n") hide(source[i++]);
    } else if (ch === "/" && next === "*") {
      hide(source[i++]);
      hide(source[i++]);
      while (i < n && !(source[i] === "*" && source[i + 1] === "/")) hide(source[i++]);
      hide(source[i++] ?? "");
      hide(source[i++] ?? "");
    } else if (ch === '"' || ch === "'") {
      keep(ch);
      i++;
      while (i < n && source[i] !== ch && source[i] !== "\n") {
        if (source[i] === "\\") hide(source[i++]);
        hide(source[i++] ?? "");
      }
      keep(source[i] ?? "");
      i++;
    } else if (ch === "`") {
      keep(ch);
      i++;
      readTemplate();
    } else if (ch === "/" && REGEX_BEFORE.test(out.slice(-40).join(""))) {
      keep("/");
      i++;
      let inClass = false;
      while (i < n && source[i] !== "\n") {
        const c = source[i];
        if (c === "\\") {
          hide(source[i++]);
          hide(source[i++] ?? "");
          continue;
        }
        if (c === "[") inClass = true;
        else if (c === "]") inClass = false;
        else if (c === "/" && !inClass) break;
        hide(c);
        i++;
      }
      keep(source[i] ?? "");
      i++;
    } else if (ch === "{") {
      depth++;
      keep(ch);
      i++;
    } else if (ch === "}") {
      depth--;
      keep(ch);
      i++;
      if (templates.length > 0 && templates[templates.length - 1] === depth) {
        templates.pop();
        readTemplate();
      }
    } else {
      keep(ch);
      i++;
    }
  }
  return out.join("");
}

/** The index of the bracket that opens the one closing at `close`, or -1. */
function opening(text: string, close: number, open: string, shut: string): number {
  let level = 0;
  for (let k = close; k >= 0; k--) {
    if (text[k] === shut) level++;
    else if (text[k] === open && --level === 0) return k;
  }
  return -1;
}

/** The index of the brace that closes the one opening at `open`, or -1. */
function closing(text: string, open: number): number {
  let level = 0;
  for (let k = open; k < text.length; k++) {
    if (text[k] === "{") level++;
    else if (text[k] === "}" && --level === 0) return k;
  }
  return -1;
}

/** Where the function whose body opens at `brace` starts, and its name, or undefined. */
function functionHead(text: string, brace: number): { start: number; name: string } | undefined {
  const before = text.slice(Math.max(0, brace - 400), brace);
  const offset = brace - before.length;
  if (/=>\s*$/.test(before)) {
    const arrow = offset + before.search(/=>\s*$/);
    let k = arrow - 1;
    while (k >= 0 && /\s/.test(text[k])) k--;
    // Skip a return type annotation on the arrow: `(x): T => {`.
    const paren = text.lastIndexOf(")", k);
    const start = paren >= 0 && /^\)\s*(:[^=;{}]*)?$/.test(text.slice(paren, k + 1))
      ? opening(text, paren, "(", ")")
      : k;
    const head = text.slice(Math.max(0, start - 80), start);
    const named = head.match(/(\w+)\s*(:[^=]*)?=\s*(async\s*)?$/);
    return { start: Math.max(0, start), name: named ? named[1] : "(arrow)" };
  }
  // `) {` or `): Type {`, but not `): {` (an object type literal as return type).
  const tail = before.match(/\)\s*(:\s*[^{};=]*[^{};=\s])?\s*$/);
  if (!tail || tail.index === undefined) return undefined;
  const paren = offset + tail.index;
  const open = opening(text, paren, "(", ")");
  if (open < 0) return undefined;
  const word = text.slice(Math.max(0, open - 80), open).match(/(\w+)\s*(<[^()]*>)?\s*$/);
  const name = word ? word[1] : "";
  if (CONTROL.has(name)) return undefined;
  if (!word && !/function\s*\*?\s*$/.test(text.slice(Math.max(0, open - 20), open))) {
    return undefined;
  }
  return { start: open, name: name || "(function)" };
}

/** Every function in one module's text longer than `limit` lines. */
export function longFunctionsIn(file: string, source: string, limit: number): LongFunction[] {
  const text = blank(source);
  const lineAt = (index: number) => text.slice(0, index).split("\n").length;
  const found: LongFunction[] = [];
  for (let k = 0; k < text.length; k++) {
    if (text[k] !== "{") continue;
    const head = functionHead(text, k);
    if (!head) continue;
    const end = closing(text, k);
    if (end < 0) continue;
    const lines = lineAt(end) - lineAt(head.start) + 1;
    if (lines > limit) found.push({ file, line: lineAt(head.start), name: head.name, lines });
  }
  return found;
}

/** Every function under `dir` (recursively, `.ts` and `.js` files) longer than `limit` lines. */
export async function longFunctions(dir: string, limit: number): Promise<LongFunction[]> {
  const found: LongFunction[] = [];
  for await (const entry of Deno.readDir(dir)) {
    const path = `${dir}/${entry.name}`;
    if (entry.isDirectory) found.push(...await longFunctions(path, limit));
    else if (entry.isFile && /\.(ts|js)$/.test(entry.name)) {
      found.push(...longFunctionsIn(path, await Deno.readTextFile(path), limit));
    }
  }
  return found.sort((a, b) => a.file.localeCompare(b.file) || a.line - b.line);
}

if (import.meta.main) {
  const [dir = "notebook", limit = "120"] = Deno.args;
  const found = await longFunctions(dir, Number(limit));
  for (const f of found) console.log(`${f.file}:${f.line} ${f.name} ${f.lines} lines`);
  console.log(`${found.length} function(s) over ${limit} lines`);
}
