/**
 * Row-wise bench: formulas over columns the loop compiler cannot hold as numbers (a text
 * acuity column, a `[prism]` column, a `[rx]` column) on 100,000 invented rows, through the
 * engine's column plan (units checked once, rows on plain values) against the row-wise path
 * through the formula language, with the same column from both.
 *
 * @module
 */

import { deepStrictEqual } from "node:assert/strict";
import { getLanguage } from "../cells/language.ts";
import { Column } from "../cells/table.ts";
import { seeded } from "../lib/seeded.ts";
import { evaluateRowWise, planColumn } from "../notebook/engine/_columns.ts";
import { type Goal, medianMs } from "./goal.ts";

const ACUITY = [
  "6/6",
  "6/9",
  "6/12",
  "6/18",
  "6/24",
  "20/20",
  "20/40",
  "0.3 logMAR",
  "0.8 decimal",
];
const PRISM = ["1 BU", "2 BI", "0.5 BD", "3 BO", "R 2 base 30", "L 1.5 base 200"];

/** Invented columns of `n` rows: acuity as text, prisms and refractions as typed values. */
export function typedColumns(n: number, seed = 7): Column[] {
  const lang = getLanguage();
  const g = seeded(seed);
  const pick = (xs: readonly string[]) => xs[Math.floor(g() * xs.length)];
  const prisms = PRISM.map((t) => lang.compile(lang.parse(`readPrism("${t}")`)).evaluate({}));
  const rxs = Array.from({ length: 40 }, (_, i) => {
    const s = (-8 + i * 0.25).toFixed(2);
    const c = (-0.25 * (i % 9)).toFixed(2);
    return lang.compile(lang.parse(`rx("${s} / ${c} x ${1 + (i * 17) % 180}")`)).evaluate({});
  });
  return [
    new Column("va", "text", "", Array.from({ length: n }, () => pick(ACUITY))),
    new Column("p", "prism", "", Array.from({ length: n }, () => prisms[Math.floor(g() * 6)])),
    new Column("r", "rx", "", Array.from({ length: n }, () => rxs[Math.floor(g() * 40)])),
    new Column("vd", "quantity", "mm", Float64Array.from({ length: n }, () => 10 + 4 * g())),
  ];
}

/** The goal's formulas: a text acuity column, a `[prism]` column, an `[rx]` column. */
const FORMULAS = [
  "toLogMAR(acuity(va))",
  'compoundPrism(p, readPrism("1 BU"))',
  "sphericalEquivalent(r)",
  "vertexRx(r, vd)",
];

/** Shown beside the goal: its cost is its own result, four quantities and a record a row. */
const BESIDE = ["prismComponents(p)"];

/** Measure the goal: the slowest of the goal's formulas, in µs a row. */
export function measure(n = 100_000): { goals: Goal[]; lines: string[] } {
  const lang = getLanguage();
  const columns = typedColumns(n);
  const scope = new Map<string, unknown>();
  const lines: string[] = [];
  let worst = 0;
  for (const expr of [...FORMULAS, ...BESIDE]) {
    const node = lang.parse(expr);
    const ev = lang.compile(node);
    const plan = planColumn("out", node, ev, columns, scope, lang);
    let path = "";
    const us = medianMs(
      () => {
        path = plan.run(columns, n).path;
      },
      5,
      2,
    ) * 1000 / n;
    // The row-wise path on a slice, for comparison and to check both give the same column.
    const slice = 10_000;
    const small = columns.map((c) =>
      new Column(c.name, c.type, c.unit, c.data.slice(0, slice) as Float64Array)
    );
    const t1 = performance.now();
    const old = evaluateRowWise("out", ev, small, slice, scope, lang);
    const oldUs = (performance.now() - t1) * 1000 / slice;
    const mine = plan.run(small, slice).column;
    deepStrictEqual(mine, old, `${expr}: the column plan and the row-wise path differ`);
    if (FORMULAS.includes(expr)) worst = Math.max(worst, us);
    lines.push(
      `${expr} over ${n.toLocaleString("en")} rows: ${
        us.toFixed(2)
      } µs a row (${path}, median of 5); ` +
        `row-wise through the language ${oldUs.toFixed(1)} µs a row`,
    );
  }
  return {
    goals: [{ name: "rowwise", value: worst, unit: "µs a row", op: "<=", target: 5 }],
    lines,
  };
}

if (import.meta.main) {
  const r = measure();
  for (const l of r.lines) console.log(l);
  const { formatGoal } = await import("./goal.ts");
  for (const g of r.goals) console.log(formatGoal(g));
}
