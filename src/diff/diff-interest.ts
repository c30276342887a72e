import { interestNear } from "../interest/near.js";
import type { Scores } from "../interest/scores.js";
import type { Tree } from "../model/tree.js";
import type { ChangeMeasures } from "./measure-changes.js";

/** Interest for a diff: changed nodes score as foci do, but only the user's foci are forced. */
export interface DiffInterest extends Scores {
  /** 1 for every changed node and every ancestor of one. */
  readonly onChangePath: Uint8Array;
}

/**
 * Furnas degree of interest (see `interest`) with every changed node added to the user's foci as a
 * soft focus: same formula, so a change and its ancestors score as a focus path does. Only the root
 * and the user's focus paths are forced, so a diff with more changes than the budget still fits.
 * Scored where the fit asks (`interestNear`): the walks up from the changes, then the nodes the fit
 * looks at, not the whole combined tree. `api`: API(x), worked out when asked (`importanceOf`). The
 * changed nodes are read from the change paths `measureChanges` listed (a few nodes a change), not
 * from every node's kind.
 */
export function diffInterest(
  tree: Tree,
  api: (x: number) => number,
  foci: Int32Array,
  kind: Uint8Array,
  changes: ChangeMeasures,
): DiffInterest {
  const { parent } = tree;
  const scores = interestNear(tree, api, withChanged(foci, kind, changes.onPath));
  // The summary's forced set for the user's foci alone: the root and every focus path.
  const forced = new Set<number>([0]);
  for (const f of foci) for (let a = f; a > 0 && !forced.has(a); a = parent[a]) forced.add(a);
  return {
    interestOf: scores.interestOf,
    distanceOf: scores.distanceOf,
    isForced: (x) => forced.has(x),
    forcedNodes: Int32Array.from(forced).sort(),
    onChangePath: changes.onChangePath,
  };
}

/**
 * The foci and every changed node, each once, in ascending order. `onPath` holds the nodes on change
 * paths in pre-order (ascending): the changed nodes are those of them with a kind.
 */
function withChanged(foci: Int32Array, kind: Uint8Array, onPath: Int32Array): Int32Array {
  let changed = 0;
  for (let s = 0; s < onPath.length; s++) if (kind[onPath[s]] !== 0) changed++;
  const all = new Int32Array(changed + foci.length);
  let at = 0;
  for (let s = 0; s < onPath.length; s++) if (kind[onPath[s]] !== 0) all[at++] = onPath[s];
  if (foci.length === 0) return all;
  all.set(foci, at);
  all.sort();
  let unique = 0;
  for (let i = 0; i < all.length; i++) if (i === 0 || all[i] !== all[i - 1]) all[unique++] = all[i];
  return all.subarray(0, unique);
}
