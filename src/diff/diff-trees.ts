import type { HierarchyNode } from "d3-hierarchy";
import { type Selection, select } from "../fit/select.js";
import { resolveSpecs } from "../focus/resolve-specs.js";
import { readsAsEarlier } from "../load/table/read-as-earlier.js";
import { type Measures, measure } from "../model/measure.js";
import { printedNames } from "../model/printed-names.js";
import type { Tree } from "../model/tree.js";
import type { SummaryOptions } from "../summary-options.js";
import { hierarchyOf } from "../view/hierarchy-of.js";
import { compileLabel } from "../view/label.js";
import { orderSiblings } from "../view/sibling-order.js";
import { alignRoots } from "./align-roots.js";
import { type Combined, combine, combineListing } from "./combine.js";
import { type DiffInterest, diffInterest } from "./diff-interest.js";
import { diffOrder } from "./diff-order.js";
import { buildDiffView, type DiffViewNode } from "./diff-view.js";
import { directCombined } from "./direct-combine.js";
import { comparedFields } from "./field-edits.js";
import { alignGraphRoots, distinctNodes, graphCombined, isGraphDiff, matchGraphs } from "./graph-changes.js";
import { type Matching, matchTreesListing } from "./match.js";
import { type ChangeMeasures, changesIn, measureChanges, netIn } from "./measure-changes.js";
import { withPathIds } from "./path-ids.js";
import { type DiffTotals, PreparedDiff } from "./prepared-diff.js";
import { checkSavedViewsApart } from "./saved-views-apart.js";
import { subtreeCounts } from "./subtree-counts.js";

/** The options of one summary of a diff (the same as a tree's, see {@link SummaryOptions}). */
export type DiffOptions = SummaryOptions;

export interface DiffResult {
  combined: Combined;
  measures: Measures;
  changeMeasures: ChangeMeasures;
  scores: DiffInterest;
  selection: Selection;
  view: HierarchyNode<DiffViewNode>;
  foci: Int32Array;
  fociPaths: string[];
  /** Foci that matched no node and were left out (see `DiffOptions.unmatchedFoci`). */
  unmatchedFoci: string[];
  totals: DiffTotals;
}

/** Lines the diff's text rendering spends before the tree by default (the header line). */
export const DIFF_HEADER_LINES = 1;

/** What a diff compares, beside structure, names and sizes. */
export interface CompareOptions {
  /**
   * Record fields whose values are compared between matched nodes (`--compare-field`): a difference
   * makes the node `edited`. Both versions must have been loaded with these fields kept.
   */
  compareFields?: readonly string[];
  /**
   * Whether a compared field may be missing from a version (the fields a diff compares by default, which
   * one version may not have): its values there are all empty, so a field NEW added is an edit wherever
   * it holds something. Else a missing field is FIELD_MISSING.
   */
  fieldsOptional?: boolean;
  /**
   * Compare by the general matching even where NEW's load read it as OLD with known changes (tests: the
   * direct layout must give the same diff; see direct-combine.ts).
   */
  generalPath?: boolean;
}

/** match → combine → measure: what a diff's summaries share, whatever their foci. */
export function prepareDiff(oldLoaded: Tree, newLoaded: Tree, compare: CompareOptions = {}): PreparedDiff {
  const [oldInput, newInput] = checkSavedViewsApart(oldLoaded, newLoaded);
  const graph = isGraphDiff(oldInput, newInput);
  const [oldTree, newTree] = graph ? alignGraphRoots(oldInput, newInput) : alignRoots(oldInput, newInput);
  const fields = compare.compareFields ?? [];
  const compared =
    fields.length > 0 ? comparedFields(oldTree, newTree, fields, compare.fieldsOptional === true) : null;
  // NEW read as OLD with known changes (a table read against OLD's: load/table/read-as-earlier.ts):
  // both laid out together from that, with no tree of NEW's own, no matching and no splice.
  const direct =
    graph || compared !== null || compare.generalPath === true
      ? undefined
      : directOf(oldInput, newInput, oldTree, newTree);
  let combined: Combined;
  // The changed nodes in ascending order, as combine placed them (a graph's kinds change after).
  let changed: Int32Array | undefined;
  let lendable: (Int32Array | undefined)[] = [];
  if (direct !== undefined) {
    ({ combined, changed } = direct);
    lendable = [undefined, undefined, direct.spare];
  } else if (graph) {
    const oldCount = subtreeCounts(oldTree);
    const newCount = subtreeCounts(newTree);
    // Graphs: full entries matched by id, references by their edges; kinds of change by edges. Nodes
    // read from YAML have references (aliases) but no ids: their paths serve, and they match by path.
    const byPath = oldTree.ids === null && newTree.ids === null;
    const oldKeyed = byPath ? withPathIds(oldTree) : oldTree;
    const newKeyed = byPath ? withPathIds(newTree) : newTree;
    const found = matchGraphs(oldKeyed, oldCount, newKeyed, newCount);
    const matching: Matching = byPath ? { ...found.matching, by: "path" } : found.matching;
    combined = graphCombined(
      combine(oldKeyed, oldCount, newKeyed, newCount, matching, compared),
      matching,
      found.oldEdges,
      found.newEdges,
    );
  } else {
    // Only subtree counts of the two versions are needed; the whole-tree arrays are kept few, because
    // every large allocation brings the next full garbage collection of both loaded versions nearer.
    // A tree's counts and matching are read no more once the combined tree is made: their memory is then
    // lent to its measures, which would otherwise each touch new memory, dear on a big tree
    // (docs/performance.md). Both versions' counts lie side by side in one block, twice their size: the
    // combined tree (at most both versions' nodes) has its subtree sizes, doubles, there, in memory the
    // counts wrote (pages no one writes cost nothing); each matching array is room for one of its
    // measures' arrays of numbers.
    const room = oldTree.length + newTree.length;
    const block = new ArrayBuffer(room * 8);
    const oldCount = subtreeCounts(oldTree, new Int32Array(block, 0, oldTree.length));
    const newCount = subtreeCounts(newTree, new Int32Array(block, oldTree.length * 4, newTree.length));
    const { matching, unmatched } = matchTreesListing(oldTree, oldCount, newTree, newCount, room);
    ({ combined, changed } = combineListing(
      oldTree,
      oldCount,
      newTree,
      newCount,
      matching,
      compared,
      unmatched,
    ));
    lendable = unread(combined, [matching.newToOld, matching.oldToNew, oldCount]);
  }
  const { tree } = combined;
  const [countMemory, childrenMemory, sizeMemory] = lendable;
  const measures = measure(tree, {
    count: countMemory,
    children: childrenMemory,
    size: asFloats(sizeMemory),
  });
  const changeMeasures = measureChanges(tree, combined.kind, combined.deltaOf, changed);
  const totals: DiffTotals = {
    changes: changesIn(changeMeasures, 0),
    old: { nodes: distinctNodes(oldTree) + elidedIn(oldTree), size: sizeOf(oldTree), ...emptyOf(oldTree) },
    new: { nodes: distinctNodes(newTree) + elidedIn(newTree), size: measures.size[0], ...emptyOf(newTree) },
    delta: netIn(changeMeasures, 0),
    graph,
  };
  return new PreparedDiff({
    combined,
    measures,
    changeMeasures,
    oldTree,
    totals,
  });
}

/**
 * The combined tree laid out directly (direct-combine.ts) when NEW's load read it as OLD with known
 * changes and both versions are as loaded (no root put above either); else undefined.
 */
function directOf(
  oldInput: Tree,
  newInput: Tree,
  oldTree: Tree,
  newTree: Tree,
): { combined: Combined; changed: Int32Array; spare: Int32Array } | undefined {
  const plan = readsAsEarlier.take(newInput);
  if (plan === undefined || oldTree !== oldInput || newTree !== newInput) return undefined;
  return directCombined(oldTree, newTree, plan);
}

/**
 * Each of `arrays` whose memory the combined tree does not hold (with nothing removed it may be the
 * matching itself), in the same places; `undefined` for one it holds. Their contents are read no more.
 */
function unread(combined: Combined, arrays: Int32Array[]): (Int32Array | undefined)[] {
  const { tree } = combined;
  const held = new Set<ArrayBufferLike>(
    [combined.newIndex, combined.oldIndex, combined.kind, tree.parent, tree.depth, tree.ownSize].map(
      (a) => a.buffer,
    ),
  );
  return arrays.map((a) => (held.has(a.buffer) ? undefined : new Int32Array(a.buffer)));
}

/** The whole memory under `numbers` read as doubles (none when there is none). */
function asFloats(numbers: Int32Array | undefined): Float64Array | undefined {
  return numbers === undefined
    ? undefined
    : new Float64Array(numbers.buffer, 0, numbers.buffer.byteLength >> 3);
}

/**
 * Compares two versions of a hierarchy: match → combine → measure → focus → interest → fit → view.
 * Pure: the same trees and options give the same result.
 */
export function diffTrees(oldInput: Tree, newInput: Tree, options: DiffOptions & CompareOptions): DiffResult {
  return summarizeDiff(prepareDiff(oldInput, newInput, options), options);
}

/** focus → interest → fit → view on a prepared diff. Pure: same inputs, same result. */
export function summarizeDiff(prepared: PreparedDiff, options: DiffOptions): DiffResult {
  const { combined, measures, changeMeasures, index, oldTree, totals } = prepared;
  const { tree } = combined;
  const key = options.pseudonymKey;
  const { foci, unmatched } = resolveSpecs(index, options.foci, key, options.unmatchedFoci);
  const api = prepared.importanceOf(options.importance);
  const scores = diffInterest(tree, api, foci, combined.kind, changeMeasures);
  const order = diffOrder(tree, measures, scores, changeMeasures);
  const selection = select(
    { tree, measures, scores, order },
    {
      budget: options.budget,
      headerLines: options.headerLines ?? DIFF_HEADER_LINES,
      spareLines: options.spareLines,
      chains: options.chains,
    },
  );
  const names = printedNames(tree, index, key);
  // The old version's path index is built only when a shown node moved.
  const old = printedNames(oldTree, () => prepared.oldIndex(), key);
  const label = compileLabel(options.label, tree, names);
  let view = buildDiffView({
    index,
    combined,
    changes: changeMeasures,
    scores,
    foci,
    selection,
    label,
    names,
    old,
  });
  if (options.siblingOrder && options.siblingOrder !== "input") {
    orderSiblings(view.data, options.siblingOrder, tree.hasSizes);
    view = hierarchyOf(view.data);
  }
  return {
    combined,
    measures,
    changeMeasures,
    scores,
    selection,
    view,
    foci,
    fociPaths: [...foci].map(names.pathOf),
    unmatchedFoci: unmatched,
    totals,
  };
}

/** The sum of every node's own size (a function of its own: a loop run once compiles apart). */
function sizeOf(tree: Tree): number {
  let size = 0;
  for (let i = 0; i < tree.length; i++) size += tree.ownSize[i];
  return size;
}

/** Nodes the version's slots stand for beyond themselves (Tree.elided: a saved summary's folds). */
function elidedIn(tree: Tree): number {
  let n = 0;
  if (tree.elided !== undefined) for (let i = 0; i < tree.length; i++) n += tree.elided[i];
  return n;
}

/** `{ empty: n }` when some of the version's nodes are empty entries (`{}`); else nothing. */
function emptyOf(tree: Tree): { empty?: number } {
  if (tree.empty === undefined) return {};
  let n = 0;
  for (let i = 0; i < tree.length; i++) n += tree.empty[i];
  return n > 0 ? { empty: n } : {};
}
