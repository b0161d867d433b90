import assert from "node:assert/strict";
import { parseNotebook } from "../notebook/format/parse.ts";
import {
  appendLineEdit,
  applyEdit,
  calcBlock,
  expressionEdit,
  formatRow,
  optionValueEdit,
  tableRowsEdit,
} from "../notebook/live/_splice.ts";

const TABLE = [
  "Before.",
  "",
  "```lentil table trials",
  "lens [D] | va [logMAR]",
  "+1.00    | 0.30",
  "# a comment between rows",
  "+0.75    | 0.20",
  "+0.50    | 0.10",
  "```",
  "After.",
  "",
].join("\n");

function rowsEdit(text: string, rows: string[][]): string {
  return applyEdit(text, tableRowsEdit(text, parseNotebook(text, "t").tables[0], rows));
}

Deno.test("an expression edit keeps name, spacing and note byte for byte", () => {
  const text = "Prose.\n\n```lentil\nvd   =  13 mm     # at the fitting\n```\n";
  const cell = parseNotebook(text, "a").cells[0];
  const out = applyEdit(text, expressionEdit(cell.exprSpan, "14 mm"));
  assert.equal(out, "Prose.\n\n```lentil\nvd   =  14 mm     # at the fitting\n```\n");
});

Deno.test("a new cell goes before the closing fence, in the file's line ending", () => {
  const text = "```lentil\r\nx = 1\r\n```\r\nTail\r\n";
  const block = calcBlock(parseNotebook(text, "a"), 0)!;
  assert.equal(
    applyEdit(text, appendLineEdit(text, block, "y = x")),
    "```lentil\r\nx = 1\r\ny = x\r\n```\r\nTail\r\n",
  );
});

Deno.test("table rows: unchanged rows and comments stay, a new row lines up under the header", () => {
  const out = rowsEdit(TABLE, [["+1.00", "0.30"], ["+0.75", "0.20"], ["+0.50", "0.10"], [
    "+0.25",
    "0.05",
  ]]);
  assert.equal(out, TABLE.replace("+0.50    | 0.10\n", "+0.50    | 0.10\n+0.25    | 0.05\n"));
});

Deno.test("table rows: same rows give the same text; an edited row keeps its comment", () => {
  assert.equal(rowsEdit(TABLE, [["+1.00", "0.30"], ["+0.75", "0.20"], ["+0.50", "0.10"]]), TABLE);
  const out = rowsEdit(TABLE, [["+1.00", "0.30"], ["+0.75", "0.25"], ["+0.50", "0.10"]]);
  assert.equal(out, TABLE.replace("+0.75    | 0.20", "+0.75    | 0.25"));
});

Deno.test("table rows: reorder moves lines as written; delete keeps an orphaned comment", () => {
  const moved = rowsEdit(TABLE, [["+0.50", "0.10"], ["+1.00", "0.30"], ["+0.75", "0.20"]]);
  assert.equal(
    moved,
    TABLE.replace(
      "+1.00    | 0.30\n# a comment between rows\n+0.75    | 0.20\n+0.50    | 0.10\n",
      "+0.50    | 0.10\n+1.00    | 0.30\n# a comment between rows\n+0.75    | 0.20\n",
    ),
  );
  const dropped = rowsEdit(TABLE, [["+1.00", "0.30"], ["+0.50", "0.10"]]);
  assert.equal(
    dropped,
    TABLE.replace("+0.75    | 0.20\n", ""),
  );
  const none = rowsEdit(TABLE, []);
  assert.equal(
    none,
    TABLE.replace("+1.00    | 0.30\n", "").replace(/\+0\.\d\d {4}\| 0\.\d0\n/g, ""),
  );
});

Deno.test("table rows: an empty table gets rows after its header; | is escaped", () => {
  const text = "```lentil table t\na | b\n```\n";
  assert.equal(rowsEdit(text, [["1", "x|y"]]), "```lentil table t\na | b\n1 | x\\|y\n```\n");
  assert.equal(
    parseNotebook(rowsEdit(text, [["1", "x|y"]]), "t").tables[0].rows[0].cells[1],
    "x|y",
  );
});

Deno.test("formatRow pads to the header's cells and keeps its indent", () => {
  assert.equal(formatRow(["1", "2", "3"], "  aa [D] | b | c"), "  1        | 2 | 3");
});

Deno.test("optionValueEdit replaces only the value", () => {
  const text = "```lentil table v\nfile:   visits.csv  \n```\n";
  const opt = parseNotebook(text, "n").tables[0].options.file;
  assert.equal(
    applyEdit(text, optionValueEdit(text, opt, "v2.csv")),
    "```lentil table v\nfile:   v2.csv  \n```\n",
  );
});
