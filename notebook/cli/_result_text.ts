/**
 * Private: a result as terminal text, from the report's headline, parts, check lines and
 * table rows (the same declaration every surface renders). The headline goes on the cell's
 * line; parts are indented and aligned below it; a check is a table of its lines, or one
 * block a line when the table is wider than the terminal; a table result shows its first
 * rows, its columns split over blocks when they do not fit. No line is wider than `width`.
 *
 * @example
 * ```ts
 * import { resultBelow } from "./_result_text.ts";
 * resultBelow({
 *   headline: "pass",
 *   parts: [{ key: "n", label: "eyes", display: "12", value: 12, unit: "" }],
 * }, 60, 4);
 * // ["    eyes  12"]
 * ```
 *
 * @module
 */

import type { CheckLine } from "../../cells/types.ts";
import { columnHeading, type PartView, type TableShown } from "../../cells/present.ts";

/** The parts of a report cell the terminal renders. */
export interface TextResult {
  /** The line read first. */
  readonly headline: string;
  /** Labelled parts. */
  readonly parts?: readonly PartView[];
  /** Check lines. */
  readonly checks?: readonly CheckLine[];
  /** A table's first rows. */
  readonly table?: TableShown;
}

/** Width used when the output is not a terminal. */
export const DEFAULT_WIDTH = 100;

/**
 * The width to render for: the terminal's columns when standard output is one, else 100.
 *
 * @example
 * ```ts
 * import { terminalWidth } from "./_result_text.ts";
 * terminalWidth() >= 40; // true
 * ```
 */
export function terminalWidth(): number {
  try {
    if (Deno.stdout.isTerminal()) return Math.max(40, Deno.consoleSize().columns);
  } catch {
    // Not a terminal, or the size cannot be read: the default.
  }
  return DEFAULT_WIDTH;
}

/**
 * Text wrapped at spaces to `width` columns (a word longer than the width is cut).
 *
 * @example
 * ```ts
 * import { wrap } from "./_result_text.ts";
 * wrap("one two three", 8); // ["one two", "three"]
 * ```
 */
export function wrap(text: string, width: number): string[] {
  const w = Math.max(10, width);
  if ([...text].length <= w) return [text];
  const out: string[] = [];
  let line = "";
  for (const word of text.split(/\s+/).filter(Boolean)) {
    let rest = word;
    while ([...rest].length > w) {
      if (line) {
        out.push(line);
        line = "";
      }
      out.push([...rest].slice(0, w).join(""));
      rest = [...rest].slice(w).join("");
    }
    if (!line) line = rest;
    else if ([...line].length + 1 + [...rest].length <= w) line += " " + rest;
    else {
      out.push(line);
      line = rest;
    }
  }
  if (line || !out.length) out.push(line);
  return out;
}

const len = (s: string) => [...s].length;
const pad = (s: string, n: number) => s + " ".repeat(Math.max(0, n - len(s)));
const padStart = (s: string, n: number) => " ".repeat(Math.max(0, n - len(s))) + s;

/** Verdict in words, upper case when it fails so it cannot be missed. */
export function verdictWord(v: CheckLine["verdict"]): string {
  return v === "fail" ? "FAIL" : v;
}

/**
 * The lines under a result's headline: its parts aligned, its check, its table; each
 * line starts with `indent` spaces and is at most `width` columns.
 */
export function resultBelow(r: TextResult, width: number, indent: number): string[] {
  const lines: string[] = [];
  const lead = " ".repeat(indent);
  const room = Math.max(20, width - indent);
  if (r.parts?.length) {
    const labelWidth = Math.min(
      Math.max(...r.parts.map((p) => len(p.label))),
      Math.floor(room / 2),
    );
    for (const p of r.parts) {
      const valueRoom = room - labelWidth - 2;
      const label = len(p.label) > labelWidth ? wrap(p.label, labelWidth) : [p.label];
      const value = wrap(p.display, valueRoom);
      const n = Math.max(label.length, value.length);
      for (let i = 0; i < n; i++) {
        const l = pad(label[i] ?? "", labelWidth);
        lines.push(`${lead}${l}  ${value[i] ?? ""}`.trimEnd());
      }
    }
  }
  if (r.checks?.length) lines.push(...checkText(r.checks, room).map((l) => lead + l));
  if (r.table) lines.push(...tableText(r.table, room).map((l) => (lead + l).trimEnd()));
  return lines;
}

const CHECK_HEAD = ["quantity", "ordered", "measured", "deviation", "tolerance", "verdict"];

/** A check as an aligned table, or one block a line when the table does not fit. */
function checkText(checks: readonly CheckLine[], width: number): string[] {
  const rows = checks.map((c) => [
    c.quantity,
    c.ordered,
    c.measured,
    c.deviation,
    c.tolerance,
    verdictWord(c.verdict) + (c.remark ? `, ${c.remark}` : ""),
  ]);
  const widths = CHECK_HEAD.map((h, i) => Math.max(len(h), ...rows.map((r) => len(r[i]))));
  const total = widths.reduce((a, b) => a + b, 0) + 2 * (widths.length - 1);
  const out: string[] = [];
  if (total <= width) {
    const line = (cells: string[]) =>
      cells.map((c, i) => (i === 0 || i === 5 ? pad(c, widths[i]) : padStart(c, widths[i])))
        .join("  ").trimEnd();
    out.push(line(CHECK_HEAD), line(widths.map((w) => "-".repeat(w))));
    for (const r of rows) out.push(line(r));
  } else {
    checks.forEach((c, i) => {
      out.push(...wrap(`${c.quantity}: ${rows[i][5]}`, width));
      const facts = [
        c.ordered ? `ordered ${c.ordered}` : "",
        `measured ${c.measured}`,
        c.deviation ? `deviation ${c.deviation}` : "",
        `tolerance ${c.tolerance}`,
      ].filter(Boolean).join(", ");
      out.push(...wrap(facts, width - 2).map((l) => "  " + l));
      if (c.clause) out.push(...wrap(`rule: ${c.clause}`, width - 2).map((l) => "  " + l));
    });
    return out;
  }
  const clauses = [...new Set(checks.flatMap((c) => c.clause ? [c.clause] : []))];
  for (const c of clauses) out.push(...wrap(`rule: ${c}`, width));
  return out;
}

/**
 * An error cell as text, aligned with the other cells: the name padded as theirs, `!` where
 * `=` is, the message wrapped under itself, and the place on the next line under the message.
 *
 * @example
 * ```ts
 * import { errorText } from "./_result_text.ts";
 * errorText("cornea ", { message: "power: expected a power", file: "a.lentil.md", line: 4, col: 22 }, 60);
 * // ["cornea ! power: expected a power", "         at a.lentil.md:4:22"]
 * ```
 */
export function errorText(
  lead: string,
  error: {
    readonly message: string;
    readonly file: string;
    readonly line: number;
    readonly col: number;
  },
  width: number,
): string[] {
  const head = `${lead}! `;
  const indent = " ".repeat(head.length);
  const body = wrap(error.message, Math.max(20, width - head.length));
  return [
    ...body.map((l, i) => (i ? indent : head) + l),
    `${indent}at ${error.file}:${error.line}:${error.col}`,
  ];
}

/**
 * A table's shown rows as aligned text, columns split over blocks when they do not fit in
 * `width`, and the footer in words.
 *
 * @example
 * ```ts
 * import { tableText } from "./_result_text.ts";
 * tableText({
 *   name: "t", rowCount: 1, excluded: 0, footer: "1 row, 1 column",
 *   columns: [{ name: "x", unit: "mm", numeric: true, computed: false }], rows: [["2.00"]],
 * }, 40);
 * // ["x [mm]", "------", "  2.00", "1 row, 1 column"]
 * ```
 */
export function tableText(t: TableShown, width: number): string[] {
  const heads = t.columns.map(columnHeading);
  // A column is at most 28 wide (its longer texts cut with …; the page and JSON hold them whole).
  const cap = Math.min(width, 28);
  const widths = heads.map((h, i) =>
    Math.min(Math.max(len(h), ...t.rows.map((r) => len(r[i] ?? ""))), i === 0 ? width : cap)
  );
  const cut = (s: string, w: number) => (len(s) > w ? [...s].slice(0, w - 1).join("") + "…" : s);
  const groups: number[][] = [];
  let group: number[] = [];
  let used = 0;
  widths.forEach((w, i) => {
    const need = (group.length ? 2 : 0) + w;
    if (group.length && used + need > width) {
      groups.push(group);
      group = [];
      used = 0;
    }
    group.push(i);
    used += group.length > 1 ? need : w;
  });
  if (group.length) groups.push(group);
  const out: string[] = [];
  groups.forEach((g, gi) => {
    if (gi) out.push("");
    const cell = (s: string, i: number) => {
      const c = cut(s, widths[i]);
      return t.columns[i].numeric ? padStart(c, widths[i]) : pad(c, widths[i]);
    };
    out.push(g.map((i) => pad(cut(heads[i], widths[i]), widths[i])).join("  ").trimEnd());
    out.push(g.map((i) => "-".repeat(widths[i])).join("  "));
    for (const r of t.rows) out.push(g.map((i) => cell(r[i] ?? "", i)).join("  ").trimEnd());
  });
  if (t.footer) out.push(...wrap(t.footer, width));
  return out;
}
