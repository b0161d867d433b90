/**
 * The reader of a plot block (```` ```lentil plot NAME ````): `key: value` option lines,
 * kept by key; the export module gives them meaning and checks them.
 *
 * @module
 */

import type { OptionDef, PlotBlock } from "./parse.ts";
import type { Fenced } from "./_fence.ts";
import {
  isBlankOrComment,
  NAME_PATTERN,
  OPTION_LINE,
  optionValue,
  type ReadContext,
} from "./_text.ts";

/**
 * Read a plot block's name and options; a line that is not `key: value`, or a key given
 * twice, is reported.
 *
 * @example
 * ```ts
 * import { readPlotBlock } from "./_plot_block.ts";
 * import { splitLines } from "./_text.ts";
 * const lines = splitLines("~~~lentil plot focus\ntable: trials\n~~~\n");
 * const ctx = { file: "f", diag: () => {}, claim: () => {} };
 * const fenced = { fence: lines[0], body: lines.slice(1, 2), span: { start: 0, end: 9, line: 1 }, rest: "focus", restCol: 16 };
 * readPlotBlock(fenced, ctx).options.table.value; // "trials"
 * ```
 */
export function readPlotBlock(block: Fenced, ctx: ReadContext): PlotBlock {
  const name = block.rest || undefined;
  if (name && !NAME_PATTERN.test(name)) {
    ctx.diag(block.fence.no, block.restCol, `plot name "${name}" must be a single word`);
  }
  const options: Record<string, OptionDef> = {};
  for (const bl of block.body) {
    const t = bl.text;
    if (isBlankOrComment(t)) continue;
    const om = OPTION_LINE.exec(t);
    if (!om) {
      ctx.diag(bl.no, 1, "expected a plot option `key: value`");
      continue;
    }
    const key = om[1].toLowerCase();
    if (options[key]) ctx.diag(bl.no, 1, `plot option "${key}" is given twice`);
    options[key] = {
      value: optionValue(om[2]),
      line: bl.no,
      col: t.indexOf(om[2]) + 1 || om[0].length + 1,
    };
  }
  return { kind: "plot", name, options, line: block.fence.no, span: block.span };
}
