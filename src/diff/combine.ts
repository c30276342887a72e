import { MergedNames } from "../model/merged-names.js";
import type { Tree } from "../model/tree.js";
import { KIND } from "./changes.js";
import type { ComparedFields } from "./field-edits.js";
import { kindOf } from "./kind-of.js";
import type { Matching, UnmatchedOld } from "./match.js";
import { splice } from "./splice.js";

/** Both versions in one tree: the new version plus every removed node at its old place. */
export interface Combined {
  /** A normal pre-order tree. Removed nodes have own size 0 here (they hold nothing now). */
  readonly tree: Tree;
  /** The node in the new version, or -1 for a removed node. */
  readonly newIndex: Int32Array;
  /** The node in the old version, or -1 for an added node. */
  readonly oldIndex: Int32Array;
  /** Kind code of each node (see `KIND`). */
  readonly kind: Uint8Array;
  /**
   * Own size in the new version minus own size in the old (a removed node: minus its old size), as
   * one array of every node: made when first read. {@link deltaOf} gives a node's without it.
   */
  readonly delta: Float64Array;
  /** Node k's entry of `delta`, read without making the whole array (non-zero only for a changed node). */
  readonly deltaOf: (k: number) => number;
  readonly oldTree: Tree;
  readonly newTree: Tree;
  readonly by: Matching["by"];
  /** The fields compared between matched nodes (`--compare-field`), or null when none are. */
  readonly compared: ComparedFields | null;
}

/**
 * Builds the combined tree. Children keep the new version's order; a removed node goes right after
 * the nearest earlier old sibling that is still a child of the same parent (first when there is none).
 * A node has one kind, by precedence: added or removed, then moved (its parent's counterpart changed;
 * a moved subtree counts once, at its root, because the nodes below keep their parent), then renamed,
 * then edited (a compared field's value differs), then resized (own size changed). The roots always
 * match; a synthetic root is never renamed.
 */
export function combine(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  matching: Matching,
  compared: ComparedFields | null = null,
): Combined {
  return combineListing(oldTree, oldCount, newTree, newCount, matching, compared).combined;
}

/**
 * {@link combine}, and the changed nodes of the combined tree (those with a kind) in ascending order,
 * listed as they are placed: a later stage then needs no pass over every node's kind to find them.
 * `unmatched`: the removed nodes as the matcher listed them (`matchTreesListing`), when it did: then
 * no pass over every old node looks for them.
 */
export function combineListing(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  matching: Matching,
  compared: ComparedFields | null = null,
  unmatched?: UnmatchedOld,
): { combined: Combined; changed: Int32Array } {
  const { oldToNew, newToOld } = matching;
  // Each pass below is a function of its own with one loop (and no growing array in it): the engine
  // compiles a loop that runs once while it runs, and compiles it again when the loop meets code it has
  // not run yet (docs/performance.md, eleventh session).
  const kindOfPair = kindOf(oldTree, newTree, matching, compared);
  const removed = unmatched?.count ?? removedIn(oldToNew);
  if (removed === 0) {
    // Nothing to splice in: the combined tree is the new tree.
    const identity = identityOf(newTree.length);
    const { kind, changed } = kinds(kindOfPair, newToOld);
    return {
      combined: combined(oldTree, newTree, matching, identity, newToOld, kind, null, compared),
      changed,
    };
  }
  const spliced = splice(
    oldTree,
    oldCount,
    newTree,
    newCount,
    matching,
    removed,
    kindOfPair,
    unmatched?.ranges,
  );
  const { newIndex, oldIndex, kind, changed } = spliced;
  return {
    combined: combined(oldTree, newTree, matching, newIndex, oldIndex, kind, spliced, compared),
    changed,
  };
}

/** Old nodes with no counterpart (the root always has one). */
function removedIn(oldToNew: Int32Array): number {
  let removed = 0;
  for (let o = 1; o < oldToNew.length; o++) if (oldToNew[o] < 0) removed++;
  return removed;
}

/** 0, 1, 2, ... `length - 1`. */
function identityOf(length: number): Int32Array {
  const identity = new Int32Array(length);
  for (let k = 0; k < length; k++) identity[k] = k;
  return identity;
}

/**
 * Each node's kind when nothing was removed (node k is new node k, old node `newToOld[k]`), and the
 * changed nodes in ascending order. The list is made as long as the tree (memory no one writes costs
 * nothing) so that it never grows in the loop, and copied to its length at the end.
 */
function kinds(
  kindOfPair: (n: number, o: number) => number,
  newToOld: Int32Array,
): { kind: Uint8Array; changed: Int32Array } {
  const total = newToOld.length;
  const kind = new Uint8Array(total);
  const changed = new Int32Array(total);
  let changes = 0;
  for (let k = 0; k < total; k++) {
    const c = kindOfPair(k, newToOld[k]);
    if (c === KIND.none) continue;
    kind[k] = c;
    changed[changes++] = k;
  }
  return { kind, changed: changed.slice(0, changes) };
}

/** A combined tree's parent, depth and own size of every node. */
interface Shape {
  parent: Int32Array;
  depth: Int32Array;
  ownSize: Float64Array;
}

/**
 * The combined tree and its record. `spliced`: its shape with the removed nodes spliced in, or null
 * when none were (the new tree's shape; the new tree itself when it has every field and id the
 * combined tree needs). The own size changes are read from both versions' sizes (one array of every
 * node is fresh memory, dear on a big tree, and only changed nodes have one).
 */
function combined(
  oldTree: Tree,
  newTree: Tree,
  matching: Matching,
  newIndex: Int32Array,
  oldIndex: Int32Array,
  kind: Uint8Array,
  spliced: Shape | null,
  compared: ComparedFields | null,
): Combined {
  const oldSize = oldTree.ownSize;
  const newSize = newTree.ownSize;
  const deltaOf = (k: number): number => {
    const n = newIndex[k];
    const o = oldIndex[k];
    return n < 0 ? 0 - oldSize[o] : o < 0 ? newSize[n] : newSize[n] - oldSize[o];
  };
  const keys = [...new Set([...newTree.fields.keys(), ...oldTree.fields.keys()])];
  const ids = matching.by === "id";
  const made: Tree =
    spliced === null && keys.length === newTree.fields.size && (!ids || newTree.ids)
      ? { ...newTree, ids: ids ? newTree.ids : null, hasSizes: oldTree.hasSizes || newTree.hasSizes }
      : copyTree(oldTree, newTree, keys, ids, newIndex, oldIndex, spliced ?? newTree);
  const elided = elidedOf(oldTree, newTree, newIndex, oldIndex);
  const tree: Tree = elided === undefined ? made : { ...made, elided };
  return combinedRecord(tree, { newIndex, oldIndex, kind, deltaOf }, oldTree, newTree, matching.by, compared);
}

/** A {@link Combined} over its arrays; its `delta` made of `deltaOf` when first read. */
export function combinedRecord(
  tree: Tree,
  arrays: Pick<Combined, "newIndex" | "oldIndex" | "kind" | "deltaOf">,
  oldTree: Tree,
  newTree: Tree,
  by: Matching["by"],
  compared: ComparedFields | null,
): Combined {
  const { newIndex, oldIndex, kind, deltaOf } = arrays;
  const total = newIndex.length;
  let delta: Float64Array | undefined;
  return {
    tree,
    newIndex,
    oldIndex,
    kind,
    get delta() {
      if (delta === undefined) {
        delta = new Float64Array(total);
        for (let k = 0; k < total; k++) if (kind[k] !== KIND.none) delta[k] = deltaOf(k);
      }
      return delta;
    },
    deltaOf,
    oldTree,
    newTree,
    by,
    compared,
  };
}

/**
 * Descendants each combined node stands for beyond its own slot (Tree.elided: a saved summary's fold
 * entry, load/saved-output.ts): the new version's, a removed node's the old one's; undefined when
 * neither version has any, so every count of the diff counts them as each version does.
 */
function elidedOf(
  oldTree: Tree,
  newTree: Tree,
  newIndex: Int32Array,
  oldIndex: Int32Array,
): Float64Array | undefined {
  if (oldTree.elided === undefined && newTree.elided === undefined) return undefined;
  const out = new Float64Array(newIndex.length);
  for (let k = 0; k < out.length; k++) {
    const n = newIndex[k];
    out[k] = n >= 0 ? (newTree.elided?.[n] ?? 0) : (oldTree.elided?.[oldIndex[k]] ?? 0);
  }
  return out;
}

/**
 * The combined tree of `shape` (removed nodes mixed in, or fields or ids the new tree lacks): names,
 * ids, fields and empty entries each from the version the node lives in.
 */
function copyTree(
  oldTree: Tree,
  newTree: Tree,
  keys: string[],
  useIds: boolean,
  newIndex: Int32Array,
  oldIndex: Int32Array,
  shape: Shape,
): Tree {
  const { parent, depth, ownSize } = shape;
  const total = newIndex.length;
  const newName = newTree.name;
  const oldName = oldTree.name;
  const newOrigin = newTree.origin;
  const oldOrigin = oldTree.origin;
  const newIds = newTree.ids;
  const oldIds = oldTree.ids;
  // Names and ids are read from the version each node came from when asked (MergedNames): a summary
  // reads the names of the nodes it shows, and a pool of the combined tree's own would be two numbers
  // a node, memory touched for the first time (dear on a big tree: docs/performance.md).
  const name = new MergedNames(newName, newIndex, oldName, oldIndex);
  const ids = useIds ? new MergedNames(newIds!, newIndex, oldIds!, oldIndex) : null;
  // Where each node came from, made when first read: no summary or diff of it reads it, and an array
  // of every node is new memory, dear on a big tree (docs/performance.md).
  let origin: Int32Array | undefined;
  const originOf = (): Int32Array => {
    if (origin !== undefined) return origin;
    origin = new Int32Array(total);
    for (let k = 0; k < total; k++) {
      const n = newIndex[k];
      origin[k] = n >= 0 ? newOrigin[n] : oldOrigin[oldIndex[k]];
    }
    return origin;
  };
  const fieldValues = keys.map((key) => {
    const values = new Array<string>(total);
    const fromNew = newTree.fields.get(key);
    const fromOld = oldTree.fields.get(key);
    for (let k = 0; k < total; k++) {
      const n = newIndex[k];
      values[k] = (n >= 0 ? fromNew?.[n] : fromOld?.[oldIndex[k]]) ?? "";
    }
    return values;
  });
  const fields = new Map<string, string[]>(keys.map((key, f) => [key, fieldValues[f]]));
  // Empty entries (`{}`), each from the version the node lives in.
  let empty: Uint8Array | undefined;
  if (newTree.empty !== undefined || oldTree.empty !== undefined) {
    empty = new Uint8Array(total);
    for (let k = 0; k < total; k++) {
      const n = newIndex[k];
      empty[k] = n >= 0 ? (newTree.empty?.[n] ?? 0) : (oldTree.empty?.[oldIndex[k]] ?? 0);
    }
  }
  return {
    length: total,
    parent,
    depth,
    name,
    ownSize,
    hasSizes: oldTree.hasSizes || newTree.hasSizes,
    ids,
    get origin() {
      return originOf();
    },
    originIsRow: newTree.originIsRow,
    fields,
    syntheticRoot: newTree.syntheticRoot,
    ...(newTree.reading ? { reading: newTree.reading } : {}),
    ...(empty ? { empty } : {}),
  };
}
