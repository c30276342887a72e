/**
 * What the node order, the fit and the view read of a degree of interest, node by node. Both ways of
 * computing it give one: {@link interest} (`doi.ts`) fills arrays for every node, {@link interestNear}
 * (`near.ts`) scores a node only when it is asked, which is what lets a new focus on a big tree cost
 * what the fit looks at rather than the whole tree. Another kind of interest (a graph distance, say)
 * plugs in by giving these four members; the fit needs no more.
 *
 * Contract, relied on by `select`: interest never rises from a parent to a child that is not forced,
 * and drops strictly there (so a parent comes before its children in the order and every prefix of the
 * order is a connected tree); every ancestor of a forced node is forced; node 0, the root, is forced.
 */
export interface Scores {
  /** The degree of interest of node `x`. */
  interestOf(x: number): number;
  /** Edges from `x` to the nearest focus (a tie-break); {@link FAR} when there is no focus. */
  distanceOf(x: number): number;
  /** Whether `x` is always shown: the root, every focus and every ancestor of a focus. */
  isForced(x: number): boolean;
  /** The forced nodes in pre-order (the fit starts from them; no walk of the tree finds them again). */
  readonly forcedNodes: Int32Array;
  /**
   * Graphs only: the rank of the parent of a focus (a reference to it, nearest a root first) whose path
   * node `x` is on; {@link FAR} elsewhere. Among equal interest, a lower rank comes first.
   */
  rankOf?(x: number): number;
}

/** The distance of every node when there is no focus. */
export const FAR = 0x7fffffff;
