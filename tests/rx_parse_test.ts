import assert from "node:assert/strict";
import { parsePrescription, parsePrism } from "../lib/prescription.ts";
import { formatAxis, formatPrescription, formatPrism } from "../lib/prescription_format.ts";
import { LentilParseError } from "../lib/errors.ts";
import { randomRx } from "./_rx_helpers.ts";
import { seeded } from "../lib/seeded.ts";

const base = { sphere: -2.25, cylinder: -0.75, axis: 170 };

Deno.test("prescription: the notations practitioners write", () => {
  // common practice, no source: the written forms of one prescription
  for (
    const text of [
      "-2.25 / -0.75 x 170",
      "-2.25 -0.75 x 170",
      "-2.25/-0.75x170",
      "−2.25 / −0.75 × 170",
      "-2.25 -0.75 @ 170",
      "-2.25 -0.75 170",
      "-2.25 DS / -0.75 DC x 170°",
      "-2.25 sph -0.75 cyl axis 170",
    ]
  ) {
    assert.deepEqual(parsePrescription(text), base, text);
  }
  assert.deepEqual(parsePrescription("+1.00 DS"), { sphere: 1, cylinder: 0, axis: 180 });
  assert.deepEqual(parsePrescription("-3.00 sph"), { sphere: -3, cylinder: 0, axis: 180 });
  assert.deepEqual(parsePrescription("pl"), { sphere: 0, cylinder: 0, axis: 180 });
  assert.deepEqual(parsePrescription("plano / -0.50 x 90"), {
    sphere: 0,
    cylinder: -0.5,
    axis: 90,
  });
});

Deno.test("prescription: axis 0 is read as 180 (standard axis notation)", () => {
  // ISO 13666 / ISO 8429 axis notation (from memory): 0 and 180 are the same meridian
  assert.equal(parsePrescription("-1.00 -0.50 x 0").axis, 180);
  assert.equal(parsePrescription("-1.00 -0.50 x 180").axis, 180);
});

Deno.test("prescription: add, prism and eye", () => {
  const rx = parsePrescription("R: -2.25 -0.75 x 170 add +2.00 1.5 BU 2 BI");
  assert.deepEqual(rx, { ...base, add: 2, prism: { horizontal: 2, vertical: 1.5 }, eye: "R" });
  assert.deepEqual(parsePrescription("OS +1.00 DS 2 Δ BO").prism, { horizontal: -2, vertical: 0 });
  // 360-degree base notation, right eye: base 0° is base in (standard frame facing the wearer)
  const r = parsePrescription("R +1.00 DS 2 base 0").prism!;
  assert.deepEqual(r, { horizontal: 2, vertical: 0 });
  const l = parsePrescription("L +1.00 DS 2 B0").prism!;
  assert.deepEqual(l, { horizontal: -2, vertical: 0 });
  // base 90 and 270 are up and down for either eye, so no eye is needed
  assert.deepEqual(parsePrescription("+1.00 DS 1 base 270").prism, {
    horizontal: 0,
    vertical: -1,
  });
  // "base up" and "base in" are written as often as "base out" (common practice, no source)
  for (
    const [text, prism] of [
      ["R -1.00 DS 2 base in", { horizontal: 2, vertical: 0 }],
      ["-1.00 DS 1.5 base up", { horizontal: 0, vertical: 1.5 }],
      ["-1.00 DS 1.5 base down", { horizontal: 0, vertical: -1.5 }],
      ["-1.00 DS 2 Δ base out", { horizontal: -2, vertical: 0 }],
    ] as const
  ) assert.deepEqual(parsePrescription(text).prism, prism, text);
  assert.deepEqual(parsePrism("R 1 base up 2 base in").prism, { horizontal: 2, vertical: 1 });
  assert.deepEqual(parsePrism("L 2 Δ base out"), {
    prism: { horizontal: -2, vertical: 0 },
    eye: "L",
  });
});

function parseError(text: string): LentilParseError {
  try {
    parsePrescription(text);
  } catch (e) {
    assert.ok(e instanceof LentilParseError, `${text}: ${e}`);
    return e;
  }
  assert.fail(`${text} should not parse`);
}

Deno.test("prescription: errors say which part was wrong and what was expected", () => {
  const cases: [string, RegExp, number][] = [
    ["-2.25 -0.75 x 181", /axis 181 is outside the accepted range 0–180/, 14],
    ["-2.25 -0.75", /cylinder -0\.75 needs an axis/, 11],
    ["-2.2575 DS", /sphere -2\.2575 is finer than instruments write: at most three decimals/, 0],
    ["-2.25 -0.7555 x 90", /cylinder -0\.7555 is finer than instruments write/, 6],
    ["-2.00 -1.00 x 17.5", /axis 17\.5: expected whole degrees/, 14],
    ["-2.00 / x 90", /expected the cylinder after "\/"/, 8],
    ["-2.00 -1.00 x 90 2 base 30", /needs the eye/, 24],
    ["-2.00 -1.00 x 90 2 BX", /expected the prism base after 2: BU, BD, BI, BO/, 19],
    ["-2.00 x 90", /an axis needs a cylinder before it/, 6],
    ["-2.00 add", /expected the add power/, 9],
    ["-2.00 add +9.00", /add \+9\.00 D is outside the accepted range 0\.25–6 D/, 10],
    ["-45.00 DS", /sphere -45\.00 D is outside the accepted range -40–40 D/, 0],
    ["sphere", /expected the sphere/, 0],
    ["", /expected a prescription/, 0],
    ["-2.00 # 3", /unexpected character "#"/, 6],
  ];
  for (const [text, message, offset] of cases) {
    const e = parseError(text);
    assert.match(e.message, message, text);
    assert.equal(e.offset, offset, `${text}: offset of the wrong part`);
  }
});

Deno.test("format: the trade's way", () => {
  // common practice, no source: signed two-decimal powers, axis 1–180, DS, plano
  assert.equal(formatPrescription(base), "-2.25 / -0.75 × 170");
  assert.equal(formatPrescription({ sphere: 1, cylinder: 0, axis: 180 }), "+1.00 DS");
  assert.equal(formatPrescription({ sphere: 0, cylinder: 0, axis: 90 }), "plano");
  assert.equal(formatPrescription({ sphere: 0, cylinder: -0.5, axis: 90 }), "plano / -0.50 × 90");
  assert.equal(formatPrescription({ sphere: 0.5, cylinder: 0.25, axis: 0 }), "+0.50 / +0.25 × 180");
  assert.equal(formatAxis(179.6), "180");
  assert.equal(formatAxis(0.2), "180");
  assert.equal(formatPrism({ horizontal: -1, vertical: -0.5 }), "1.00 Δ BO, 0.50 Δ BD");
  assert.equal(
    formatPrescription({ ...base, add: 2.5, prism: { horizontal: 1, vertical: 0 }, eye: "L" }),
    "L: -2.25 / -0.75 × 170, add +2.50, 1.00 Δ BI",
  );
});

Deno.test("property: format then parse returns the prescription", () => {
  const next = seeded(3);
  for (let i = 0; i < 500; i++) {
    const rx = randomRx(next);
    const back = parsePrescription(formatPrescription(rx));
    if (rx.cylinder === 0) {
      assert.deepEqual(back, { sphere: rx.sphere, cylinder: 0, axis: 180 });
    } else {
      assert.deepEqual(back, rx);
    }
  }
  const full = parsePrescription("R: -2.25 -0.75 x 170 add +2.00 1.5 BU 2 BO");
  assert.deepEqual(parsePrescription(formatPrescription(full)), full);
});

Deno.test("a meridian's prism given twice is refused rather than silently combined", () => {
  // Common practice, no source: a prescription states each meridian's prism once.
  assert.throws(
    () => parsePrescription("-1.00 DS 2 BU 3 BD"),
    /vertical \(up\/down\) prism is given twice/,
  );
  assert.throws(
    () => parsePrescription("R: -1.00 DS 1 BI 2 BO"),
    /horizontal \(in\/out\) prism is given twice/,
  );
  const both = parsePrescription("R: -1.00 DS 2 BU 1.5 BI");
  assert.equal(both.prism?.vertical, 2);
});
