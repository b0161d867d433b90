import assert from "node:assert/strict";
import { regularChart, scoreChart } from "../lib/acuity_scoring.ts";
import { LentilInputError, LentilRangeError } from "../lib/errors.ts";

const close = (a: number | null, b: number, tol = 1e-9) =>
  assert.ok(a !== null && Math.abs(a - b) <= tol, `${a} ≠ ${b}`);

const chart = regularChart(); // 1.0 to −0.3, five letters a line

Deno.test("a line read in full with every larger line scores its own size", () => {
  // Bailey & Lovie 1976: each line of the design scores its logMAR when read in full
  for (let k = 1; k <= 14; k++) {
    const read = chart.map((_, i) => (i < k ? 5 : 0));
    const s = scoreChart(chart, read);
    close(s.letterLogMAR, chart[k - 1].logMAR);
    close(s.lineLogMAR, chart[k - 1].logMAR);
  }
});

Deno.test("letter by letter: 0.02 logMAR per letter on five-letter lines", () => {
  // Bailey & Lovie 1976: 0.02 per letter
  const read = [5, 5, 5, 5, 5, 5, 5, 5, 4, 3, 1, 0, null, null];
  const s = scoreChart(chart, read);
  close(s.letterLogMAR, 1.1 - 0.02 * 48);
  // more-than-half rule: 3 of 5 on 0.1 credits it; 1 of 5 on 0.0 does not (common practice, no source)
  close(s.lineLogMAR, 0.1);
  assert.equal(s.lineMissed, 2);
  assert.equal(s.nextLineRead, 1);
  assert.equal(s.lettersRead, 48);
});

Deno.test("the per-letter value on lines of other lengths and steps", () => {
  // general rule: the step from the next larger line over the letters on the line
  const lines = [
    { logMAR: 1.0, letters: 1 },
    { logMAR: 0.7, letters: 2 },
    { logMAR: 0.5, letters: 4 },
    { logMAR: 0.4, letters: 8 },
  ];
  const s = scoreChart(lines, [1, 2, 4, 2]);
  assert.deepEqual(s.lines.map((l) => l.perLetter), [0.3, 0.15, 0.05, 0.0125]);
  close(s.letterLogMAR, 0.5 - 2 * 0.0125);
  close(s.lineLogMAR, 0.5); // 2 of 8 is not more than half
  // lines given in any order are sorted largest first
  const shuffled = scoreChart([lines[2], lines[0], lines[3], lines[1]], [4, 1, 2, 2]);
  close(shuffled.letterLogMAR, 0.475);
});

Deno.test("lines above the start, skipped lines and lines not attempted are stated", () => {
  // Bailey & Lovie 1976 (0.02 per letter); counting unread lines: common practice, no source
  const read = [null, null, null, 5, 5, null, 5, 4, 3, 1, 0, null, null, null];
  const s = scoreChart(chart, read);
  assert.deepEqual(
    s.lines.slice(0, 7).map((l) => l.status),
    ["above-start", "above-start", "above-start", "read", "read", "skipped", "read"],
  );
  assert.equal(s.lines[12].status, "not-attempted");
  close(s.letterLogMAR, 1.1 - 0.02 * 43);
  assert.equal(s.notes.length, 3);
  assert.match(s.notes[0], /3 lines larger than line 4 \(0\.70 logMAR\)/);
  assert.match(s.notes[1], /line 6 \(0\.50 logMAR\) was skipped/);
  assert.match(s.notes[2], /smaller than line 11/);
});

Deno.test("a partial line on top and an uncredited line above a credited one", () => {
  // more-than-half rule: common practice, no source
  const s = scoreChart(chart, [2, 5, 5, ...Array(11).fill(null)]);
  close(s.lineLogMAR, 0.8);
  assert.ok(s.notes.some((n) => /line 1 \(1\.00 logMAR\) was not credited/.test(n)));
  const none = scoreChart(chart, [0, 0, ...Array(12).fill(null)]);
  assert.equal(none.letterLogMAR, null);
  assert.equal(none.lineLogMAR, null);
});

Deno.test("bad chart readings name the line", () => {
  assert.throws(
    () => scoreChart(chart, [5, 6, ...Array(12).fill(null)]),
    (e) => e instanceof LentilRangeError && /line 2 \(0\.90 logMAR\)/.test(e.message),
  );
  assert.throws(() => scoreChart(chart, Array(14).fill(null)), LentilInputError);
  assert.throws(() => scoreChart([], []), LentilInputError);
  assert.throws(() => scoreChart(chart, [5]), LentilInputError);
  assert.throws(
    () => scoreChart([{ logMAR: 0.3, letters: 5 }, { logMAR: 0.3, letters: 5 }], [5, 5]),
    LentilInputError,
  );
});
