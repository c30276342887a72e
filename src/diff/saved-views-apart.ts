import { EspalierError, quoted, say } from "../errors.js";
import { FOLDED_FIELD } from "../load/saved-output.js";
import type { Tree } from "../model/tree.js";
import { atCoarserFolds } from "./at-coarser-folds.js";
import { withPathIds } from "./path-ids.js";

/**
 * Two versions a diff can compare node by node, one or both read from espalier's own summary
 * (SAVED_VIEW), which shows only part of its tree, each fold one entry that stands for the nodes it
 * hides. A node the other version has under a parent whose saved view folds some of its children may
 * be one of those hidden nodes: counting it added (or removed) would be a change no one made, as two
 * views of one tree saved with different budgets or foci give. When only one version has such nodes
 * (its view is finer than the other's: every fold of it lies inside one of the other's, or holds only
 * nodes the other has no place for), it is read at the other's folds (diff/at-coarser-folds.ts), which
 * compares exactly; when both have them (the views' folds cross), or a version is a graph, the diff
 * is SHAPE, naming the first such node. Views that fold at the same places compare as they are, each
 * fold a whole (diff/combine.ts).
 */
export function checkSavedViewsApart(oldTree: Tree, newTree: Tree): [Tree, Tree] {
  const oldSaved = isSavedView(oldTree);
  const newSaved = isSavedView(newTree);
  if (!oldSaved && !newSaved) return [oldTree, newTree];
  const oldKeys = pathKeys(oldTree);
  const newKeys = pathKeys(newTree);
  const newUnsure = oldSaved ? firstUnsure(newTree, newKeys, oldTree, oldKeys) : null;
  const oldUnsure = newSaved ? firstUnsure(oldTree, oldKeys, newTree, newKeys) : null;
  if (newUnsure === null && oldUnsure === null) return [oldTree, newTree];
  const graph = oldTree.referenceTo !== undefined || newTree.referenceTo !== undefined;
  if (newUnsure !== null && oldUnsure === null && !graph)
    return [oldTree, atCoarserFolds(newTree, newKeys, oldTree, oldKeys, "OLD")];
  if (oldUnsure !== null && newUnsure === null && !graph)
    return [atCoarserFolds(oldTree, oldKeys, newTree, newKeys, "NEW"), newTree];
  const unsure = (newUnsure ?? oldUnsure)!;
  const [shownIn, folds] = unsure.side === newTree ? ["NEW", "OLD"] : ["OLD", "NEW"];
  const under = unsure.parent === "" ? ["the root"] : say`${quoted.path(unsure.parent)}`;
  const other = newUnsure !== null && oldUnsure !== null ? oldUnsure : null;
  throw new EspalierError(
    "SHAPE",
    [
      ...say`${shownIn} shows ${quoted.path(unsure.path)}, which ${folds} may hold in a fold: ${folds} is a saved view (SAVED_VIEW) that folds some children of `,
      ...under,
      ...(other === null
        ? []
        : say`, and OLD shows ${quoted.path(other.path)}, which NEW may hold in one: the views' folds cross, neither inside the other's`),
      `, so whether such a node was ${shownIn === "NEW" ? "added" : "removed"} or is only folded cannot be told (views saved with different foci, or a change that moved where the view cuts, fold apart); diff the original inputs, or save both views with the same --focus and a --budget that shows the node in both`,
    ],
    undefined,
    { path: unsure.path },
  );
}

function isSavedView(tree: Tree): boolean {
  return tree.reading?.notes?.some((n) => n.code === "SAVED_VIEW") === true;
}

/** Each node's path below the root as espalier prints paths (escaped, `~~N` for a repeated name; the root ""). */
function pathKeys(tree: Tree): readonly string[] {
  const ids = withPathIds(tree).ids;
  return Array.from({ length: tree.length }, (_, i) => ids?.get(i) ?? "");
}

/**
 * The first node of `shown` (in its order) that `saved` has not at its path while `saved` has its
 * parent, and that parent holds a fold entry there: a node the fold may hide. `side` is `shown`.
 */
function firstUnsure(
  shown: Tree,
  shownKeys: readonly string[],
  saved: Tree,
  savedKeys: readonly string[],
): { side: Tree; path: string; parent: string } | null {
  const folded = saved.fields.get(FOLDED_FIELD);
  if (folded === undefined) return null;
  const present = new Set(savedKeys);
  // The parents (by path) under which the saved view has a fold entry.
  const folding = new Set<string>();
  for (let i = 1; i < saved.length; i++) if (folded[i] !== "") folding.add(savedKeys[saved.parent[i]]);
  if (folding.size === 0) return null;
  const shownFolds = shown.fields.get(FOLDED_FIELD);
  for (let i = 1; i < shown.length; i++) {
    if (shownFolds !== undefined && shownFolds[i] !== "") continue;
    const parent = shownKeys[shown.parent[i]];
    if (folding.has(parent) && !present.has(shownKeys[i])) return { side: shown, path: shownKeys[i], parent };
  }
  return null;
}
