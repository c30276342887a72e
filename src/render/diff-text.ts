import type { HierarchyNode } from "d3-hierarchy";
import { changeKinds, treeChangeKinds } from "../diff/changes.js";
import type { DiffTotals } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import type { NumberOptions } from "./amount.js";
import { diffLineParts, signed } from "./diff-line-parts.js";
import { shortenEnd } from "./display-width.js";
import { formatSize } from "./format-size.js";
import { lineGroups } from "./line-groups.js";
import { layoutLine } from "./line-layout.js";
import type { Palette } from "./palette.js";

export interface DiffTextOptions extends NumberOptions {
  /** How nodes were matched, named on the totals line. */
  by: "id" | "path";
  palette?: Palette;
  /** Join an only child that is neither a focus nor a change onto its parent's line (as the fit did). */
  chains?: boolean;
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
}

/**
 * The summary's layout (see `renderText`) after one line of totals. A changed node carries a tag in
 * square brackets before its label: `[added]`, `[removed]`, `[moved from OLD/PARENT]`,
 * `[renamed from OLD]`, `[resized]`, with its own size change signed (`[resized +12 B]`). Marks: `*`
 * a focus, `>` a change or an ancestor of a focus or change, `-` any other node. A folded remainder
 * says what changed inside it (`+3 more: 41 nodes, 2.0 MiB; 2 added, net +1.0 KiB`) or that nothing
 * did (`unchanged`).
 */
export function renderDiffText(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  const { width } = options;
  const head = totalsLine(totals, options);
  const lines = [width === undefined ? head : shortenEnd(head, width)];
  for (const group of lineGroups(view, options.chains ?? false))
    lines.push(layoutLine(diffLineParts(group, options), options));
  return `${lines.join("\n")}\n`;
}

/** `matched by id: 1 added, 0 removed, 1 moved, 0 renamed, 0 resized; 6 -> 7 nodes; size …`. */
export function totalsLine(totals: DiffTotals, options: DiffTextOptions): string {
  // A diff of graphs counts edges linked and unlinked too; a diff of trees has none to count.
  const kinds = (totals.graph ? changeKinds : treeChangeKinds)
    .map((k) => `${totals.changes[k]} ${k}`)
    .join(", ");
  let line = `matched by ${options.by}: ${kinds}; ${totals.old.nodes} -> ${totals.new.nodes} nodes`;
  if (options.sizes) {
    const { units } = options;
    const sizes = `${formatSize(totals.old.size, units)} -> ${formatSize(totals.new.size, units)}`;
    line += `; size ${sizes} (${signed(totals.delta, options)})`;
  }
  return line;
}
