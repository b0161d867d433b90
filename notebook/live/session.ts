/**
 * One live editing session on one notebook file. Every edit replaces the text of a span of
 * the file (an expression, a table's row lines, a new line in a calc block) and is then
 * re-parsed, so what the user did not touch stays byte-for-byte; an edit to an existing
 * cell goes through the reactive engine's `update`, which recomputes only what depends on
 * it. Undo and redo are stacks of exact text states. Tables read from CSV keep their edits
 * in memory and are written to their file only when their data was edited. Saving refuses
 * to overwrite a file that changed on disk since it was read.
 *
 * @example
 * ```ts ignore
 * import { LiveSession } from "./session.ts";
 * const s = await LiveSession.open("case.lentil.md");
 * s.setExpression("spectacle", "-6.00 D").recomputed; // ["spectacle", "cornea"]
 * await s.save();
 * ```
 *
 * @module
 */

import { basename, dirname, join, resolve } from "node:path";
import { stringify as stringifyCsv } from "csv-stringify/sync";
import { Notebook } from "../engine/engine.ts";
import { decodeNotebook } from "../format/read.ts";
import {
  isLiteral,
  type NotebookDoc,
  noteStart,
  parseNotebook,
  type TableBlock,
} from "../format/parse.ts";
import {
  changedOnDisk,
  type Fingerprint,
  fingerprintOf,
  SaveError,
  type SaveFailure,
  writeAtomic,
} from "./save.ts";
import {
  appendLineEdit,
  applyEdit,
  calcBlock,
  expressionEdit,
  lineEnding,
  optionValueEdit,
  tableRowsEdit,
  type TextEdit,
} from "./_splice.ts";
import { bareName, insideFolder } from "./_paths.ts";
import { EXPORT_RENDERERS, remembering } from "./_markup.ts";
import { readRawTable } from "../engine/_tables.ts";
import { countingStream, type ProgressListener } from "../progress.ts";
import { type BudgetLimits, EvaluationBudget, type OverBudget } from "../engine/budget.ts";
import {
  buildPageView,
  type CellView,
  type PageView,
  type PlotView,
  type Renderers,
  type TableText,
  type TableView,
} from "./_views.ts";

/** Where the session stands. */
export interface SessionStatus {
  /** The notebook's file name. */
  readonly file: string;
  /** Unsaved changes exist. */
  readonly dirty: boolean;
  /** CSV files with unsaved edits. */
  readonly dirtyFiles: readonly string[];
  /** Undo is possible. */
  readonly canUndo: boolean;
  /** Redo is possible. */
  readonly canRedo: boolean;
}

/** What changed on the page after an operation. */
export interface Patch {
  /** The whole page, when its block structure changed (then the lists below are empty). */
  readonly full?: PageView;
  /** Cells whose view changed. */
  readonly cells: readonly CellView[];
  /** Cells that no longer exist. */
  readonly removed: readonly string[];
  /**
   * Tables whose view changed: the whole view, or only the computed columns that changed
   * and the row problems, when the rows and the shape are as before.
   */
  readonly tables: readonly (TableView | TableUpdate)[];
  /** Plots whose view changed. */
  readonly plots: readonly PlotView[];
  /** Numbered sources, when they changed (the page keeps what it has otherwise). */
  readonly sources?: PageView["sources"];
  /** Cautions, when they changed. */
  readonly cautions?: PageView["cautions"];
  /** The one cautions section's markup, when it changed. */
  readonly cautionsHtml?: PageView["cautionsHtml"];
  /** Parse problems, when they changed. */
  readonly problems?: PageView["problems"];
  /** Status after the operation. */
  readonly status: SessionStatus;
}

/** The parts below the notebook a patch carries only when they changed. */
const FOOTER_PARTS = ["sources", "cautions", "cautionsHtml", "problems"] as const;

/** A table whose data rows and shape are unchanged: its changed computed columns. */
export interface TableUpdate {
  /** Table name. */
  readonly name: string;
  /** Always true: only what is listed changed. */
  readonly update: true;
  /** The computed columns whose values changed. */
  readonly computed: TableView["computed"];
  /** Row problems, all of them. */
  readonly problems: TableView["problems"];
}

/** The part of a table's view that changes only with its rows or shape. */
function tableShape(t: TableView): string {
  return JSON.stringify([
    t.file,
    t.editable,
    t.locked,
    t.columns,
    t.rows,
    t.computed.map((c) => c.name),
    t.error,
  ]);
}

/** What to send for a table whose view changed. */
function tableChange(before: TableView | undefined, after: TableView): TableView | TableUpdate {
  if (!before || tableShape(before) !== tableShape(after)) return after;
  const computed = after.computed.filter((c, i) =>
    before.computed[i].values !== c.values &&
    JSON.stringify(before.computed[i].values) !== JSON.stringify(c.values)
  );
  return { name: after.name, update: true, computed, problems: after.problems };
}

/** The outcome of an edit. */
export interface EditResult {
  /** False when the edit was refused (nothing changed); `error` says why. */
  readonly ok: boolean;
  /** Why an edit was refused. */
  readonly error?: string;
  /** Node ids the engine recomputed, in order. */
  readonly recomputed: readonly string[];
  /** What to change on the page. */
  readonly patch: Patch;
}

/** The outcome of a save. */
export type SaveResult =
  | { readonly ok: true; readonly written: readonly string[]; readonly status: SessionStatus }
  | { readonly ok: false; readonly conflict: readonly string[]; readonly status: SessionStatus }
  | {
    readonly ok: false;
    readonly conflict: readonly [];
    /** Why the files could not be written ("cannot save: the disk is full; …"). */
    readonly error: string;
    /** What kind of failure. */
    readonly reason: SaveFailure;
    /** Files written before the failure (each complete). */
    readonly written: readonly string[];
    readonly status: SessionStatus;
  };

/** An edit the session refuses; nothing was changed. */
export class EditRefused extends Error {
  /** @param message why. */
  constructor(message: string) {
    super(message);
    this.name = "EditRefused";
  }
}

interface CsvEntry {
  /** Text as on disk when read (or last saved). */
  disk: string;
  /** Current text. */
  text: string;
  /** Byte-order mark on disk. */
  bom: boolean;
  /** Fingerprint of what was read. */
  base?: Fingerprint;
  bytes: Uint8Array;
  mtime: number;
}

interface TextState {
  readonly text: string;
  readonly csv: ReadonlyMap<string, string>;
}

/** Thrown to end a dry run once the new state is known. */
const DRY_RUN = Symbol("dry run");

/** Undo keeps this many states. */
const UNDO_LIMIT = 200;

const BOM = new Uint8Array([0xef, 0xbb, 0xbf]);

function stamp(d = new Date()): string {
  const p = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}${p(d.getMonth() + 1)}${p(d.getDate())}-${p(d.getHours())}${
    p(d.getMinutes())
  }${p(d.getSeconds())}`;
}

/** An edit whose previous edit evaluated within this many ms may skip the worker's trial. */
export const QUICK_EDIT_MS = 150;

/** A live editing session on one notebook file. */
export class LiveSession {
  #path: string;
  #dir: string;
  #text = "";
  #bom = false;
  #saved = "";
  #base?: Fingerprint;
  #doc!: NotebookDoc;
  #nb!: Notebook;
  #view!: PageView;
  readonly #csv = new Map<string, CsvEntry>();
  readonly #csvRead = new Map<
    string,
    { text: string; options: string; raw: TableText | undefined }
  >();
  readonly #undo: TextState[] = [];
  readonly #redo: TextState[] = [];
  readonly #renderers: Renderers;
  /** Set when an edit changed the engine in place (so undoing it means rebuilding). */
  #touched = false;
  /** Trials each new state in a worker first, when given. */
  readonly #budget?: EvaluationBudget;
  /** Cells that went over the budget, not evaluated while their expression stays. */
  readonly #overBudget = new Map<string, OverBudget>();
  /** How long the last edit's evaluation took (ms); none yet counts as slow. */
  #lastEditMs = Infinity;
  /** While set, an edit only computes its new text (see {@linkcode guarded}). */
  #dry = false;
  #candidate?: { text: string; csv: [string, string][] };

  private constructor(path: string, renderers: Renderers, budget?: EvaluationBudget) {
    this.#path = path;
    this.#dir = dirname(resolve(path));
    this.#renderers = remembering(renderers);
    this.#budget = budget;
  }

  /**
   * Open a notebook file for editing.
   *
   * @example
   * ```ts ignore
   * const s = await LiveSession.open("case.lentil.md");
   * ```
   * @throws {Error} when the file cannot be read or is not valid UTF-8.
   */
  static async open(
    path: string,
    options: {
      renderers?: Renderers;
      budget?: EvaluationBudget | BudgetLimits;
      onProgress?: ProgressListener;
    } = {},
  ): Promise<LiveSession> {
    const budget = options.budget instanceof EvaluationBudget
      ? options.budget
      : options.budget
      ? new EvaluationBudget(options.budget)
      : undefined;
    const s = new LiveSession(path, options.renderers ?? EXPORT_RENDERERS, budget);
    s.#onProgress = options.onProgress;
    await s.#readFromDisk();
    return s;
  }

  async #readFromDisk(): Promise<void> {
    const stat = await Deno.stat(this.#path);
    const bytes = await Deno.readFile(this.#path);
    const decoded = decodeNotebook(bytes, this.#path);
    if (!decoded.ok) throw new Error(decoded.diagnostic.message);
    this.#bom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
    this.#text = decoded.text;
    this.#saved = decoded.text;
    this.#base = await fingerprintOf(bytes, stat);
    this.#csv.clear();
    const doc = parseNotebook(this.#text, this.#path);
    await this.#readTablesAhead(doc);
    await this.#trial({ text: this.#text, csv: [] });
    const start = performance.now();
    this.#rebuild(doc);
    this.#lastEditMs = performance.now() - start;
    this.#view = this.#buildView();
    await this.#settleCsv();
  }

  /** Fingerprint CSV files read since the last call. */
  async #settleCsv(): Promise<void> {
    for (const e of this.#csv.values()) {
      e.base ??= await fingerprintOf(e.bytes, { mtime: e.mtime ? new Date(e.mtime) : null });
    }
  }

  /** The notebook file being edited (as given, or the copy after "keep both"). */
  get path(): string {
    return this.#path;
  }

  /** The current text of the notebook. */
  get text(): string {
    return this.#text;
  }

  /** The current text of a CSV file the notebook reads, if it was read. */
  csvText(rel: string): string | undefined {
    return this.#csv.get(rel)?.text;
  }

  /** The evaluated notebook. */
  get notebook(): Notebook {
    return this.#nb;
  }

  /** The whole page as it stands. */
  get view(): PageView {
    return this.#view;
  }

  /** Status: dirty, undo, redo. */
  status(): SessionStatus {
    const dirtyFiles = [...this.#csv].filter(([, e]) => e.text !== e.disk).map(([k]) => k);
    return {
      file: basename(this.#path),
      dirty: this.#text !== this.#saved || dirtyFiles.length > 0,
      dirtyFiles,
      canUndo: this.#undo.length > 0,
      canRedo: this.#redo.length > 0,
    };
  }

  #readCsv(rel: string): string {
    const hit = this.#csv.get(rel);
    if (hit) return hit.text;
    const full = insideFolder(this.#dir, rel);
    // A device or pipe would never end (or never answer): only a regular file is read.
    if (!Deno.statSync(full).isFile) {
      throw new Error("it is not a regular file (a device, pipe or folder?)");
    }
    const bytes = Deno.readFileSync(full);
    return this.#keepCsv(rel, bytes, Deno.statSync(full).mtime?.getTime() ?? 0);
  }

  #keepCsv(rel: string, bytes: Uint8Array, mtime: number): string {
    const bom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
    const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(
      bom ? bytes.subarray(3) : bytes,
    );
    this.#csv.set(rel, { disk: text, text, bom, bytes, mtime });
    return text;
  }

  /** Told how far the reading of table files has come while the notebook opens. */
  #onProgress?: ProgressListener;

  /**
   * Read the notebook's table files before it is evaluated, in chunks, telling
   * {@linkcode #onProgress} as they come (the server answers the page meanwhile). A file
   * that cannot be read here is left to the evaluation, which says why at its table.
   */
  async #readTablesAhead(doc: NotebookDoc): Promise<void> {
    const listen = this.#onProgress;
    for (const block of doc.tables) {
      const rel = block.options.file?.value;
      if (!rel || this.#csv.has(rel)) continue;
      let full: string;
      let stat: Deno.FileInfo;
      try {
        full = insideFolder(this.#dir, rel);
        stat = await Deno.stat(full);
        if (!stat.isFile) continue;
      } catch {
        continue;
      }
      const parts: Uint8Array[] = [];
      let size = 0;
      try {
        // The stream closes the file when it ends or fails.
        const file = await Deno.open(full, { read: true });
        const report = (rows: number, fraction: number, done: boolean) =>
          listen?.({ table: block.name, file: rel, rows, fraction, done });
        for await (const chunk of countingStream(file.readable, stat.size, report)) {
          parts.push(chunk);
          size += chunk.length;
        }
      } catch {
        continue;
      }
      const bytes = new Uint8Array(size);
      let at = 0;
      for (const p of parts) {
        bytes.set(p, at);
        at += p.length;
      }
      this.#keepCsv(rel, bytes, stat.mtime?.getTime() ?? 0);
    }
  }

  #engineOptions() {
    return {
      host: { readText: (rel: string) => this.#readCsv(rel) },
      overBudget: this.#overBudget,
    };
  }

  /**
   * Run an edit under the evaluation budget: its new text is first evaluated in a worker,
   * and a cell that computes too long or grows too large there is stopped and marked, so
   * the edit then applies here with that cell shown as an error (never evaluated here).
   * Without a budget, the edit simply runs.
   *
   * @example
   * ```ts ignore
   * const r = await session.guarded(() => session.setExpression("n", "bellNumbers(20000)"));
   * r.patch.cells[0].error; // "stopped: this cell computed for more than 3 s …"
   * ```
   */
  async guarded(edit: () => EditResult, quick = false): Promise<EditResult> {
    if (!this.#budget) return edit();
    // A new value for an input of a notebook whose last evaluation was quick (see
    // isQuickEdit): no formula changed, and a formula's cost over the same data is bounded
    // (no loops, ranges capped, the library's costly functions refused), so the edit runs here
    // at typing speed.
    if (quick) return this.#timed(edit);
    this.#dry = true;
    this.#candidate = undefined;
    try {
      edit();
    } catch {
      // A refusal shows when the edit runs for real, below.
    } finally {
      this.#dry = false;
    }
    const candidate = this.#candidate;
    this.#candidate = undefined;
    if (candidate) await this.#trial(candidate);
    return this.#timed(edit);
  }

  /** Run an edit for real, remembering how long its evaluation took. */
  #timed(edit: () => EditResult): EditResult {
    const start = performance.now();
    try {
      return edit();
    } finally {
      this.#lastEditMs = performance.now() - start;
    }
  }

  /**
   * Whether setting cell `id` to `expression` may skip the worker's trial in
   * {@linkcode guarded}: the cell is an input, the new text is a literal too, no cell it
   * feeds builds a range, and the last edit evaluated in under {@linkcode QUICK_EDIT_MS} ms.
   *
   * @example
   * ```ts ignore
   * session.isQuickEdit("vd", "13 mm"); // true after a quick edit of the same notebook
   * ```
   */
  isQuickEdit(id: string, expression: string): boolean {
    const r = this.#nb.result(id);
    return !!r && r.kind === "cell" && r.input && !this.#overBudget.has(id) &&
      isLiteral(expression) && this.#lastEditMs < QUICK_EDIT_MS && !this.#feedsRange(id);
  }

  /**
   * Whether a cell downstream of `id` builds a range (`a:b`), the one construct whose amount
   * of work a value decides; a formula's own counts are bounded by its declared ranges.
   */
  #feedsRange(id: string): boolean {
    for (const d of this.#nb.graph.downstream([id])) {
      const expression = this.#nb.result(d)?.expression;
      if (expression?.includes(":") && this.#buildsRange(expression)) return true;
    }
    return false;
  }

  /** Expressions already looked at for a range (a formula is parsed once, not per keystroke). */
  readonly #ranges = new Map<string, boolean>();

  #buildsRange(expression: string): boolean {
    let found = this.#ranges.get(expression);
    if (found === undefined) {
      try {
        found = this.#nb.language.parse(expression).filter((n) =>
          n.type === "RangeNode"
        ).length > 0;
      } catch {
        found = true;
      }
      this.#ranges.set(expression, found);
    }
    return found;
  }

  /** Trial a state in the budget's worker until no cell goes over (marking those that do). */
  async #trial(state: { text: string; csv: [string, string][] }): Promise<void> {
    if (!this.#budget) return;
    for (let round = 0; round < 50; round++) {
      const slow = await this.#budget.trial({
        text: state.text,
        file: this.#path,
        dir: this.#dir,
        csv: state.csv,
        skip: [...this.#overBudget],
      });
      if (!slow) return;
      this.#overBudget.set(slow.id, { expression: slow.expression, message: slow.message });
    }
  }

  /** In a dry run, record the new state and stop before anything is evaluated. */
  #stopIfDry(text: string): void {
    if (!this.#dry) return;
    this.#candidate = { text, csv: [...this.#csv].map(([k, e]) => [k, e.text]) };
    throw DRY_RUN;
  }

  /** Stop the budget's worker (when the server stops). */
  close(): void {
    this.#budget?.close();
  }

  /** Evaluate the current text again (`doc` when the caller has parsed it already). */
  #rebuild(doc: NotebookDoc = parseNotebook(this.#text, this.#path)): string[] {
    this.#doc = doc;
    const options = this.#engineOptions();
    if (!this.#nb) {
      this.#nb = new Notebook(this.#doc, options);
      return this.#nb.evaluateAll();
    }
    // Only what the edit changed, and what depends on it, is evaluated again.
    const { notebook, recomputed } = Notebook.reconcile(this.#nb, this.#doc, options);
    this.#nb = notebook;
    return recomputed;
  }

  #tableText(block: TableBlock): TableText | undefined {
    // The engine's own reading of a table's text, over the CSV as the page holds it.
    const file = block.options.file?.value;
    if (file && !this.#csv.has(file)) return undefined;
    const read = () => {
      const raw = readRawTable(block, this.#path, { readText: (rel) => this.#csv.get(rel)!.text })
        .raw;
      // Rows the reader skipped are not in the grid: editing it would drop them on save.
      return raw?.rows.some((r) => r.bad) ? undefined : raw;
    };
    if (!file) return read();
    // A CSV's text is read again only when it or the block's options changed.
    const text = this.#csv.get(file)!.text;
    const options = JSON.stringify(Object.entries(block.options).map(([k, o]) => [k, o.value]));
    const hit = this.#csvRead.get(block.name);
    if (hit && hit.text === text && hit.options === options) return hit.raw;
    const raw = read();
    this.#csvRead.set(block.name, { text, options, raw });
    return raw;
  }

  #buildView(): PageView {
    return buildPageView(
      this.#nb,
      this.#doc,
      basename(this.#path),
      this.#renderers,
      (b) => this.#tableText(b),
    );
  }

  #snapshot(): TextState {
    return { text: this.#text, csv: new Map([...this.#csv].map(([k, e]) => [k, e.text])) };
  }

  #restore(s: TextState): void {
    this.#text = s.text;
    for (const [k, t] of s.csv) {
      const e = this.#csv.get(k);
      if (e) e.text = t;
    }
  }

  #push(): void {
    this.#undo.push(this.#snapshot());
    if (this.#undo.length > UNDO_LIMIT) this.#undo.shift();
    this.#redo.length = 0;
  }

  /** Compare the page before and after, and describe what changed. */
  #patch(before: PageView): Patch {
    const after = this.#view = this.#buildView();
    const status = this.status();
    if (
      JSON.stringify(before.blocks) !== JSON.stringify(after.blocks) || before.title !== after.title
    ) {
      return { full: after, cells: [], removed: [], tables: [], plots: [], status };
    }
    const differs = <T>(a: T | undefined, b: T) =>
      a !== b && JSON.stringify(a) !== JSON.stringify(b);
    const footer = Object.fromEntries(
      FOOTER_PARTS.filter((k) => differs(before[k], after[k])).map((k) => [k, after[k]]),
    );
    return {
      cells: Object.values(after.cells).filter((c) => differs(before.cells[c.id], c)),
      removed: Object.keys(before.cells).filter((id) => !after.cells[id]),
      tables: Object.values(after.tables).filter((t) => differs(before.tables[t.name], t))
        .map((t) => tableChange(before.tables[t.name], t)),
      plots: Object.values(after.plots).filter((p) => differs(before.plots[p.key], p)),
      ...footer,
      status,
    };
  }

  /**
   * Run a change of the session's state as one step that applies in full or not at all:
   * when anything in it throws, the text, the CSV texts, the document, the engine, the page
   * and both undo stacks are put back as they were, and the edit is refused with the reason.
   */
  #atomically(change: () => EditResult): EditResult {
    const kept = {
      text: this.#text,
      csv: [...this.#csv.values()].map((e) => [e, e.text] as const),
      doc: this.#doc,
      nb: this.#nb,
      view: this.#view,
      undo: [...this.#undo],
      redo: [...this.#redo],
    };
    this.#touched = false;
    try {
      return change();
    } catch (e) {
      if (e instanceof EditRefused) throw e;
      this.#text = kept.text;
      for (const [entry, text] of kept.csv) entry.text = text;
      this.#doc = kept.doc;
      this.#nb = kept.nb;
      if (this.#touched) {
        this.#nb = new Notebook(kept.doc, this.#engineOptions());
        this.#nb.evaluateAll();
      }
      this.#view = kept.view;
      this.#undo.splice(0, this.#undo.length, ...kept.undo);
      this.#redo.splice(0, this.#redo.length, ...kept.redo);
      if (e === DRY_RUN) throw e;
      return {
        ok: false,
        error: `the edit was not applied (nothing changed): ${(e as Error).message}`,
        recomputed: [],
        patch: this.#samePage(),
      };
    }
  }

  /** A patch that changes nothing on the page (built without rendering it again). */
  #samePage(): Patch {
    return { cells: [], removed: [], tables: [], plots: [], status: this.status() };
  }

  /** Apply a text edit of the notebook as one undoable step, re-parse and re-evaluate. */
  #commitText(edit: TextEdit, fast?: { id: string; expression: string }): EditResult {
    return this.#atomically(() => {
      const before = this.#view;
      this.#push();
      const oldDoc = this.#doc;
      const text = applyEdit(this.#text, edit);
      this.#stopIfDry(text);
      const doc = parseNotebook(text, this.#path);
      this.#text = text;
      let recomputed: string[];
      if (fast && this.#sameShape(oldDoc, doc, fast)) {
        // The engine changes in place: should it fail, it is rebuilt from the old text.
        this.#touched = true;
        this.#doc = doc;
        recomputed = this.#nb.update(fast.id, fast.expression);
      } else {
        recomputed = this.#rebuild(doc);
      }
      return { ok: true, recomputed, patch: this.#patch(before) };
    });
  }

  /** Whether only the one cell's expression changed, so the engine can update in place. */
  #sameShape(a: NotebookDoc, b: NotebookDoc, fast: { id: string; expression: string }): boolean {
    if (a.cells.length !== b.cells.length || a.blocks.length !== b.blocks.length) return false;
    if (JSON.stringify(a.diagnostics) !== JSON.stringify(b.diagnostics)) return false;
    if (!this.#nb.result(fast.id)) return false;
    return a.cells.every((c, i) => {
      const d = b.cells[i];
      if (c.name !== d.name || c.table !== d.table || c.line !== d.line || c.note !== d.note) {
        return false;
      }
      const id = c.table ? `${c.table}.${c.name}` : c.name;
      return id === fast.id ? d.expression === fast.expression : c.expression === d.expression;
    });
  }

  #cellDef(id: string) {
    const r = this.#nb.result(id);
    if (!r || r.kind === "table") throw new EditRefused(`no cell "${id}" to change`);
    const cell = this.#doc.cells.find((c) => c.line === r.line);
    if (!cell) throw new EditRefused(`no cell "${id}" to change`);
    return cell;
  }

  /**
   * Change the expression of a cell or computed column (an input's value or a formula).
   * What was typed is kept even when it does not parse: the cell then shows the error.
   *
   * @example
   * ```ts ignore
   * session.setExpression("vd", "13 mm");
   * ```
   * @throws {EditRefused} when there is no such cell or the text spans lines.
   */
  setExpression(id: string, expression: string): EditResult {
    if (/[\r\n]/.test(expression)) throw new EditRefused("an expression is one line");
    if (noteStart(expression) >= 0) {
      // Saved as typed, the text after # would be read back as the cell's note.
      throw new EditRefused("# starts a note: a formula cannot hold # outside quotes");
    }
    const cell = this.#cellDef(id);
    const expr = expression.trim();
    if (expr === cell.expression) return this.#unchanged();
    return this.#commitText(expressionEdit(cell.exprSpan, expr), { id, expression: expr });
  }

  #unchanged(): EditResult {
    return { ok: true, recomputed: [], patch: this.#patch(this.#view) };
  }

  /**
   * Append `name = expression` as a new line at the end of a calc block (by its index among
   * the calc blocks). A line that is not `name = expression` is refused and nothing changes.
   *
   * @example
   * ```ts ignore
   * session.addCell(0, "near = 1 / 40 cm");
   * ```
   * @throws {EditRefused} when the block does not exist or the text spans lines.
   */
  addCell(blockIndex: number, line: string): EditResult {
    if (/[\r\n]/.test(line)) throw new EditRefused("a cell is one line");
    const block = calcBlock(this.#doc, blockIndex);
    if (!block) throw new EditRefused(`no calc block number ${blockIndex + 1}`);
    const trimmed = line.trim();
    const edit = appendLineEdit(this.#text, block, trimmed);
    const trial = parseNotebook(applyEdit(this.#text, edit), this.#path);
    const grown = calcBlock(trial, blockIndex);
    if (!trimmed || !grown || grown.cells.length !== block.cells.length + 1) {
      return {
        ok: false,
        error: "expected `name = expression` (a note may follow after #)",
        recomputed: [],
        patch: this.#patch(this.#view),
      };
    }
    return this.#commitText(edit);
  }

  /**
   * Remove a cell's line.
   *
   * @example
   * ```ts ignore
   * session.deleteCell("near");
   * ```
   * @throws {EditRefused} when there is no such cell.
   */
  deleteCell(id: string): EditResult {
    const cell = this.#cellDef(id);
    let end = cell.span.end;
    if (this.#text[end] === "\r") end++;
    if (this.#text[end] === "\n") end++;
    return this.#commitText({ start: cell.span.start, end, text: "" });
  }

  /**
   * Give a table exactly these rows (cell text as typed). An inline table's row lines are
   * rewritten, keeping unchanged rows' text; a CSV table's file text is replaced in memory
   * and written on save.
   *
   * @example
   * ```ts ignore
   * session.setRows("trials", [["+1.00", "0.30"], ["+0.75", "0.20"]]);
   * ```
   * @throws {EditRefused} when there is no such table or it cannot be edited.
   */
  setRows(name: string, rows: readonly (readonly string[])[]): EditResult {
    const block = this.#doc.tables.find((t) => t.name === name);
    const view = this.#view.tables[name];
    if (!block || !view) throw new EditRefused(`no table "${name}"`);
    if (!view.editable) throw new EditRefused(`table ${name} cannot be edited: ${view.locked}`);
    if (rows.some((r) => r.some((c) => /[\r\n]/.test(c)))) {
      throw new EditRefused("a table cell is one line");
    }
    const clean = rows.map((r) => r.map((c) => c.trim()));
    const file = block.options.file?.value;
    if (!file) {
      if (JSON.stringify(clean) === JSON.stringify(block.rows.map((r) => r.cells))) {
        return this.#unchanged();
      }
      return this.#commitText(tableRowsEdit(this.#text, block, clean));
    }
    const entry = this.#csv.get(file)!;
    const next = csvWithRows(entry.text, clean);
    if (next === entry.text) return this.#unchanged();
    return this.#atomically(() => {
      const before = this.#view;
      this.#push();
      entry.text = next;
      this.#stopIfDry(this.#text);
      const recomputed = this.#rebuild();
      return { ok: true, recomputed, patch: this.#patch(before) };
    });
  }

  /**
   * Step back one edit.
   *
   * @example
   * ```ts ignore
   * session.undo();
   * ```
   */
  undo(): EditResult {
    return this.#step(this.#undo, this.#redo);
  }

  /**
   * Step forward again after an undo.
   *
   * @example
   * ```ts ignore
   * session.redo();
   * ```
   */
  redo(): EditResult {
    return this.#step(this.#redo, this.#undo);
  }

  #step(from: TextState[], to: TextState[]): EditResult {
    if (!from.length) return { ...this.#unchanged(), ok: false, error: "nothing to undo or redo" };
    return this.#atomically(() => {
      const s = from.pop()!;
      const before = this.#view;
      to.push(this.#snapshot());
      this.#restore(s);
      this.#stopIfDry(this.#text);
      const recomputed = this.#rebuild();
      return { ok: true, recomputed, patch: this.#patch(before) };
    });
  }

  /**
   * Files that changed on disk since they were read or saved (the notebook, CSV files).
   *
   * @example
   * ```ts ignore
   * (await session.changedFiles()).length; // 0 while nobody else edits
   * ```
   */
  async changedFiles(): Promise<string[]> {
    await this.#settleCsv();
    const out: string[] = [];
    if (await changedOnDisk(this.#path, this.#base)) out.push(basename(this.#path));
    for (const [rel, e] of this.#csv) {
      if (await changedOnDisk(join(this.#dir, rel), e.base)) out.push(rel);
    }
    return out;
  }

  /**
   * Write the notebook, and every CSV file whose data was edited, atomically with a backup.
   * Refuses, writing nothing, when any of those files changed on disk since it was read.
   *
   * @example
   * ```ts ignore
   * const r = await session.save();
   * if (!r.ok) console.log("changed on disk:", r.conflict);
   * ```
   */
  async save(): Promise<SaveResult> {
    const changed = await this.changedFiles();
    const dirty = new Set(this.status().dirtyFiles);
    const conflict = changed.filter((f) => f === basename(this.#path) || dirty.has(f));
    if (conflict.length) return { ok: false, conflict, status: this.status() };
    const written: string[] = [];
    // What is written is the state when Save was asked for, even if an edit lands meanwhile.
    const text = this.#text;
    const csv = [...dirty].map((rel) =>
      [rel, this.#csv.get(rel)!, this.#csv.get(rel)!.text] as const
    );
    try {
      this.#base = await writeAtomic(this.#path, this.#bytes(text, this.#bom));
      this.#saved = text;
      written.push(basename(this.#path));
      for (const [rel, e, t] of csv) {
        e.base = await writeAtomic(insideFolder(this.#dir, rel), this.#bytes(t, e.bom));
        e.disk = t;
        written.push(rel);
      }
    } catch (e) {
      if (!(e instanceof SaveError)) throw e;
      const why = e.reason === "read-only"
        ? "the folder is read-only"
        : e.reason === "disk-full"
        ? "the disk is full"
        : e.detail;
      return {
        ok: false,
        conflict: [],
        error: `cannot save: ${why}; your edits are kept in the page`,
        reason: e.reason,
        written,
        status: this.status(),
      };
    }
    return { ok: true, written, status: this.status() };
  }

  #bytes(text: string, bom: boolean): Uint8Array {
    const body = new TextEncoder().encode(text);
    if (!bom) return body;
    const out = new Uint8Array(body.length + 3);
    out.set(BOM);
    out.set(body, 3);
    return out;
  }

  /**
   * Drop the page's edits and read the files again from disk. The state before is kept on
   * the undo stack, so nothing typed is lost.
   *
   * @example
   * ```ts ignore
   * await session.reload();
   * ```
   */
  async reload(): Promise<EditResult> {
    const before = this.#view;
    const kept = this.#snapshot();
    await this.#readFromDisk();
    this.#undo.push({ text: kept.text, csv: new Map() });
    this.#redo.length = 0;
    const patch = this.#patch(before);
    return { ok: true, recomputed: [], patch };
  }

  /**
   * Keep both versions: write the page's notebook (and its edited CSV files) as new files
   * beside the originals, leave the originals as they are on disk, and go on editing the
   * copy. Returns the copy's file name.
   *
   * @example
   * ```ts ignore
   * const { file } = await session.keepBoth();
   * ```
   * @throws {UnsafePathError} when `name` is not a plain `*.lentil.md` name.
   * @throws {EditRefused} when a file of that name exists.
   */
  async keepBoth(name?: string): Promise<{ file: string; written: string[]; patch: Patch }> {
    const stem = basename(this.#path).replace(/\.lentil\.md$/, "");
    const tag = stamp();
    const copyName = bareName(name ?? `${stem}.edited-${tag}.lentil.md`, ".lentil.md");
    const copyPath = insideFolder(this.#dir, copyName);
    const dirty = this.status().dirtyFiles;
    const renames = new Map(
      dirty.map((rel) => [rel, rel.replace(/(\.[^./]+)?$/, `.edited-${tag}$1`)]),
    );
    for (const p of [copyPath, ...[...renames.values()].map((r) => insideFolder(this.#dir, r))]) {
      if (await Deno.lstat(p).then(() => true, () => false)) {
        throw new EditRefused(`${basename(p)} exists; choose another name`);
      }
    }
    // Point the copy's tables at the CSV copies, last option first so offsets hold.
    let text = this.#text;
    const opts = this.#doc.tables.map((t) => t.options.file).filter((o) =>
      o && renames.has(o.value)
    )
      .sort((a, b) => b!.line - a!.line);
    for (const o of opts) text = applyEdit(text, optionValueEdit(text, o!, renames.get(o!.value)!));
    const written: string[] = [];
    for (const [rel, copy] of renames) {
      const e = this.#csv.get(rel)!;
      await writeAtomic(insideFolder(this.#dir, copy), this.#bytes(e.text, e.bom));
      written.push(copy);
    }
    const before = this.#view;
    this.#base = await writeAtomic(copyPath, this.#bytes(text, this.#bom));
    written.unshift(copyName);
    // Continue on the copy: its CSV copies hold the edited data; the originals are untouched.
    for (const [rel, copy] of renames) {
      const e = this.#csv.get(rel)!;
      this.#csv.delete(rel);
      this.#csv.set(copy, {
        ...e,
        disk: e.text,
        base: undefined,
        bytes: this.#bytes(e.text, e.bom),
      });
      const st = await Deno.stat(insideFolder(this.#dir, copy));
      this.#csv.get(copy)!.mtime = st.mtime?.getTime() ?? 0;
    }
    this.#path = join(dirname(this.#path), copyName);
    this.#text = text;
    this.#saved = text;
    this.#undo.length = 0;
    this.#redo.length = 0;
    this.#rebuild();
    await this.#settleCsv();
    return { file: copyName, written, patch: this.#patch(before) };
  }

  /**
   * The text of a CSV file this notebook's tables read, by the name its `file:` option gives.
   *
   * @example
   * ```ts ignore
   * session.tableFile("trials.csv");
   * ```
   * @throws {UnsafePathError} for a name that could leave the folder.
   * @throws {EditRefused} when no table reads that file.
   */
  tableFile(rel: string): string {
    insideFolder(this.#dir, rel);
    if (!this.#doc.tables.some((t) => t.options.file?.value === rel)) {
      throw new EditRefused(`no table of this notebook reads "${rel}"`);
    }
    return this.#readCsv(rel);
  }
}

/** CSV text with its header line kept as written and the data rows replaced. */
function csvWithRows(text: string, rows: readonly (readonly string[])[]): string {
  const eol = lineEnding(text);
  const nl = text.indexOf("\n");
  const header = nl === -1 ? text : text.slice(0, text[nl - 1] === "\r" ? nl - 1 : nl);
  const trailing = /\r?\n$/.test(text) || nl === -1;
  const body = rows.length ? stringifyCsv(rows as string[][], { record_delimiter: eol }) : "";
  const joined = header + eol + body;
  return trailing ? joined : joined.replace(/\r?\n$/, "");
}
