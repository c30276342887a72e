import { EspalierError, quoted, say } from "../errors.js";
import { FOLDED_FIELD } from "../load/saved-output.js";
import type { Tree } from "../model/tree.js";
import { withPathIds } from "./path-ids.js";

/**
 * SHAPE when a diff cannot tell a change from a fold: a version read from espalier's own summary
 * (SAVED_VIEW) shows only part of its tree, each fold one entry that stands for the nodes it hides. A
 * node the other version has under a parent whose saved view folds some of its children may be one of
 * those hidden nodes: counting it added (or removed) would be a change no one made, as two views of
 * one tree saved with different budgets or foci, or a change elsewhere that moved the view's cut, give.
 * Such a diff is refused, naming the first such node; when the views fold at the same places (the same
 * nodes shown under every folded parent), the folds are compared as wholes (diff/combine.ts).
 */
export function checkSavedViewsApart(oldTree: Tree, newTree: Tree): void {
  const oldSaved = isSavedView(oldTree);
  const newSaved = isSavedView(newTree);
  if (!oldSaved && !newSaved) return;
  const oldKeys = pathKeys(oldTree);
  const newKeys = pathKeys(newTree);
  const unsure =
    (oldSaved ? firstUnsure(newTree, newKeys, oldTree, oldKeys) : null) ??
    (newSaved ? firstUnsure(oldTree, oldKeys, newTree, newKeys) : null);
  if (unsure === null) return;
  const [shownIn, folds] = unsure.side === newTree ? ["NEW", "OLD"] : ["OLD", "NEW"];
  const under = unsure.parent === "" ? ["the root"] : say`${quoted.path(unsure.parent)}`;
  throw new EspalierError(
    "SHAPE",
    say`${shownIn} shows ${quoted.path(unsure.path)}, which ${folds} may hold in a fold: ${folds} is a saved view (SAVED_VIEW) that folds some children of ${under}, so whether that node was ${shownIn === "NEW" ? "added" : "removed"} or is only folded cannot be told (views saved with different budgets or foci, or a change that moved where the view cuts, fold different nodes); diff the original inputs, or save both views with the same --focus and a --budget that shows the node in both`,
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
