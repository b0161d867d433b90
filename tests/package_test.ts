// The package's entry points: lib/mod.ts re-exports every public lib module, and deno.json's
// exports name the entry points the README documents.
import assert from "node:assert/strict";

const root = new URL("../", import.meta.url);

Deno.test("lib/mod.ts re-exports every public module of lib/", async () => {
  const mod = await Deno.readTextFile(new URL("lib/mod.ts", root));
  const missing: string[] = [];
  for await (const e of Deno.readDir(new URL("lib/", root))) {
    if (!e.isFile || !e.name.endsWith(".ts") || e.name.startsWith("_") || e.name === "mod.ts") {
      continue;
    }
    if (!mod.includes(`export * from "./${e.name}";`)) missing.push(e.name);
  }
  assert.deepEqual(
    missing,
    [],
    `add to lib/mod.ts: ${missing.map((m) => `export * from "./${m}";`).join(" ")}`,
  );
});

Deno.test("deno.json exports the notebook API, the methods and the catalogue", async () => {
  const config = JSON.parse(await Deno.readTextFile(new URL("deno.json", root)));
  assert.deepEqual(config.exports, {
    ".": "./notebook/mod.ts",
    "./lib": "./lib/mod.ts",
    "./catalogue": "./cells/mod.ts",
  });
  for (const path of Object.values(config.exports) as string[]) {
    assert.ok((await Deno.stat(new URL(path, root))).isFile, `${path} exists`);
  }
});

Deno.test("the lib entry point gives the methods their published values", async () => {
  const lib = await import("../lib/mod.ts");
  // Vertex check from Tunnacliffe, Introduction to Visual Optics: −10.00 D at 12 mm → −8.93 D.
  assert.equal(lib.effectivePower(-10, 0.012).toFixed(2), "-8.93");
  // Thibos 1997: M = S + C/2 for −2.00 / −1.00 × 180.
  assert.equal(lib.toPowerVector(lib.parsePrescription("-2.00 / -1.00 x 180")).m, -2.5);
});
