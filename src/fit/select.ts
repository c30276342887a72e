import { EspalierError } from "../errors.js";
import { NodeTable } from "../interest/node-table.js";
import type { NodeOrder } from "../interest/order.js";
import type { Scores } from "../interest/scores.js";
import type { Measures } from "../model/measure.js";
import type { Tree } from "../model/tree.js";
import { NodeHeap } from "./heap.js";

/** The nodes chosen for display. */
export interface Selection {
  /**
   * 1 where a node is shown: one flag per node of the tree, made on first read (a fit keeps only the
   * few shown nodes; {@link isShown} asks without making it).
   */
  readonly shown: Uint8Array;
  /** Whether node `i` is shown, as `shown[i] === 1`. */
  isShown(i: number): boolean;
  /** Shown nodes in admission order: forced nodes (pre-order), then the order's prefix. */
  readonly admitted: Int32Array;
  /** How many of `admitted` are forced. */
  readonly forcedCount: number;
  /** Lines the text rendering of this selection takes. */
  readonly lines: number;
  /** Whether the fit dropped the header's spare lines (see `SelectOptions.spareLines`) to fit at all. */
  readonly spared: boolean;
}

/**
 * The children of `p` in the order's own order for nodes that are not forced, or null to have them
 * scanned. A hint for nodes with very many children; it must agree with the order it comes with.
 */
export type ChildrenInOrder = (p: number) => Int32Array | null;

/**
 * Lines that showing node `x` adds. One, except with `chains`: a node that is the only child of a
 * parent which is not a focus continues its parent's line (`a / b / c`), so it costs nothing. The
 * rule depends only on the tree, never on what else is shown, so costs stay fixed as the budget grows.
 */
export function lineCost(tree: Tree, measures: Measures, scores: Scores, chains: boolean, x: number): number {
  if (!chains) return 1;
  const p = tree.parent[x];
  // The root, and a reference (graphs), always have a line of their own.
  if (p < 0 || (tree.referenceTo !== undefined && tree.referenceTo[x] !== -1)) return 1;
  // x is p's only child: its only slot (a reference is another child) and its only node (elided ones count).
  const only = measures.count[p] === measures.count[x] + 1 && measures.nodes[p] === measures.nodes[x] + 1;
  return only && scores.distanceOf(p) !== 0 ? 0 : 1;
}

/** What the fit chooses from: a tree, its measures, the interest of its nodes and their one total order. */
export interface Ranked {
  readonly tree: Tree;
  readonly measures: Measures;
  readonly scores: Scores;
  readonly order: NodeOrder;
}

/** How much the fit may show, and how lines are counted. */
export interface SelectOptions {
  /** Lines the output may take, header included. */
  budget: number;
  /** Lines the output spends before the tree; default 0. */
  headerLines?: number;
  /**
   * How many of `headerLines` the output does without (the key line) rather than refuse a budget too
   * small for the root and the focus paths; default 0.
   */
  spareLines?: number;
  /** A run of only children takes one line (see {@link lineCost}); default false. */
  chains?: boolean;
  /** Wide nodes' children in the order's own order (a hint, see {@link ChildrenInOrder}). */
  childrenInOrder?: ChildrenInOrder;
}

/**
 * Chooses the shown set under a line budget: the forced nodes, then the longest prefix of the node
 * order whose rendering fits. A shown node takes one line (folded remainders ride on their parent's
 * line), or none when `chains` joins it to its parent's line (see {@link lineCost}), plus
 * `headerLines` for the whole output. The prefix is found by best-first expansion: the next node in
 * the order is always a child of a node already shown, because a parent precedes its children.
 * Cost: O(k log k + children of shown nodes), never a sort of the whole tree.
 */
export function select(ranked: Ranked, options: SelectOptions): Selection {
  const { tree, measures, scores, order } = ranked;
  const { budget, headerLines = 0, spareLines = 0, chains = false, childrenInOrder } = options;
  const n = tree.length;
  // The shown nodes by number: a fit shows a few of a tree's nodes, so a new focus allocates nothing
  // the size of the tree (a flag per node, a megabyte a call at a million nodes, brought the engine's
  // full collections, meant for large outside memory, into the calls).
  const shown = new NodeTable(64);
  const isShown = (x: number) => shown.get(x) !== -1;
  const { count } = measures;
  const { forcedNodes } = scores;
  const cost = (x: number) => lineCost(tree, measures, scores, chains, x);
  let needed = headerLines;
  for (const f of forcedNodes) needed += cost(f);
  // The spare lines go first: a screen without its key beats no screen.
  const spared = needed > budget && spareLines > 0 && needed - spareLines <= budget;
  if (spared) needed -= spareLines;
  if (needed > budget) {
    const forcedLines = forcedNodes.reduce((sum, f) => sum + cost(f), 0);
    throw budgetTooSmall(budget, needed, needed - forcedLines, forcedNodes.length > 1);
  }
  const admitted: number[] = [];
  for (const f of forcedNodes) {
    shown.set(f, 1);
    admitted.push(f);
  }
  let lines = needed;
  const heap = new NodeHeap(order);
  // The last-in-order of the children kept so far, on top: a bounded choice of the best few.
  const best = new NodeHeap((a, b) => order(b, a));
  const pushChildren = (p: number) => {
    if (count[p] === 1) return;
    const end = p + count[p];
    if (count[p + 1] + 1 === count[p]) {
      // An only child (it may cost no line, see lineCost).
      if (!isShown(p + 1)) heap.push(p + 1);
      return;
    }
    // Two or more children each cost a line, so at most `budget - lines` of them can still enter;
    // one more, the first in the order of the rest, must stop any later node that costs nothing (the
    // shown set stays a prefix). Only those go to the heap: a node with a million children costs one
    // scan of them, not a million pushes.
    if (lines >= budget && !chains) return;
    const keep = Math.max(0, budget - lines) + 1;
    const sorted = childrenInOrder?.(p);
    if (sorted) {
      for (let k = 0, taken = 0; k < sorted.length && taken < keep; k++) {
        if (isShown(sorted[k])) continue;
        heap.push(sorted[k]);
        taken++;
      }
      return;
    }
    keepFirst(count, p + 1, end, keep, shown, order, best);
    while (best.size > 0) heap.push(best.pop());
  };
  for (const f of forcedNodes) pushChildren(f);
  // Stop at the first node that does not fit: the shown set stays a prefix of the order.
  while (heap.size > 0 && lines + cost(heap.peek()) <= budget) {
    const next = heap.pop();
    lines += cost(next);
    shown.set(next, 1);
    admitted.push(next);
    pushChildren(next);
  }
  return new Chosen(n, Int32Array.from(admitted), forcedNodes.length, lines, spared, shown);
}

/**
 * Keeps in `best` the first `keep` in `order` of the children `c` of a node that are not `shown`, the
 * first at `first` and each next at `c + count[c]` up to `end`. A function of its own: on a node with
 * many children (a graph's hub: 155,000 under the bench graph's root) the engine compiles this loop
 * while it runs, and compiled code that ends in the loop's caller is thrown away at the first code
 * after the loop it has not seen run; here that is the return. In `select`, the same compiled loop was
 * entered and thrown away again for each later node with two or more children (317 times in one
 * summary of the bench graph).
 */
function keepFirst(
  count: Int32Array,
  first: number,
  end: number,
  keep: number,
  shown: NodeTable,
  order: NodeOrder,
  best: NodeHeap,
): void {
  for (let c = first; c < end; c += count[c]) {
    if (shown.get(c) !== -1) continue;
    if (best.size < keep) best.push(c);
    else if (order(c, best.peek()) < 0) {
      best.pop();
      best.push(c);
    }
  }
}

/** A {@link Selection} whose flags per node are made only when read. */
class Chosen implements Selection {
  private flags: Uint8Array | null = null;

  constructor(
    private readonly n: number,
    readonly admitted: Int32Array,
    readonly forcedCount: number,
    readonly lines: number,
    readonly spared: boolean,
    private readonly table: NodeTable,
  ) {}

  isShown(i: number): boolean {
    return this.table.get(i) !== -1;
  }

  get shown(): Uint8Array {
    if (this.flags === null) {
      this.flags = new Uint8Array(this.n);
      for (const x of this.admitted) this.flags[x] = 1;
    }
    return this.flags;
  }
}

/**
 * BUDGET_TOO_SMALL, saying what takes the lines: those before the tree (`before`: the header, a key
 * or legend) and the root, with the focus paths only when one is more than the root (`focused`), and
 * the key or the header's words that it was left out where neither had room (`keySaid`).
 */
export function budgetTooSmall(
  budget: number,
  smallest: number,
  before: number,
  focused: boolean,
  keySaid = false,
): EspalierError {
  const held = [
    ...(before > 0 ? [`the ${linesOf(before)} before the tree`] : []),
    "the root",
    ...(focused ? ["the focus paths"] : []),
    ...(keySaid ? ["the key or a note that it was left out"] : []),
  ];
  const list = held.length === 1 ? held[0] : `${held.slice(0, -1).join(", ")} and ${held[held.length - 1]}`;
  return new EspalierError(
    "BUDGET_TOO_SMALL",
    `a budget of ${linesOf(budget)} cannot hold ${list}; the smallest budget that works is ${smallest}`,
    undefined,
    { budget, smallest, before, focused, ...(keySaid ? { keySaid } : {}) },
  );
}

function linesOf(n: number): string {
  return `${n} ${n === 1 ? "line" : "lines"}`;
}
