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

import type { Diagnostic } from "./diagnostic.ts";
import { readFrontMatter } from "./_front.ts";
import type { Fenced } from "./_fence.ts";
import { readFormulaBlock } from "./_formula_block.ts";
import { readPlotBlock } from "./_plot_block.ts";
import { readTableBlock, type TABLE_OPTION_KEYS } from "./_table_block.ts";
import { type Line, type ReadContext, splitLines } from "./_text.ts";

export { isLiteral, NAME_PATTERN, noteStart, optionValue } from "./_text.ts";

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

/** One `name = expression` line of a formula block. */
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

/** A formula block (```` ```lentil ````); its kind tag is `calc`. */
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

/** Fence info words that open Lentil blocks, as kind tags (`calc` is a formula block). */
export const BLOCK_KINDS = ["calc", "table", "plot"] as const;

/** Known table option keys. */
export type TableOptionKey = typeof TABLE_OPTION_KEYS[number];

/** A Lentil block's opening fence: its marker and kind, and the text after the kind. */
interface Opening {
  readonly marker: string;
  readonly kind: typeof BLOCK_KINDS[number];
  readonly after: string;
}

/**
 * The opening of a Lentil block on this line, or undefined for any other line (another
 * language's fence included). Lentil's blocks open with the word `lentil`, then `table NAME`
 * or `plot NAME` for those kinds.
 */
function opening(text: string): Opening | { readonly marker: string } | undefined {
  const fence = /^(`{3,}|~{3,})\s*([A-Za-z]+)?(.*)$/.exec(text);
  if (!fence) return undefined;
  if ((fence[2] ?? "").toLowerCase() !== "lentil") return { marker: fence[1] };
  const sub = /^\s+(table|plot)\b(.*)$/i.exec(fence[3] ?? "");
  const kind = sub ? sub[1].toLowerCase() as "table" | "plot" : "calc";
  return { marker: fence[1], kind, after: sub ? sub[2] : fence[3] ?? "" };
}

/** Index of the line that closes a fence opened with `marker` at `from - 1`; -1 if none. */
function closingLine(lines: readonly Line[], from: number, marker: string): number {
  const closeRe = new RegExp(`^${marker[0] === "`" ? "`" : "~"}{${marker.length},}\\s*$`);
  for (let j = from; j < lines.length; j++) if (closeRe.test(lines[j].text)) return j;
  return -1;
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
  const seen = new Map<string, number>();
  const ctx: ReadContext = {
    file,
    diag: (line, col, message, severity = "error") =>
      diagnostics.push({ file, line, col, message, severity }),
    claim: (name, line, col) => {
      const first = seen.get(name);
      if (first !== undefined) {
        ctx.diag(line, col, `duplicate name "${name}" (first defined at line ${first})`);
      } else seen.set(name, line);
    },
  };
  const lines = splitLines(text);
  const blocks: Block[] = [];
  const { front, span: frontSpan, next } = readFrontMatter(lines, ctx);
  let i = next;
  let proseStart = i < lines.length ? lines[i].start : text.length;
  let proseLine = i < lines.length ? lines[i].no : lines.length + 1;
  const flushProse = (uptoOffset: number) => {
    if (uptoOffset <= proseStart) return;
    const span = { start: proseStart, end: uptoOffset, line: proseLine };
    blocks.push({ kind: "prose", text: text.slice(proseStart, uptoOffset), span });
  };

  while (i < lines.length) {
    const l = lines[i];
    const open = opening(l.text);
    if (!open) {
      i++;
      continue;
    }
    const at = i;
    const j = closingLine(lines, at + 1, open.marker);
    const end = j === -1 ? lines.length : j;
    i = j === -1 ? lines.length : j + 1;
    // Another language's fence: prose, skipped as a whole.
    if (!("kind" in open)) continue;
    if (j === -1) {
      const what = open.kind === "calc" ? "lentil" : `lentil ${open.kind}`;
      ctx.diag(l.no, 1, `${what} block opened here is never closed (add a line ${open.marker})`);
    }
    flushProse(l.start);
    blocks.push(readBlock(open, lines, at, end, ctx));
    proseStart = i < lines.length ? lines[i].start : text.length;
    proseLine = i < lines.length ? lines[i].no : lines.length + 1;
  }
  flushProse(text.length);
  const cells = blocks.flatMap((b) => b.kind === "calc" ? b.cells : []);
  const tables = blocks.filter((b): b is TableBlock => b.kind === "table" && b.name !== "");
  return { file, text, front, frontSpan, blocks, cells, tables, diagnostics };
}

/** Hand an opened block (fence at `i`, closing fence or end at `end`) to its kind's reader. */
function readBlock(
  open: Opening,
  lines: readonly Line[],
  i: number,
  end: number,
  ctx: ReadContext,
): Block {
  const l = lines[i];
  const endLine = end < lines.length ? lines[end] : lines[lines.length - 1];
  const fenced: Fenced = {
    fence: l,
    body: lines.slice(i + 1, end),
    span: { start: l.start, end: endLine.end, line: l.no },
    rest: open.after.trim(),
    restCol: l.text.length - open.after.trimStart().length + 1,
  };
  if (open.kind === "calc") return readFormulaBlock(fenced, ctx);
  if (open.kind === "table") return readTableBlock(fenced, ctx);
  return readPlotBlock(fenced, ctx);
}
