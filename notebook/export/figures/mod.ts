/**
 * Every figure a plot block can draw, one module each. To add a figure, write a module
 * exporting a `FigureDef` (see `figure.ts`) and list it here.
 *
 * @example
 * ```ts
 * import { FIGURES } from "./mod.ts";
 * FIGURES.map((f) => f.name); // ["curve", "scatter", "distribution", "agreement", "repeatability", "fellow-eyes"]
 * ```
 *
 * @module
 */

import type { FigureDef } from "./figure.ts";
import { curve } from "./curve.ts";
import { scatter } from "./scatter.ts";
import { distribution } from "./distribution.ts";
import { agreement } from "./agreement.ts";
import { repeatability } from "./repeatability.ts";
import { fellowEyes } from "./fellow_eyes.ts";

export type { FigureDef, FigureDrawing, FigureInput } from "./figure.ts";

/** The figures, in the order the docs list them. */
export const FIGURES: readonly FigureDef[] = [
  curve,
  scatter,
  distribution,
  agreement,
  repeatability,
  fellowEyes,
];
