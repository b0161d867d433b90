import assert from "node:assert/strict";
import { jStat } from "./_jstat.ts";
import {
  guessAnyLine,
  guessChance,
  guessChanceDistinct,
  letterSetSize,
  naiveGuessChance,
} from "../lib/guessing.ts";
import { LentilInputError, LentilRangeError } from "../lib/errors.ts";

const close = (a: number, b: number, tol = 1e-12, what = "") =>
  assert.ok(Math.abs(a - b) <= tol, `${what} ${a} ≠ ${b}`);

Deno.test("binomial tail against jstat's binomial CDF", () => {
  // jstat (npm): P(X ≥ k) = 1 − CDF(k − 1); jstat rounds its CDF to 10 decimals
  for (const m of [2, 4, 8, 9, 10, 26]) {
    for (const n of [1, 3, 5, 8]) {
      for (let k = 1; k <= n; k++) {
        const ref = 1 - jStat.binomial.cdf(k - 1, n, 1 / m);
        close(guessChance(m, n, k), ref, 1e-9, `m=${m} n=${n} k=${k}`);
      }
    }
  }
});

Deno.test("the naive figure: three letters from nine is 1 in 729", () => {
  // common practice, no source
  close(naiveGuessChance(9, 3), 1 / 729);
  // the exact chance is larger: the other letters of the line may be the right ones
  assert.ok(guessChance(9, 5, 3) > naiveGuessChance(9, 3));
  // with exactly the needed letters on the line the two agree
  close(guessChance(9, 3, 3), naiveGuessChance(9, 3));
});

function bruteDistinct(m: number, n: number, k: number): number {
  // every ordered selection of n distinct letters named, against the line 0..n−1
  let hit = 0;
  let all = 0;
  const walk = (seq: number[]) => {
    if (seq.length === n) {
      all++;
      if (seq.filter((x, i) => x === i).length >= k) hit++;
      return;
    }
    for (let x = 0; x < m; x++) if (!seq.includes(x)) walk([...seq, x]);
  };
  walk([]);
  return hit / all;
}

Deno.test("no-repetition form against direct enumeration", () => {
  // checked by direct enumeration of every ordered selection (no outside source needed)
  for (const [m, n] of [[3, 3], [5, 3], [6, 4], [8, 5], [10, 5]]) {
    for (let k = 0; k <= n; k++) {
      close(guessChanceDistinct(m, n, k), bruteDistinct(m, n, k), 1e-12, `m=${m} n=${n} k=${k}`);
    }
  }
  // a whole line of three from a set of three: 1 of 3! orders
  close(guessChanceDistinct(3, 3, 3), 1 / 6);
});

Deno.test("forced-choice optotypes use the same tail", () => {
  // a ring with 4 gap positions, 5 rings on the line, 3 needed (jstat reference)
  close(guessChance(4, 5, 3), 1 - jStat.binomial.cdf(2, 5, 0.25), 1e-9);
  close(guessChance(8, 5, 3), 1 - jStat.binomial.cdf(2, 5, 0.125), 1e-9);
  // with repetition allowed, a set smaller than the count needed is fine
  close(guessChance(4, 8, 5), 1 - jStat.binomial.cdf(4, 8, 0.25), 1e-9);
});

Deno.test("one or more of several lines in a row", () => {
  // any probability text: P(one or more of L independent lines) = 1 − (1 − p)^L
  const p = guessChance(10, 5, 3);
  close(guessAnyLine(10, 5, 3, 1), p);
  close(guessAnyLine(10, 5, 3, 3), 1 - (1 - p) ** 3);
  close(guessAnyLine(10, 5, 3, 2, true), 1 - (1 - guessChanceDistinct(10, 5, 3)) ** 2);
});

Deno.test("letter sets by their letters or a count", () => {
  // Sloan 1959 (from memory): ten letters C D H K N O R S V Z
  assert.equal(letterSetSize("CDHKNORSVZ"), 10);
  assert.equal(letterSetSize("c, d, h"), 3);
  assert.throws(
    () => letterSetSize("CDHC"),
    (e) => e instanceof LentilInputError && /repeats C/.test(e.message),
  );
  assert.throws(() => letterSetSize(1), LentilRangeError);
  assert.throws(() => letterSetSize("A"), LentilInputError);
});

Deno.test("a letter set with fewer letters than needed is refused", () => {
  // common practice, no source: a set smaller than the line cannot fill it without repetition
  assert.throws(
    () => guessChanceDistinct(3, 5, 4),
    (e) => e instanceof LentilInputError && /3 letters, fewer than the 4 needed/.test(e.message),
  );
  assert.throws(() => guessChanceDistinct(4, 5, 3), LentilInputError);
  assert.throws(() => guessChance(10, 5, 6), LentilRangeError);
  assert.throws(() => guessChance(10, 2.5, 1), LentilInputError);
});
