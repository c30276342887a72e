import { interestNear } from "../interest/near.js";
import type { Scores } from "../interest/scores.js";
import type { Tree } from "../model/tree.js";

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
 * looks at, not the whole combined tree. `onChangePath` comes from `measureChanges`.
 */
export function diffInterest(
  tree: Tree,
  api: Float64Array,
  foci: Int32Array,
  kind: Uint8Array,
  onChangePath: Uint8Array,
): DiffInterest {
  const { parent } = tree;
  const all = new Set<number>(foci);
  for (let i = 0; i < tree.length; i++) if (kind[i] !== 0) all.add(i);
  const scores = interestNear(tree, api, Int32Array.from([...all].sort((a, b) => a - b)));
  // The summary's forced set for the user's foci alone: the root and every focus path.
  const forced = new Set<number>([0]);
  for (const f of foci) for (let a = f; a > 0 && !forced.has(a); a = parent[a]) forced.add(a);
  return {
    interestOf: scores.interestOf,
    distanceOf: scores.distanceOf,
    isForced: (x) => forced.has(x),
    forcedNodes: Int32Array.from(forced).sort(),
    onChangePath,
  };
}
