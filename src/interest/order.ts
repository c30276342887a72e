import type { Measures } from "../model/measure.js";
import type { Tree } from "../model/tree.js";
import type { Scores } from "./scores.js";

/**
 * The one total order of the nodes that the fitter takes a prefix of. Forced nodes (root, foci and
 * their ancestors) come first, in pre-order. Then, for the rest:
 *   1. higher interest first;
 *   2. nearer to a focus first (a focus's children, then its siblings, then its ancestors' siblings);
 *   3. shallower first;
 *   4. more nodes in the subtree first (the bigger team or package before the smaller one);
 *   5. input order.
 * No tie-break reads sizes, so a size change alone never reorders nodes under the default importance.
 * A parent always precedes its children: from a non-forced parent to its child interest drops strictly
 * (by at least 2 with foci, at least 1 without), because API drops by at least 1 per level.
 */
export type NodeOrder = (a: number, b: number) => number;

/**
 * `between` (a diff's: changes first) decides, when it returns non-zero, between tie-break 1 and the
 * rest; it must keep a parent before its children.
 */
export function nodeOrder(tree: Tree, measures: Measures, scores: Scores, between?: NodeOrder): NodeOrder {
  const rest = contextTieBreaks(tree, measures, scores);
  return (a, b) => {
    const fa = scores.isForced(a);
    if (fa !== scores.isForced(b)) return fa ? -1 : 1;
    if (fa) return a - b;
    const va = scores.interestOf(a);
    const vb = scores.interestOf(b);
    if (va !== vb) return vb - va;
    // Graphs: the paths to a focus's parents, nearest a root first (interest/graph-doi.ts).
    if (scores.rankOf !== undefined) {
      const ra = scores.rankOf(a);
      const rb = scores.rankOf(b);
      if (ra !== rb) return ra - rb;
    }
    if (between !== undefined) {
      const t = between(a, b);
      if (t !== 0) return t;
    }
    return rest(a, b);
  };
}

/** Tie-breaks 2 to 5 above (nearer a focus, shallower, bigger subtree, input order). */
function contextTieBreaks(tree: Tree, measures: Measures, scores: Pick<Scores, "distanceOf">): NodeOrder {
  const { depth } = tree;
  const { nodes } = measures;
  return (a, b) => {
    const da = scores.distanceOf(a);
    const db = scores.distanceOf(b);
    if (da !== db) return da - db;
    if (depth[a] !== depth[b]) return depth[a] - depth[b];
    if (nodes[a] !== nodes[b]) return nodes[b] - nodes[a];
    return a - b;
  };
}

/**
 * The children of `p` in the order {@link nodeOrder} puts those of them that are not forced, under the
 * a-priori importance by depth: such siblings have the same interest (API and depth are equal, and
 * their best ancestor term is their parent's), the same distance to a focus and the same depth, so
 * tie-break 4 and 5 decide: bigger subtree first, then input order. No focus enters, so a tree can keep
 * it per parent and a new focus need not look at every child of a node with very many.
 */
export function childrenByDepthOrder(measures: Measures, p: number): Int32Array {
  const { count, nodes, children } = measures;
  const list = new Int32Array(children[p]);
  let uniform = true;
  for (let c = p + 1, k = 0, end = p + count[p]; c < end; c += count[c], k++) {
    list[k] = c;
    if (nodes[c] !== nodes[p + 1]) uniform = false;
  }
  // Children come in input order; with equal subtree counts that is the order already.
  return uniform ? list : list.sort((a, b) => nodes[b] - nodes[a] || a - b);
}
