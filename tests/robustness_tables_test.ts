// A table that cannot be read: its computed columns show the table's error, not a cascade of
// "unknown name" messages, and unrelated cells still evaluate.
import assert from "node:assert/strict";
import { Notebook } from "../notebook/engine/engine.ts";

const host = (files: Record<string, string>) => ({
  readText: (rel: string) => {
    if (!(rel in files)) throw new Deno.errors.NotFound(rel);
    return files[rel];
  },
});

const NB = "```lentil table t\nfile: t.csv\n```\n\n```lentil\nt.y = x * 2\nk = 3 mm\n```\n";

for (
  const [label, files] of [
    ["missing", {}],
    ["empty", { "t.csv": "" }],
    ["ends inside quotes", { "t.csv": 'x [mm],y\n1,2\n3,"abc\n' }],
  ] as const
) {
  Deno.test(`computed column on a CSV table that is ${label}: one error, at the table`, () => {
    const nb = Notebook.fromText(NB, "c.lentil.md", { host: host(files) });
    const y = nb.result("t.y")!.error!;
    assert.equal(y.kind, "dependency");
    assert.equal(y.cause?.id, "t");
    assert.ok(!nb.diagnostics().some((d) => /unknown name/.test(d.message)));
    assert.equal(nb.language.describe(nb.value("k")).display, "3.00 mm");
  });
}
