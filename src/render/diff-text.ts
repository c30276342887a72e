import type { HierarchyNode } from "d3-hierarchy";
import { type ChangeCounts, changeKinds } from "../diff/changes.js";
import type { DiffTotals } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import { safeText } from "./escape.js";
import { noColour, type Palette } from "./palette.js";
import { MARK } from "./text.js";
import { formatSize, type Units } from "./units.js";

export interface DiffTextOptions {
  units: Units;
  /** Whether sizes are printed (either version had sizes). */
  sizes: boolean;
  /** How nodes were matched, named on the totals line. */
  by: "id" | "path";
  palette?: Palette;
}

/**
 * The summary's layout (see `renderText`) after one line of totals. A changed node carries a tag in
 * square brackets before its label: `[added]`, `[removed]`, `[moved from OLD/PARENT]`,
 * `[renamed from OLD]`, `[resized]`, with its own size change signed (`[resized +12 B]`). Marks:
 * `*` a focus, `>` a change or an ancestor of a focus or change, `-` any other node. A folded remainder
 * says what changed inside it (`+3 more: 41 nodes, 2.0 MiB; 2 added, net +1.0 KiB`) or `unchanged`.
 */
export function renderDiffText(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  const pal = options.palette ?? noColour;
  const lines = [totalsLine(totals, options)];
  const top = view.data.depth;
  view.eachBefore((h) => {
    const node = h.data;
    const indent = "  ".repeat(node.depth - top);
    const mark = node.focus ? MARK.focus : node.onPath ? MARK.path : MARK.other;
    const style = node.focus ? pal.focus : node.onPath ? pal.path : (s: string) => s;
    const tag = changeTag(node, options);
    let line = `${indent}${style(mark)} ${tag ? `${pal.focus(tag)} ` : ""}${style(safeText(node.label))}`;
    const stats = amount(node.nodes, node.change === "removed" ? null : node.size, options);
    const parts = stats ? [stats] : [];
    if (options.sizes && node.nodes > 1 && node.net !== 0) parts.push(`net ${signed(node.net, options)}`);
    if (parts.length > 0) line += `  ${pal.quiet(parts.join(", "))}`;
    if (node.hidden) {
      const { children, nodes, size, changes, delta } = node.hidden;
      const inside = amount(nodes, size, { ...options, always: true });
      line += `  ${pal.quiet(`+${children} more: ${inside}; ${changeSummary(changes, delta, options)}`)}`;
    }
    lines.push(line);
  });
  return `${lines.join("\n")}\n`;
}

/** `matched by id: 1 added, 0 removed, 1 moved, 0 renamed, 0 resized; 6 -> 7 nodes; size …`. */
function totalsLine(totals: DiffTotals, options: DiffTextOptions): string {
  const kinds = changeKinds.map((k) => `${totals.changes[k]} ${k}`).join(", ");
  let line = `matched by ${options.by}: ${kinds}; ${totals.old.nodes} -> ${totals.new.nodes} nodes`;
  if (options.sizes) {
    const { units } = options;
    line += `; size ${formatSize(totals.old.size, units)} -> ${formatSize(totals.new.size, units)} (${signed(totals.delta, options)})`;
  }
  return line;
}

function changeTag(node: DiffViewNode, options: DiffTextOptions): string {
  if (node.change === null) return "";
  let text: string = node.change;
  if (node.movedFrom !== null)
    text += ` from ${node.movedFrom === "" ? "the root" : safeText(node.movedFrom)}`;
  if (node.renamedFrom !== null) text += ` from ${safeText(node.renamedFrom)}`;
  if (options.sizes && node.delta !== 0)
    text += `${node.movedFrom !== null || node.renamedFrom !== null ? "," : ""} ${signed(node.delta, options)}`;
  return `[${text}]`;
}

/** `2 added, 1 resized, net +1.0 KiB`, or `unchanged`. */
function changeSummary(changes: ChangeCounts, delta: number, options: DiffTextOptions): string {
  const parts = changeKinds.filter((k) => changes[k] > 0).map((k) => `${changes[k]} ${k}`);
  if (options.sizes && delta !== 0) parts.push(`net ${signed(delta, options)}`);
  return parts.length > 0 ? parts.join(", ") : "unchanged";
}

/** A size change with its sign: `+12 B`, `-3.0 KiB`, `+0 B`. */
function signed(value: number, options: DiffTextOptions): string {
  return value < 0 ? formatSize(value, options.units) : `+${formatSize(Math.abs(value), options.units)}`;
}

function amount(nodes: number, size: number | null, options: DiffTextOptions & { always?: boolean }): string {
  const parts: string[] = [];
  if (nodes > 1 || options.always) parts.push(`${nodes} ${nodes === 1 ? "node" : "nodes"}`);
  if (options.sizes && size !== null) parts.push(formatSize(size, options.units));
  return parts.join(", ");
}
