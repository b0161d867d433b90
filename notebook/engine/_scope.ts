/**
 * A mathjs scope for one table row: the row's column values over the notebook's scope.
 * mathjs accepts any object with the Map interface as a scope.
 *
 * @module
 */

/** A read-mostly layered map: `row` first, then `base`. Writes go to `row`. */
export class RowScope {
  readonly row = new Map<string, unknown>();
  /** @param base the notebook scope underneath. */
  constructor(readonly base: ReadonlyMap<string, unknown>) {}
  get(key: string): unknown {
    return this.row.has(key) ? this.row.get(key) : this.base.get(key);
  }
  has(key: string): boolean {
    return this.row.has(key) || this.base.has(key);
  }
  set(key: string, value: unknown): this {
    this.row.set(key, value);
    return this;
  }
  delete(key: string): boolean {
    return this.row.delete(key);
  }
  clear(): void {
    this.row.clear();
  }
  get size(): number {
    return new Set([...this.base.keys(), ...this.row.keys()]).size;
  }
  *keys(): MapIterator<string> {
    yield* new Set([...this.base.keys(), ...this.row.keys()]);
  }
  *values(): MapIterator<unknown> {
    for (const k of this.keys()) yield this.get(k);
  }
  *entries(): MapIterator<[string, unknown]> {
    for (const k of this.keys()) yield [k, this.get(k)];
  }
  [Symbol.iterator](): MapIterator<[string, unknown]> {
    return this.entries();
  }
  forEach(cb: (value: unknown, key: string, map: RowScope) => void): void {
    for (const [k, v] of this.entries()) cb(v, k, this);
  }
  get [Symbol.toStringTag](): string {
    return "RowScope";
  }
}
