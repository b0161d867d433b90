/**
 * An evaluation budget per cell: a notebook is first evaluated in a worker that is stopped
 * when one cell computes longer than the time budget, or the process grows past the memory
 * budget while it does. The cell is then known, and the notebook can be evaluated without
 * it (the engine's `overBudget` option), so one slow or huge formula never freezes the
 * thread that serves the page or saves the file.
 *
 * @example
 * ```ts ignore
 * import { EvaluationBudget } from "./budget.ts";
 * const budget = new EvaluationBudget({ timeMs: 2000 });
 * const slow = await budget.trial({ text, file: "a.lentil.md", dir: ".", csv: [], skip: [] });
 * if (slow) console.log(slow.id, slow.message);
 * budget.close();
 * ```
 *
 * @module
 */

/** What a trial evaluates. */
export interface TrialInput {
  /** The notebook's text. */
  readonly text: string;
  /** Its file name (for positions). */
  readonly file: string;
  /** Its folder (CSV files not in `csv` are read from there). */
  readonly dir: string;
  /** CSV texts as the session holds them, by the name `file:` gives. */
  readonly csv: readonly (readonly [string, string])[];
  /** Cells already over budget, not evaluated. */
  readonly skip: readonly (readonly [string, OverBudget])[];
}

/** A cell that went over budget: its expression then and what to show. */
export interface OverBudget {
  /** The expression that exceeded the budget. */
  readonly expression: string;
  /** The message shown at the cell. */
  readonly message: string;
}

/** Limits of one cell's evaluation. */
export interface BudgetLimits {
  /** Longest time one cell may compute, in ms (default 3,000). */
  readonly timeMs?: number;
  /** Most the process may grow while it does, in bytes (default 1 GiB). */
  readonly memoryBytes?: number;
}

type WorkerMessage = { type: "start"; id: string; expression?: string } | { type: "done" };

/** Runs trials in a worker it stops and replaces when a cell goes over budget. */
export class EvaluationBudget {
  readonly timeMs: number;
  readonly memoryBytes: number;
  #worker?: Worker;
  /** CSV texts the current worker holds. */
  readonly #sent = new Map<string, string>();

  /** @param limits time and memory per cell. */
  constructor(limits: BudgetLimits = {}) {
    this.timeMs = limits.timeMs ?? 3000;
    this.memoryBytes = limits.memoryBytes ?? 1024 ** 3;
  }

  #spawn(): Worker {
    this.#worker ??= new Worker(new URL("./_budget_worker.ts", import.meta.url).href, {
      type: "module",
    });
    return this.#worker;
  }

  /**
   * Evaluate `input` in the worker. Resolves with the first cell that went over budget
   * (its id, expression and message), or undefined when every cell finished in time.
   */
  trial(input: TrialInput): Promise<({ id: string } & OverBudget) | undefined> {
    const fresh = !this.#worker;
    const worker = this.#spawn();
    if (fresh) this.#sent.clear();
    // CSV texts go over once; later trials send only those that changed.
    const csv = input.csv.filter(([rel, text]) => this.#sent.get(rel) !== text);
    for (const [rel, text] of csv) this.#sent.set(rel, text);
    input = { ...input, csv };
    const base = Deno.memoryUsage().rss;
    return new Promise((resolve) => {
      let current: { id: string; expression: string } | undefined;
      let timer: ReturnType<typeof setTimeout> | undefined;
      const finish = (over?: { id: string } & OverBudget, kill = !!over) => {
        clearTimeout(timer);
        clearInterval(poll);
        worker.onmessage = null;
        worker.onerror = null;
        if (kill) {
          worker.terminate();
          this.#worker = undefined;
        }
        resolve(over);
      };
      const stop = (why: string) => {
        // A table (not a cell) over budget: stop, and let the session read it itself.
        if (!current) return finish(undefined, true);
        finish({ id: current.id, expression: current.expression, message: why });
      };
      const arm = () => {
        clearTimeout(timer);
        timer = setTimeout(
          () =>
            stop(
              `stopped: this cell computed for more than ${
                this.timeMs / 1000
              } s, the limit for one cell (simplify the formula, or split it)`,
            ),
          this.timeMs,
        );
      };
      const poll = setInterval(() => {
        if (Deno.memoryUsage().rss - base > this.memoryBytes) {
          stop(
            `stopped: this cell needed more than ${
              Math.round(this.memoryBytes / 1024 ** 2)
            } MB of memory, the limit for one cell (use smaller sizes)`,
          );
        }
      }, 25);
      worker.onmessage = (e: MessageEvent<WorkerMessage>) => {
        if (e.data.type === "done") return finish();
        current = e.data.expression === undefined
          ? undefined
          : { id: e.data.id, expression: e.data.expression };
        // Only cells are timed: the worker's start and reading a table are not a cell's.
        if (current) arm();
        else clearTimeout(timer);
      };
      worker.onerror = (e) => {
        e.preventDefault();
        stop("stopped: this cell could not be evaluated within the limits for one cell");
      };
      worker.postMessage(input);
    });
  }

  /** Stop the worker. */
  close(): void {
    this.#worker?.terminate();
    this.#worker = undefined;
  }
}
