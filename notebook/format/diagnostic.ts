/**
 * Positioned messages about a notebook: every problem the reader, parser or engine finds is
 * reported as `FILE:LINE:COL: message`, with 1-based line and column.
 *
 * @example
 * ```ts
 * import { formatDiagnostic } from "./diagnostic.ts";
 * formatDiagnostic({ file: "a.lentil.md", line: 3, col: 7, message: "unknown unit \"mn\"", severity: "error" });
 * // "a.lentil.md:3:7: unknown unit \"mn\""
 * ```
 *
 * @module
 */

/** How serious a diagnostic is: errors fail `lentil check`, warnings do not. */
export type Severity = "error" | "warning";

/** One positioned message. */
export interface Diagnostic {
  /** File the message is about (as the user named it). */
  readonly file: string;
  /** 1-based line. */
  readonly line: number;
  /** 1-based column. */
  readonly col: number;
  /** What is wrong and, where it helps, what was expected. */
  readonly message: string;
  /** Error or warning. */
  readonly severity: Severity;
}

/**
 * Render as `FILE:LINE:COL: message` (warnings get a `warning:` prefix on the message).
 *
 * @example
 * ```ts
 * import { formatDiagnostic } from "./diagnostic.ts";
 * formatDiagnostic({ file: "x", line: 1, col: 1, message: "m", severity: "warning" }); // "x:1:1: warning: m"
 * ```
 */
export function formatDiagnostic(d: Diagnostic): string {
  return `${d.file}:${d.line}:${d.col}: ${d.severity === "warning" ? "warning: " : ""}${d.message}`;
}

/** A position in a file, for values that point back to where they were written. */
export interface Position {
  /** 1-based line. */
  readonly line: number;
  /** 1-based column. */
  readonly col: number;
}
