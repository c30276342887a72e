import { type Interest, interest } from "../interest/doi.js";
import type { Tree } from "../model/tree.js";

/** Interest for a diff: changed nodes score as foci do, but only the user's foci are forced. */
export interface DiffInterest extends Interest {
  /** 1 for every changed node and every ancestor of one. */
  readonly onChangePath: Uint8Array;
}

/**
 * Furnas degree of interest (see `interest`) with every changed node added to the user's foci as a
 * soft focus: same formula, so a change and its ancestors score as a focus path does. `forced` holds
 * only the root and the user's focus paths, so a diff with more changes than the budget still fits.
 */
export function diffInterest(
  tree: Tree,
  api: Float64Array,
  foci: Int32Array,
  kind: Uint8Array,
): DiffInterest {
  const n = tree.length;
  const { parent } = tree;
  const isFocus = new Uint8Array(n);
  for (const f of foci) isFocus[f] = 1;
  const all: number[] = [];
  for (let i = 0; i < n; i++) if (isFocus[i] || kind[i] !== 0) all.push(i);
  const scores = interest(tree, api, Int32Array.from(all));
  const forced = new Uint8Array(n);
  const onChangePath = new Uint8Array(n);
  forced[0] = 1;
  for (let i = n - 1; i > 0; i--) {
    if (isFocus[i]) forced[i] = 1;
    if (kind[i] !== 0) onChangePath[i] = 1;
    const p = parent[i];
    if (forced[i]) forced[p] = 1;
    if (onChangePath[i]) onChangePath[p] = 1;
  }
  if (kind[0] !== 0) onChangePath[0] = 1;
  return { value: scores.value, distance: scores.distance, forced, onChangePath };
}
