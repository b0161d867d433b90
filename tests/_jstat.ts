/**
 * jstat (npm), the general-purpose statistics library the tests check against. Its module
 * shape differs between builds, so the tests take it from here.
 *
 * @module
 */

import jStatModule from "jstat";

/** The jStat object. */
// deno-lint-ignore no-explicit-any
export const jStat = ((jStatModule as any).jStat ?? jStatModule) as any;
