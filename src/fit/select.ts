import { EspalierError } from "../errors.js";
import type { Interest } from "../interest/doi.js";
import type { NodeOrder } from "../interest/order.js";
import type { Measures } from "../model/measure.js";
import type { Tree } from "../model/tree.js";
import { NodeHeap } from "./heap.js";

/** The nodes chosen for display. */
export interface Selection {
  /** 1 where a node is shown. */
  readonly shown: Uint8Array;
  /** Shown nodes in admission order: forced nodes (pre-order), then the order's prefix. */
  readonly admitted: Int32Array;
  /** How many of `admitted` are forced. */
  readonly forcedCount: number;
  /** Lines the text rendering of this selection takes. */
  readonly lines: number;
}

/**
 * Chooses the shown set under a line budget: the forced nodes, then the longest prefix of the node
 * order whose rendering fits. Each shown node takes exactly one line (folded remainders ride on their
 * parent's line), plus `headerLines` for the whole output, so the prefix is found by best-first
 * expansion: the next node in the order is always a child of a node already shown, because a parent
 * precedes its children. Cost: O(k log k + children of shown nodes), never a sort of the whole tree.
 */
export function select(
  tree: Tree,
  measures: Measures,
  scores: Interest,
  order: NodeOrder,
  budget: number,
  headerLines = 0,
): Selection {
  const n = tree.length;
  const shown = new Uint8Array(n);
  const { forced } = scores;
  const { count } = measures;
  const forcedNodes: number[] = [];
  for (let i = 0; i < n; i++) {
    if (forced[i]) forcedNodes.push(i);
    else i += count[i] - 1; // a non-forced node has no forced descendant
  }
  const needed = forcedNodes.length + headerLines;
  if (needed > budget) {
    throw new EspalierError(
      "BUDGET_TOO_SMALL",
      `a budget of ${budget} lines cannot hold the root and the focus paths; the smallest budget that works is ${needed}`,
    );
  }
  const admitted = new Int32Array(Math.min(n, budget - headerLines));
  let k = 0;
  for (const f of forcedNodes) {
    shown[f] = 1;
    admitted[k++] = f;
  }
  const heap = new NodeHeap(order);
  const pushChildren = (p: number) => {
    const end = p + count[p];
    for (let c = p + 1; c < end; c += count[c]) if (!shown[c]) heap.push(c);
  };
  if (k < admitted.length) for (const f of forcedNodes) pushChildren(f);
  while (k < admitted.length && heap.size > 0) {
    const next = heap.pop();
    shown[next] = 1;
    admitted[k++] = next;
    if (k < admitted.length) pushChildren(next);
  }
  return {
    shown,
    admitted: admitted.subarray(0, k),
    forcedCount: forcedNodes.length,
    lines: k + headerLines,
  };
}
