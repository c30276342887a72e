import { bytesCompare, sameName } from "../model/names.js";
import type { Tree } from "../model/tree.js";
import { KIND } from "./changes.js";
import { type ComparedFields, isEdited } from "./field-edits.js";
import type { Matching } from "./match.js";

/**
 * The kind code (see `KIND`) of new node n whose old counterpart is o (-1: none), by the precedence
 * `combine` states: added, then moved (its parent's counterpart changed), then renamed, then edited (a
 * compared field's value differs), then resized; `KIND.none` for an unchanged node. A removed node is
 * the caller's to mark. The root is never moved, and renamed only when neither version's root is
 * synthetic; matched by path, no other pair can be renamed.
 */
export function kindOf(
  oldTree: Tree,
  newTree: Tree,
  matching: Matching,
  compared: ComparedFields | null,
): (n: number, o: number) => number {
  const renameRoot = !oldTree.syntheticRoot && !newTree.syntheticRoot;
  const byId = matching.by === "id";
  const { newToOld } = matching;
  const oldSize = oldTree.ownSize;
  const newSize = newTree.ownSize;
  const oldParent = oldTree.parent;
  const newParent = newTree.parent;
  const oldName = oldTree.name;
  const newName = newTree.name;
  // Equal bytes are the same name, compared in the caller's loop; other pairs (a rename, or names only
  // decoding can tell apart) go through sameName.
  const equalBytes = bytesCompare(newName, oldName);
  return (n, o) => {
    if (o < 0) return KIND.added;
    if (n > 0 && newToOld[newParent[n]] !== oldParent[o]) return KIND.moved;
    if ((n > 0 ? byId : renameRoot) && !equalBytes(n, o) && !sameName(newName, n, oldName, o))
      return KIND.renamed;
    if (compared !== null && isEdited(compared, o, n)) return KIND.edited;
    if (newSize[n] - oldSize[o] !== 0) return KIND.resized;
    return KIND.none;
  };
}
