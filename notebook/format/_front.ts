/**
 * The front matter of a notebook: `---` lines around `key: value` fields, validated with
 * zod; a bad field is reported at its line and dropped, the others kept.
 *
 * @module
 */

import { z } from "zod";
import type { FrontMatter, Span } from "./parse.ts";
import type { Line, ReadContext } from "./_text.ts";

/** Display steps for powers a notebook may ask for (D). */
const POWER_STEPS = [0.01, 0.05, 0.1, 0.12, 0.125, 0.25, 0.5, 1];

/** The front-matter keys a notebook may use. */
export const FRONT_KEYS = ["title", "author", "date", "case", "power-step"] as const;

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

/** The front matter read, its span, and the index of the first line after it. */
export interface FrontRead {
  /** Validated fields. */
  readonly front: FrontMatter;
  /** Span of the front matter, when there is one. */
  readonly span?: Span;
  /** Index (0-based) of the first line after the front matter. */
  readonly next: number;
}

/**
 * Read the front matter at the top of the notebook's lines, if the first line is `---`.
 *
 * @example
 * ```ts
 * import { readFrontMatter } from "./_front.ts";
 * import { splitLines } from "./_text.ts";
 * const ctx = { file: "f", diag: () => {}, claim: () => {} };
 * readFrontMatter(splitLines("---\ntitle: A case\n---\nprose\n"), ctx).front.title; // "A case"
 * ```
 */
export function readFrontMatter(lines: readonly Line[], ctx: ReadContext): FrontRead {
  if (!lines.length || lines[0].text !== "---") return { front: {}, next: 0 };
  let j = 1;
  while (j < lines.length && lines[j].text !== "---") j++;
  if (j >= lines.length) {
    ctx.diag(1, 1, "front matter opened with --- is never closed (add a line --- after it)");
    return { front: {}, next: 0 };
  }
  const raw: Record<string, unknown> = {};
  const where: Record<string, [number, number]> = {};
  for (let k = 1; k < j; k++) {
    const l = lines[k];
    if (l.text.trim() === "" || l.text.trimStart().startsWith("#")) continue;
    const m = /^([A-Za-z-]+):\s*(.*)$/.exec(l.text);
    if (!m) {
      ctx.diag(l.no, 1, "expected a front-matter line `key: value`");
      continue;
    }
    const key = m[1].toLowerCase();
    const col = l.text.indexOf(m[2]) + 1 || m[1].length + 2;
    if (!(FRONT_KEYS as readonly string[]).includes(key)) {
      ctx.diag(
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
  return {
    front: validate(raw, where, ctx),
    span: { start: 0, end: lines[j].end, line: 1 },
    next: j + 1,
  };
}

/** Validate the fields; each bad one is reported at its line and left out. */
function validate(
  raw: Record<string, unknown>,
  where: Record<string, [number, number]>,
  ctx: ReadContext,
): FrontMatter {
  const parsed = FrontSchema.safeParse(raw);
  if (parsed.success) return parsed.data;
  const good: Record<string, unknown> = { ...raw };
  for (const issue of parsed.error.issues) {
    const prop = String(issue.path[0]);
    const [ln, col] = where[prop] ?? [1, 1];
    ctx.diag(
      ln,
      col,
      `front matter ${prop === "powerStep" ? "power-step" : prop}: ${issue.message}`,
    );
    delete good[prop];
  }
  return FrontSchema.parse(good);
}
