/**
 * Progress of a long table read: the event readers send (rows so far, the part of the file
 * done), and a printer for stderr that shows rows, rows per second, percent and time left —
 * in place on a terminal, as an occasional plain line otherwise. The same events are what a
 * live page can forward while a big table loads.
 *
 * @module
 */

import { countText } from "../lib/number_text.ts";

/** How far a table read has come. */
export interface ProgressEvent {
  /** The table. */
  readonly table: string;
  /** Its file. */
  readonly file: string;
  /** Rows read so far (an estimate while reading in-process: lines seen). */
  readonly rows: number;
  /** Part of the file done, 0–1, when known. */
  readonly fraction?: number;
  /** True on the last event of a read. */
  readonly done?: boolean;
}

/** Receives progress events. */
export type ProgressListener = (e: ProgressEvent) => void;

/** One progress line in words. */
export function progressLine(e: ProgressEvent, seconds: number): string {
  const rate = seconds > 0 ? e.rows / seconds : 0;
  const parts = [
    `reading ${e.file} (table ${e.table}): ${countText(e.rows)} rows`,
    `${countText(rate)} rows/s`,
  ];
  if (e.fraction !== undefined && e.fraction >= 0) {
    parts.push(`${Math.floor(e.fraction * 100)}%`);
    if (!e.done && e.fraction > 0.01) {
      const left = seconds * (1 - e.fraction) / e.fraction;
      parts.push(
        `about ${left < 60 ? `${Math.ceil(left)} s` : `${Math.ceil(left / 60)} min`} left`,
      );
    }
  }
  if (e.done) parts.push(`done in ${seconds.toFixed(1)} s`);
  return parts.join(", ");
}

/**
 * A listener that prints progress to stderr: rewritten in place on a terminal (a few times a
 * second), else one plain line every `every` seconds; nothing for reads shorter than `after`
 * seconds.
 *
 * @example
 * ```ts
 * import { progressPrinter } from "./progress.ts";
 * const lines: string[] = [];
 * const p = progressPrinter({ write: (s) => lines.push(s), terminal: false, after: 0, every: 0 });
 * p({ table: "eyes", file: "eyes.csv", rows: 1000, fraction: 0.5 });
 * lines[0].includes("1,000 rows"); // true
 * ```
 */
export function progressPrinter(
  options: {
    write?: (text: string) => void;
    terminal?: boolean;
    after?: number;
    every?: number;
  } = {},
): ProgressListener {
  const enc = new TextEncoder();
  const write = options.write ?? ((s: string) => {
    const b = enc.encode(s);
    for (let off = 0; off < b.length;) off += Deno.stderr.writeSync(b.subarray(off));
  });
  const terminal = options.terminal ?? Deno.stderr.isTerminal();
  const after = options.after ?? 1;
  const every = options.every ?? (terminal ? 0.25 : 5);
  const started = new Map<string, number>();
  let last = 0;
  let shown = false;
  return (e) => {
    const now = performance.now() / 1000;
    const t0 = started.get(e.table) ?? now;
    started.set(e.table, t0);
    const seconds = now - t0;
    if (!e.done && (seconds < after || now - last < every)) return;
    if (e.done && !shown) return; // a short read shows nothing
    last = now;
    shown = true;
    const line = progressLine(e, seconds);
    if (terminal) write(`\r\x1b[2K${line}${e.done ? "\n" : ""}`);
    else write(`${line}\n`);
    if (e.done) {
      started.delete(e.table);
      shown = false;
    }
  };
}

/**
 * Wrap a file's byte stream so it reports progress: lines seen and the part of `size` read.
 *
 * @example
 * ```ts ignore
 * const counted = countingStream(file.readable, size, (rows, fraction) => listener({ ... }));
 * ```
 */
export async function* countingStream(
  source: AsyncIterable<Uint8Array>,
  size: number,
  report: (rows: number, fraction: number, done: boolean) => void,
): AsyncGenerator<Uint8Array> {
  let bytes = 0;
  let lines = 0;
  for await (const chunk of source) {
    bytes += chunk.length;
    for (let i = chunk.indexOf(10); i >= 0; i = chunk.indexOf(10, i + 1)) lines++;
    report(Math.max(0, lines - 1), size ? bytes / size : 0, false);
    yield chunk;
  }
  report(Math.max(0, lines - 1), 1, true);
}
