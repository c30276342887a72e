import { say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import { matchTrees } from "./match.js";
import type { PreparedDiff } from "./prepared-diff.js";
import { subtreeCounts } from "./subtree-counts.js";

/**
 * At most this share of the smaller version's nodes (the roots aside) kept their id, and at least
 * {@link BY_PATH} of them pair by name and place: then the ids look renumbered. Chosen, not measured:
 * "almost none" and "almost all" (a reorganisation that kept its ids pairs far more by id, one that
 * renamed and moved most people far fewer by path).
 */
const BY_ID = 0.1;
const BY_PATH = 0.9;

/**
 * IDS_RENUMBERED: a diff matched by id (tables with an id and a parent column) in which almost no node
 * kept its id while almost every node pairs with one of the same name under its parent's counterpart,
 * as matching by path pairs them: every node then reads as removed and added, which is loud but says
 * nothing of why. Undefined otherwise, and for graphs, diffs matched by path and versions of fewer than
 * two nodes below the root. The path matching runs only when matching by id paired almost nothing.
 */
export function idsRenumberedNote(prepared: PreparedDiff): ReadingNote | undefined {
  const { combined, totals } = prepared;
  if (combined.by !== "id" || totals.graph) return undefined;
  const { oldTree, newTree } = combined;
  const smaller = Math.min(oldTree.length, newTree.length) - 1;
  if (smaller < 2) return undefined;
  const byId = oldTree.length - 1 - totals.changes.removed;
  if (byId > BY_ID * smaller) return undefined;
  const byPath = pairedByPath(oldTree, newTree);
  if (byPath < BY_PATH * smaller) return undefined;
  const kept = byId === 1 ? "1 kept its id" : `${byId} kept their ids`;
  return {
    code: "IDS_RENUMBERED",
    count: byPath,
    parts: say`matched by id, of OLD's ${oldTree.length - 1} nodes below the root ${kept} in NEW, while ${byPath} have a node of the same name under the same parent there, as matching by path pairs them: the ids look renumbered, so nodes read as removed and added. A diff of two tables with ids matches by id (see docs/diff.md, Matching); to compare by name and place, give both versions the same ids, or name a column both share with --id-field (and its parent column with --parent-field)`,
  };
}

/** How many nodes below the root pair by path (names under matched parents), the ids set aside. */
function pairedByPath(oldTree: Tree, newTree: Tree): number {
  const oldPaths: Tree = { ...oldTree, ids: null };
  const newPaths: Tree = { ...newTree, ids: null };
  const { newToOld } = matchTrees(oldPaths, subtreeCounts(oldPaths), newPaths, subtreeCounts(newPaths));
  let pairs = 0;
  for (let n = 1; n < newToOld.length; n++) if (newToOld[n] >= 0) pairs++;
  return pairs;
}
