import type { HierarchyNode } from "d3-hierarchy";
import type { Selection } from "../fit/select.js";
import type { Interest } from "../interest/doi.js";
import type { PathIndex } from "../model/paths.js";
import { hierarchyOf } from "./hierarchy-of.js";
import type { Folded, ViewNode } from "./view-node.js";

/** Turns a node's fields into its display text. */
export type Labeller = (index: number) => string;

/**
 * The shown nodes as a d3-hierarchy tree in input order, each carrying what is folded under it, so
 * that at every shown node: nodes = 1 + sum of shown children's nodes + hidden.nodes (size likewise).
 */
export function buildView(
  index: PathIndex,
  scores: Interest,
  foci: Int32Array,
  selection: Selection,
  label: Labeller,
  nameOf: (i: number) => string = (i) => index.tree.name.get(i),
  pathOf: (i: number) => string = (i) => index.path(i),
  idOf: (i: number) => string | null = (i) => index.tree.ids?.get(i) ?? null,
): HierarchyNode<ViewNode> {
  const { tree, measures } = index;
  const { count, size } = measures;
  const { shown } = selection;
  const isFocus = new Set(foci);
  const byIndex = new Map<number, ViewNode>();
  let root: ViewNode | undefined;
  for (let i = 0; i < tree.length; i++) {
    if (!shown[i]) {
      i += count[i] - 1;
      continue;
    }
    let folded: Folded | null = null;
    const end = i + count[i];
    for (let c = i + 1; c < end; c += count[c]) {
      if (shown[c]) continue;
      folded ??= { children: 0, nodes: 0, size: 0 };
      folded.children++;
      folded.nodes += count[c];
      folded.size += size[c];
    }
    const node: ViewNode = {
      index: i,
      name: nameOf(i),
      path: pathOf(i),
      id: idOf(i),
      label: label(i),
      interest: round(scores.value[i]),
      nodes: count[i],
      size: size[i],
      focus: isFocus.has(i),
      onPath: foci.length > 0 && scores.forced[i] === 1,
      depth: tree.depth[i],
      children: [],
      hidden: folded,
    };
    byIndex.set(i, node);
    const p = tree.parent[i];
    if (p < 0) root = node;
    else byIndex.get(p)!.children.push(node);
  }
  return hierarchyOf(root!);
}

function round(x: number): number {
  const r = Math.round(x * 1000) / 1000;
  return Object.is(r, -0) ? 0 : r;
}
