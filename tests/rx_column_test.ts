import assert from "node:assert/strict";
import { parsePrescription } from "../lib/prescription.ts";
import { fastRx, readRxColumn } from "../cells/_rx_column.ts";
import { seeded } from "../lib/seeded.ts";
import { getLanguage } from "../cells/language.ts";

/** What the prescription parser gives, or its error message. */
function reference(text: string): [number, number, number] | string {
  try {
    const p = parsePrescription(text);
    return [p.sphere, p.cylinder, p.axis];
  } catch (e) {
    return (e as Error).message;
  }
}

function column(text: string): [number, number, number] | string {
  try {
    const r = readRxColumn([text]);
    return [r.sph[0], r.cyl[0], r.axis[0]];
  } catch (e) {
    return (e as Error).message.replace(/^column rx, row 1: /, "");
  }
}

// The same inputs as the prescription parser's own tests and the trade's written forms
// (common practice, no source), plus the edges of its checks.
const CASES = [
  "-2.25 / -0.75 x 170",
  "-2.25 -0.75 x 170",
  "-2.25/-0.75x170",
  "−2.25 / −0.75 × 170",
  "-2.25 -0.75 @ 170",
  "-2.25 DS / -0.75 DC x 170°",
  "+1.00 DS",
  "-3.00 sph",
  "pl",
  "plano",
  "PLANO",
  "plano / -0.50 x 90",
  "-1.00 -0.50 x 0",
  "-1.00 / -0.50 x 180",
  "-1.00 / -0.50 x 181",
  "-1.00 / -0.50 x 90.5",
  "-3.375 / -0.125 x 90",
  "-3.3755 / -0.125 x 90",
  "-2,00 / -0,50 x 90",
  "-2,25 / -0,75 x 170",
  "+0.50 / -0.25 x 180 add +2.00",
  "R -2.25 / -0.75 x 170",
  "L: +1.00 DS 1.5 BU",
  "-40.00 DS",
  "+35.00 / -1.00 x 10",
  "-2.00 / -12.00 x 10",
  "-2.00 / +0.50 x 10",
  "0 / 0 x 0",
  "-0.00",
  "  -1.25  /  -0.50  x  45  ",
  "-1.25 / -0.50 x",
  "abc",
  "-1.25 /",
];

Deno.test("the rx column parser gives what the prescription parser gives, on the same inputs", () => {
  for (const text of CASES) assert.deepEqual(column(text), reference(text), text);
});

Deno.test("the rx column parser agrees with the prescription parser on 20,000 generated texts", () => {
  // seeded generator; forms and values invented (common practice, no source)
  const g = seeded(11);
  const seps = [" / ", "/", " ", " /"];
  const xs = [" x ", "x", " × ", " @ "];
  for (let i = 0; i < 20000; i++) {
    const s = (Math.round((-32 + 64 * g()) * 8) / 8).toFixed(g() < 0.5 ? 2 : 3);
    const c = (-Math.round(14 * g() * 8) / 8).toFixed(2);
    const a = String(Math.floor(185 * g()));
    const sign = g() < 0.3 && !s.startsWith("-") ? "+" : "";
    const text = g() < 0.15
      ? `${sign}${s}${g() < 0.5 ? " DS" : ""}`
      : `${sign}${s}${seps[i % 4]}${c}${xs[(i >> 2) % 4]}${a}`;
    assert.deepEqual(column(text), reference(text), text);
  }
});

Deno.test("the rx column parser takes prescription values and empty cells", () => {
  const lang = getLanguage();
  const v = lang.compile(lang.parse('rx("-1.50 / -0.25 x 20")')).evaluate({});
  const r = readRxColumn([v, "", null, "-1.00 DS"]);
  assert.deepEqual([...r.sph], [-1.5, NaN, NaN, -1]);
  assert.deepEqual([...r.axis], [20, NaN, NaN, 180]);
  assert.equal(fastRx("R -1.00 DS"), undefined);
  assert.throws(() => readRxColumn(["-1.00 DS", "x"], "subjective"), /column subjective, row 2:/);
});
