/**
 * A notebook's results as a report: each cell with its display text, unit and footnote
 * numbers, the numbered list of every source used, and whether the cautions apply. `run`,
 * `--json` and the export all present this one structure.
 *
 * @example
 * ```ts
 * import { Notebook } from "./engine/engine.ts";
 * import { buildReport } from "./report.ts";
 * const nb = Notebook.fromText("~~~lentil\ncl = vertexPower(-10 D, 12 mm)\n~~~\n", "a.lentil.md");
 * buildReport(nb).sources[0].id; // "vertex-formula"
 * ```
 *
 * @module
 */

import { getSource, type SourceStatus, statusLabel } from "../shared/sources.ts";
import { CAUTIONS } from "../shared/cautions.ts";
import type { CellError, CellResult, Notebook } from "./engine/engine.ts";

/** A numbered source in a report. */
export interface ReportSource {
  /** Footnote number, from 1. */
  readonly n: number;
  /** Registry id. */
  readonly id: string;
  /** Full citation. */
  readonly citation: string;
  /** Trust mark. */
  readonly status: SourceStatus;
  /** "", "common practice, no source" or "from memory". */
  readonly mark: string;
}

/** One cell in a report. */
export interface ReportCell {
  /** Node id. */
  readonly id: string;
  /** Name as written. */
  readonly name: string;
  /** Cell, table or computed column. */
  readonly kind: CellResult["kind"];
  /** JSON value (a number in `unit` for quantities), null on error. */
  readonly value: unknown;
  /** Unit of `value`. */
  readonly unit: string;
  /** Display text in the trade's conventions. */
  readonly display: string;
  /** Source ids used. */
  readonly sources: readonly string[];
  /** Footnote numbers of those sources. */
  readonly notes: readonly number[];
  /** The cautions apply. */
  readonly caution: boolean;
  /** 1-based line. */
  readonly line: number;
  /** Expression as written. */
  readonly expression?: string;
  /** Note after `#`. */
  readonly note?: string;
  /** True for an input cell. */
  readonly input: boolean;
  /** The error, if any. */
  readonly error?: CellError;
}

/** The report of a whole notebook. */
export interface Report {
  /** Cells in document order. */
  readonly cells: readonly ReportCell[];
  /** Numbered sources. */
  readonly sources: readonly ReportSource[];
  /** Cautions text, when any result could be used to make or fit a lens (else empty). */
  readonly cautions: readonly string[];
}

/**
 * Build the report of an evaluated notebook.
 *
 * @example
 * ```ts
 * import { Notebook } from "./engine/engine.ts";
 * import { buildReport } from "./report.ts";
 * buildReport(Notebook.fromText("~~~lentil\nx = 2 mm\n~~~\n", "x.lentil.md")).cells[0].display; // "2.00 mm"
 * ```
 */
export function buildReport(nb: Notebook): Report {
  const numbers = new Map<string, number>();
  const sources: ReportSource[] = [];
  const lang = nb.language;
  const cells = nb.results().map((r): ReportCell => {
    const notes = r.sources.map((id) => {
      let n = numbers.get(id);
      if (n === undefined) {
        n = numbers.size + 1;
        numbers.set(id, n);
        const s = getSource(id);
        sources.push({ n, id, citation: s.citation, status: s.status, mark: statusLabel(s) });
      }
      return n;
    });
    // An input shows exactly what was typed; computed results show in the power step.
    const options = r.input ? { ...nb.display, powerStep: 0 } : nb.display;
    const d = r.error
      ? { display: `error: ${r.error.message}`, value: null, unit: "" }
      : lang.describe(r.value, options);
    return {
      id: r.id,
      name: r.name,
      kind: r.kind,
      value: d.value,
      unit: d.unit,
      display: d.display,
      sources: r.sources,
      notes,
      caution: r.caution,
      line: r.line,
      expression: r.expression,
      note: r.note,
      input: r.input,
      error: r.error,
    };
  });
  return { cells, sources, cautions: cells.some((c) => c.caution) ? CAUTIONS : [] };
}
