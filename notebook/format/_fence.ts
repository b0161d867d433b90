/**
 * The opened block a reader receives: its fence line, the lines inside it, its span and the
 * text after the block's kind on the fence line.
 *
 * @module
 */

import type { Span } from "./parse.ts";
import type { Line } from "./_text.ts";

/** A fenced Lentil block as found, before its kind's reader reads its lines. */
export interface Fenced {
  /** The opening fence line. */
  readonly fence: Line;
  /** The lines between the fences (to the end of the text when never closed). */
  readonly body: readonly Line[];
  /** The whole block, fences included. */
  readonly span: Span;
  /** The text after the kind on the fence line, trimmed (a table's or plot's name). */
  readonly rest: string;
  /** 1-based column of `rest` on the fence line. */
  readonly restCol: number;
}
