import { MergedNames } from "../model/merged-names.js";
import { bytesCompare, sameName } from "../model/names.js";
import type { Tree } from "../model/tree.js";
import { KIND } from "./changes.js";
import { type ComparedFields, isEdited } from "./field-edits.js";
import type { Matching } from "./match.js";

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
 */
export function combineListing(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  matching: Matching,
  compared: ComparedFields | null = null,
): { combined: Combined; changed: Int32Array } {
  const { oldToNew, newToOld } = matching;
  // Each pass below is a function of its own with one loop (and no growing array in it): the engine
  // compiles a loop that runs once while it runs, and compiles it again when the loop meets code it has
  // not run yet (docs/performance.md, eleventh session).
  const flags = new Uint8Array(newTree.length);
  const removedCount = markSplices(oldTree.parent, newTree.parent, oldToNew, flags);
  const total = newTree.length + removedCount;
  if (removedCount === 0) {
    // Nothing to splice in: the combined tree is the new tree.
    const identity = identityOf(total);
    const { kind, changed } = kinds(oldTree, newTree, matching, compared, identity, newToOld);
    return {
      combined: combined(oldTree, newTree, matching, identity, newToOld, kind, null, compared),
      changed,
    };
  }
  const spliced = splice(oldTree, oldCount, newTree, newCount, matching, flags, total);
  const { newIndex, oldIndex } = spliced;
  const { kind, changed } = kinds(oldTree, newTree, matching, compared, newIndex, oldIndex);
  return {
    combined: combined(oldTree, newTree, matching, newIndex, oldIndex, kind, spliced, compared),
    changed,
  };
}

/**
 * Per new node: SPLICE when its old counterpart has a removed child (spliced in among its children by
 * {@link splice}), MIXED when its subtree holds such a node (else the subtree is copied as one block):
 * marked up from each, to the first node marked before. Returns the number of removed nodes.
 */
function markSplices(
  oldParent: Int32Array,
  newParent: Int32Array,
  oldToNew: Int32Array,
  flags: Uint8Array,
): number {
  let removed = 0;
  for (let o = 1; o < oldToNew.length; o++) {
    if (oldToNew[o] >= 0) continue;
    removed++;
    const m = oldToNew[oldParent[o]];
    if (m < 0) continue;
    flags[m] |= SPLICE;
    for (let a = m; a >= 0 && (flags[a] & MIXED) === 0; a = a > 0 ? newParent[a] : -1) flags[a] |= MIXED;
  }
  return removed;
}

/** 0, 1, 2, ... `length - 1`. */
function identityOf(length: number): Int32Array {
  const identity = new Int32Array(length);
  for (let k = 0; k < length; k++) identity[k] = k;
  return identity;
}

/** The combined tree's nodes (where each comes from) and shape, the removed nodes spliced in. */
interface Spliced extends Shape {
  newIndex: Int32Array;
  oldIndex: Int32Array;
}

/** Blocks shorter than this are copied by a loop; longer ones by the runtime's copy of a range. */
const SHORT_BLOCK = 64;

/**
 * The combined tree in pre-order, depth first. Stack entries: n >= 0 a new node, -(o + 1) a removed
 * old node. A new node with no removed node in its subtree (not MIXED) is copied with its whole subtree
 * as one block: where each node comes from, and the new version's parents (shifted by the block's
 * place), depths and own sizes (a new node's depth is the same in both trees: removed nodes only add
 * siblings and their subtrees). Each node is pushed once, so neither stack outgrows the combined tree:
 * both are made that long (memory no one writes costs nothing) and never grow in the loop.
 */
function splice(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  matching: Matching,
  flags: Uint8Array,
  total: number,
): Spliced {
  const { oldToNew, newToOld } = matching;
  const newParent = newTree.parent;
  const newDepth = newTree.depth;
  const newSize = newTree.ownSize;
  const newIndex = new Int32Array(total);
  const oldIndex = new Int32Array(total);
  const parent = new Int32Array(total);
  const depth = new Int32Array(total);
  const ownSize = new Float64Array(total);
  const stack = new Int32Array(total);
  const stackParent = new Int32Array(total);
  let sp = 0;
  stack[sp] = 0;
  stackParent[sp++] = -1;
  let k = 0;
  while (sp > 0) {
    const entry = stack[--sp];
    const pc = stackParent[sp];
    if (entry >= 0 && (flags[entry] & MIXED) === 0) {
      const n = entry;
      const end = n + newCount[n];
      const base = k - n;
      newIndex[k] = n;
      parent[k] = pc;
      if (end - n < SHORT_BLOCK) {
        for (let j = n; j < end; j++) {
          oldIndex[j + base] = newToOld[j];
          depth[j + base] = newDepth[j];
          ownSize[j + base] = newSize[j];
        }
      } else {
        oldIndex.set(newToOld.subarray(n, end), k);
        depth.set(newDepth.subarray(n, end), k);
        ownSize.set(newSize.subarray(n, end), k);
      }
      for (let j = n + 1; j < end; j++) {
        newIndex[j + base] = j;
        parent[j + base] = newParent[j] + base;
      }
      k += end - n;
      continue;
    }
    const self = k++;
    parent[self] = pc;
    depth[self] = pc < 0 ? 0 : depth[pc] + 1;
    const first = sp;
    if (entry >= 0) {
      newIndex[self] = entry;
      oldIndex[self] = newToOld[entry];
      ownSize[self] = newSize[entry];
      sp =
        (flags[entry] & SPLICE) === 0
          ? pushChildren(stack, sp, entry, newCount)
          : pushSpliced(stack, sp, entry, newTree, newCount, newToOld[entry], oldCount, oldToNew);
    } else {
      const o = -entry - 1;
      newIndex[self] = -1;
      oldIndex[self] = o;
      const end = o + oldCount[o];
      for (let c = o + 1; c < end; c += oldCount[c]) if (oldToNew[c] < 0) stack[sp++] = -c - 1;
    }
    // Reverse the children just pushed, so that the first child is popped first.
    for (let a = first, b = sp - 1; a < b; a++, b--) {
      const t = stack[a];
      stack[a] = stack[b];
      stack[b] = t;
    }
    for (let a = first; a < sp; a++) stackParent[a] = self;
  }
  return { newIndex, oldIndex, parent, depth, ownSize };
}

/** Pushes the children of new node n from stack position `at`; returns the new stack position. */
function pushChildren(stack: Int32Array, at: number, n: number, newCount: Int32Array): number {
  let sp = at;
  const end = n + newCount[n];
  for (let c = n + 1; c < end; c += newCount[c]) stack[sp++] = c;
  return sp;
}

/**
 * Pushes the children of new node n, whose old counterpart o lost some, from stack position `at`: its
 * new children with the removed old ones spliced in, each right after the nearest earlier old sibling
 * that is still a child of n (first when there is none). Returns the new stack position.
 */
function pushSpliced(
  stack: Int32Array,
  at: number,
  n: number,
  newTree: Tree,
  newCount: Int32Array,
  o: number,
  oldCount: Int32Array,
  oldToNew: Int32Array,
): number {
  const newParent = newTree.parent;
  const after = new Map<number, number[]>(); // new child -> removed old siblings placed after it
  let anchor = -1;
  const oEnd = o + oldCount[o];
  for (let s = o + 1; s < oEnd; s += oldCount[s]) {
    const m = oldToNew[s];
    if (m >= 0) {
      if (newParent[m] === n) anchor = m;
      continue;
    }
    const list = after.get(anchor);
    if (list) list.push(-s - 1);
    else after.set(anchor, [-s - 1]);
  }
  let sp = at;
  const first = after.get(-1);
  if (first !== undefined) for (let r = 0; r < first.length; r++) stack[sp++] = first[r];
  const nEnd = n + newCount[n];
  for (let c = n + 1; c < nEnd; c += newCount[c]) {
    stack[sp++] = c;
    const list = after.get(c);
    if (list !== undefined) for (let r = 0; r < list.length; r++) stack[sp++] = list[r];
  }
  return sp;
}

/** Flags of a new node in `combine`: its counterpart has a removed child; its subtree holds such a node. */
const SPLICE = 1;
const MIXED = 2;

/**
 * Each node's kind, by the precedence `combine` states, and the changed nodes in ascending order. The
 * list is made as long as the tree (memory no one writes costs nothing) so that it never grows in the
 * loop, and copied to its length at the end.
 */
function kinds(
  oldTree: Tree,
  newTree: Tree,
  matching: Matching,
  compared: ComparedFields | null,
  newIndex: Int32Array,
  oldIndex: Int32Array,
): { kind: Uint8Array; changed: Int32Array } {
  const total = newIndex.length;
  const kind = new Uint8Array(total);
  const changed = new Int32Array(total);
  let changes = 0;
  const renameRoot = !oldTree.syntheticRoot && !newTree.syntheticRoot;
  // Matched by path, every pair below the root has equal names.
  const byId = matching.by === "id";
  const { newToOld } = matching;
  const oldSize = oldTree.ownSize;
  const newSize = newTree.ownSize;
  const oldParent = oldTree.parent;
  const newParent = newTree.parent;
  const oldName = oldTree.name;
  const newName = newTree.name;
  // Equal bytes are the same name, compared in this loop; other pairs (a rename, or names only
  // decoding can tell apart) go through sameName.
  const equalBytes = bytesCompare(newName, oldName);
  for (let k = 0; k < total; k++) {
    const n = newIndex[k];
    const o = oldIndex[k];
    let c: number = KIND.none;
    if (n < 0) c = KIND.removed;
    else if (o < 0) c = KIND.added;
    else if (n > 0 && newToOld[newParent[n]] !== oldParent[o]) c = KIND.moved;
    else if ((n > 0 ? byId : renameRoot) && !equalBytes(n, o) && !sameName(newName, n, oldName, o))
      c = KIND.renamed;
    else if (compared !== null && isEdited(compared, o, n)) c = KIND.edited;
    else if (newSize[n] - oldSize[o] !== 0) c = KIND.resized;
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
  const total = newIndex.length;
  const oldSize = oldTree.ownSize;
  const newSize = newTree.ownSize;
  const deltaOf = (k: number): number => {
    const n = newIndex[k];
    const o = oldIndex[k];
    return n < 0 ? 0 - oldSize[o] : o < 0 ? newSize[n] : newSize[n] - oldSize[o];
  };
  const keys = [...new Set([...newTree.fields.keys(), ...oldTree.fields.keys()])];
  const ids = matching.by === "id";
  const tree: Tree =
    spliced === null && keys.length === newTree.fields.size && (!ids || newTree.ids)
      ? { ...newTree, ids: ids ? newTree.ids : null, hasSizes: oldTree.hasSizes || newTree.hasSizes }
      : copyTree(oldTree, newTree, keys, ids, newIndex, oldIndex, spliced ?? newTree);
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
    by: matching.by,
    compared,
  };
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
