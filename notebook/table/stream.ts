/**
 * Streaming mode: one pass over a large CSV table in bounded memory. Rows are read through
 * csv-parse in chunks; each chunk's computed columns are evaluated with the plans compiled
 * once (the column compiler, or row-wise where it cannot); running aggregates (Welford
 * moments and co-moments) are fed; and the chunk is written to a new CSV through
 * csv-stringify. Memory holds one chunk, never the file.
 *
 * Aggregates available in streaming mode: `countOf`, `meanOf`, `sdOf`, `sampleStats` (n,
 * missing, mean, SD, lowest and highest; its quartiles and median are reported as not
 * available), `meanRx`, `vectorStats`, `ellipse95`, `spread95`, `agreement` and
 * `rxAgreement` over the streamed table's columns. Medians and quantiles need every value
 * and are not computed (never approximated); other cells that read the streamed table are
 * reported as not available. Cells that do not read it evaluate as usual.
 *
 * The output is written to a fresh temporary file in its folder (a random name that is none of
 * the files the notebook reads) and renamed when the run completes; it never replaces an input, and an existing output is replaced only when asked.
 *
 * @module
 */

import { dirname, join, resolve } from "node:path";
import { stringify } from "csv-stringify/sync";
import type { MathNode } from "mathjs";
import { getLanguage, type Language, plainMathMessage } from "../../cells/language.ts";
import { Column, makeTable, tableInfo } from "../../cells/table.ts";
import { DEFAULT_DISPLAY, typeOfValue } from "../../cells/types.ts";
import {
  agreementRecord,
  columnNumbers,
  ellipseRecord,
  meanRxRecord,
  refractionArrays,
  sampleStatsRecord,
  vectorStatsRecord,
} from "../../cells/stats.ts";
import { markExact } from "../../cells/quantity.ts";
import { INDEPENDENT_NOTE, pairedColumns } from "../../cells/_eyes_context.ts";
import { agreementFrom } from "../../lib/agreement.ts";
import { pushRefraction, RunningMoments, vectorSummaryFrom } from "../../lib/stats.ts";
import { toPowerVector } from "../../lib/power_vector.ts";
import { type NotebookDoc, parseNotebook, type TableBlock } from "../format/parse.ts";
import { type CellResult, Notebook } from "../engine/engine.ts";
import { CAUTIONS } from "../../shared/cautions.ts";
import { createTempBeside } from "./_temp.ts";
import { checkedTableFile } from "../engine/_table_file.ts";
import { type ColumnPlan, planColumn } from "../engine/_columns.ts";
import {
  CsvReadError,
  type CsvRecord,
  openCsvTable,
  type TableBuilder,
  type TableProblem,
} from "../engine/_tables.ts";

/** Options of a streaming run. */
export interface StreamOptions {
  /** The table to stream (default: the notebook's only table read from a file). */
  readonly table?: string;
  /** Output CSV path (relative to the working folder); none: aggregates only. */
  readonly out?: string;
  /** Replace an existing output file. */
  readonly overwrite?: boolean;
  /** Let the table file be reached through a symbolic link (default: refused). */
  readonly followLinks?: boolean;
  /** Rows per chunk (default 16,384). */
  readonly chunkRows?: number;
  /** Called after each chunk with the rows read so far (for progress or memory sampling). */
  readonly onChunk?: (rowsRead: number) => void;
}

/** One computed column of the streamed table and how it was evaluated. */
export interface StreamedColumn {
  /** Column name. */
  readonly name: string;
  /** Unit ("" when none). */
  readonly unit: string;
  /** "compiled" or "row-wise" (the path of the last chunk). */
  readonly path: "compiled" | "row-wise";
  /** Why it did not compile. */
  readonly reason?: string;
}

/** One cell's outcome in streaming mode. */
export interface StreamedCell {
  /** Cell name. */
  readonly name: string;
  /** Value text as the report shows it, when available. */
  readonly display?: string;
  /** The value. */
  readonly value?: unknown;
  /** Why there is no value (an error, or not available in streaming mode). */
  readonly unavailable?: string;
}

/** The outcome of a streaming run. */
export interface StreamResult {
  /** True when the whole file was read and, if asked, written. */
  readonly ok: boolean;
  /** The streamed table. */
  readonly table: string;
  /** Its CSV file. */
  readonly input: string;
  /** The output written, if any. */
  readonly output?: string;
  /** Data rows read (good and bad). */
  readonly rowsRead: number;
  /** Rows written to the output (or that would be). */
  readonly rowsKept: number;
  /** Bad rows excluded (with `bad rows: skip`). */
  readonly excluded: number;
  /** Computed columns. */
  readonly columns: readonly StreamedColumn[];
  /** Cells, in document order. */
  readonly cells: readonly StreamedCell[];
  /** Row problems (the first 1,000 kept) and a fatal problem, if any. */
  readonly problems: readonly TableProblem[];
  /** The cautions, when a cell calls a formula that could be used to make or fit a lens. */
  readonly cautions: readonly string[];
  /** Notes: normalised rows, excluded rows. */
  readonly notes: readonly TableProblem[];
  /** Why the run stopped, when it did. */
  readonly stopped?: string;
}

/** A streaming run that cannot start (no such table, output over the input, …). */
export class StreamSetupError extends Error {
  /** @param message what to change. */
  constructor(message: string) {
    super(message);
    this.name = "StreamSetupError";
  }
}

/** Rows stringified and written at a time. */
const WRITE_SLICE = 256;

/** Records read from csv-parse at a time. */
const READ_BATCH = 256;

/** What streamed sample statistics leave out, and why. */
const STREAM_ORDER_NOTE =
  "quartiles and median are not available in streaming mode (they need every value)";

/** A running aggregate for one cell. */
interface Aggregate {
  push(cols: ReadonlyMap<string, Column>): void;
  result(): unknown;
  readonly note?: string;
}

const STREAMABLE = new Set([
  "countOf",
  "meanOf",
  "sdOf",
  "sampleStats",
  "meanRx",
  "vectorStats",
  "ellipse95",
  "spread95",
  "agreement",
  "rxAgreement",
]);

/**
 * The column names of `table.col` arguments of a call, or undefined when not all are.
 *
 * @example
 * ```ts
 * import { columnArgs } from "./stream.ts";
 * import { getLanguage } from "../../cells/language.ts";
 * const call = getLanguage().parse("meanOf(t.x)") as unknown as { args: never[] };
 * columnArgs(call.args, "t"); // ["x"]
 * ```
 */
export function columnArgs(args: readonly MathNode[], table: string): string[] | undefined {
  const names: string[] = [];
  for (const a of args) {
    const any = a as unknown as {
      type: string;
      object?: { type: string; name?: string };
      index?: { dimensions: { value?: unknown }[]; isObjectProperty(): boolean };
    };
    if (
      any.type !== "AccessorNode" || any.object?.type !== "SymbolNode" ||
      any.object.name !== table || !any.index?.isObjectProperty()
    ) return undefined;
    names.push(String(any.index.dimensions[0].value));
  }
  return names;
}

/** A running aggregate for `fn(table.a, …)`, or a reason it is not available. */
function aggregateFor(
  fn: string,
  cols: string[],
  lang: Language,
): Aggregate | string {
  const get = (m: ReadonlyMap<string, Column>, name: string) => m.get(name)!;
  const one = (combine: (r: RunningMoments, unit: string) => unknown, note?: string) => {
    if (cols.length !== 1) return `${fn} takes one column`;
    const r = new RunningMoments(1);
    let unit = "";
    return {
      push(m: ReadonlyMap<string, Column>) {
        const c = get(m, cols[0]);
        unit = c.type === "quantity" ? c.unit : "";
        for (const x of columnNumbers(c)) r.push1(x);
      },
      result: () => combine(r, unit),
      note,
    };
  };
  // Statistics are measures: shown exactly, not in the lens power step.
  const q = (v: number, unit: string) => (unit ? markExact(lang.quantity(v + 0, unit)) : v);
  const vector = (finish: (r: RunningMoments) => unknown): Aggregate | string => {
    if (cols.length !== 1 && cols.length !== 3) return `${fn} takes one rx column or three columns`;
    const r = new RunningMoments(3);
    return {
      push(m) {
        const cs = cols.map((c) => get(m, c));
        const a = refractionArrays(cs[0], cs[1], cs[2]);
        for (let i = 0; i < a.sph.length; i++) pushRefraction(r, a.sph[i], a.cyl[i], a.axis[i]);
      },
      result: () => finish(r),
    };
  };
  switch (fn) {
    case "countOf":
      return one((r) => r.count);
    case "meanOf":
      return one((r, u) => q(r.mean(0), u));
    case "sdOf":
      return one((
        r,
        u,
      ) => (u ? markExact(lang.quantity(r.sd(0), u), { unsigned: true }) : r.sd(0)));
    case "sampleStats":
      return one(
        (r, u) =>
          sampleStatsRecord(
            {
              n: r.count,
              missing: r.missing,
              mean: r.mean(0),
              sd: r.sd(0),
              lowest: r.min(0),
              highest: r.max(0),
            },
            u,
            STREAM_ORDER_NOTE,
          ),
      );
    case "meanRx":
      return vector((r) => meanRxRecord(vectorSummaryFrom(r)));
    case "vectorStats":
      return vector((r) => vectorStatsRecord(vectorSummaryFrom(r)));
    case "ellipse95":
      return vector((r) =>
        ellipseRecord(vectorSummaryFrom(r), "mean", "hotelling", { eyes: INDEPENDENT_NOTE })
      );
    case "spread95":
      return vector((r) => ellipseRecord(vectorSummaryFrom(r), "observations"));
    case "agreement": {
      if (cols.length !== 2) return "agreement takes two columns";
      const r = new RunningMoments(1);
      let unit = "";
      return {
        push(m) {
          const a = get(m, cols[0]);
          unit = a.type === "quantity" ? a.unit : "";
          const xa = columnNumbers(a);
          const xb = columnNumbers(get(m, cols[1]), unit || undefined);
          for (let i = 0; i < xa.length; i++) r.push1(xa[i] - xb[i]);
        },
        result: () => agreementRecord(agreementFrom(r, 0), unit),
      };
    }
    case "rxAgreement": {
      if (cols.length !== 2 && cols.length !== 6) return "rxAgreement takes two or six columns";
      const r = new RunningMoments(3);
      return {
        push(m) {
          const cs = cols.map((c) => get(m, c));
          const [a, b] = cols.length === 2
            ? [refractionArrays(cs[0]), refractionArrays(cs[1])]
            : [refractionArrays(cs[0], cs[1], cs[2]), refractionArrays(cs[3], cs[4], cs[5])];
          for (let i = 0; i < a.sph.length; i++) {
            const va = toPowerVector({ sphere: a.sph[i], cylinder: a.cyl[i], axis: a.axis[i] });
            const vb = toPowerVector({ sphere: b.sph[i], cylinder: b.cyl[i], axis: b.axis[i] });
            r.push([va.m - vb.m, va.j0 - vb.j0, va.j45 - vb.j45]);
          }
        },
        result: () => {
          const part = (k: number) => agreementRecord(agreementFrom(r, k), "D");
          return { n: r.count, M: part(0), J0: part(1), J45: part(2) };
        },
      };
    }
  }
  return `${fn} is not available in streaming mode`;
}

/** Text of one output cell. */
/**
 * A number as the output writes it: at most 12 significant digits, so the binary noise of
 * arithmetic (-1.2500000000000002) is not written, and no figure a measure has is lost.
 */
export function numberText(x: number): string {
  if (Number.isNaN(x)) return "";
  if (!Number.isFinite(x)) return String(x);
  return String(Number(x.toPrecision(12)) + 0);
}

function cellText(v: unknown): string {
  if (typeof v === "number") return numberText(v);
  if (v === null || v === undefined) return "";
  if (typeof v === "string") return v;
  const t = typeOfValue(v);
  return t ? t.display(v, DEFAULT_DISPLAY) : String(v);
}

/** A plain header: the name, with the unit of a quantity (so the file reads back with it). */
function header(c: Column): string {
  if (c.type === "quantity" && c.unit) return `${c.name} [${c.unit}]`;
  if (c.type === "number") return c.unit ? `${c.name} [${c.unit}]` : c.name;
  if (c.type === "text") return c.name;
  return `${c.name} [${c.type}]`;
}

async function sameFile(a: string, b: string): Promise<boolean> {
  try {
    return (await Deno.realPath(a)) === (await Deno.realPath(b));
  } catch {
    return resolve(a) === resolve(b);
  }
}

/** A computed column that fails on the streamed data. */
class ColumnStreamError extends Error {}

/**
 * Run a notebook in streaming mode over one of its CSV tables.
 *
 * @example
 * ```ts ignore
 * const r = await streamNotebook("study.lentil.md", { out: "results.csv" });
 * console.log(r.rowsRead, r.excluded);
 * ```
 * @throws {StreamSetupError} when the run cannot start (see the message).
 */
export async function streamNotebook(
  path: string,
  options: StreamOptions = {},
): Promise<StreamResult> {
  const lang = getLanguage();
  const text = await Deno.readTextFile(path);
  const doc = parseNotebook(text, path);
  const { block, fileTables } = chooseTable(doc, path, options.table);
  const dir = dirname(path);
  const input = join(dir, block.options.file!.value);
  const out = options.out;
  // Every file the notebook reads: the output and its temporary file must be none of them.
  const inputs = fileTables.map((t) => join(dir, t.options.file!.value));
  if (out) await checkOutput(out, inputs, options.overwrite);
  const skip = (block.options["bad rows"]?.value ?? "stop").toLowerCase() === "skip";
  const chunkRows = options.chunkRows ?? 8192;
  const file = await openTableFile(dir, block, input, options.followLinks);
  const opened = await openCsvTable(block, path, file.readable, lang, READ_BATCH);
  const base = {
    table: block.name,
    input,
    rowsRead: 0,
    rowsKept: 0,
    excluded: 0,
    columns: [],
    cells: [],
    cautions: [],
    notes: [],
  };
  if ("problem" in opened) {
    return { ...base, ok: false, problems: [opened.problem], stopped: opened.problem.message };
  }
  const { start, rest } = opened;
  if (start.problems.length) {
    await rest.return?.();
    return { ...base, ok: false, problems: start.problems, stopped: start.problems[0].message };
  }
  const builder: TableBuilder = start.builder;
  const nb = restOfNotebook(doc, block, builder);
  const plan = planCells(nb, block.name, lang);

  // Output.
  const temp = out ? await createTempBeside(out, inputs) : undefined;
  const part = temp?.path;
  const writer = temp?.file;
  const chunks = new ChunkWriter(builder, plan, block.name, lang, writer, options.onChunk);
  let stopped: string | undefined;
  try {
    stopped = await readAll(rest, builder, skip, chunkRows, () => chunks.process());
  } catch (e) {
    if (e instanceof CsvReadError) stopped = e.problem.message;
    else if (e instanceof ColumnStreamError) stopped = e.message;
    else {
      writer?.close();
      if (part) await Deno.remove(part).catch(() => {});
      throw e;
    }
  } finally {
    await rest.return?.();
  }
  writer?.close();
  const problems = [...builder.problems];
  if (stopped && !problems.some((p) => stopped!.includes(p.message))) {
    problems.push({ file: input, line: 0, col: 0, message: stopped });
  }
  if (part) {
    if (stopped) await Deno.remove(part).catch(() => {});
    else if (/\.(parquet|parq|pq)$/i.test(out!)) {
      // Parquet out: the CSV written above becomes Parquet through DuckDB (loaded only now).
      const { csvToParquet } = await import("../duck/convert.ts");
      const target = await createTempBeside(out!, inputs);
      target.file.close();
      try {
        await csvToParquet(part, target.path);
        await Deno.rename(target.path, out!);
      } finally {
        await Deno.remove(part).catch(() => {});
        await Deno.remove(target.path).catch(() => {});
      }
    } else await Deno.rename(part, out!);
  }
  return {
    ok: !stopped,
    table: block.name,
    input,
    output: stopped ? undefined : out,
    rowsRead: builder.rowsSeen,
    rowsKept: chunks.rowsKept,
    excluded: builder.badRows,
    columns: chunks.colInfo,
    cells: finishCells(plan, stopped, lang, nb),
    problems,
    notes: builder.notes(block.name, { file: path, line: block.line, col: block.col }, skip),
    stopped,
    cautions: nb.callsCautionFormulas ? CAUTIONS : [],
  };
}

/** The table to stream: the one asked for, or the notebook's only table read from a file. */
function chooseTable(
  doc: NotebookDoc,
  path: string,
  table: string | undefined,
): { block: TableBlock; fileTables: TableBlock[] } {
  const fileTables = doc.tables.filter((t) => t.options.file);
  let block: TableBlock | undefined;
  if (table) {
    block = fileTables.find((t) => t.name === table);
    if (!block) {
      throw new StreamSetupError(
        `no table "${table}" read from a file in ${path} (tables from files: ${
          fileTables.map((t) => t.name).join(", ") || "none"
        })`,
      );
    }
  } else if (fileTables.length === 1) block = fileTables[0];
  else {
    throw new StreamSetupError(
      fileTables.length
        ? `${path} reads ${fileTables.length} tables from files; choose one with --table (${
          fileTables.map((t) => t.name).join(", ")
        })`
        : `${path} has no table read from a file (a table block with a file: option)`,
    );
  }
  return { block, fileTables };
}

/** Refuses an output that is one of the inputs, or that exists without `overwrite`. */
async function checkOutput(
  out: string,
  inputs: readonly string[],
  overwrite: boolean | undefined,
): Promise<void> {
  for (const read of inputs) {
    if (await sameFile(out, read)) {
      throw new StreamSetupError(
        `refusing to write over the input ${read}; choose another --out`,
      );
    }
  }
  let exists = false;
  try {
    await Deno.lstat(out);
    exists = true;
  } catch (e) {
    if (!(e instanceof Deno.errors.NotFound)) throw e;
  }
  if (exists && !overwrite) {
    throw new StreamSetupError(`${out} exists; add --overwrite to replace it`);
  }
}

/** Opens the streamed table's file: a regular file in the notebook's folder tree only. */
async function openTableFile(
  dir: string,
  block: TableBlock,
  input: string,
  followLinks: boolean | undefined,
): Promise<Deno.FsFile> {
  try {
    // A regular file in the notebook's folder tree only: no link, device or pipe.
    return await Deno.open(
      checkedTableFile(dir, block.options.file!.value, { followLinks }),
    );
  } catch (e) {
    const why = e instanceof Deno.errors.NotFound ? "no such file" : (e as Error).message;
    throw new StreamSetupError(`cannot read table file ${input}: ${why}`);
  }
}

/** The rest of the notebook, evaluated over an empty copy of the streamed table. */
function restOfNotebook(doc: NotebookDoc, block: TableBlock, builder: TableBuilder): Notebook {
  const emptyColumns = builder.columns.map((c, i) => {
    const k = builder.kinds[i];
    return k.type === "quantity" || k.type === "number"
      ? new Column(c.name, k.type, k.unit, new Float64Array())
      : new Column(c.name, k.type === "value" ? k.name : "text", "", []);
  });
  const nb = new Notebook(doc, {
    tables: new Map([[block.name, {
      columns: builder.columns,
      built: {
        value: makeTable(block.name, emptyColumns, { file: block.options.file!.value }),
        problems: [],
        notes: [],
        excluded: 0,
      },
    }]]),
  });
  nb.evaluateAll();
  return nb;
}

/** What a run computes: computed columns in evaluation order, and each cell's fate. */
interface CellPlan {
  /** Cells that do not read the streamed table, by name. */
  readonly scope: Map<string, unknown>;
  /** The streamed table's computed columns, in evaluation order. */
  readonly computed: CellResult[];
  /** A computed column's place in document order. */
  readonly docIndex: ReadonlyMap<string, number>;
  /** The running aggregate of each cell that reads the table and can be streamed. */
  readonly aggregates: Map<string, Aggregate>;
  /** Every cell, in document order (values filled in at the end for aggregates). */
  readonly cells: StreamedCell[];
}

function planCells(nb: Notebook, table: string, lang: Language): CellPlan {
  const scope = new Map<string, unknown>(Object.entries(lang.constants));
  const readsTable = (deps: readonly string[]) =>
    deps.some((d) => d === table || d.startsWith(`${table}.`));
  const results = nb.results();
  for (const r of results) {
    if (r.kind === "cell" && r.value !== undefined && !readsTable(r.deps)) {
      scope.set(r.name, r.value);
    }
  }
  const computed = nb.graph.order
    .map((id) => nb.result(id)!)
    .filter((r) => r.kind === "column" && r.table === table);
  const docIndex = new Map(
    [...computed].sort((a, b) => a.line - b.line).map((r, i) => [r.name, i]),
  );
  const aggregates = new Map<string, Aggregate>();
  const cells: StreamedCell[] = [];
  const info = tableInfo(nb.result(table)?.value);
  const block = nb.doc.blocks.find((b) => b.kind === "table" && b.name === table) as
    | TableBlock
    | undefined;
  const eyes = pairedColumns(info?.columns.map((c) => c.name) ?? [], {
    subject: block?.options.subject?.value,
    eye: block?.options.eye?.value,
  });
  for (const r of results) {
    if (r.kind !== "cell") continue;
    if (!readsTable(r.deps)) {
      cells.push(
        r.error
          ? { name: r.name, unavailable: r.error.message }
          : { name: r.name, value: r.value, display: lang.describe(r.value, nb.display).display },
      );
      continue;
    }
    const agg = aggregateOf(r.expression!, table, lang, eyes);
    if (typeof agg === "string") cells.push({ name: r.name, unavailable: agg });
    else {
      aggregates.set(r.name, agg);
      cells.push({ name: r.name });
    }
  }
  return { scope, computed, docIndex, aggregates, cells };
}

/** The running aggregate of a cell that reads the streamed table, or why there is none. */
function aggregateOf(
  expression: string,
  table: string,
  lang: Language,
  eyes?: { subject: string; eye: string },
): Aggregate | string {
  const node = lang.parse(expression) as unknown as {
    type: string;
    fn?: { type: string; name?: string };
    args?: MathNode[];
  };
  const fn = node.type === "FunctionNode" && node.fn?.type === "SymbolNode" ? node.fn.name! : "";
  const cols = fn ? columnArgs(node.args!, table) : undefined;
  let agg: Aggregate | string =
    "only a single call of countOf, meanOf, sdOf, sampleStats, meanRx, " +
    "vectorStats, ellipse95, spread95, agreement or rxAgreement over the streamed table's columns " +
    "is computed in streaming mode";
  if (fn === "medianOf" || fn === "quantileOf" || fn === "sampleStatsBy" || fn === "meanRxBy") {
    agg = `${fn} needs every value at once; it is not computed in streaming mode`;
  } else if (eyes && ["ellipse95", "agreement", "rxAgreement"].includes(fn)) {
    agg = `${fn} counts persons (the table's rows are eyes: ${eyes.subject} and ${eyes.eye}), ` +
      "which needs every row at once; it is not computed in streaming mode (use run)";
  } else if (STREAMABLE.has(fn) && cols) agg = aggregateFor(fn, cols, lang);
  return agg;
}

/** Each chunk: its computed columns through plans compiled once, the aggregates, the CSV. */
class ChunkWriter {
  wroteHeader = false;
  plans: ColumnPlan[] | undefined;
  readonly colInfo: StreamedColumn[] = [];
  rowsKept = 0;
  readonly #enc = new TextEncoder();

  constructor(
    readonly builder: TableBuilder,
    readonly plan: CellPlan,
    readonly table: string,
    readonly lang: Language,
    readonly sink: Deno.FsFile | undefined,
    readonly onChunk: ((rowsRead: number) => void) | undefined,
  ) {}

  process(): void {
    const data = this.builder.take();
    const rows = data.length ? data[0].length : 0;
    if (rows === 0 && this.wroteHeader) return;
    const byName = this.computeColumns(data, rows);
    const shown = [...data, ...this.colInfo.map((c) => byName.get(c.name)!)];
    for (const a of this.plan.aggregates.values()) a.push(byName);
    this.rowsKept += rows;
    if (this.sink) this.write(shown, rows);
    this.onChunk?.(this.builder.rowsSeen);
  }

  /** The chunk's columns by name, the computed ones added in evaluation order. */
  computeColumns(data: readonly Column[], rows: number): Map<string, Column> {
    const { computed, scope, docIndex } = this.plan;
    const lang = this.lang;
    const all: Column[] = [...data];
    const byName = new Map(all.map((c) => [c.name, c]));
    const planning = !this.plans;
    if (planning) this.plans = [];
    const plans = this.plans!;
    for (let i = 0; i < computed.length; i++) {
      const r = computed[i];
      const inputs = all.filter((c) => c.name !== r.name);
      if (planning) {
        const node = lang.parse(r.expression!);
        plans.push(planColumn(r.name, node, lang.compile(node), inputs, scope, lang));
      }
      let run;
      try {
        run = plans[i].run(inputs, rows);
      } catch (e) {
        // A formula that fails on the data stops the run with its reason, never a trace.
        throw new ColumnStreamError(
          `computed column ${this.table}.${r.name}: ${plainMathMessage((e as Error).message)}`,
        );
      }
      const { column, path } = run;
      all.push(column);
      byName.set(column.name, column);
      this.colInfo[docIndex.get(r.name)!] = {
        name: r.name,
        unit: column.unit,
        path,
        reason: plans[i].reason,
      };
    }
    return byName;
  }

  /** Writes the chunk (and the header, once) in small slices. */
  write(shown: readonly Column[], rows: number): void {
    // Small slices keep what is alive between collections small (memory stays flat).
    const columns = shown.map((c) => header(c));
    for (let s = 0; s < rows || !this.wroteHeader; s += WRITE_SLICE) {
      const records: string[][] = [];
      for (let i = s; i < Math.min(rows, s + WRITE_SLICE); i++) {
        records.push(shown.map((c) => cellText(c.data[i])));
      }
      const csv = stringify(records, {
        header: !this.wroteHeader,
        columns,
        record_delimiter: "unix",
      });
      this.wroteHeader = true;
      const bytes = this.#enc.encode(csv);
      for (let off = 0; off < bytes.length;) off += this.sink!.writeSync(bytes.subarray(off));
    }
  }
}

/**
 * Reads the rest of the file into the builder, processing a chunk each `chunkRows` rows and
 * the last at the end; returns why the run stopped at a bad row, if it did.
 */
async function readAll(
  rest: AsyncIterator<CsvRecord[]>,
  builder: TableBuilder,
  skip: boolean,
  chunkRows: number,
  processChunk: () => void,
): Promise<string | undefined> {
  let stopped: string | undefined;
  const stopAtBad = () => {
    if (!skip && builder.badRows) {
      stopped = `bad row ${builder.problems[0].row! + 1}: ${builder.problems[0].message} ` +
        `(the run stops at a bad row; add "bad rows: skip" to the table block to exclude and count them)`;
      return true;
    }
    return false;
  };
  if (!stopAtBad()) {
    if (builder.pending >= chunkRows) processChunk();
    for (let r = await rest.next(); !r.done; r = await rest.next()) {
      for (const rec of r.value as CsvRecord[]) {
        if (rec.bad) builder.addBad(rec.line, rec.bad);
        else builder.add(rec.cells, rec.line);
      }
      if (stopAtBad()) break;
      if (builder.pending >= chunkRows) processChunk();
    }
    if (!stopped) processChunk();
  }
  return stopped;
}

/** Every cell's outcome: aggregates' values once the whole file has been read. */
function finishCells(
  plan: CellPlan,
  stopped: string | undefined,
  lang: Language,
  nb: Notebook,
): StreamedCell[] {
  return plan.cells.map((c) => {
    const a = plan.aggregates.get(c.name);
    if (!a) return c;
    if (stopped) return { name: c.name, unavailable: "the run stopped before the end of the file" };
    try {
      const value = a.result();
      const display = lang.describe(value, nb.display).display;
      return { name: c.name, value, display: a.note ? `${display} (${a.note})` : display };
    } catch (e) {
      return { name: c.name, unavailable: (e as Error).message };
    }
  });
}
