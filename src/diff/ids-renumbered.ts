import { say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import { KIND } from "./changes.js";
import { matchTrees } from "./match.js";
import type { PreparedDiff } from "./prepared-diff.js";
import { subtreeCounts } from "./subtree-counts.js";

/**
 * At least this share of the removed nodes pair by name and place with added ones: then their ids look
 * renumbered. Chosen, not measured: "most of them" (a month of an org chart's real changes pairs none
 * so, as people who leave and join have other names; half an export numbered afresh pairs all).
 */
const BY_PATH = 0.5;

/**
 * At least this share of the smaller version's nodes (the roots aside) moved or were renamed: then the
 * ids may name other rows in NEW than in OLD (row numbers as ids), and both versions are matched by
 * path to see. Chosen, not measured: a reorganisation moves fewer, and below it no whole-tree matching
 * by path is paid for.
 */
const REUSED = 0.1;

/**
 * IDS_RENUMBERED: a diff matched by id (tables with an id and a parent column) whose ids look numbered
 * afresh, loud but saying nothing of why. Either most removed nodes (two at least) have an added node of
 * the same name under the same parent, as matching by path would pair them (every id changed, or a part
 * of them: they read as removed and added); or a tenth of the nodes moved or were renamed while most of
 * those changes (and removals) are nodes that matching by path pairs with another node than their id
 * does (ids that number rows, shifted by a row taken out: they read as moved and renamed). The note says
 * how many nodes pair so, in the words the header says it with (`998,998 nodes pair by path`), each
 * number written by `count` (the CLI's `formatCount`). Undefined otherwise, and for graphs and diffs
 * matched by path.
 */
export function idsRenumberedNote(
  prepared: PreparedDiff,
  count: (n: number) => string = String,
): ReadingNote | undefined {
  const { combined, totals } = prepared;
  if (combined.by !== "id" || totals.graph) return undefined;
  const { removed, added, moved, renamed } = totals.changes;
  const { oldTree, newTree } = combined;
  const advice =
    "A diff of two tables with ids matches by id (see docs/diff.md, Matching); to compare by name and place, give both versions the same ids, or name a column both share with --id-field (and its parent column with --parent-field)";
  if (removed >= 2 && added >= 2) {
    const byPath = removedPairedByPath(prepared);
    if (byPath >= 2 && byPath >= BY_PATH * removed)
      return {
        code: "IDS_RENUMBERED",
        count: byPath,
        parts: say`matched by id, of OLD's ${count(oldTree.length - 1)} nodes below the root ${count(removed)} found no id in NEW, while ${count(byPath)} of them pair by path (have a node of the same name under the same parent there that found no id in OLD, as matching by path pairs them): their ids look renumbered, so they read as removed and added. ${advice}`,
      };
  }
  const smaller = Math.min(oldTree.length, newTree.length) - 1;
  if (moved + renamed < 2 || moved + renamed < REUSED * smaller) return undefined;
  const otherwise = pairedOtherwise(prepared, oldTree, newTree);
  if (otherwise < 2 || otherwise < BY_PATH * (moved + renamed + removed)) return undefined;
  return {
    code: "IDS_RENUMBERED",
    count: otherwise,
    parts: say`matched by id, of OLD's ${count(oldTree.length - 1)} nodes below the root ${count(moved)} moved, ${count(renamed)} were renamed and ${count(removed)} found no id in NEW, while ${count(otherwise)} nodes of NEW pair by path with another node than their id's (have a node of the same name under the same parent in OLD that another id named, as matching by path pairs them): the ids look renumbered (as row numbers are when a row is taken out), so nodes read as moved and renamed. ${advice}`,
  };
}

/**
 * How many nodes of NEW pair by path (names under matched parents, the ids set aside) with an old node
 * that matching by id paired with another node, or with none.
 */
function pairedOtherwise(prepared: PreparedDiff, oldTree: Tree, newTree: Tree): number {
  const { newIndex, oldIndex } = prepared.combined;
  const byId = new Int32Array(oldTree.length).fill(-1);
  for (let k = 0; k < newIndex.length; k++)
    if (newIndex[k] >= 0 && oldIndex[k] >= 0) byId[oldIndex[k]] = newIndex[k];
  const oldPaths: Tree = { ...oldTree, ids: null };
  const newPaths: Tree = { ...newTree, ids: null };
  const { newToOld } = matchTrees(oldPaths, subtreeCounts(oldPaths), newPaths, subtreeCounts(newPaths));
  let pairs = 0;
  for (let n = 1; n < newToOld.length; n++) if (newToOld[n] >= 0 && byId[newToOld[n]] !== n) pairs++;
  return pairs;
}

/**
 * How many removed nodes pair with an added node of the same name under the same parent, in the
 * combined tree (docs/diff.md): a removed node stands under its old parent's counterpart, or under its
 * removed old parent, whose pair's added children it then pairs with. Pre-order pairs a parent first;
 * among children of one name the k-th removed pairs with the k-th added, as matching by path pairs them.
 * Reads the nodes on change paths only.
 */
function removedPairedByPath(prepared: PreparedDiff): number {
  const { tree, kind } = prepared.combined;
  const { parent, name } = tree;
  // The nodes on change paths, in pre-order (a parent before its children), hold every removed and
  // every added node: no pass over every node or over every child of a parent (such passes took 16-40
  // ms on the bench's 1M pair, a tenth of its matching).
  const { onPath } = prepared.changeMeasures;
  const addedUnder = new Map<number, number[]>();
  for (let s = 0; s < onPath.length; s++) {
    const a = onPath[s];
    if (kind[a] !== KIND.added) continue;
    const list = addedUnder.get(parent[a]);
    if (list) list.push(a);
    else addedUnder.set(parent[a], [a]);
  }
  // Each parent's added children by name, and how many of each name were taken (a list is never shifted:
  // a root of a million renumbered children would make that quadratic).
  const byParent = new Map<number, Map<string, { nodes: number[]; taken: number }>>();
  const addedChildren = (q: number): Map<string, { nodes: number[]; taken: number }> | undefined => {
    let byName = byParent.get(q);
    if (byName) return byName;
    const children = addedUnder.get(q);
    if (!children) return undefined;
    byName = new Map();
    for (const c of children) {
      const key = name.get(c);
      const list = byName.get(key);
      if (list) list.nodes.push(c);
      else byName.set(key, { nodes: [c], taken: 0 });
    }
    byParent.set(q, byName);
    return byName;
  };
  const partner = new Map<number, number>();
  let pairs = 0;
  for (let s = 0; s < onPath.length; s++) {
    const r = onPath[s];
    if (kind[r] !== KIND.removed) continue;
    const p = parent[r];
    const q = kind[p] === KIND.removed ? partner.get(p) : p;
    if (q === undefined) continue;
    const list = addedChildren(q)?.get(name.get(r));
    if (list === undefined || list.taken === list.nodes.length) continue;
    partner.set(r, list.nodes[list.taken++]);
    pairs++;
  }
  return pairs;
}
