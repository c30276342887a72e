import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";

/** The shown nodes that one output line stands for: one node, or a chain of only children. */
export interface LineGroup<T extends ViewNode = ViewNode> {
  /** Nesting level of the line (0 for the root's line). */
  level: number;
  /** The chain, top first; the line's numbers are the top's (all of it), its mark and fold the last's. */
  nodes: T[];
  /** The node of the line above (the chain top's parent), or null for the root's line. */
  above: T | null;
  /** The view's root, for shares of the total. */
  root: T;
}

/**
 * Whether `child` continues its parent's line: the fit's lineCost of 0 read off the view (an only
 * child whose parent is not an anchor, that is neither a focus nor, in a diff, a change).
 */
export function continuesLine(parent: ViewNode, child: ViewNode, chains: boolean): boolean {
  // An only child: the one shown child, nothing folded beside it. A reference line (graphs) never joins one.
  return (
    chains &&
    !parent.anchor &&
    parent.children.length === 1 &&
    parent.hidden === null &&
    parent.nodes === child.nodes + 1 &&
    child.reference === undefined
  );
}

/** The lines of a view in order: every renderer that prints lines shares this grouping. */
export function lineGroups<T extends ViewNode>(view: HierarchyNode<T>, chains: boolean): LineGroup<T>[] {
  const groups: LineGroup<T>[] = [];
  const level = new Map<T, number>();
  view.eachBefore((h) => {
    const top = h.data;
    const parent = h.parent?.data;
    if (parent && continuesLine(parent, top, chains)) return; // printed with its parent's line
    const depth = parent ? level.get(parent)! + 1 : 0;
    const nodes = [top];
    let last = top;
    level.set(top, depth);
    while (last.children.length === 1 && continuesLine(last, last.children[0], chains)) {
      last = last.children[0] as T;
      level.set(last, depth);
      nodes.push(last);
    }
    groups.push({ level: depth, nodes, above: parent ?? null, root: view.data });
  });
  return groups;
}
