import type { ViewNode } from "../view/view-node.js";
import { amount, type NumberOptions } from "./amount.js";
import type { LineGroup } from "./line-groups.js";
import type { LineParts } from "./line-layout.js";
import { shownLabel } from "./safe-text.js";

/** Line marks; they carry the meaning without colour. */
export const MARK = { focus: "*", path: ">", other: "-" } as const;

/**
 * The node converter of every line-based format: what the line of `group` says. The chain's labels,
 * the numbers of its top node, and the fold of its last. A diff adds its fields on top (see
 * `diffLineParts`).
 */
export function lineParts<T extends ViewNode>(group: LineGroup<T>, options: NumberOptions): LineParts {
  const { level, nodes } = group;
  const top = nodes[0];
  const last = nodes[nodes.length - 1];
  const role = last.focus ? "focus" : last.onPath ? "path" : "other";
  return {
    level,
    mark: MARK[role],
    role,
    tag: "",
    shortTag: "",
    labels: nodes.map((n) => shownLabel(n.label)),
    numbers: amount(top.nodes, top.size, options),
    fold: last.hidden ? `+${last.hidden.children} more: ${foldAmount(last, options)}` : "",
    foldShort: last.hidden ? `+${last.hidden.children} more` : "",
  };
}

/** The numbers of what is folded under `node`: always with its count. */
export function foldAmount(node: ViewNode, options: NumberOptions): string {
  const { nodes, size } = node.hidden!;
  return amount(nodes, size, { ...options, always: true });
}
