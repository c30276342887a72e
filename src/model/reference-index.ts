import type { Tree } from "./tree.js";

/** A graph's references to some of its full entries (the foci of a summary), grouped by entry. */
export interface ReferenceIndex {
  /** The references to full entry `t`, in pre-order: empty when there are none or `t` was not asked for. */
  of(t: number): Int32Array;
}

/** Targets beyond which {@link referencesTo} marks them in an array rather than comparing with each. */
const FEW = 16;

/**
 * The references that stand for each of `targets` (slots of full entries): one pass over
 * `referenceTo`, so a summary pays for its foci only, not for an index of every node's references;
 * null on a tree.
 */
export function referencesTo(tree: Tree, targets: ArrayLike<number>): ReferenceIndex | null {
  const to = tree.referenceTo;
  if (to === undefined) return null;
  const n = tree.length;
  const wanted = Int32Array.from(new Set(Array.from(targets)));
  const found: number[][] = Array.from(wanted, () => []);
  const place = new Map<number, number>();
  for (let k = 0; k < wanted.length; k++) place.set(wanted[k], k);
  if (wanted.length <= FEW) {
    // Target by target, by the runtime's search of the array: a few times faster than one loop here
    // comparing every slot with each target (2.9M slots on the bench graph).
    const slots = to.length === n ? to : to.subarray(0, n);
    for (let k = 0; k < wanted.length; k++)
      for (let s = slots.indexOf(wanted[k]); s !== -1; s = slots.indexOf(wanted[k], s + 1)) found[k].push(s);
  } else {
    const mark = new Uint8Array(n);
    for (const t of wanted) mark[t] = 1;
    for (let s = 0; s < n; s++) {
      const t = to[s];
      if (t !== -1 && mark[t] === 1) found[place.get(t)!].push(s);
    }
  }
  const lists = found.map((list) => Int32Array.from(list));
  const none = new Int32Array(0);
  return { of: (t) => lists[place.get(t) ?? -1] ?? none };
}
