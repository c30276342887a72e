import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";

/** The shown nodes that one output line stands for: one node, or a chain of only children. */
export interface LineGroup {
  /** Nesting level of the line (0 for the root's line). */
  level: number;
  /** The chain, top first; its numbers are those of `nodes[0]`, its fold that of the last. */
  nodes: ViewNode[];
}

/** Whether `child` continues its parent's line (the fit's lineCost of 0, read off the view). */
export function continuesLine(parent: ViewNode, child: ViewNode, chains: boolean): boolean {
  // An only child: the one shown child, nothing folded beside it. A reference line never joins one.
  return (
    chains &&
    !parent.focus &&
    parent.children.length === 1 &&
    parent.hidden === null &&
    parent.nodes === child.nodes + 1 &&
    child.reference === undefined
  );
}

/** The lines of a view in order: every renderer that prints lines shares this grouping. */
export function lineGroups(view: HierarchyNode<ViewNode>, chains: boolean): LineGroup[] {
  const groups: LineGroup[] = [];
  const level = new Map<ViewNode, number>();
  view.eachBefore((h) => {
    const top = h.data;
    const parent = h.parent?.data;
    if (parent && continuesLine(parent, top, chains)) return; // printed with its parent's line
    const depth = parent ? level.get(parent)! + 1 : 0;
    const nodes = [top];
    let last = top;
    level.set(top, depth);
    while (last.children.length === 1 && continuesLine(last, last.children[0], chains)) {
      last = last.children[0];
      level.set(last, depth);
      nodes.push(last);
    }
    groups.push({ level: depth, nodes });
  });
  return groups;
}
