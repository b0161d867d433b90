/**
 * Goals measured by `deno task bench`: each bench module returns the goals it measured in
 * the same run, and `bench/main.ts` prints one line per goal:
 * `goal NAME: VALUE UNIT (target OP VALUE) met` or `... short`.
 *
 * @example
 * ```ts
 * import { formatGoal } from "./goal.ts";
 * formatGoal({ name: "x", value: 60, unit: "×", op: ">=", target: 50 }); // "goal x: 60 × (target >= 50) met"
 * ```
 *
 * @module
 */

/** One measured goal. */
export interface Goal {
  /** Short name, kebab-case. */
  readonly name: string;
  /** Measured value. */
  readonly value: number;
  /** Unit of value and target. */
  readonly unit: string;
  /** Comparison that must hold. */
  readonly op: "<" | "<=" | ">" | ">=";
  /** Target. */
  readonly target: number;
}

/** Whether the goal is met. */
export function met(g: Goal): boolean {
  switch (g.op) {
    case "<":
      return g.value < g.target;
    case "<=":
      return g.value <= g.target;
    case ">":
      return g.value > g.target;
    case ">=":
      return g.value >= g.target;
  }
}

/** The goal line. */
export function formatGoal(g: Goal): string {
  const v = Number.isInteger(g.value)
    ? String(g.value)
    : g.value.toPrecision(4).replace(/\.?0+$/, "");
  return `goal ${g.name}: ${v} ${g.unit} (target ${g.op} ${g.target}) ${met(g) ? "met" : "short"}`;
}

/** Median of timings in ms of `fn` over `runs` runs after `warm` warm-up runs. */
export function medianMs(fn: () => void, runs = 15, warm = 3): number {
  for (let i = 0; i < warm; i++) fn();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    fn();
    t.push(performance.now() - s);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)];
}
