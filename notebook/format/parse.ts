/**
 * The Lentil notebook format (`*.lentil.md`): Markdown prose with a small front-matter
 * header and three kinds of fenced block of our own.
 *
 * ````text
 * ---
 * title: Dispense check
 * case: DEMO-017
 * ---
 * Prose in Markdown.
 *
 * ```lentil
 * vd = 13 mm                       # vertex distance measured at the fitting
 * cl = vertexPower(-6.50 D, vd)    # power at the cornea
 * trials.blur = lens - 0.25 D      # a computed column of table trials
 * ```
 *
 * ```lentil table trials
 * lens [D] | va [logMAR]
 * +1.00    | 0.30
 * ```
 *
 * ```lentil plot
 * kind: line
 * table: trials
 * ```
 * ````
 *
 * The parser never rewrites text: every block keeps its byte span, so an editor can splice
 * a change into the original and leave the rest byte-for-byte as it was.
 *
 * @example
 * ```ts
 * import { parseNotebook } from "./parse.ts";
 * const nb = parseNotebook("~~~lentil\nx = 2 D\n~~~\n", "a.lentil.md");
 * nb.cells[0].name; // "x"
 * ```
 *
 * @module
 */

import { z } from "zod";
import type { Diagnostic } from "./diagnostic.ts";

/** Front-matter fields. */
export interface FrontMatter {
  /** Title of the case or study. */
  readonly title?: string;
  /** Who wrote it. */
  readonly author?: string;
  /** ISO date, YYYY-MM-DD. */
  readonly date?: string;
  /** A case identifier that holds no personal data. */
  readonly case?: string;
  /** Display step for powers in D (default 0.25). */
  readonly powerStep?: number;
}

/** A span of the source text: `[start, end)` character offsets, and the first line. */
export interface Span {
  /** Offset of the first character. */
  readonly start: number;
  /** Offset after the last character. */
  readonly end: number;
  /** 1-based line of `start`. */
  readonly line: number;
}

/** One `name = expression` line of a calc block. */
export interface CellDef {
  /** The name (for a computed column: the column name). */
  readonly name: string;
  /** For a computed column `table.column = …`: the table. */
  readonly table?: string;
  /** Expression text as written, without the note. */
  readonly expression: string;
  /** The note after `#`, trimmed, if any. */
  readonly note?: string;
  /** 1-based line. */
  readonly line: number;
  /** 1-based column of the name. */
  readonly col: number;
  /** 1-based column where the expression starts. */
  readonly exprCol: number;
  /** Span of the whole line (without its newline). */
  readonly span: Span;
  /** Span of the expression text within the file. */
  readonly exprSpan: Span;
  /** True when the expression is a literal (a number, a quantity, text): an input. */
  readonly input: boolean;
}

/** A declared table column: `name [unit]` or `name [type]`. */
export interface ColumnDef {
  /** Column name. */
  readonly name: string;
  /** Bracketed unit or type as written ("" when none). */
  readonly spec: string;
  /** 1-based column of the header cell. */
  readonly col: number;
}

/** One data row of an inline table. */
export interface RowDef {
  /** Cell texts, trimmed, `\|` unescaped. */
  readonly cells: readonly string[];
  /** 1-based line. */
  readonly line: number;
  /** 1-based column of each cell's first character. */
  readonly cols: readonly number[];
  /** Span of the row's line. */
  readonly span: Span;
}

/** A named option line (`key: value`) inside a table or plot block. */
export interface OptionDef {
  /** Value text, trimmed. */
  readonly value: string;
  /** 1-based line. */
  readonly line: number;
  /** 1-based column of the value. */
  readonly col: number;
}

/** Prose: Markdown text between blocks (including fences of other languages). */
export interface ProseBlock {
  /** Kind tag. */
  readonly kind: "prose";
  /** The text. */
  readonly text: string;
  /** Where it is. */
  readonly span: Span;
}

/** A calc block. */
export interface CalcBlock {
  /** Kind tag. */
  readonly kind: "calc";
  /** Cells in order. */
  readonly cells: readonly CellDef[];
  /** The whole block, fences included. */
  readonly span: Span;
}

/** A table block: inline rows, or rows from a CSV file beside the notebook. */
export interface TableBlock {
  /** Kind tag. */
  readonly kind: "table";
  /** Table name. */
  readonly name: string;
  /** 1-based line and column of the name on the fence line. */
  readonly line: number;
  /** 1-based column of the name. */
  readonly col: number;
  /** Options (`file`, `bad rows`, …) by key. */
  readonly options: Readonly<Record<string, OptionDef>>;
  /** Declared columns (may be empty for a CSV table that declares none). */
  readonly columns: readonly ColumnDef[];
  /** Line of the header (0 when there is none). */
  readonly headerLine: number;
  /** Inline rows. */
  readonly rows: readonly RowDef[];
  /** The whole block, fences included. */
  readonly span: Span;
}

/** A plot block: options only; the export module gives them meaning. */
export interface PlotBlock {
  /** Kind tag. */
  readonly kind: "plot";
  /** Optional name on the fence line. */
  readonly name?: string;
  /** Options by key. */
  readonly options: Readonly<Record<string, OptionDef>>;
  /** Line of the opening fence. */
  readonly line: number;
  /** The whole block, fences included. */
  readonly span: Span;
}

/** Any block. */
export type Block = ProseBlock | CalcBlock | TableBlock | PlotBlock;

/** A parsed notebook. */
export interface NotebookDoc {
  /** File name as given. */
  readonly file: string;
  /** The exact source text. */
  readonly text: string;
  /** Front matter (validated fields only). */
  readonly front: FrontMatter;
  /** Span of the front matter, if present. */
  readonly frontSpan?: Span;
  /** Blocks in order. */
  readonly blocks: readonly Block[];
  /** All calc cells in order, across blocks. */
  readonly cells: readonly CellDef[];
  /** All table blocks in order. */
  readonly tables: readonly TableBlock[];
  /** Problems found while parsing. */
  readonly diagnostics: readonly Diagnostic[];
}

/** Fence info words that open Lentil blocks. */
export const BLOCK_KINDS = ["calc", "table", "plot"] as const;

/** Display steps for powers a notebook may ask for (D). */
const POWER_STEPS = [0.01, 0.05, 0.1, 0.12, 0.125, 0.25, 0.5, 1];

const FRONT_KEYS = ["title", "author", "date", "case", "power-step"] as const;

const FrontSchema = z.object({
  title: z.string().min(1).max(300).optional(),
  author: z.string().min(1).max(300).optional(),
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "expected a date as YYYY-MM-DD").refine(
    (d) => {
      const t = new Date(`${d}T00:00:00Z`);
      return !Number.isNaN(t.getTime()) && t.toISOString().slice(0, 10) === d;
    },
    "expected a real calendar date as YYYY-MM-DD",
  ).optional(),
  case: z.string().regex(
    /^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/,
    "expected a short case id of letters, digits, '.', '_' or '-' (no personal data)",
  ).optional(),
  powerStep: z.number().refine(
    (n) => POWER_STEPS.includes(n),
    `expected one of the steps ${POWER_STEPS.join(", ")} (D)`,
  ).optional(),
});

/** Names: a letter or underscore, then letters, digits, underscores. */
export const NAME_PATTERN = /^[A-Za-z_][A-Za-z0-9_]*$/;

const CELL_LINE = /^(\s*)([A-Za-z_][A-Za-z0-9_]*)(?:\.([A-Za-z_][A-Za-z0-9_]*))?\s*=(?!=)/;

const TABLE_OPTION_KEYS = ["file", "bad rows"] as const;

/** Known table option keys. */
export type TableOptionKey = typeof TABLE_OPTION_KEYS[number];

interface Line {
  readonly text: string;
  readonly start: number;
  readonly end: number;
  readonly no: number;
}

function splitLines(text: string): Line[] {
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
 * Find where a `#` note starts in a calc line, outside string literals; -1 when none.
 *
 * @example
 * ```ts
 * import { noteStart } from "./parse.ts";
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
 * import { isLiteral } from "./parse.ts";
 * isLiteral("-2.25 D"); // true
 * isLiteral('rx("+1.00 DS")'); // true
 * isLiteral("a + 1"); // false
 * ```
 */
export function isLiteral(expr: string): boolean {
  const e = expr.trim();
  const num = String.raw`[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?(?:\s*[A-Za-z]+(?:\^-?\d+)?)?`;
  const str = String.raw`"(?:[^"\\]|\\.)*"|'(?:[^'\\]|\\.)*'`;
  const one = `(?:${num}|${str}|true|false)`;
  const fromText = `[A-Za-z_][A-Za-z0-9_]*\\(\\s*(?:${str})\\s*\\)`;
  return new RegExp(`^(?:${one}|${fromText}|\\[\\s*${one}(?:\\s*,\\s*${one})*\\s*\\])$`).test(e);
}

function splitRow(text: string): { cells: string[]; cols: number[] } {
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
 * The value of a `key: value` option line: trimmed, without a trailing note — a `#` after
 * white space, as in `kind: curve   # the line kind` (a `#` inside a word, as in
 * `title: Case #3`, stays).
 *
 * @example
 * ```ts
 * import { optionValue } from "./parse.ts";
 * optionValue("curve   # the line kind"); // "curve"
 * optionValue("Case #3"); // "Case #3"
 * ```
 */
export function optionValue(text: string): string {
  const m = /(^|\s)#(\s|$)/.exec(text);
  return (m ? text.slice(0, m.index) : text).trim();
}

/**
 * Parse notebook text. Never throws for user errors: problems come back as diagnostics,
 * and everything the user wrote is kept in a block.
 *
 * @example
 * ```ts
 * import { parseNotebook } from "./parse.ts";
 * const nb = parseNotebook("~~~lentil\nx = 1\nx = 2\n~~~\n", "dup.lentil.md");
 * nb.diagnostics[0].message; // 'duplicate name "x" (first defined at line 2)'
 * ```
 */
export function parseNotebook(text: string, file: string): NotebookDoc {
  const diagnostics: Diagnostic[] = [];
  const diag = (
    line: number,
    col: number,
    message: string,
    severity: "error" | "warning" = "error",
  ) => diagnostics.push({ file, line, col, message, severity });
  const lines = splitLines(text);
  const blocks: Block[] = [];
  const cells: CellDef[] = [];
  const tables: TableBlock[] = [];
  let front: FrontMatter = {};
  let frontSpan: Span | undefined;
  let i = 0;

  // Front matter.
  if (lines.length && lines[0].text === "---") {
    let j = 1;
    while (j < lines.length && lines[j].text !== "---") j++;
    if (j >= lines.length) {
      diag(1, 1, "front matter opened with --- is never closed (add a line --- after it)");
    } else {
      const raw: Record<string, unknown> = {};
      const where: Record<string, [number, number]> = {};
      for (let k = 1; k < j; k++) {
        const l = lines[k];
        if (l.text.trim() === "" || l.text.trimStart().startsWith("#")) continue;
        const m = /^([A-Za-z-]+):\s*(.*)$/.exec(l.text);
        if (!m) {
          diag(l.no, 1, "expected a front-matter line `key: value`");
          continue;
        }
        const key = m[1].toLowerCase();
        const col = l.text.indexOf(m[2]) + 1 || m[1].length + 2;
        if (!(FRONT_KEYS as readonly string[]).includes(key)) {
          diag(
            l.no,
            1,
            `unknown front-matter key "${m[1]}" (known: ${FRONT_KEYS.join(", ")})`,
            "warning",
          );
          continue;
        }
        const prop = key === "power-step" ? "powerStep" : key;
        raw[prop] = prop === "powerStep" ? Number(m[2].replace(/\s*D$/, "")) : m[2].trim();
        where[prop] = [l.no, col];
      }
      const parsed = FrontSchema.safeParse(raw);
      if (parsed.success) front = parsed.data;
      else {
        const good: Record<string, unknown> = { ...raw };
        for (const issue of parsed.error.issues) {
          const prop = String(issue.path[0]);
          const [ln, col] = where[prop] ?? [1, 1];
          diag(
            ln,
            col,
            `front matter ${prop === "powerStep" ? "power-step" : prop}: ${issue.message}`,
          );
          delete good[prop];
        }
        front = FrontSchema.parse(good);
      }
      frontSpan = { start: 0, end: lines[j].end, line: 1 };
      i = j + 1;
    }
  }

  let proseStart = i < lines.length ? lines[i].start : text.length;
  let proseLine = i < lines.length ? lines[i].no : lines.length + 1;
  const flushProse = (uptoOffset: number) => {
    if (uptoOffset > proseStart) {
      blocks.push({
        kind: "prose",
        text: text.slice(proseStart, uptoOffset),
        span: { start: proseStart, end: uptoOffset, line: proseLine },
      });
    }
  };

  const seen = new Map<string, number>();
  const claim = (name: string, line: number, col: number): void => {
    const first = seen.get(name);
    if (first !== undefined) {
      diag(line, col, `duplicate name "${name}" (first defined at line ${first})`);
    } else seen.set(name, line);
  };

  while (i < lines.length) {
    const l = lines[i];
    const fence = /^(`{3,}|~{3,})\s*([A-Za-z]+)?(.*)$/.exec(l.text);
    if (!fence) {
      i++;
      continue;
    }
    const marker = fence[1];
    // Lentil's blocks open with the word `lentil`, then `table NAME` or `plot NAME` for those
    // kinds; every other fence is another language's and reads as prose.
    const own = (fence[2] ?? "").toLowerCase() === "lentil";
    const sub = own ? /^\s+(table|plot)\b(.*)$/i.exec(fence[3] ?? "") : null;
    const kind = !own ? "" : sub ? sub[1].toLowerCase() : "calc";
    if (sub) fence[3] = sub[2];
    // Find the closing fence.
    let j = i + 1;
    const closeRe = new RegExp(`^${marker[0] === "`" ? "`" : "~"}{${marker.length},}\\s*$`);
    while (j < lines.length && !closeRe.test(lines[j].text)) j++;
    const closed = j < lines.length;
    if (!(BLOCK_KINDS as readonly string[]).includes(kind)) {
      // Another language's fence: prose, skipped as a whole.
      i = closed ? j + 1 : lines.length;
      continue;
    }
    if (!closed) {
      diag(
        l.no,
        1,
        `${
          kind === "calc" ? "lentil" : `lentil ${kind}`
        } block opened here is never closed (add a line ${marker})`,
      );
    }
    flushProse(l.start);
    const endLine = closed ? lines[j] : lines[lines.length - 1];
    const span: Span = { start: l.start, end: endLine.end, line: l.no };
    const body = lines.slice(i + 1, closed ? j : lines.length);
    const rest = (fence[3] ?? "").trim();
    const restCol = l.text.length - (fence[3] ?? "").trimStart().length + 1;

    if (kind === "calc") {
      if (rest) {
        diag(
          l.no,
          restCol,
          `unexpected text after lentil: "${rest}" (a table block opens with \`lentil table NAME\`, a plot with \`lentil plot NAME\`)`,
        );
      }
      const blockCells: CellDef[] = [];
      for (const bl of body) {
        const t = bl.text;
        if (t.trim() === "" || t.trimStart().startsWith("#")) continue;
        const m = CELL_LINE.exec(t);
        if (!m) {
          diag(
            bl.no,
            t.length - t.trimStart().length + 1,
            "expected `name = expression` (a note may follow after #)",
          );
          continue;
        }
        const nameCol = m[1].length + 1;
        const afterEq = m[0].length;
        const hash = noteStart(t.slice(afterEq));
        const exprRaw = hash === -1 ? t.slice(afterEq) : t.slice(afterEq, afterEq + hash);
        const lead = exprRaw.length - exprRaw.trimStart().length;
        const expression = exprRaw.trim();
        const note = hash === -1 ? undefined : t.slice(afterEq + hash + 1).trim() || undefined;
        const table = m[3] ? m[2] : undefined;
        const name = m[3] ?? m[2];
        const exprStart = bl.start + afterEq + lead;
        const cell: CellDef = {
          name,
          table,
          expression,
          note,
          line: bl.no,
          col: nameCol,
          exprCol: afterEq + lead + 1,
          span: { start: bl.start, end: bl.start + t.length, line: bl.no },
          exprSpan: { start: exprStart, end: exprStart + expression.length, line: bl.no },
          input: !table && isLiteral(expression),
        };
        if (!expression) {
          diag(bl.no, afterEq + 1, `cell "${name}" has no expression after =`);
        }
        claim(table ? `${table}.${name}` : name, bl.no, nameCol);
        blockCells.push(cell);
        cells.push(cell);
      }
      blocks.push({ kind: "calc", cells: blockCells, span });
    } else if (kind === "table") {
      const nm = /^([A-Za-z_][A-Za-z0-9_]*)\s*$/.exec(rest);
      const name = nm ? nm[1] : "";
      if (!nm) {
        diag(
          l.no,
          restCol,
          rest
            ? `table name "${rest}" must be a single word of letters, digits or _`
            : "a table block needs a name: ```lentil table NAME",
        );
      } else claim(name, l.no, restCol);
      const options: Record<string, OptionDef> = {};
      const columns: ColumnDef[] = [];
      const rows: RowDef[] = [];
      let headerLine = 0;
      for (const bl of body) {
        const t = bl.text;
        if (t.trim() === "" || t.trimStart().startsWith("#")) continue;
        if (!headerLine) {
          const om = /^\s*([a-z][a-z ]*[a-z]):\s*(.*)$/i.exec(t);
          if (om && !t.includes("|") && !/\[/.test(om[1])) {
            const key = om[1].toLowerCase();
            if (!(TABLE_OPTION_KEYS as readonly string[]).includes(key)) {
              diag(
                bl.no,
                1,
                `unknown table option "${om[1]}" (known: ${TABLE_OPTION_KEYS.join(", ")})`,
              );
            }
            options[key] = {
              value: optionValue(om[2]),
              line: bl.no,
              col: t.indexOf(om[2]) + 1,
            };
            continue;
          }
          headerLine = bl.no;
          const { cells: hs, cols } = splitRow(t);
          const names = new Set<string>();
          hs.forEach((h, k) => {
            const hm = /^([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[([^\]]*)\])?$/.exec(h);
            if (!hm) {
              diag(bl.no, cols[k], `column header "${h}" should be \`name\` or \`name [unit]\``);
              columns.push({ name: h || `column${k + 1}`, spec: "", col: cols[k] });
              return;
            }
            if (names.has(hm[1])) diag(bl.no, cols[k], `duplicate column "${hm[1]}"`);
            names.add(hm[1]);
            columns.push({ name: hm[1], spec: (hm[2] ?? "").trim(), col: cols[k] });
          });
          continue;
        }
        const { cells: cs, cols } = splitRow(t);
        if (cs.length !== columns.length) {
          diag(
            bl.no,
            1,
            `row has ${cs.length} field${
              cs.length === 1 ? "" : "s"
            }, the header has ${columns.length}`,
          );
        }
        rows.push({
          cells: cs,
          cols,
          line: bl.no,
          span: { start: bl.start, end: bl.start + t.length, line: bl.no },
        });
      }
      if (!options.file && !headerLine && name) {
        diag(l.no, 1, `table ${name} has neither a header line nor a \`file:\` option`);
      }
      if (options.file && rows.length) {
        diag(
          rows[0].line,
          1,
          `table ${name} reads its rows from ${options.file.value}; inline rows are not allowed as well`,
        );
      }
      const tb: TableBlock = {
        kind: "table",
        name,
        line: l.no,
        col: restCol,
        options,
        columns,
        headerLine,
        rows,
        span,
      };
      blocks.push(tb);
      if (name) tables.push(tb);
    } else {
      const name = rest || undefined;
      if (name && !NAME_PATTERN.test(name)) {
        diag(l.no, restCol, `plot name "${name}" must be a single word`);
      }
      const options: Record<string, OptionDef> = {};
      for (const bl of body) {
        const t = bl.text;
        if (t.trim() === "" || t.trimStart().startsWith("#")) continue;
        const om = /^\s*([a-z][a-z -]*[a-z]):\s*(.*)$/i.exec(t);
        if (!om) {
          diag(bl.no, 1, "expected a plot option `key: value`");
          continue;
        }
        const key = om[1].toLowerCase();
        if (options[key]) diag(bl.no, 1, `plot option "${key}" is given twice`);
        options[key] = {
          value: optionValue(om[2]),
          line: bl.no,
          col: t.indexOf(om[2]) + 1 || om[0].length + 1,
        };
      }
      blocks.push({ kind: "plot", name, options, line: l.no, span });
    }
    i = closed ? j + 1 : lines.length;
    proseStart = i < lines.length ? lines[i].start : text.length;
    proseLine = i < lines.length ? lines[i].no : lines.length + 1;
  }
  flushProse(text.length);
  return { file, text, front, frontSpan, blocks, cells, tables, diagnostics };
}
