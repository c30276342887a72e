import { type NodeOrder, nodeOrder } from "../interest/order.js";
import type { Measures } from "../model/measure.js";
import type { Tree } from "../model/tree.js";
import type { DiffInterest } from "./diff-interest.js";
import { type ChangeMeasures, changeTotalIn } from "./measure-changes.js";

/**
 * The total order the fitter takes a prefix of, for a diff: the summary's {@link nodeOrder} with the
 * changes put between its first tie-break and the rest. Forced nodes (root, the user's foci and
 * their ancestors) first, in pre-order. Then:
 *   1. higher interest first;
 *   2. nodes on a change path (a changed node or an ancestor of one) before the others;
 *   3. on change paths: shallower first, then more changes in the subtree, then input order. A changed
 *      node scores like its ancestors (both as a focus path), so ordering by depth keeps every parent
 *      before its children, and a small budget shows where changes lie before showing them one by one;
 *   4. elsewhere, the summary's tie-breaks: nearer to a focus or change, shallower, bigger subtree,
 *      input order.
 * Off change paths interest drops strictly from parent to child, so a parent always comes first.
 */
export function diffOrder(
  tree: Tree,
  measures: Measures,
  scores: DiffInterest,
  changes: ChangeMeasures,
): NodeOrder {
  const { onChangePath } = scores;
  const { depth } = tree;
  // 0 leaves the pair to the summary's tie-breaks: neither is on a change path.
  return nodeOrder(tree, measures, scores, (a, b) => {
    if (onChangePath[a] !== onChangePath[b]) return onChangePath[b] - onChangePath[a];
    if (!onChangePath[a]) return 0;
    if (depth[a] !== depth[b]) return depth[a] - depth[b];
    const d = changeTotalIn(changes, b) - changeTotalIn(changes, a);
    return d !== 0 ? d : a - b;
  });
}
