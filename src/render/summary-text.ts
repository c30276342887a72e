import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import type { NumberOptions } from "./amount.js";
import { lineGroups } from "./line-groups.js";
import { layoutLine } from "./line-layout.js";
import { lineParts } from "./line-parts.js";
import type { Palette } from "./palette.js";

export interface TextOptions extends NumberOptions {
  palette?: Palette;
  /** Join an only child that is not below a focus onto its parent's line (must match the fit's choice). */
  chains?: boolean;
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
}

/**
 * One line per shown node, indented two spaces a level:
 *   `<mark> <label>  <N nodes>, <size>  +<k> more: <N nodes>, <size>`
 * The folded remainder rides on its parent's line, so every line names a node and the budget buys
 * nodes. Marks: `*` a focus, `>` an ancestor of a focus, `-` any other node. With `chains`, a run of
 * only children prints as one line `a / b / c` with the numbers of its top node.
 */
export function renderText(view: HierarchyNode<ViewNode>, options: TextOptions): string {
  const lines = lineGroups(view, options.chains ?? false).map((g) =>
    layoutLine(lineParts(g, options), options),
  );
  return `${lines.join("\n")}\n`;
}
