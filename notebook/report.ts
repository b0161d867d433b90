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
import type { CheckLine } from "../cells/types.ts";
import {
  type PartView,
  present,
  type Presented,
  type PresentSettings,
  type TableShown,
} from "../cells/present.ts";
import { tableInfo } from "../cells/table.ts";
import type { DisplayOptions } from "../cells/types.ts";
import { asTyped, MEASURE_RULES, type MeasureKind } from "../cells/display.ts";
import type { Catalogue } from "../cells/catalogue.ts";

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
  /** Display text in the trade's conventions, on one line. */
  readonly display: string;
  /** The line read first: beside the cell on the page, on the cell's line in the terminal. */
  readonly headline: string;
  /** The labelled parts read under the headline, when the value has parts. */
  readonly parts?: readonly PartView[];
  /** The lines of a check, when the value is one. */
  readonly checks?: readonly CheckLine[];
  /** The first rows of a table result, with the counts in words. */
  readonly table?: TableShown;
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

/** Settings of {@linkcode buildReport}. */
export interface ReportOptions {
  /** Rows of a table result shown (default 25). */
  readonly maxRows?: number;
}

/**
 * The kind of measure a cell's result is, when its expression is one call of a formula that
 * declares it (`toLogMAR(…)` gives logMAR): plain numbers then show by that kind's rule.
 *
 * @example
 * ```ts
 * import { getLanguage } from "../cells/language.ts";
 * import { declaredKind } from "./report.ts";
 * declaredKind('letterScore("6/9")', getLanguage().catalogue); // "letters"
 * declaredKind("letterScore(a) + 1", getLanguage().catalogue); // undefined
 * ```
 */
export function declaredKind(
  expression: string | undefined,
  catalogue: Catalogue,
): MeasureKind | undefined {
  const m = expression ? /^\s*([A-Za-z_]\w*)\s*\(/.exec(expression) : null;
  if (!m) return undefined;
  const e = expression!.trim();
  // The call's own closing parenthesis must end the expression.
  let depth = 0;
  let quote = "";
  for (let i = e.indexOf("("); i < e.length; i++) {
    const c = e[i];
    if (quote) {
      if (c === "\\") i++;
      else if (c === quote) quote = "";
    } else if (c === '"' || c === "'") quote = c;
    else if (c === "(") depth++;
    else if (c === ")" && --depth === 0 && i !== e.length - 1) return undefined;
  }
  const kind = catalogue.formulas.get(m[1])?.returns.display;
  return kind && kind !== "exact" && kind in MEASURE_RULES ? kind : undefined;
}

/**
 * What {@linkcode present} made of a value object, with the settings it was made with. A
 * table is known by its metadata, which is new whenever a column is added to it in place.
 */
const presented = new WeakMap<object, { key: string; shown: Presented }>();

/** {@linkcode present}, once per value object and settings (a live edit keeps most values). */
function presentOnce(value: unknown, options: DisplayOptions, settings: PresentSettings) {
  if (typeof value !== "object" || value === null) return present(value, options, settings);
  const owner = tableInfo(value) ?? value;
  const key = JSON.stringify([options, settings]);
  const hit = presented.get(owner);
  if (hit?.key === key) return hit.shown;
  const shown = present(value, options, settings);
  presented.set(owner, { key, shown });
  return shown;
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
export function buildReport(nb: Notebook, settings: ReportOptions = {}): Report {
  const numbers = new Map<string, number>();
  const sources: ReportSource[] = [];
  const lang = nb.language;
  const cells = nb.results().map((r): ReportCell => {
    // A cell with an error used no source: only results put sources in the list.
    const notes = (r.error ? [] : r.sources).map((id) => {
      let n = numbers.get(id);
      if (n === undefined) {
        n = numbers.size + 1;
        numbers.set(id, n);
        const s = getSource(id);
        sources.push({ n, id, citation: s.citation, status: s.status, mark: statusLabel(s) });
      }
      return n;
    }).sort((a, b) => a - b);
    // An input shows exactly what was typed; computed results show in the power step.
    const options = r.input ? { ...nb.display, powerStep: 0 } : nb.display;
    const d = r.error
      ? { display: `error: ${r.error.message}`, value: null, unit: "", headline: "" }
      : presentOnce(r.value, options, {
        kind: declaredKind(r.expression, lang.catalogue),
        maxRows: settings.maxRows,
      });
    const typed = r.input && !r.error && r.expression ? asTyped(r.expression) : undefined;
    return {
      id: r.id,
      name: r.name,
      kind: r.kind,
      value: d.value,
      unit: d.unit,
      display: typed ?? d.display,
      headline: typed ?? (r.error ? d.display : (d as { headline: string }).headline),
      ...("parts" in d && d.parts ? { parts: d.parts } : {}),
      ...("checks" in d && d.checks ? { checks: d.checks } : {}),
      ...("table" in d && d.table ? { table: d.table } : {}),
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
