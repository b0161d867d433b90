// Lentil's colours reach WCAG 2 AA contrast where they carry text or data. The formulas are
// WCAG 2.1's own definitions (W3C Recommendation): relative luminance of sRGB colours and the
// contrast ratio (L1 + 0.05) / (L2 + 0.05); text needs 4.5:1 (SC 1.4.3), graphics 3:1
// (SC 1.4.11). The browser tests check the rendered pages with axe-core as well.
import assert from "node:assert/strict";
import { FIGURE, PAGE, SERIES } from "../notebook/export/_palette.ts";

function luminance(hex: string): number {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
    .map((v) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
}

function contrast(a: string, b: string): number {
  const [x, y] = [luminance(a), luminance(b)].sort((p, q) => q - p);
  return (x + 0.05) / (y + 0.05);
}

Deno.test("contrast: the formula gives WCAG's own end points", () => {
  assert.equal(contrast("#000000", "#ffffff"), 21);
  assert.equal(contrast("#777777", "#777777"), 1);
  // #767676 on white is the lightest grey commonly quoted as passing 4.5:1 (from memory).
  assert.ok(contrast("#767676", "#ffffff") >= 4.5);
});

Deno.test("page text colours reach 4.5:1 on every background they sit on", () => {
  const texts = [PAGE.ink, PAGE.muted, PAGE.accent, PAGE.bad, PAGE.good, PAGE.caution];
  const grounds = [PAGE.paper, PAGE.band, PAGE.cautionBg, PAGE.badBg, PAGE.goodBg];
  for (const t of texts) {
    for (const g of grounds) {
      assert.ok(contrast(t, g) >= 4.5, `${t} on ${g}: ${contrast(t, g).toFixed(2)}`);
    }
  }
});

Deno.test("figure text reaches 4.5:1 and data colours 3:1 on white", () => {
  for (const t of [FIGURE.tick, FIGURE.title, FIGURE.marked, FIGURE.limits, FIGURE.fitted]) {
    assert.ok(contrast(t, "#ffffff") >= 4.5, `${t}: ${contrast(t, "#ffffff").toFixed(2)}`);
  }
  for (const c of [FIGURE.data, ...SERIES]) {
    assert.ok(contrast(c, "#ffffff") >= 3, `${c}: ${contrast(c, "#ffffff").toFixed(2)}`);
  }
  assert.ok(contrast(FIGURE.axis, "#ffffff") >= 3, "axis lines");
});

Deno.test("series colours are told apart from each other", () => {
  for (let i = 0; i < SERIES.length; i++) {
    for (let j = i + 1; j < SERIES.length; j++) assert.notEqual(SERIES[i], SERIES[j]);
  }
});
