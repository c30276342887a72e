import type { HierarchyNode } from "d3-hierarchy";
import type { Selection } from "../fit/select.js";
import type { Scores } from "../interest/scores.js";
import type { PathIndex } from "../model/path-index.js";
import { type PrintedNames, printedNames } from "../model/printed-names.js";
import { hierarchyOf } from "./hierarchy-of.js";
import type { ViewNode } from "./view-node.js";

/** Turns a node's fields into its display text. */
export type Labeller = (index: number) => string;

/** Graphs: of a focus with several parents, how many it has and how many of them are not shown. */
export type ParentsOf = (i: number) => { count: number; hidden: number } | undefined;

/** What a view is built from: the fit's selection and how each shown node is printed. */
export interface ViewInput {
  readonly index: PathIndex;
  readonly scores: Scores;
  /** The foci, sorted node indices. */
  readonly foci: Int32Array;
  readonly selection: Selection;
  /** Each node's display text; default its printed name. */
  readonly label?: Labeller;
  /** Names, paths and ids as printed; default the input's own (see model/printed-names.ts). */
  readonly names?: PrintedNames;
  /** Graphs only: a focus's parents (see {@link ParentsOf}). */
  readonly parentsOf?: ParentsOf;
}

/**
 * The shown nodes as a d3-hierarchy tree in input order, each carrying what is folded under it, so
 * that at every shown node: nodes = 1 + sum of shown children's nodes + hidden.nodes (size likewise).
 */
export function buildView(input: ViewInput): HierarchyNode<ViewNode> {
  const { index, scores, foci, selection, parentsOf } = input;
  const { nameOf, pathOf, idOf } = input.names ?? printedNames(index.tree, index, undefined);
  const label = input.label ?? nameOf;
  const { tree, measures } = index;
  const { count, nodes, size, children } = measures;
  const ref = tree.referenceTo;
  const emptyBefore = tree.empty === undefined ? undefined : countsBefore(tree.empty);
  // Empty entries (`{}`) in the subtree of slot i: a difference of prefix counts (pre-order).
  const emptyIn = (i: number) => (emptyBefore === undefined ? 0 : emptyBefore[i + count[i]] - emptyBefore[i]);
  const isFocus = new Set(foci);
  const byIndex = new Map<number, ViewNode>();
  // The shown nodes in pre-order (parents first); a sort of the shown set, never a walk of the tree.
  const order = Int32Array.from(selection.admitted).sort();
  // What the shown children of each shown node hold, to take from the node's own totals: the folded
  // rest then costs nothing per hidden child, however many children a node has.
  const shownKids = new Map<
    number,
    { children: number; nodes: number; slots: number; size: number; exact: boolean; empty: number }
  >();
  let root: ViewNode | undefined;
  for (const i of order) {
    const node: ViewNode = {
      index: i,
      name: nameOf(i),
      path: pathOf(i),
      id: idOf(i),
      label: label(i),
      interest: round(scores.interestOf(i)),
      nodes: nodes[i],
      size: size[i],
      focus: isFocus.has(i),
      // On a graph, the paths to a focus's other parents lead to it too.
      onPath:
        foci.length > 0 && (scores.isForced(i) || (scores.rankOf !== undefined && scores.rankOf(i) !== FAR)),
      anchor: scores.distanceOf(i) === 0,
      depth: tree.depth[i],
      children: [],
      hidden: null,
    };
    if (node.focus && parentsOf) {
      const parents = parentsOf(i);
      if (parents) node.parents = parents;
    }
    if (emptyBefore !== undefined) {
      if (tree.empty![i] === 1) node.empty = true;
      node.emptyBelow = emptyIn(i);
    }
    if (ref !== undefined && ref[i] !== -1) {
      const at = ref[i];
      node.reference = { path: pathOf(at), cycle: at <= i && i < at + count[at] };
    }
    byIndex.set(i, node);
    const p = tree.parent[i];
    if (p < 0) {
      root = node;
      continue;
    }
    byIndex.get(p)!.children.push(node);
    let sums = shownKids.get(p);
    if (!sums) {
      sums = { children: 0, nodes: 0, slots: 0, size: 0, exact: true, empty: 0 };
      shownKids.set(p, sums);
    }
    sums.empty += emptyIn(i);
    sums.children++;
    sums.nodes += nodes[i];
    sums.slots += count[i];
    sums.size += size[i];
    if (!Number.isInteger(size[i])) sums.exact = false;
  }
  for (const i of order) {
    const sums = shownKids.get(i) ?? { children: 0, nodes: 0, slots: 0, size: 0, exact: true, empty: 0 };
    const hiddenChildren = children[i] - sums.children;
    if (hiddenChildren === 0) continue;
    const own = tree.ownSize[i];
    // Whole sizes below 2^53 add and subtract exactly; a fractional size is summed child by child, in
    // input order, so the total is the same double either way.
    const exact = sums.exact && Number.isInteger(size[i]) && Number.isInteger(own);
    const hiddenNodes = nodes[i] - 1 - sums.nodes;
    byIndex.get(i)!.hidden = {
      children: hiddenChildren,
      nodes: hiddenNodes,
      size: exact ? size[i] - own - sums.size : hiddenSize(i),
      // Hidden slots that are no node's full entry are references.
      ...(ref !== undefined ? { references: count[i] - 1 - sums.slots - hiddenNodes } : {}),
      ...(emptyBefore !== undefined ? { empty: emptyIn(i) - tree.empty![i] - sums.empty } : {}),
    };
  }
  function hiddenSize(i: number): number {
    let total = 0;
    for (let c = i + 1, end = i + count[i]; c < end; c += count[c])
      if (!selection.isShown(c)) total += size[c];
    return total;
  }

  return hierarchyOf(root!);
}

const FAR = 0x7fffffff;

/** before[i] = how many of flags[0..i) are 1 (length n + 1). */
function countsBefore(flags: Uint8Array): Int32Array {
  const before = new Int32Array(flags.length + 1);
  for (let i = 0; i < flags.length; i++) before[i + 1] = before[i] + flags[i];
  return before;
}

function round(x: number): number {
  const r = Math.round(x * 1000) / 1000;
  return Object.is(r, -0) ? 0 : r;
}
