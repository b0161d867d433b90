// No function in notebook/ is longer than 120 lines: a long one is split along its seams
// (one reader, step or part per function) before it lands.
import assert from "node:assert/strict";
import { blank, longFunctions, longFunctionsIn } from "./_function_length.ts";

const LIMIT = 120;

Deno.test("no function in notebook/ is longer than 120 lines", async () => {
  const found = await longFunctions("notebook", LIMIT);
  assert.deepEqual(
    found.map((f) => `${f.file}:${f.line} ${f.name} (${f.lines} lines)`),
    [],
    "split these along their seams",
  );
});

Deno.test("the length check measures functions, methods and arrows, not blocks or text", () => {
  const body = (n: number) => Array.from({ length: n }, (_, i) => `  x += ${i};`).join("\n");
  const source = [
    `export function long(a: number): number {`,
    `  let x = a;`,
    `  if (x > 0) {`,
    body(10),
    `  }`,
    body(LIMIT),
    `  return x;`,
    `}`,
    `class C {`,
    `  method(): string {`,
    `    return "} not the end {";`,
    `  }`,
    `}`,
    `const arrow = (y: number): number => {`,
    body(LIMIT),
    `  return y / 2; // a regex-like /}/ and a brace } in a comment`,
    `};`,
    "const t = `${arrow(1)} { in a template`;",
  ].join("\n");
  const found = longFunctionsIn("m.ts", source, LIMIT);
  assert.deepEqual(found.map((f) => [f.name, f.line]), [["long", 1], ["arrow", 142]]);
  assert.equal(found[0].lines, LIMIT + 16);
  assert.equal(blank(`"a{b}" // {`), `"    "     `);
});
