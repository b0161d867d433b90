/**
 * A notebook's work on one table, in SQL: its computed columns as expressions grouped in
 * sets (a set reads only the table and earlier sets), and its statistics cells as aggregate
 * queries over complete rows, whose totals (count, missing, means, co-moments, smallest and
 * largest) finish into the same records the in-process statistics give.
 *
 * Statistics in SQL: `countOf`, `meanOf`, `sdOf`, `meanRx` and `vectorStats` over the table's
 * numeric columns, and `agreement` when the rows are independent eyes (the table names no
 * subject and eye columns, and has none by those names). Statistics that need every value or
 * the persons behind the eyes (ellipses and rxAgreement, with their medians and
 * person-clustered errors) keep the in-process path. A notebook that reads the table any
 * other way is not table work in SQL (the reason says where).
 *
 * @module
 */

import type { MathNode } from "mathjs";
import type { Language } from "../../cells/language.ts";
import { Column, makeTable } from "../../cells/table.ts";
import { markExact } from "../../cells/quantity.ts";
import { agreementRecord, meanRxRecord, vectorStatsRecord } from "../../cells/stats.ts";
import { EYE_NAMES, INDEPENDENT_NOTE, SUBJECT_NAMES } from "../../cells/_eyes_context.ts";
import { LentilInputError } from "../../lib/errors.ts";
import { agreementFrom } from "../../lib/agreement.ts";
import { RunningMoments, vectorSummaryFrom } from "../../lib/stats.ts";
import type { NotebookDoc, TableBlock } from "../format/parse.ts";
import { Notebook } from "../engine/engine.ts";
import type { ColumnShape } from "../engine/_columns.ts";
import { NotInSql, sqlExpression, type SqlValue, unitScale } from "./expression.ts";
import { quoteName } from "./_names.ts";
import { columnArgs } from "../table/stream.ts";

/** One computed column in SQL. */
export interface SqlColumn {
  /** Column name. */
  readonly name: string;
  /** Expression over the table and earlier sets. */
  readonly sql: string;
  /** Unit of its values ("" for plain numbers). */
  readonly unit: string;
  /** The set it belongs to (1 reads only the table). */
  readonly set: number;
  /** Line of the formula in the notebook. */
  readonly line: number;
}

/** One statistics cell in SQL. */
export interface SqlStatistic {
  /** Cell name. */
  readonly cell: string;
  /** The statistics function. */
  readonly fn: string;
  /** Column arguments. */
  readonly args: readonly string[];
  /** Expressions of the variables observed together (over the last set). */
  readonly variables: readonly string[];
  /** Unit of the results of a one-column statistic or an agreement. */
  readonly unit: string;
  /** True when each variable is summarised on its own rows (the three agreements of rxAgreement). */
  readonly separate?: boolean;
  /** Line of the cell. */
  readonly line: number;
}

/** A table's work in SQL. */
export interface TableWork {
  /** The table. */
  readonly table: string;
  /** Its input columns. */
  readonly inputs: readonly ColumnShape[];
  /** Computed columns, in evaluation order. */
  readonly columns: readonly SqlColumn[];
  /** Statistics cells, in document order. */
  readonly statistics: readonly SqlStatistic[];
  /** Number of computed-column sets. */
  readonly sets: number;
}

/** Statistics that run as SQL. */
export const SQL_STATISTICS: readonly string[] = [
  "countOf",
  "meanOf",
  "sdOf",
  "meanRx",
  "vectorStats",
  "agreement",
];

function symbols(node: MathNode): Set<string> {
  const out = new Set<string>();
  node.traverse((n) => {
    if (n.type === "SymbolNode") out.add((n as unknown as { name: string }).name);
  });
  return out;
}

/**
 * Plan a table's work in SQL, or give the reason it is not all in SQL. `inputs` are the
 * table's columns as read (names, types, units); `value` writes numbers into SQL.
 *
 * @example
 * ```ts
 * import { parseNotebook } from "../format/parse.ts";
 * import { getLanguage } from "../../cells/language.ts";
 * import { planTableWork } from "./work.ts";
 * const doc = parseNotebook("~~~lentil table t\nfile: t.csv\n~~~\n~~~lentil\nt.M = sph + cyl / 2\navg = meanOf(t.M)\n~~~\n", "a.lentil.md");
 * const shapes = ["sph", "cyl"].map((name) => ({ name, type: "quantity", unit: "D", numeric: true }));
 * const w = planTableWork(doc, doc.tables[0], shapes, getLanguage(), String);
 * typeof w === "string" ? w : w.statistics[0].fn; // "meanOf"
 * ```
 */
export function planTableWork(
  doc: NotebookDoc,
  block: TableBlock,
  inputs: readonly ColumnShape[],
  lang: Language,
  value: SqlValue,
): TableWork | string {
  const empty = inputs.map((s) =>
    s.numeric
      ? new Column(s.name, s.type, s.unit, new Float64Array())
      : new Column(s.name, s.type, "", [])
  );
  const nb = new Notebook(doc, {
    language: lang,
    tables: new Map([[block.name, {
      columns: inputs.map((s, i) => ({ name: s.name, spec: s.unit || s.type, col: i + 1 })),
      built: {
        value: makeTable(block.name, empty, { file: block.options.file?.value }),
        problems: [],
        notes: [],
        excluded: 0,
      },
    }]]),
  });
  nb.evaluateAll();
  const reads = (deps: readonly string[]) =>
    deps.some((d) => d === block.name || d.startsWith(`${block.name}.`));
  const scope = new Map<string, unknown>(Object.entries(lang.constants));
  for (const r of nb.results()) {
    if (r.kind === "cell" && r.value !== undefined && !reads(r.deps)) scope.set(r.name, r.value);
  }
  const shapes: ColumnShape[] = [...inputs];
  const setOf = new Map<string, number>();
  const columns: SqlColumn[] = [];
  for (const id of nb.graph.order) {
    const r = nb.result(id)!;
    if (r.kind !== "column" || r.table !== block.name) continue;
    const node = lang.parse(r.expression!);
    let e;
    try {
      e = sqlExpression(node, shapes.filter((s) => s.name !== r.name), scope, lang, value);
    } catch (err) {
      if (err instanceof NotInSql) return `computed column ${block.name}.${r.name}: ${err.message}`;
      throw err;
    }
    if (shapes.some((s) => s.name === r.name)) {
      return `computed column ${block.name}.${r.name} replaces a column of the table`;
    }
    const set = 1 + Math.max(0, ...[...symbols(node)].map((n) => setOf.get(n) ?? 0));
    setOf.set(r.name, set);
    columns.push({ name: r.name, sql: e.sql, unit: e.unit, set, line: r.line });
    shapes.push({
      name: r.name,
      type: e.unit ? "quantity" : "number",
      unit: e.unit,
      numeric: true,
    });
  }
  const byName = new Map(shapes.map((s) => [s.name, s]));
  const statistics: SqlStatistic[] = [];
  for (const r of nb.results()) {
    if (r.kind !== "cell" || !reads(r.deps)) continue;
    const node = lang.parse(r.expression!) as unknown as {
      type: string;
      fn?: { type: string; name?: string };
      args?: MathNode[];
    };
    const fn = node.type === "FunctionNode" && node.fn?.type === "SymbolNode" ? node.fn.name! : "";
    const args = fn ? columnArgs(node.args!, block.name) : undefined;
    const where = `cell ${r.name} (line ${r.line})`;
    if (!SQL_STATISTICS.includes(fn) || !args) {
      return `${where} reads table ${block.name} other than by one call of ${
        SQL_STATISTICS.join(", ")
      } over its columns`;
    }
    if (
      fn === "agreement" &&
      (block.options.subject || block.options.eye || inputs.some((c) =>
        SUBJECT_NAMES.test(c.name)
      ) ||
        inputs.some((c) => EYE_NAMES.test(c.name)))
    ) {
      return `${where}: agreement over the eyes of persons is computed in-process`;
    }
    if (node.args!.length !== args.length) return `${where}: settings are computed in-process`;
    const stat = statisticVariables(fn, args, byName, lang, value);
    if (typeof stat === "string") return `${where}: ${stat}`;
    statistics.push({ cell: r.name, fn, args, ...stat, line: r.line });
  }
  const sets = Math.max(0, ...columns.map((c) => c.set));
  return { table: block.name, inputs, columns, statistics, sets };
}

/** The variables a statistic observes together, as SQL over the table's columns. */
function statisticVariables(
  fn: string,
  args: readonly string[],
  shapes: ReadonlyMap<string, ColumnShape>,
  lang: Language,
  value: SqlValue,
): { variables: string[]; unit: string; separate?: boolean } | string {
  for (const a of args) {
    const s = shapes.get(a);
    if (!s) return `no column ${a}`;
    if (!s.numeric) return `column ${a} holds ${s.type} values (not in SQL)`;
  }
  /** Column `a` in `unit` (of the same kind). */
  const inUnit = (a: string, unit: string): string | undefined => {
    const s = shapes.get(a)!;
    if (!unit || s.type !== "quantity" || s.unit === unit) return quoteName(a);
    const from = unitScale(lang, s.unit);
    const to = unitScale(lang, unit);
    if (!from || !to || from.base !== to.base) return undefined;
    return `(${quoteName(a)} * ${value(from.scale / to.scale)})`;
  };
  const vectors = (sph: string, cyl: string, axis: string): string[] | string => {
    const s = inUnit(sph, "D");
    const c = inUnit(cyl, "D");
    const x = inUnit(axis, "deg");
    if (!s || !c || !x) return "sphere and cylinder in D, axis in deg";
    const angle = `(${value(2)} * ${x} * ${value(Math.PI / 180)})`;
    const half = `(${c} / ${value(2)})`;
    return [`(${s} + ${half})`, `((-${half}) * COS(${angle}))`, `((-${half}) * SIN(${angle}))`];
  };
  switch (fn) {
    case "countOf":
    case "meanOf":
    case "sdOf": {
      if (args.length !== 1) return `${fn} takes one column`;
      const s = shapes.get(args[0])!;
      return { variables: [quoteName(args[0])], unit: s.type === "quantity" ? s.unit : "" };
    }
    case "meanRx":
    case "vectorStats":
    case "ellipse95":
    case "spread95": {
      if (args.length !== 3) return `${fn} in SQL takes sphere, cylinder and axis columns`;
      const v = vectors(args[0], args[1], args[2]);
      return typeof v === "string" ? v : { variables: v, unit: "D" };
    }
    case "agreement": {
      if (args.length !== 2) return "agreement takes two columns";
      const a = shapes.get(args[0])!;
      const unit = a.type === "quantity" ? a.unit : "";
      const b = inUnit(args[1], unit);
      if (!b) return `columns ${args[0]} and ${args[1]} are of different kinds`;
      return { variables: [`(${quoteName(args[0])} - ${b})`], unit };
    }
    case "rxAgreement": {
      if (args.length !== 6) {
        return "rxAgreement in SQL takes six columns (two sets of sphere, cylinder, axis)";
      }
      const a = vectors(args[0], args[1], args[2]);
      const b = vectors(args[3], args[4], args[5]);
      if (typeof a === "string") return a;
      if (typeof b === "string") return b;
      return { variables: a.map((x, i) => `(${x} - ${b[i]})`), unit: "D", separate: true };
    }
  }
  return `${fn} is not in SQL`;
}

/**
 * The aggregate list of a statistic: totals over complete rows (and rows passing `keep`),
 * named with `prefix`, over its variables written as `vars[i]`.
 */
export function statisticAggregates(
  vars: readonly string[],
  prefix = "",
  keep = "",
): string[] {
  const k = vars.length;
  const complete = vars.map((v) => `${v} IS NOT NULL`).join(" AND ");
  const rows = keep ? `FILTER (WHERE ${keep})` : "";
  const f = `FILTER (WHERE ${keep ? `${keep} AND ` : ""}${complete})`;
  const parts = [
    `COUNT(*) ${f} AS ${prefix}n`,
    `COUNT(*) ${rows} - COUNT(*) ${f} AS ${prefix}missing`,
  ];
  for (let i = 0; i < k; i++) {
    parts.push(`AVG(${vars[i]}) ${f} AS ${prefix}mean_${i}`);
    parts.push(
      `MIN(${vars[i]}) ${f} AS ${prefix}min_${i}`,
      `MAX(${vars[i]}) ${f} AS ${prefix}max_${i}`,
    );
    for (let j = i; j < k; j++) {
      parts.push(
        i === j
          ? `VAR_SAMP(${vars[i]}) ${f} AS ${prefix}cov_${i}_${j}`
          : `COVAR_SAMP(${vars[i]}, ${vars[j]}) ${f} AS ${prefix}cov_${i}_${j}`,
      );
    }
  }
  return parts;
}

/**
 * Totals of variables already NULL on rows left out (aggregates skip NULLs): count, means,
 * variances and covariances, named with `prefix` (the statistics in SQL need no smallest or
 * largest value). The count of rows left out is found by the caller.
 */
export function statisticTotals(vars: readonly string[], prefix: string): string[] {
  const parts = [`COUNT(${vars[0]}) AS ${prefix}n`];
  vars.forEach((v, i) => {
    parts.push(`AVG(${v}) AS ${prefix}mean_${i}`);
    for (let j = i; j < vars.length; j++) {
      parts.push(
        i === j
          ? `VAR_SAMP(${v}) AS ${prefix}cov_${i}_${j}`
          : `COVAR_SAMP(${v}, ${vars[j]}) AS ${prefix}cov_${i}_${j}`,
      );
    }
  });
  return parts;
}

/** The aggregate query of a statistic over a row source: totals over complete rows. */
export function statisticQuery(stat: SqlStatistic, from: string): string {
  const v = stat.variables.map((_, i) => `v${i}`);
  const vars = stat.variables.map((x, i) => `${x} AS ${v[i]}`).join(",\n    ");
  return `SELECT\n  ${
    statisticAggregates(v).join(",\n  ")
  }\nFROM (\n  SELECT\n    ${vars}\n  FROM ${from}\n) AS observed`;
}

/** Totals of one statistic as read back from its query, by column name. */
export type StatisticRow = Readonly<Record<string, unknown>>;

const toNumber = (x: unknown): number =>
  x === null || x === undefined ? NaN : typeof x === "bigint" ? Number(x) : Number(x);

/** Running moments restored from a statistic's row (`prefix` for combined queries). */
export function momentsFromRow(k: number, row: StatisticRow, prefix = ""): RunningMoments {
  const n = toNumber(row[`${prefix}n`]);
  const mean: number[] = [];
  const min: number[] = [];
  const max: number[] = [];
  const co = new Float64Array(k * k);
  for (let i = 0; i < k; i++) {
    mean.push(toNumber(row[`${prefix}mean_${i}`]));
    min.push(toNumber(row[`${prefix}min_${i}`]));
    max.push(toNumber(row[`${prefix}max_${i}`]));
    for (let j = i; j < k; j++) {
      const c = n > 1 ? toNumber(row[`${prefix}cov_${i}_${j}`]) * (n - 1) : 0;
      co[i * k + j] = c;
      co[j * k + i] = c;
    }
  }
  return RunningMoments.fromTotals({
    count: n,
    missing: toNumber(row[`${prefix}missing`]),
    mean,
    co,
    min,
    max,
  });
}

/**
 * The value of a statistics cell from its running moments, as the in-process formula gives
 * it (records for the vector statistics and the agreements; measures shown exactly).
 */
export function finishStatistic(
  fn: string,
  rs: readonly RunningMoments[],
  unit: string,
  lang: Language,
): unknown {
  const r = rs[0];
  const q = (v: number, u: string) => (u ? markExact(lang.quantity(v + 0, u)) : v);
  switch (fn) {
    case "countOf":
      return r.count;
    case "meanOf":
      return q(r.mean(0), unit);
    case "sdOf":
      return unit ? markExact(lang.quantity(r.sd(0), unit), { unsigned: true }) : r.sd(0);
    case "meanRx":
      return meanRxRecord(vectorSummaryFrom(r));
    case "vectorStats":
      return vectorStatsRecord(vectorSummaryFrom(r));
    case "agreement": {
      const a = agreementFrom(r, 0);
      if (a.n < 2) {
        throw new LentilInputError(`agreement needs at least 2 complete pairs, got ${a.n}`);
      }
      return agreementRecord(a, unit, { eyes: INDEPENDENT_NOTE });
    }
  }
  throw new Error(`${fn} is not in SQL`);
}
