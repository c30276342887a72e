import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";

/** A shown node, or (with `folded`) the folded remainder of one. */
export interface IcicleMember<T extends ViewNode> {
  node: T;
  folded: boolean;
}

/**
 * One block of the icicle: a shown node, the folded remainder of one (drawn after its shown
 * children), or a group of siblings each too narrow to label (drawn last among them).
 */
export interface IcicleBlock<T extends ViewNode> {
  /** The shown node; for a folded block or a group, the parent whose children it stands for. */
  node: T;
  folded: boolean;
  /** A group: the siblings (shown nodes with all below them, or the folded remainder) it stands for. */
  members?: IcicleMember<T>[];
  /** Row: 0 for the view's root. */
  depth: number;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
  /** What the width is proportional to: the block's size or node count. */
  weight: number;
  /** Nothing is drawn beneath the block. */
  leaf: boolean;
}

export interface IcicleLayout<T extends ViewNode> {
  blocks: IcicleBlock<T>[];
  /**
   * Width the blocks have beyond their share by weight, summed over the blocks with nothing beneath
   * them (the widening near a focus and of blocks raised to `minBlock`), in the layout's units.
   */
  widened: number;
}

export interface IcicleOptions<T extends ViewNode> {
  /** Block widths follow subtree size, or node counts. */
  weight: "size" | "nodes";
  width: number;
  rowHeight: number;
  /**
   * Width a shown node is widened to when its share by weight is smaller (say, room for its whole
   * label); 0 for a node that may be grouped with its narrow siblings.
   */
  floor: (node: T) => number;
  /** Most of the width the floors may take together (they shrink alike beyond it), e.g. 0.25. */
  floorShare: number;
  /**
   * The narrowest block drawn (say, room for a short label): siblings whose share is narrower are
   * drawn together as one group; a lone narrow one is widened to it.
   */
  minBlock: number;
}

interface Item<T extends ViewNode> {
  member: IcicleMember<T>;
  children: Item<T>[];
  weight: number;
  /** Own floor (widened label room), 0 when the item may be grouped. */
  own: number;
  /** Width the item's subtree asks for: its own floor, and room for the floors beneath it. */
  need: number;
}

/**
 * An icicle (partition) layout of a view: a row per depth, each node's shown children and then its
 * folded remainder side by side beneath it, together exactly as wide as it. Siblings share their
 * parent's width in proportion to their weight (subtree size or node count; an inner node's own size
 * has no width of its own), except that:
 * - a focus and its ancestors are widened to their floor (see `IcicleOptions.floor`); when the
 *   floors would take more than `floorShare` of the width, they shrink alike;
 * - siblings whose share is narrower than `minBlock` are drawn as one group block (last among
 *   them, standing for their whole subtrees), widened to `minBlock` if the group is still narrower;
 *   when the floors of a row do not fit their parent, its smallest children join the group.
 * So every block is at least `minBlock` wide (the root included, when `width` is), and the row
 * beneath a block fills it exactly. Blocks come in pre-order; time and memory are linear in the
 * number of shown nodes, up to a sort of each node's children.
 */
export function icicle<T extends ViewNode>(
  view: HierarchyNode<T>,
  options: IcicleOptions<T>,
): IcicleLayout<T> {
  const { minBlock } = options;
  // Items without recursion (a focus may lie 100,000 levels down): pre-order, then weights and
  // needs bottom-up in reverse pre-order.
  const top = item({ node: view.data, folded: false }, options);
  const order: [Item<T>, HierarchyNode<T>][] = [[top, view]];
  for (let k = 0; k < order.length; k++) {
    const [it, h] = order[k];
    for (const c of h.children ?? []) {
      const child = item({ node: c.data, folded: false }, options);
      it.children.push(child);
      order.push([child, c]);
    }
    if (h.data.hidden) it.children.push(item({ node: h.data, folded: true }, options));
  }
  for (let k = order.length - 1; k >= 0; k--) {
    const it = order[k][0];
    if (it.children.length > 0) it.weight = it.children.reduce((w, c) => w + c.weight, 0);
  }
  // Without any weight (every size 0), blocks share by the number of leaves beneath them.
  if (!(top.weight > 0)) {
    for (let k = order.length - 1; k >= 0; k--) {
      const it = order[k][0];
      for (const c of it.children) if (c.member.folded) c.weight = 1;
      it.weight = it.children.length === 0 ? 1 : it.children.reduce((s, c) => s + c.weight, 0);
    }
  }
  // The widened floors shrink alike (by s) until they add at most `floorShare` of the width to the
  // room of minBlock each block needs (which does not shrink). The root's need grows with s: halve
  // the interval.
  const needs = (s: number) => {
    for (let k = order.length - 1; k >= 0; k--) {
      const it = order[k][0];
      const own = it.own > 0 ? Math.max(minBlock, it.own * s) : 0;
      let forced = 0;
      let free = false;
      for (const c of it.children) {
        if (c.need > 0) forced += c.need;
        else free = true;
      }
      it.need = Math.max(own, forced + (free && forced > 0 ? minBlock : 0));
    }
    return top.need;
  };
  const cap = Math.min(options.width, needs(0) + options.width * options.floorShare);
  if (needs(1) > cap) {
    let [lo, hi] = [0, 1];
    for (let round = 0; round < 20; round++) {
      const mid = (lo + hi) / 2;
      if (needs(mid) > cap) hi = mid;
      else lo = mid;
    }
    needs(lo);
  }
  const scale = options.width / top.weight;

  const blocks: IcicleBlock<T>[] = [];
  let widened = 0;
  const h = options.rowHeight;
  // Pre-order without recursion: a stack of parts with their place, each one's children pushed in reverse.
  interface Placed {
    part: Part<T>;
    x0: number;
    x1: number;
    depth: number;
  }
  const stack: Placed[] = [{ part: { item: top, width: options.width }, x0: 0, x1: options.width, depth: 0 }];
  for (let next = stack.pop(); next !== undefined; next = stack.pop()) {
    const { part, x0, x1, depth } = next;
    const row = part.item ? arrange(part.item, x1 - x0, minBlock) : [];
    const group = part.group;
    const weight = group ? group.reduce((s, c) => s + c.weight, 0) : part.item!.weight;
    const block: IcicleBlock<T> = {
      node: group ? part.parent!.member.node : part.item!.member.node,
      folded: group ? false : part.item!.member.folded,
      depth,
      x0,
      x1,
      y0: depth * h,
      y1: (depth + 1) * h,
      weight,
      leaf: row.length === 0,
    };
    if (group) block.members = group.map((c) => c.member);
    blocks.push(block);
    if (block.leaf) widened += Math.max(0, x1 - x0 - weight * scale);
    let x = x0;
    const below: Placed[] = [];
    row.forEach((r, k) => {
      const end = k === row.length - 1 ? x1 : x + r.width;
      below.push({ part: r, x0: x, x1: end, depth: depth + 1 });
      x = end;
    });
    for (let k = below.length - 1; k >= 0; k--) stack.push(below[k]);
  }
  return { blocks, widened };
}

/** A child's place in its parent's row: one item, or a group of them (then `parent` is set). */
interface Part<T extends ViewNode> {
  item?: Item<T>;
  group?: Item<T>[];
  parent?: Item<T>;
  width: number;
}

/**
 * Splits an item's width among its children: a floor for each (its need, at least `minBlock`),
 * the narrow ones gathered into one group, the rest shared by weight (see {@link share}).
 */
function arrange<T extends ViewNode>(it: Item<T>, total: number, minBlock: number): Part<T>[] {
  const kids = it.children;
  if (kids.length === 0) return [];
  const floorOf = (c: Item<T>) => Math.max(minBlock, c.need);
  // First guess: with only the widened floors, which of the others would be narrower than minBlock?
  const first = share(
    total,
    kids.map((c) => c.weight),
    kids.map((c) => (c.need > 0 ? floorOf(c) : 0)),
  );
  const grouped = kids.map((c, k) => c.need === 0 && first[k] < minBlock);
  // While the floors do not fit, the smallest child joins the group: one free of floors first.
  let floors = 0;
  let groupWeight = 0;
  let inGroup = 0;
  kids.forEach((c, k) => {
    if (grouped[k]) {
      groupWeight += c.weight;
      inGroup++;
    } else floors += floorOf(c);
  });
  const joiners = kids
    .map((_, k) => k)
    .filter((k) => !grouped[k])
    .sort(
      (a, b) =>
        Number(kids[a].need > 0) - Number(kids[b].need > 0) || kids[a].weight - kids[b].weight || a - b,
    );
  for (const k of joiners) {
    if (floors + (inGroup > 0 ? minBlock : 0) <= total + 1e-9) break;
    grouped[k] = true;
    floors -= floorOf(kids[k]);
    groupWeight += kids[k].weight;
    inGroup++;
  }
  const parts: Part<T>[] = [];
  const shownAt = kids.map((_, k) => k).filter((k) => !grouped[k] || inGroup === 1);
  const shown = shownAt.map((k) => kids[k]);
  // A group of one is the node itself, raised to its floor.
  const members = inGroup > 1 ? kids.filter((_, k) => grouped[k]) : [];
  const weights = [...shown.map((c) => c.weight), ...(members.length > 0 ? [groupWeight] : [])];
  // A group of one keeps the group's floor (it may be a forced child that had to join).
  const floorsOf = [
    ...shownAt.map((k) => (grouped[k] ? minBlock : floorOf(kids[k]))),
    ...(members.length > 0 ? [minBlock] : []),
  ];
  const widths = share(total, weights, floorsOf);
  shown.forEach((c, k) => {
    parts.push({ item: c, width: widths[k] });
  });
  // The folded remainder stays last unless it is in the group; the group comes before it.
  if (members.length > 0) {
    const group: Part<T> = { group: members, parent: it, width: widths[widths.length - 1] };
    const last = parts[parts.length - 1];
    if (last?.item?.member.folded) parts.splice(parts.length - 1, 0, group);
    else parts.push(group);
  }
  return parts;
}

function item<T extends ViewNode>(member: IcicleMember<T>, options: IcicleOptions<T>): Item<T> {
  const node = member.folded ? member.node.hidden! : member.node;
  const own = member.folded ? 0 : options.floor(member.node);
  return {
    member,
    children: [],
    weight: options.weight === "size" ? node.size : node.nodes,
    own,
    need: own,
  };
}

/**
 * Splits `total` into parts proportional to `weights` but none below its floor: part k is
 * max(floor_k, λ · weight_k), one λ for all. The parts whose floor binds are those with the largest
 * floor-to-weight ratio: taken in that order, each is pinned while λ, computed from the rest, would
 * give it less than its floor. When the floors alone exceed `total`, they shrink alike.
 */
export function share(total: number, weights: number[], floors: number[]): number[] {
  const n = weights.length;
  const floorSum = floors.reduce((a, b) => a + b, 0);
  if (floorSum >= total) return floors.map((f) => (floorSum > 0 ? (f * total) / floorSum : total / n));
  const ratio = (k: number) => (weights[k] > 0 ? floors[k] / weights[k] : Number.POSITIVE_INFINITY);
  const byRatio = weights.map((_, k) => k).sort((a, b) => ratio(b) - ratio(a) || a - b);
  let rest = total;
  let free = weights.reduce((a, w) => a + Math.max(w, 0), 0);
  const pinned = new Uint8Array(n);
  for (const k of byRatio) {
    // λ only falls as parts are pinned, so the first part whose floor does not bind ends the pinning.
    if (weights[k] > 0 && (rest / free) * weights[k] >= floors[k]) break;
    pinned[k] = 1;
    rest -= floors[k];
    if (weights[k] > 0) free -= weights[k];
  }
  if (!(free > 0)) {
    // Everything sits on its floor: what is left goes to the parts in proportion to their floors.
    return floors.map((f) => (floorSum > 0 ? f + ((total - floorSum) * f) / floorSum : total / n));
  }
  const lambda = rest / free;
  return weights.map((w, k) => (pinned[k] ? floors[k] : lambda * w));
}
