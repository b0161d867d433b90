// Plot blocks: each figure renders SVG with its marks; problems are named; cell values read.
import assert from "node:assert/strict";
import { loadNotebook } from "../notebook/load.ts";
import { Notebook } from "../notebook/engine/engine.ts";
import type { PlotBlock } from "../notebook/format/parse.ts";
import { MAX_PLOT_POINTS, PLOT_FIGURES, renderPlot } from "../notebook/export/plot.ts";
import { signed } from "../cells/display.ts";
import { limitsOf, markOf, outlineOf, pointsOf } from "../notebook/export/_plot_values.ts";

const FIXTURE = new URL("./fixtures/export-plots.lentil.md", import.meta.url).pathname;

function plots(nb: Notebook): PlotBlock[] {
  return nb.doc.blocks.filter((b): b is PlotBlock => b.kind === "plot");
}

const loaded = await loadNotebook(FIXTURE);
if (!loaded.ok) throw new Error(loaded.diagnostic.message);
const nb = loaded.notebook;
const byName = new Map(plots(nb).map((b) => [b.name, renderPlot(b, nb)]));

/** The marks drawn in a part of a figure: each mark's path starts with `M x,y`. */
function marks(svg: string, part: string): [number, number][] {
  const g = new RegExp(`<g data-part="${part}">([^]*?)</g>`).exec(svg);
  if (!g) return [];
  return [...g[1].matchAll(/M(-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}

Deno.test("plot: the fixture has one plot of every figure, all without problems", () => {
  const kinds = plots(nb).map((b) => b.options.figure.value).sort();
  assert.deepEqual(kinds, [...PLOT_FIGURES].sort());
  for (const [name, p] of byName) {
    assert.deepEqual(p.problems, [], `plot ${name}`);
    assert.match(p.svg, /<svg[^>]*viewBox/);
  }
});

Deno.test("plot curve: line, marks, the endpoint marked in words and the fitted curve dashed", () => {
  const p = byName.get("focus")!;
  assert.match(p.svg, /data-part="curve"/);
  assert.equal(marks(p.svg, "rows").length, 10);
  assert.match(p.svg, /data-part="mark"/);
  assert.match(p.svg, /data-part="fitted"[^>]*stroke-dasharray="6 4"/);
  const ep = nb.value("ep");
  const json = nb.language.describe(ep).value as { endpoint: number };
  assert.ok(p.svg.includes(`endpoint ${signed(json.endpoint)} D`), "endpoint label");
  assert.equal(p.heading, "Acuity through focus");
});

Deno.test("plot scatter: a dot a row, coloured by group, with the ellipse outline", () => {
  const p = byName.get("vectors")!;
  assert.equal(marks(p.svg, "rows").length, 240);
  assert.match(p.svg, /data-part="ellipse"/);
  assert.ok(p.svg.includes(">j0 (D)<") && p.svg.includes(">j45 (D)<"));
  // Two series (R and L eyes) in two colours and shapes, with their key.
  assert.equal((p.svg.match(/data-series="/g) ?? []).length, 2);
  assert.match(p.svg, /data-part="key"[^]*>R<[^]*>L</);
});

Deno.test("plot distribution: bars counting every row", () => {
  const p = byName.get("spread_j0")!;
  const bars = /data-part="classes" d="([^"]*)"/.exec(p.svg)![1];
  assert.equal((bars.match(/M/g) ?? []).length, 20, "classes: 20");
  assert.ok(p.svg.includes("number of rows"));
});

Deno.test("plot agreement: dots, bias and the two limits labelled", () => {
  const p = byName.get("methods")!;
  assert.equal(marks(p.svg, "rows").length, 240);
  const loa = nb.language.describe(nb.value("loa")).value as Record<string, number>;
  for (
    const [label, key] of [
      ["bias", "bias"],
      ["lower limit of agreement", "lower"],
      ["upper limit of agreement", "upper"],
    ]
  ) {
    const t = `${label} ${signed(loa[key])} D`;
    assert.ok(p.svg.includes(t), t);
  }
  assert.ok(loa.lower < loa.bias && loa.bias < loa.upper);
  assert.ok(p.svg.includes("difference, auto − subjective [D]"));
});

function one(text: string) {
  const n = Notebook.fromText(text, "one.lentil.md");
  return renderPlot(plots(n)[0], n);
}

const T = "```lentil table t\na [D] | b | w [text]\n1 | 2 | x\n2 | 3 | y\n3 | 5 | z\n```\n\n";

Deno.test("plot problems: unknown figure, table, column, key, cell; a text column", () => {
  const cases: [string, RegExp][] = [
    ["figure: pie\ntable: t", /figure "pie" is not one of curve, scatter, distribution, agreement/],
    ["table: t", /needs `figure:`/],
    ["figure: scatter\ntable: nope\nhorizontal: a\nvertical: b", /no table "nope"/],
    [
      "figure: scatter\ntable: t\nhorizontal: zz\nvertical: b",
      /no column "zz" for horizontal \(columns: a, b, w\)/,
    ],
    [
      "figure: scatter\ntable: t\nhorizontal: w\nvertical: b",
      /column "w" for horizontal is not numeric/,
    ],
    [
      "kind: scatter\ntable: t\nx-axis: a\ny-axis: b",
      /unknown key "kind" \(valid keys: figure, table, horizontal, vertical, heading,/,
    ],
    ["figure: scatter\ntable: t\nhorizontal: a\nvertical: b\ncolour: red", /unknown key "colour"/],
    [
      "figure: curve\ntable: t\nhorizontal: a\nvertical: b\ninvert-y: yes",
      /unknown key "invert-y"/,
    ],
    [
      "figure: curve\ntable: t\nhorizontal: a\nvertical: b\nmark: ghost",
      /no cell named "ghost" for mark/,
    ],
    [
      "figure: scatter\ntable: t\nhorizontal: a\nvertical: b\nclasses: 3",
      /classes applies to distribution figures/,
    ],
    [
      "figure: distribution\ntable: t\nhorizontal: a\nclasses: 0",
      /classes: expected a whole number/,
    ],
    ["figure: scatter\ntable: t\nhorizontal: a", /needs `vertical:`/],
    [
      "figure: scatter\ntable: t\nhorizontal: a\nvertical: b\nbetter-up: maybe",
      /better-up: expected yes or no/,
    ],
  ];
  for (const [opts, re] of cases) {
    const p = one(T + "```lentil plot\n" + opts + "\n```\n");
    assert.ok(p.problems.some((d) => re.test(d.message)), `${opts}: ${JSON.stringify(p.problems)}`);
    assert.equal(p.svg, "");
  }
});

Deno.test("plot: a logMAR vertical axis puts better acuity up unless better-up: no", () => {
  const t = "```lentil table t\nlens [D] | va [logMAR]\n0 | 0.1\n1 | 0.4\n```\n\n```lentil plot\n" +
    "figure: curve\ntable: t\nhorizontal: lens\nvertical: va\n";
  // The y pixel of each dot: with better acuity up, the smaller logMAR (0.1) is higher (smaller y).
  const ys = (svg: string) => marks(svg, "rows").map(([, y]) => y);
  const up = ys(one(t + "```\n").svg);
  assert.ok(up[0] < up[1], String(up));
  const down = ys(one(t + "better-up: no\n```\n").svg);
  assert.ok(down[0] > down[1], String(down));
  const plain = "```lentil table t\nx | y\n0 | 0.1\n1 | 0.4\n```\n\n```lentil plot\n" +
    "figure: curve\ntable: t\nhorizontal: x\nvertical: y\n```\n";
  const other = ys(one(plain).svg);
  assert.ok(other[0] > other[1], "a column that is not logMAR is drawn upward");
});

Deno.test("plot: `cell.part` reads a part of a record value", () => {
  const base = T +
    "```lentil\nk = 3\n```\n\n```lentil plot\nfigure: curve\ntable: t\nhorizontal: a\nvertical: b\n";
  const ok = one(base + "mark: k\n```\n");
  assert.deepEqual(ok.problems, []);
  const bad = one(base + "mark: k.endpoint\n```\n");
  assert.ok(bad.problems.some((d) => /mark: k has no part "endpoint"/.test(d.message)));
  const ghost = one(base + "mark: t.a\n```\n");
  assert.ok(ghost.problems.some((d) => /no cell named "t" for mark/.test(d.message)));
});

Deno.test("plot: a cell that holds no curve is named as the problem", () => {
  const p = one(
    T +
      "```lentil\nk = 3\n```\n\n```lentil plot\nfigure: curve\ntable: t\nhorizontal: a\nvertical: b\nfitted: k\n```\n",
  );
  assert.ok(p.problems.some((d) => /fitted: the cell holds no curve points/.test(d.message)));
});

Deno.test("plot: a large table is thinned to the point cap and the caption says so", () => {
  const rows = Array.from({ length: MAX_PLOT_POINTS * 2 + 10 }, (_, i) => `${i} | ${i % 7}`);
  const p = one(
    "```lentil table big\nx | y\n" + rows.join("\n") +
      "\n```\n\n```lentil plot\nfigure: scatter\ntable: big\nhorizontal: x\nvertical: y\n```\n",
  );
  assert.deepEqual(p.problems, []);
  const dots = marks(p.svg, "rows").length;
  assert.ok(dots <= MAX_PLOT_POINTS && dots > MAX_PLOT_POINTS / 2, String(dots));
  assert.match(p.caption ?? "", /One row in 3 drawn, of 8,010\./);
});

Deno.test("plot values: points, marks and limits in the shapes cells give them", () => {
  assert.deepEqual(pointsOf([[0, 1], [2, 3]]), [{ x: 0, y: 1 }, { x: 2, y: 3 }]);
  assert.deepEqual(
    pointsOf({ fit: { curve: [{ power: 1, logMAR: 0.2 }, { power: 0, logMAR: 0 }] } }),
    [
      { x: 1, y: 0.2 },
      { x: 0, y: 0 },
    ],
  );
  assert.equal(pointsOf({ nothing: 1 }), undefined);
  assert.deepEqual(markOf({ endpoint: 0.25, endpointLogMAR: -0.04 }), { x: 0.25, y: -0.04 });
  assert.deepEqual(markOf(-0.5), { x: -0.5 });
  assert.deepEqual(limitsOf([-0.3, 0.1, 0.5]), { lower: -0.3, bias: 0.1, upper: 0.5 });
  assert.deepEqual(limitsOf({ bias: 0.1, sd: 0.2, lower: -0.292, upper: 0.492 }), {
    bias: 0.1,
    lower: -0.292,
    upper: 0.492,
  });
  assert.deepEqual(limitsOf({ m: { bias: 0, lower: -1, upper: 1 } }), undefined);
  // An ellipse given by centre, semi-axes and angle is traced for drawing: every traced
  // point satisfies the ellipse's own equation.
  const e = { cx: 1, cy: -1, semiMajor: 3, semiMinor: 1, angle: 30 };
  const ring = outlineOf(e)!;
  assert.equal(ring.length, 96);
  const t = (30 * Math.PI) / 180;
  for (const p of ring) {
    const dx = p.x - 1;
    const dy = p.y + 1;
    const u = dx * Math.cos(t) + dy * Math.sin(t);
    const v = -dx * Math.sin(t) + dy * Math.cos(t);
    assert.ok(Math.abs((u / 3) ** 2 + v ** 2 - 1) < 1e-9);
  }
});

Deno.test("plot theme: titles in words with the unit in brackets, lens-step and logMAR ticks", () => {
  const p = byName.get("focus")!;
  const ticks = (part: string) =>
    [...new RegExp(`<g data-part="${part}"[^>]*>([^]*?)</g>`).exec(p.svg)![1].matchAll(
      />([^<]*)</g,
    )].map((m) => m[1]).filter((t) => t !== "");
  const h = ticks("horizontal-ticks");
  // Power axis: signed, two decimals, on multiples of a lens step (0.25 D).
  for (const t of h) assert.match(t, /^([+-]\d+\.\d\d|0\.00)$/, t);
  for (const t of h) assert.equal(Math.abs(Number(t) * 4 - Math.round(Number(t) * 4)) < 1e-9, true);
  // logMAR axis: 0.1 steps, better acuity (smaller logMAR) at the top.
  const v = ticks("vertical-ticks").map(Number);
  for (let i = 1; i < v.length; i++) assert.ok(Math.abs(Math.abs(v[i] - v[i - 1]) - 0.1) < 1e-9);
  assert.match(p.svg, />lens \(D\)</);
  assert.match(p.svg, />visual acuity \(logMAR, better up\)</);
  for (const q of byName.values()) {
    assert.doesNotMatch(q.svg, /[↑↓←→]/, "no arrows");
    // One label for the whole figure; none on its parts.
    assert.equal((q.svg.match(/aria-/g) ?? []).length, 1, q.name);
    assert.match(q.svg, /^<svg[^>]*role="img" aria-label="[^"]+"/);
  }
});
