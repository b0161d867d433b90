/**
 * The dependency graph of a notebook: topological order, cycles with their path, and the
 * set of nodes downstream of a change.
 *
 * @example
 * ```ts
 * import { DependencyGraph } from "./graph.ts";
 * const g = new DependencyGraph(new Map([["a", []], ["b", ["a"]], ["c", ["b"]]]));
 * g.order; // ["a", "b", "c"]
 * [...g.downstream(["b"])]; // ["b", "c"]
 * ```
 *
 * @module
 */

/** A graph built from each node's dependencies. */
export class DependencyGraph {
  /** Nodes in an order where every node comes after what it depends on (cycles last). */
  readonly order: readonly string[];
  /** Each cycle found, as its members in dependency order (a depends on b: a → b). */
  readonly cycles: readonly (readonly string[])[];
  readonly #rank = new Map<string, number>();
  readonly #dependents = new Map<string, string[]>();
  readonly #deps: ReadonlyMap<string, readonly string[]>;

  /**
   * @param deps each node's dependencies; names not in the map are ignored.
   */
  constructor(deps: ReadonlyMap<string, readonly string[]>) {
    this.#deps = deps;
    for (const id of deps.keys()) this.#dependents.set(id, []);
    for (const [id, ds] of deps) {
      for (const d of ds) this.#dependents.get(d)?.push(id);
    }
    this.cycles = findCycles(deps);
    const inCycle = new Set(this.cycles.flat());
    // Kahn's algorithm in document order; cycle members and their dependents come last.
    const indegree = new Map<string, number>();
    for (const [id, ds] of deps) indegree.set(id, ds.filter((d) => deps.has(d)).length);
    const order: string[] = [];
    const ready: string[] = [];
    for (const id of deps.keys()) if (indegree.get(id) === 0) ready.push(id);
    let head = 0;
    while (head < ready.length) {
      const id = ready[head++];
      order.push(id);
      for (const dep of this.#dependents.get(id)!) {
        const k = indegree.get(dep)! - 1;
        indegree.set(dep, k);
        if (k === 0) ready.push(dep);
      }
    }
    const placed = new Set(order);
    for (const id of deps.keys()) if (!placed.has(id) && inCycle.has(id)) placed.add(id);
    for (const id of deps.keys()) if (!placed.has(id)) placed.add(id);
    this.order = [...placed];
    this.order.forEach((id, i) => this.#rank.set(id, i));
  }

  /** Dependencies of a node. */
  depsOf(id: string): readonly string[] {
    return this.#deps.get(id) ?? [];
  }

  /** Direct dependents of a node. */
  dependentsOf(id: string): readonly string[] {
    return this.#dependents.get(id) ?? [];
  }

  /** Position of a node in {@linkcode order}. */
  rank(id: string): number {
    return this.#rank.get(id) ?? -1;
  }

  /**
   * The given nodes and everything that depends on them, in evaluation order.
   */
  downstream(changed: Iterable<string>): string[] {
    const seen = new Set<string>();
    const stack = [...changed].filter((id) => this.#rank.has(id));
    while (stack.length) {
      const id = stack.pop()!;
      if (seen.has(id)) continue;
      seen.add(id);
      for (const d of this.#dependents.get(id)!) if (!seen.has(d)) stack.push(d);
    }
    return [...seen].sort((a, b) => this.#rank.get(a)! - this.#rank.get(b)!);
  }
}

/** Strongly connected components with more than one node, or a self-loop (Tarjan). */
function findCycles(deps: ReadonlyMap<string, readonly string[]>): string[][] {
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const out: string[][] = [];
  let counter = 0;
  const visit = (v: string) => {
    // Iterative Tarjan to stay safe on long chains.
    const work: [string, number][] = [[v, 0]];
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    while (work.length) {
      const top = work[work.length - 1];
      const [node, i] = top;
      const ds = (deps.get(node) ?? []).filter((d) => deps.has(d));
      if (i < ds.length) {
        top[1]++;
        const w = ds[i];
        if (!index.has(w)) {
          index.set(w, counter);
          low.set(w, counter++);
          stack.push(w);
          onStack.add(w);
          work.push([w, 0]);
        } else if (onStack.has(w)) low.set(node, Math.min(low.get(node)!, index.get(w)!));
        continue;
      }
      work.pop();
      if (work.length) {
        const parent = work[work.length - 1][0];
        low.set(parent, Math.min(low.get(parent)!, low.get(node)!));
      }
      if (low.get(node) === index.get(node)) {
        const comp: string[] = [];
        let w: string;
        do {
          w = stack.pop()!;
          onStack.delete(w);
          comp.push(w);
        } while (w !== node);
        const selfLoop = comp.length === 1 && (deps.get(node) ?? []).includes(node);
        if (comp.length > 1 || selfLoop) out.push(cyclePath(comp, deps));
      }
    }
  };
  for (const v of deps.keys()) if (!index.has(v)) visit(v);
  return out;
}

/** Order a component's members along one cycle through them, starting at the first. */
function cyclePath(comp: string[], deps: ReadonlyMap<string, readonly string[]>): string[] {
  const members = new Set(comp);
  const start = [...deps.keys()].find((k) => members.has(k))!;
  // Breadth-first search for the shortest way back to start.
  const prev = new Map<string, string>();
  const queue = [start];
  let head = 0;
  while (head < queue.length) {
    const v = queue[head++];
    for (const w of deps.get(v) ?? []) {
      if (!members.has(w)) continue;
      if (w === start) {
        const path = [v];
        let u = v;
        while (u !== start) {
          u = prev.get(u)!;
          path.push(u);
        }
        return path.reverse();
      }
      if (!prev.has(w)) {
        prev.set(w, v);
        queue.push(w);
      }
    }
  }
  return comp;
}
