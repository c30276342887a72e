import type { HierarchyNode } from "d3-hierarchy";
import { type ChildrenInOrder, type Selection, select } from "./fit/select.js";
import { type ResolvedFoci, resolveSpecs } from "./focus/resolve-specs.js";
import { graphInterest } from "./interest/graph-doi.js";
import { depthImportance, type Importance, importance } from "./interest/importance.js";
import { interestNear } from "./interest/near.js";
import { childrenByDepthOrder, nodeOrder } from "./interest/order.js";
import type { Scores } from "./interest/scores.js";
import { type GraphNeighbours, graphNeighbours } from "./model/graph-neighbours.js";
import { type Measures, measure } from "./model/measure.js";
import { NAME_TABLE_MIN, PathIndex } from "./model/path-index.js";
import { printedNames } from "./model/printed-names.js";
import { type ReferenceIndex, referencesTo } from "./model/reference-index.js";
import type { Tree } from "./model/tree.js";
import type { SummaryOptions } from "./summary-options.js";
import { buildView, type ParentsOf } from "./view/build-view.js";
import { hierarchyOf } from "./view/hierarchy-of.js";
import { compileLabel } from "./view/label.js";
import { orderSiblings } from "./view/sibling-order.js";
import type { ViewNode } from "./view/view-node.js";

/** Children of a node with at least this many are kept in order (see {@link Prepared.childrenInOrder}). */
const WIDE = 1024;

/**
 * A loaded tree with its aggregates and what every summary of it shares, whatever the foci: load
 * once, then summarise for many foci and budgets. It owns its caches: the a-priori importance of each
 * kind asked for, and the children of wide nodes in the fit's order. A new focus then scores only the
 * nodes its fit looks at (interestNear) and allocates nothing the size of the tree but the fit's
 * shown flags.
 */
export class Prepared {
  readonly measures: Measures;
  readonly index: PathIndex;
  /** Graphs only: each node's neighbours, for the graph interest's searches; null on a tree. */
  readonly neighbours: GraphNeighbours | null;
  private readonly importances = new Map<Importance, Float64Array>();
  private readonly wide = new Map<number, Int32Array>();
  private lastFoci: { key: string; resolved: ResolvedFoci } | undefined;

  constructor(readonly tree: Tree) {
    this.measures = measure(tree);
    this.index = new PathIndex(tree, this.measures);
    const graph = tree.referenceTo !== undefined;
    this.neighbours = graph ? graphNeighbours(tree) : null;
    // Built here, at load time, so that even the first focus costs only interest + fit + view (a
    // single summary needs them anyway): one pass over the child counts, which also builds the path
    // index's name tables of wide nodes. A graph's summary reads neither the importance by depth (its
    // interest works it out for the slots it reads) nor the wide nodes' children in order (siblings
    // of a graph need not share an interest): it is spared both.
    if (!graph) this.importance("depth");
    const { children } = this.measures;
    for (let p = 0; p < children.length; p++) {
      if (children[p] >= NAME_TABLE_MIN) this.index.warm(p);
      if (!graph && children[p] >= WIDE) this.wide.set(p, childrenByDepthOrder(this.measures, p));
    }
  }

  /** The a-priori importance of every node, computed once per kind. */
  importance(kind: Importance): Float64Array {
    let api = this.importances.get(kind);
    if (!api) {
      api = importance(this.tree, this.measures, kind);
      this.importances.set(kind, api);
    }
    return api;
  }

  /**
   * The foci `specs` name on this tree (see `resolveSpecs`), the last answer kept: the command line
   * fits one summary at several budgets and key rows with the same foci, and a focus named by a name
   * or an id is found by a scan of every name (24 ms a fit on a table of 1M rows). A copy each time.
   */
  fociOf(
    specs: SummarizeOptions["foci"],
    pseudonymKey?: string,
    unmatched?: SummarizeOptions["unmatchedFoci"],
  ) {
    const key = JSON.stringify([specs, pseudonymKey ?? null, unmatched ?? null]);
    if (this.lastFoci?.key !== key)
      this.lastFoci = { key, resolved: resolveSpecs(this.index, specs, pseudonymKey, unmatched) };
    const { foci, unmatched: missed } = this.lastFoci.resolved;
    return { foci: foci.slice(), unmatched: [...missed] };
  }

  /**
   * The children of a node with at least {@link WIDE} of them in the order the fit takes them under
   * the importance by depth (null for other nodes), so a new focus costs no scan of a node's million
   * children.
   */
  readonly childrenInOrder: ChildrenInOrder = (p) => this.wide.get(p) ?? null;
}

/** Measures `tree` and builds its path index and caches: see {@link Prepared}. */
export function prepare(tree: Tree): Prepared {
  return new Prepared(tree);
}

/** The options of one summary (the same as a diff's, see {@link SummaryOptions}). */
export type SummarizeOptions = SummaryOptions;

export interface SummaryResult {
  view: HierarchyNode<ViewNode>;
  selection: Selection;
  /** Interest of the nodes the fit looked at (see interest/near.ts). */
  scores: Scores;
  foci: Int32Array;
  /** Printed paths of the foci, in pre-order. */
  fociPaths: string[];
  /** Foci that matched no node and were left out (see `SummarizeOptions.unmatchedFoci`). */
  unmatchedFoci: string[];
}

/** focus -> interest -> fit -> view, on a prepared tree. Pure: same inputs, same result. */
export function summarize(prepared: Prepared, options: SummarizeOptions): SummaryResult {
  const { tree, measures, index } = prepared;
  const key = options.pseudonymKey;
  const { foci: found, unmatched } = prepared.fociOf(options.foci, key, options.unmatchedFoci);
  const foci = fullEntries(tree, found);
  // The references to the foci (graphs; null on a tree).
  const refs = referencesTo(tree, foci);
  // A graph scores by graph distance over the whole graph; a tree (no reference) near its foci, as before.
  const scores: Scores = refs
    ? graphInterest(
        tree,
        measures,
        options.importance === "depth" ? depthImportance(tree) : prepared.importance(options.importance),
        foci,
        refs,
        prepared.neighbours ?? undefined,
      )
    : interestNear(tree, prepared.importance(options.importance), foci);
  const selection = select(
    { tree, measures, scores, order: nodeOrder(tree, measures, scores) },
    {
      budget: options.budget,
      headerLines: options.headerLines,
      spareLines: options.spareLines,
      chains: options.chains,
      // Siblings of a graph need not share an interest (one may be nearer a focus through a reference).
      childrenInOrder: options.importance === "depth" && refs === null ? prepared.childrenInOrder : undefined,
    },
  );
  const names = printedNames(tree, index, key);
  const label = compileLabel(options.label, tree, names);
  let view = buildView({
    index,
    scores,
    foci,
    selection,
    label,
    names,
    parentsOf: parentsOf(tree, refs, selection),
  });
  if (options.siblingOrder && options.siblingOrder !== "input") {
    orderSiblings(view.data, options.siblingOrder, tree.hasSizes);
    view = hierarchyOf(view.data);
  }
  return { view, selection, scores, foci, fociPaths: [...foci].map(names.pathOf), unmatchedFoci: unmatched };
}

/**
 * Graphs: for a focus with several parents (its full entry's parent and the parents of the references
 * that stand for it), how many it has and how many of them are not shown.
 */
function parentsOf(tree: Tree, refs: ReferenceIndex | null, selection: Selection): ParentsOf | undefined {
  if (refs === null) return undefined;
  return (i: number) => {
    const p = tree.parent[i];
    const own = p >= 0 && !(p === 0 && tree.syntheticRoot) ? 1 : 0;
    const toI = refs.of(i);
    let hidden = 0;
    for (const r of toI) if (!selection.isShown(r)) hidden++;
    const count = own + toI.length;
    return count >= 2 ? { count, hidden } : undefined;
  };
}

/** Foci with each reference (graphs) replaced by its node's full entry, sorted, without repeats. */
function fullEntries(tree: Tree, foci: Int32Array): Int32Array {
  const ref = tree.referenceTo;
  if (ref === undefined) return foci;
  const set = new Set<number>();
  for (const f of foci) set.add(ref[f] === -1 ? f : ref[f]);
  return Int32Array.from([...set].sort((a, b) => a - b));
}
