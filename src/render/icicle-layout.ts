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
   * them (the widening near a focus and of blocks raised to `minBlock`), in the layout's units; at
   * most `cap` of the width.
   */
  widened: number;
  /**
   * Nodes with a floor (on the path to a focus, or in a diff to a change) that are not drawn as a
   * block of their own but inside a group, so that the widening keeps within the cap.
   */
  pathGrouped: number;
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
  /**
   * Most of the width that all widening together may take (the floors and the blocks raised to
   * `minBlock`), as a share of the width, e.g. 0.25: see {@link icicle} for what gives way.
   */
  cap: number;
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
  /** Floor (widened label room) as asked for, 0 when the item may be grouped. */
  asked: number;
  /** Own floor in the layout being tried: `asked` scaled, or 0 once released. */
  own: number;
  /** Width the item's subtree asks for: its own floor, and room for the floors beneath it. */
  need: number;
  /** The item is a focus or has one beneath it. */
  focusPath: boolean;
}

/**
 * An icicle (partition) layout of a view: a row per depth, each node's shown children and then its
 * folded remainder side by side beneath it, together exactly as wide as it. Siblings share their
 * parent's width in proportion to their weight (subtree size or node count; an inner node's own size
 * has no width of its own), except that:
 * - a node with a floor (a focus and its ancestors; in a diff, the path to a change) is widened to
 *   it (see `IcicleOptions.floor`);
 * - siblings whose share is narrower than `minBlock` are drawn as one group block (last among
 *   them, standing for their whole subtrees), widened to `minBlock` if the group is still narrower;
 *   when the floors of a row do not fit their parent, its smallest children join the group.
 * All this widening together — the width of the blocks with nothing beneath them beyond their share
 * by weight — is at most `cap` of the width. Until it is, in this order: the floors of the path to
 * a change give way, smallest weight first (those nodes may then be grouped like any other); the
 * floors of the focus path shrink alike down to `minBlock`; those floors give way too, smallest
 * first; and last, a row that would still pass the cap (rows are laid out shallowest first) is drawn
 * as one group of all its blocks. So every block is at least `minBlock` wide (the root included, when
 * `width` is), and the row beneath a block fills it exactly. Blocks come in pre-order; each layout
 * tried takes time and memory linear in the number of shown nodes (up to a sort of each node's
 * children), and the search tries one layout when nothing passes the cap, a few dozen at most.
 */
export function icicle<T extends ViewNode>(
  view: HierarchyNode<T>,
  options: IcicleOptions<T>,
): IcicleLayout<T> {
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
    it.focusPath = (!it.member.folded && it.member.node.focus) || it.children.some((c) => c.focusPath);
  }
  // Without any weight (every size 0), blocks share by the number of leaves beneath them.
  if (!(top.weight > 0)) {
    for (let k = order.length - 1; k >= 0; k--) {
      const it = order[k][0];
      for (const c of it.children) if (c.member.folded) c.weight = 1;
      it.weight = it.children.length === 0 ? 1 : it.children.reduce((s, c) => s + c.weight, 0);
    }
  }
  // The floors that may give way, in the order they do: the path to a change, then the focus path;
  // the lightest first, and of equal weight the deepest (later in pre-order) first, so that a node
  // gives way no later than the nodes beneath it.
  const floored = order.map(([it], k) => ({ it, k })).filter(({ it }) => it.asked > 0);
  floored.sort(
    (a, b) => Number(a.it.focusPath) - Number(b.it.focusPath) || a.it.weight - b.it.weight || b.k - a.k,
  );
  const changePath = floored.filter(({ it }) => !it.focusPath).length;
  const released = new Uint8Array(order.length);
  const { minBlock } = options;
  const budget = options.cap * options.width;

  /** Lays the icicle out with floors scaled by `s` and the first `r` floors of `floored` given way. */
  const attempt = (s: number, r: number) => {
    released.fill(0);
    for (let j = 0; j < r; j++) released[floored[j].k] = 1;
    for (let k = order.length - 1; k >= 0; k--) {
      const it = order[k][0];
      it.own = it.asked > 0 && !released[k] ? Math.max(minBlock, it.asked * s) : 0;
      let forced = 0;
      let free = false;
      for (const c of it.children) {
        if (c.need > 0) forced += c.need;
        else free = true;
      }
      it.need = Math.max(it.own, forced + (free && forced > 0 ? minBlock : 0));
    }
    return place(top, options, budget, floored.length, floored.length - r);
  };

  // One layout when nothing passes the cap; else the least giving way that draws every row and every
  // node whose floor stands as a block of its own.
  const whole = (p: Placement<T>) => p.collapsed === 0 && p.lost === 0;
  let best = attempt(1, 0);
  if (whole(best)) return best.layout;
  let r = 0;
  let s = 1;
  const search = (lo: number, hi: number, at: (r: number) => Placement<T>) => {
    // `lo` is known to pass the cap (or is where the search starts); the smallest r in (lo, hi] that
    // keeps every row, or hi.
    const last = at(hi);
    if (!whole(last)) return { r: hi, placed: last };
    let good = { r: hi, placed: last };
    while (hi - lo > 1) {
      const mid = Math.floor((lo + hi) / 2);
      const p = at(mid);
      if (whole(p)) {
        hi = mid;
        good = { r: mid, placed: p };
      } else lo = mid;
    }
    return good;
  };
  if (changePath > 0) {
    ({ r, placed: best } = search(0, changePath, (j) => attempt(s, j)));
    if (whole(best)) return best.layout;
  }
  const none = attempt(0, r);
  if (whole(none)) {
    let [lo, hi] = [0, 1];
    best = none;
    for (let round = 0; round < 12; round++) {
      const mid = (lo + hi) / 2;
      const p = attempt(mid, r);
      if (whole(p)) {
        lo = mid;
        best = p;
      } else hi = mid;
    }
    return best.layout;
  }
  s = 0;
  if (floored.length > r) ({ placed: best } = search(r, floored.length, (j) => attempt(s, j)));
  else best = none;
  return best.layout;
}

interface Placement<T extends ViewNode> {
  layout: IcicleLayout<T>;
  /** Rows drawn as one group to keep within the cap. */
  collapsed: number;
  /** Nodes whose floor stands (not given way) that are drawn inside a group all the same. */
  lost: number;
}

/**
 * Places the items with their needs as computed: rows shallowest first, each row's widening added
 * to what the blocks laid so far have beyond their share; a row that would pass `budget` is drawn as
 * one group of all its blocks, which adds none. Blocks are returned in pre-order.
 */
function place<T extends ViewNode>(
  top: Item<T>,
  options: IcicleOptions<T>,
  budget: number,
  floors: number,
  standing: number,
): Placement<T> {
  const { minBlock } = options;
  const scale = options.width / top.weight;
  const h = options.rowHeight;
  interface Placed {
    part: Part<T>;
    x0: number;
    x1: number;
    depth: number;
    /** Index of the block drawn for it. */
    at: number;
  }
  const blocks: IcicleBlock<T>[] = [];
  // Children of each block by index, to put the blocks in pre-order at the end.
  const below: number[][] = [];
  const excess = (p: Part<T>, w: number) => Math.max(0, w - weightOf(p) * scale);
  // Breadth first, so that the shallow rows are drawn whole before the deep ones spend the cap.
  const queue: Placed[] = [
    { part: { item: top, width: options.width }, x0: 0, x1: options.width, depth: 0, at: 0 },
  ];
  let spent = 0;
  let collapsed = 0;
  let drawnFloors = 0;
  let drawnStanding = 0;
  for (let head = 0; head < queue.length; head++) {
    const { part, x0, x1, depth, at } = queue[head];
    const w = x1 - x0;
    let row = part.item ? arrange(part.item, w, minBlock) : [];
    if (row.length > 1) {
      // What the row would add to the widening so far; past the budget, one group of all.
      let added = -excess(part, w);
      for (const r of row) added += excess(r, r.width);
      if (spent + added > budget + 1e-9 * options.width) {
        row = [{ group: part.item!.children, parent: part.item!, width: w }];
        collapsed++;
      } else spent += Math.max(0, added);
    }
    const group = part.group;
    const block: IcicleBlock<T> = {
      node: group ? part.parent!.member.node : part.item!.member.node,
      folded: group ? false : part.item!.member.folded,
      depth,
      x0,
      x1,
      y0: depth * h,
      y1: (depth + 1) * h,
      weight: weightOf(part),
      leaf: row.length === 0,
    };
    if (group) block.members = group.map((c) => c.member);
    else if (part.item!.asked > 0) {
      drawnFloors++;
      if (part.item!.own > 0) drawnStanding++;
    }
    blocks[at] = block;
    below[at] = [];
    let x = x0;
    row.forEach((r, k) => {
      const end = k === row.length - 1 ? x1 : x + r.width;
      const index = queue.length;
      below[at].push(index);
      queue.push({ part: r, x0: x, x1: end, depth: depth + 1, at: index });
      x = end;
    });
  }
  // Pre-order, and the widening measured on the blocks with nothing beneath them.
  const ordered: IcicleBlock<T>[] = [];
  let widened = 0;
  const stack = [0];
  for (let k = stack.pop(); k !== undefined; k = stack.pop()) {
    const b = blocks[k];
    ordered.push(b);
    if (b.leaf) widened += Math.max(0, b.x1 - b.x0 - b.weight * scale);
    for (let j = below[k].length - 1; j >= 0; j--) stack.push(below[k][j]);
  }
  return {
    layout: { blocks: ordered, widened, pathGrouped: floors - drawnFloors },
    collapsed,
    lost: standing - drawnStanding,
  };
}

function weightOf<T extends ViewNode>(part: Part<T>): number {
  return part.group ? part.group.reduce((s, c) => s + c.weight, 0) : part.item!.weight;
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
  const asked = member.folded ? 0 : options.floor(member.node);
  return {
    member,
    children: [],
    weight: options.weight === "size" ? node.size : node.nodes,
    asked,
    own: asked,
    need: asked,
    focusPath: false,
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
