import type { ReadAsEarlier } from "../load/table/read-as-earlier.js";
import { MergedNames } from "../model/merged-names.js";
import { NamePool, type Names, sameName } from "../model/names.js";
import type { Tree } from "../model/tree.js";
import { KIND } from "./changes.js";
import { type Combined, combinedRecord } from "./combine.js";
import { subtreeCounts } from "./subtree-counts.js";

/**
 * The combined tree of OLD and a NEW read as OLD with known changes (load/table/read-as-earlier.ts),
 * laid out from OLD's pre-order and the rows NEW did not take whole, without NEW's tree, a matching or a
 * splice: the same tree, kinds and changed nodes as `combineListing` makes from `matchTreesListing`'s
 * matching by id (the diff tests check both give the same output). NEW's rows keep OLD's order, so the
 * children that stay under a parent keep theirs; OLD's pre-order is copied a run at a time, a moved
 * subtree cut out where it was and laid under its new parent, and the moved and added children of a
 * parent go before its first staying child that comes after them in NEW (after the last, when none),
 * in NEW's order. A removed node stays where it was, which is right after its nearest earlier sibling
 * that stays, after that sibling's whole subtree, as `splice` places it. At one place in OLD's
 * pre-order, a deeper parent's children come first. Undefined when `plan` is not NEW's against `oldTree`.
 */
export function directCombined(
  oldTree: Tree,
  newTree: Tree,
  plan: ReadAsEarlier,
): { combined: Combined; changed: Int32Array; spare: Int32Array } | undefined {
  if (plan.earlier !== oldTree || newTree.length !== plan.rows) return undefined;
  // OLD's subtree counts and each OLD node's place, side by side in memory as big as the combined
  // tree's doubles: read no more once it is laid out, it is lent to its sizes (see `prepareDiff`).
  const total = oldTree.length + plan.added;
  const block = new ArrayBuffer(total * 8);
  const oldCount = subtreeCounts(oldTree, new Int32Array(block, 0, oldTree.length));
  const placed = new Int32Array(block, total * 4, oldTree.length);
  const units = insertedUnits(oldTree, plan);
  const events = placesOf(oldTree, oldCount, plan, units);
  const layout = new Layout(oldTree, oldCount, placed, plan, units, events);
  layout.lay();
  const changed = layout.pairedKinds();
  return { combined: combinedOf(oldTree, newTree, plan, layout), changed, spare: new Int32Array(block) };
}

/**
 * The scanned rows laid elsewhere than OLD's place (moved: their parent changed; added), by the parent
 * they go under (an OLD row, or `-2 - j` for added row j), each list in NEW's order; and the moved ones
 * by their OLD row.
 */
interface Units {
  under: Map<number, number[]>;
  moved: Map<number, number>;
}

function insertedUnits(oldTree: Tree, plan: ReadAsEarlier): Units {
  const { scannedEarlier, scannedParent } = plan;
  const oldParent = oldTree.parent;
  const under = new Map<number, number[]>();
  const moved = new Map<number, number>();
  for (let j = 0; j < scannedEarlier.length; j++) {
    const o = scannedEarlier[j];
    const p = scannedParent[j];
    if (o >= 0 && p === oldParent[o]) continue;
    if (o >= 0) moved.set(o, j);
    const list = under.get(p);
    if (list) list.push(j);
    else under.set(p, [j]);
  }
  return { under, moved };
}

/**
 * Where OLD's pre-order is broken: a moved subtree cut out at its OLD row (`unit` -1), or a moved or
 * added unit (scanned row `unit`) put in under OLD row `owner` before OLD row `at`; sorted by place,
 * then the deeper owner first, then NEW's order.
 */
interface Places {
  at: Int32Array;
  owner: Int32Array;
  unit: Int32Array;
  length: number;
}

function placesOf(oldTree: Tree, oldCount: Int32Array, plan: ReadAsEarlier, units: Units): Places {
  const { scanned, rowOfEarlier } = plan;
  const { depth, parent } = oldTree;
  const list: { at: number; owner: number; unit: number; row: number }[] = [];
  for (const [o] of units.moved) list.push({ at: o, owner: parent[o], unit: -1, row: -1 });
  for (const [p, js] of units.under) {
    if (p < 0) continue;
    const end = p + oldCount[p];
    let u = 0;
    for (let c = p + 1; c < end && u < js.length; c += oldCount[c]) {
      const row = rowOfEarlier[c];
      if (row === -1 || units.moved.has(c)) continue;
      for (; u < js.length && scanned[js[u]] < row; u++)
        list.push({ at: c, owner: p, unit: js[u], row: scanned[js[u]] });
    }
    for (; u < js.length; u++) list.push({ at: end, owner: p, unit: js[u], row: scanned[js[u]] });
  }
  list.sort((a, b) => a.at - b.at || depth[b.owner] - depth[a.owner] || a.row - b.row);
  const places: Places = {
    at: new Int32Array(list.length),
    owner: new Int32Array(list.length),
    unit: new Int32Array(list.length),
    length: list.length,
  };
  list.forEach((e, i) => {
    places.at[i] = e.at;
    places.owner[i] = e.owner;
    places.unit[i] = e.unit;
  });
  return places;
}

/** The combined tree's arrays as they are laid out, node by node, in pre-order. */
class Layout {
  readonly total: number;
  readonly parent: Int32Array;
  readonly depth: Int32Array;
  readonly ownSize: Float64Array;
  readonly newIndex: Int32Array;
  readonly oldIndex: Int32Array;
  readonly kind: Uint8Array;
  /** NEW's row each node's name, id and size come from, or -1 where OLD's are the same (or it is removed). */
  readonly fromRow: Int32Array;
  private readonly changedNodes: Int32Array;
  private changes = 0;
  private k = 0;
  private n = 0;

  constructor(
    private readonly oldTree: Tree,
    private readonly oldCount: Int32Array,
    /** The combined node of each OLD node. */
    private readonly placed: Int32Array,
    private readonly plan: ReadAsEarlier,
    private readonly units: Units,
    private readonly places: Places,
  ) {
    const total = oldTree.length + plan.added;
    this.total = total;
    this.parent = new Int32Array(total);
    this.depth = new Int32Array(total);
    this.ownSize = new Float64Array(total);
    this.newIndex = new Int32Array(total);
    this.oldIndex = new Int32Array(total);
    this.kind = new Uint8Array(total);
    this.fromRow = new Int32Array(total).fill(-1);
    this.changedNodes = new Int32Array(total);
  }

  /** Lays out every node: the root, then OLD's pre-order with its places. */
  lay(): void {
    this.node(0, -1);
    const end = this.range(1, this.oldTree.length, this.after(0), 0);
    if (end !== this.places.length || this.k !== this.total || this.n !== this.plan.rows)
      throw new Error("direct-combine: laid out another number of nodes than the versions have");
  }

  /**
   * OLD nodes `from` to `to - 1` (part of the subtree of `lo`), with the places among them from place
   * `e` on: those before `to`, and those at `to` whose owner lies in the subtree. Returns the first place
   * after them.
   */
  private range(from: number, to: number, e: number, lo: number): number {
    const { at, owner, unit } = this.places;
    const length = this.places.length;
    let o = from;
    while (e < length && (at[e] < to || (at[e] === to && owner[e] >= lo && owner[e] < to))) {
      this.copy(o, at[e]);
      o = at[e];
      if (unit[e] === -1) {
        // A moved subtree: laid where it goes; its places with it.
        const end = o + this.oldCount[o];
        e++;
        while (e < length && (at[e] < end || (at[e] === end && owner[e] >= o && owner[e] < end))) e++;
        o = end;
      } else {
        this.unit(unit[e], this.placed[owner[e]]);
        e++;
      }
    }
    this.copy(o, to);
    return e;
  }

  /** The first place after OLD node `o`'s own (places at `o` belong to nodes before it). */
  private after(o: number): number {
    const at = this.places.at;
    let lo = 0;
    let hi = this.places.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (at[mid] <= o) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /** Scanned row `j`'s unit under combined node `under`: a moved OLD subtree, or an added row and its children. */
  private unit(j: number, under: number): void {
    const o = this.plan.scannedEarlier[j];
    if (o >= 0) {
      this.node(o, under);
      this.range(o + 1, o + this.oldCount[o], this.after(o), o);
      return;
    }
    const k = this.k++;
    const row = this.plan.scanned[j];
    this.parent[k] = under;
    this.depth[k] = this.depth[under] + 1;
    this.newIndex[k] = this.n++;
    this.oldIndex[k] = -1;
    this.fromRow[k] = row;
    this.ownSize[k] = this.plan.sizes === null ? 0 : this.plan.sizes[row];
    this.kind[k] = KIND.added;
    this.changedNodes[this.changes++] = k;
    for (const child of this.units.under.get(-2 - j) ?? []) this.unit(child, k);
  }

  /** OLD node `o` under combined node `under` (-1: the root). */
  private node(o: number, under: number): void {
    const k = this.k++;
    this.placed[o] = k;
    this.parent[k] = under;
    this.depth[k] = under === -1 ? 0 : this.depth[under] + 1;
    this.oldIndex[k] = o;
    if (this.plan.rowOfEarlier[o] === -1) {
      this.newIndex[k] = -1;
      this.kind[k] = KIND.removed;
      this.changedNodes[this.changes++] = k;
    } else {
      this.newIndex[k] = this.n++;
      this.ownSize[k] = this.oldTree.ownSize[o];
    }
  }

  /** OLD nodes `from` to `to - 1` in order, each under its OLD parent's place: the loop over most nodes. */
  private copy(from: number, to: number): void {
    if (from >= to) return;
    const { parent, depth, ownSize, newIndex, oldIndex, kind, placed, changedNodes } = this;
    const oldParent = this.oldTree.parent;
    const oldSize = this.oldTree.ownSize;
    const rowOf = this.plan.rowOfEarlier;
    let k = this.k;
    let n = this.n;
    let changes = this.changes;
    for (let o = from; o < to; o++, k++) {
      const p = placed[oldParent[o]];
      placed[o] = k;
      parent[k] = p;
      depth[k] = depth[p] + 1;
      oldIndex[k] = o;
      if (rowOf[o] === -1) {
        newIndex[k] = -1;
        kind[k] = KIND.removed;
        changedNodes[changes++] = k;
      } else {
        newIndex[k] = n++;
        ownSize[k] = oldSize[o];
      }
    }
    this.k = k;
    this.n = n;
    this.changes = changes;
  }

  /**
   * The scanned rows NEW shares with OLD: their sizes, names and kinds (by `kindOf`'s precedence: moved,
   * renamed, resized); then the changed nodes in ascending order.
   */
  pairedKinds(): Int32Array {
    const { scanned, scannedEarlier, sizes, names } = this.plan;
    const oldName = this.oldTree.name;
    const oldSize = this.oldTree.ownSize;
    for (let j = 0; j < scanned.length; j++) {
      const o = scannedEarlier[j];
      if (o < 0) continue;
      const k = this.placed[o];
      const row = scanned[j];
      this.fromRow[k] = row;
      const size = sizes === null ? 0 : sizes[row];
      this.ownSize[k] = size;
      const kind = this.units.moved.has(o)
        ? KIND.moved
        : !sameName(names, row, oldName, o)
          ? KIND.renamed
          : size - oldSize[o] !== 0
            ? KIND.resized
            : KIND.none;
      if (kind === KIND.none) continue;
      this.kind[k] = kind;
      this.changedNodes[this.changes++] = k;
    }
    return this.changedNodes.slice(0, this.changes).sort();
  }
}

/** Names or ids of the combined nodes: NEW's row's where `fromRow` has one, else OLD's node's. */
class RowsOrEarlier extends MergedNames {
  constructor(
    private readonly rows: Names,
    private readonly fromRow: Int32Array,
    private readonly earlier: Names,
    private readonly earlierIndex: Int32Array,
  ) {
    super(rows, fromRow, earlier, earlierIndex);
  }

  /**
   * The first node named `text` (NEW's rows are not in the combined order, so node by node): by the
   * names' bytes when both versions' are all pooled bytes, nothing decoded (a text without U+FFFD is
   * only the name whose bytes are its UTF-8: a name of other bytes decodes with U+FFFD); else by text.
   */
  override indexOf(text: string): number {
    if (text === "") return -1;
    const { rows, fromRow, earlier, earlierIndex } = this;
    const total = fromRow.length;
    if (
      rows instanceof NamePool &&
      earlier instanceof NamePool &&
      !rows.hasExact &&
      !earlier.hasExact &&
      text.isWellFormed() &&
      !text.includes("\uFFFD")
    ) {
      const bytes = Buffer.from(text, "utf8");
      const n = bytes.length;
      for (let k = 0; k < total; k++) {
        const r = fromRow[k];
        const named =
          r >= 0 ? rows.equalsBytes(r, bytes, 0, n) : earlier.equalsBytes(earlierIndex[k], bytes, 0, n);
        if (named) return k;
      }
      return -1;
    }
    for (let k = 0; k < total; k++) if (this.get(k) === text) return k;
    return -1;
  }
}

/** The combined record over the laid out arrays, as `combine` makes it for a matching by id. */
function combinedOf(oldTree: Tree, newTree: Tree, plan: ReadAsEarlier, layout: Layout): Combined {
  const { total, parent, depth, ownSize, newIndex, oldIndex, kind, fromRow } = layout;
  const oldSize = oldTree.ownSize;
  const deltaOf = (k: number): number => {
    const n = newIndex[k];
    const o = oldIndex[k];
    return n < 0 ? 0 - oldSize[o] : o < 0 ? ownSize[k] : ownSize[k] - oldSize[o];
  };
  // Where each node came from (NEW's row, or OLD's for a removed node), made when first read.
  let origin: Int32Array | undefined;
  const originOf = (): Int32Array => {
    if (origin !== undefined) return origin;
    origin = new Int32Array(total);
    const rowOf = plan.rowOfEarlier;
    for (let k = 0; k < total; k++) {
      const o = oldIndex[k];
      origin[k] = fromRow[k] >= 0 ? fromRow[k] + 1 : newIndex[k] >= 0 ? rowOf[o] + 1 : oldTree.origin[o];
    }
    return origin;
  };
  const tree: Tree = {
    length: total,
    parent,
    depth,
    name: new RowsOrEarlier(plan.names, fromRow, oldTree.name, oldIndex),
    ownSize,
    hasSizes: oldTree.hasSizes || newTree.hasSizes,
    ids: new RowsOrEarlier(plan.ids, fromRow, oldTree.ids!, oldIndex),
    get origin() {
      return originOf();
    },
    originIsRow: true,
    fields: new Map(),
    syntheticRoot: false,
    ...(newTree.reading ? { reading: newTree.reading } : {}),
  };
  return combinedRecord(tree, { newIndex, oldIndex, kind, deltaOf }, oldTree, newTree, "id", null);
}
