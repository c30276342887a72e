import type { ViewNode } from "./view-node.js";

/** How shown siblings are ordered: as in the input (the default), biggest first, or by label. */
export const siblingOrders = ["input", "size", "name"] as const;
export type SiblingOrder = (typeof siblingOrders)[number];

/**
 * Sorts every shown node's children in place, without recursion. `size`: bigger subtree first (size,
 * or node count without sizes), ties in input order; `name`: by label in UTF-16 code-unit order of
 * its lower case, then of the label itself, then input order, the same on every machine (no locale).
 * Input order, the default, keeps line diffs of saved summaries small.
 */
export function orderSiblings<T extends ViewNode>(root: T, order: SiblingOrder, sizes: boolean): void {
  if (order === "input") return;
  const compare =
    order === "size"
      ? (a: ViewNode, b: ViewNode) => (sizes ? b.size - a.size : 0) || b.nodes - a.nodes || a.index - b.index
      : (a: ViewNode, b: ViewNode) =>
          codePoints(a.label.toLowerCase(), b.label.toLowerCase()) ||
          codePoints(a.label, b.label) ||
          a.index - b.index;
  const stack: ViewNode[] = [root];
  for (let node = stack.pop(); node !== undefined; node = stack.pop()) {
    if (node.children.length > 1) node.children.sort(compare);
    for (const child of node.children) stack.push(child);
  }
}

function codePoints(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
