import { type HierarchyNode, partition } from "d3-hierarchy";
import { hierarchyOf } from "../view/hierarchy-of.js";
import type { ViewNode } from "../view/view-node.js";

/** One block of the icicle: a shown node, or the folded remainder of one (drawn after its children). */
export interface IcicleBlock<T extends ViewNode> {
  /** The shown node; for a folded block, the node whose hidden children it stands for. */
  node: T;
  folded: boolean;
  /** Row: 0 for the view's root. */
  depth: number;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

export interface IcicleOptions<T extends ViewNode> {
  /** Block widths follow subtree size, or node counts. */
  weight: "size" | "nodes";
  width: number;
  rowHeight: number;
  /**
   * Narrowest width of a block (say, room for its label): of a shown node, or with `folded` of the
   * node's folded remainder; `belowFocus` tells whether a focus lies above the block.
   */
  floor: (node: T, folded: boolean, belowFocus: boolean) => number;
  /** Most of the width the floors may take together (they shrink alike beyond it), e.g. 0.5. */
  floorShare: number;
}

interface Item<T extends ViewNode> {
  h: HierarchyNode<T>;
  folded: boolean;
  children: Item<T>[];
}

/**
 * An icicle (partition) layout of a view: a row per depth, each node's shown children and then its
 * folded remainder side by side beneath it, together exactly as wide as it. Siblings share their
 * parent's width in proportion to their weight (subtree size or node count), except that no block
 * is narrower than its floor (see `IcicleOptions.floor`); when the floors would take more than
 * `floorShare` of the width, they shrink alike, so the rest is always shared out by weight. A block
 * with something beneath it weighs what is beneath it, so an inner node's own size has no width of
 * its own. The widths are handed to d3-hierarchy's `partition` as values, which places the blocks.
 * Blocks come in pre-order, a folded block after its parent's children.
 */
export function icicle<T extends ViewNode>(
  view: HierarchyNode<T>,
  options: IcicleOptions<T>,
): IcicleBlock<T>[] {
  // Built without recursion and with heights in one pass (hierarchyOf): d3's own constructor walks
  // to the root from every node, which costs depth squared on a deep chain.
  const top: Item<T> = { h: view, folded: false, children: [] };
  const stack = [top];
  for (let item = stack.pop(); item !== undefined; item = stack.pop()) {
    for (const c of item.h.children ?? []) {
      const child: Item<T> = { h: c, folded: false, children: [] };
      item.children.push(child);
      stack.push(child);
    }
    if (item.h.data.hidden) item.children.push({ h: item.h, folded: true, children: [] });
  }
  const items = hierarchyOf(top);
  items.sum(({ h, folded }) => {
    if (!folded && (h.children || h.data.hidden)) return 0;
    const node = folded ? h.data.hidden! : h.data;
    return options.weight === "size" ? node.size : node.nodes;
  });
  if (!((items.value ?? 0) > 0)) items.count();

  // Floors, bottom-up: a block needs its own floor and room for the floors beneath it.
  const floor = new Map<HierarchyNode<Item<T>>, number>();
  // Whether a focus lies above a block, top-down in one pass (not a walk to the root per block).
  const belowFocus = new Set<HierarchyNode<Item<T>>>();
  items.eachBefore((b) => {
    const p = b.parent;
    if (p && (belowFocus.has(p) || (!p.data.folded && p.data.h.data.focus))) belowFocus.add(b);
  });
  items.eachAfter((b) => {
    const { h, folded } = b.data;
    const own = options.floor(h.data, folded, belowFocus.has(b));
    floor.set(
      b,
      Math.max(
        own,
        (b.children ?? []).reduce((s, c) => s + floor.get(c)!, 0),
      ),
    );
  });
  const shrink = Math.min(1, (options.width * options.floorShare) / floor.get(items)!);

  // Widths, top-down; the leaves' widths become the values that partition lays out.
  const width = new Map([[items, options.width]]);
  items.eachBefore((b) => {
    if (!b.children) return;
    const shares = share(
      width.get(b)!,
      b.children.map((c) => c.value!),
      b.children.map((c) => floor.get(c)! * shrink),
    );
    b.children.forEach((c, k) => {
      width.set(c, shares[k]);
    });
  });
  const leafWidth = new Map(items.leaves().map((b) => [b.data, width.get(b)!]));
  items.sum((item) => leafWidth.get(item) ?? 0);

  const laid = partition<Item<T>>().size([options.width, options.rowHeight * (items.height + 1)])(items);
  const blocks: IcicleBlock<T>[] = [];
  laid.eachBefore((b) =>
    blocks.push({
      node: b.data.h.data,
      folded: b.data.folded,
      depth: b.depth,
      x0: b.x0,
      x1: b.x1,
      y0: b.y0,
      y1: b.y1,
    }),
  );
  return blocks;
}

/**
 * Splits `total` into parts proportional to `weights` but none below its floor: part k is
 * max(floor_k, λ · weight_k), with λ found by pinning the parts whose share falls below their floor
 * (each round can only pin more, so it ends within as many rounds as there are parts).
 */
function share(total: number, weights: number[], floors: number[]): number[] {
  const n = weights.length;
  const pinned = weights.map((w) => !(w > 0));
  for (let round = 0; round <= n; round++) {
    let free = 0;
    let rest = total;
    for (let k = 0; k < n; k++) {
      if (pinned[k]) rest -= floors[k];
      else free += weights[k];
    }
    if (free === 0) {
      // Everything sits on its floor: what is left goes to the parts in proportion to their floors.
      const sum = floors.reduce((a, b) => a + b, 0);
      return floors.map((f) => (sum > 0 ? f + (rest * f) / sum : total / n));
    }
    const lambda = rest / free;
    let changed = false;
    for (let k = 0; k < n; k++) {
      if (!pinned[k] && lambda * weights[k] < floors[k]) {
        pinned[k] = true;
        changed = true;
      }
    }
    if (!changed) return weights.map((w, k) => (pinned[k] ? floors[k] : lambda * w));
  }
  return floors;
}
