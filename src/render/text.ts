import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import { safeText } from "./escape.js";
import { noColour, type Palette } from "./palette.js";
import { formatSize, type Units } from "./units.js";

export interface TextOptions {
  units: Units;
  /** Whether sizes are printed (the input had sizes). */
  sizes: boolean;
  palette?: Palette;
}

/** Line marks; they carry the meaning without colour. */
export const MARK = { focus: "*", path: ">", other: "-" } as const;

/**
 * One line per shown node, indented two spaces a level:
 *   `<mark> <label>  <N nodes>, <size>  +<k> more: <N nodes>, <size>`
 * The folded remainder rides on its parent's line, so every line names a node and the budget buys
 * nodes. Marks: `*` a focus, `>` an ancestor of a focus, `-` any other node.
 */
export function renderText(view: HierarchyNode<ViewNode>, options: TextOptions): string {
  const pal = options.palette ?? noColour;
  const lines: string[] = [];
  const top = view.data.depth;
  view.eachBefore((h) => {
    const node = h.data;
    const indent = "  ".repeat(node.depth - top);
    const mark = node.focus ? MARK.focus : node.onPath ? MARK.path : MARK.other;
    const style = node.focus ? pal.focus : node.onPath ? pal.path : (s: string) => s;
    let line = `${indent}${style(`${mark} ${safeText(node.label)}`)}`;
    const stats = amount(node.nodes, node.size, options);
    if (stats) line += `  ${pal.quiet(stats)}`;
    if (node.hidden) {
      const { children, nodes, size } = node.hidden;
      const inside = amount(nodes, size, { ...options, always: true });
      line += `  ${pal.quiet(`+${children} more: ${inside}`)}`;
    }
    lines.push(line);
  });
  return `${lines.join("\n")}\n`;
}

function amount(nodes: number, size: number, options: TextOptions & { always?: boolean }): string {
  const parts: string[] = [];
  if (nodes > 1 || options.always) parts.push(`${nodes} ${nodes === 1 ? "node" : "nodes"}`);
  if (options.sizes) parts.push(formatSize(size, options.units));
  return parts.join(", ");
}
