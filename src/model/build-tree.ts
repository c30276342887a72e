import { EspalierError, type MessagePart, quoted, say } from "../errors.js";
import { checkSizes } from "./check-sizes.js";
import type { LinkedNodes } from "./linked-nodes.js";
import { NamePool } from "./names.js";
import type { Tree } from "./tree.js";

/** Linked nodes with their names and ids pooled. */
type PooledNodes = LinkedNodes & { name: NamePool; ids: NamePool | null };

/**
 * Orders linked nodes into a pre-order {@link Tree}. Children keep input order. Several top-level nodes
 * get one synthetic root named `rootName`. Nodes unreachable from a top-level node lie on a cycle, which
 * is reported with the rows or lines on it. Iterative: no recursion a deep tree could overflow.
 * The linked nodes are the tree's afterwards: their arrays may be the tree's own or hold its other
 * arrays (nodes out of pre-order: `parentOf`, `ownSize` and `origin` are read no more once reordered,
 * and their memory holds what would otherwise be new arrays), so the caller reads them no more.
 */
export function buildTree(linked: LinkedNodes, file?: string): Tree {
  const input = {
    ...linked,
    name: poolOf(linked.name),
    ids: linked.ids === null ? null : poolOf(linked.ids),
  };
  checkSizes(input, file);
  const parentOf = input.parentOf;
  const n = parentOf.length;
  let tops = 0;
  for (let i = 0; i < n; i++) if (parentOf[i] === -1) tops++;
  const ordered = inPreOrder(input, tops);
  if (ordered) {
    const slotOf = (i: number) => i + ordered.length - n;
    return withEmpty(withReferences(ordered, input.referenceOf, slotOf), input.empty, slotOf);
  }
  // Each loop of the general path is a function of its own: one whose loops ran before compiles again
  // at each loop (the code after a loop never ran), and a diff's NEW is the load that takes this path
  // after OLD took the one above (docs/performance.md).
  const synthetic = tops !== 1;
  const total = n + (synthetic ? 1 : 0);
  const rootOld = synthetic ? n : parentOf.indexOf(-1);
  // par: old index -> old parent index, with the synthetic root (if any) at index n: without one, the
  // loader's own parents, which say just that (the one top-level node is the root, its parent -1).
  const par = synthetic ? underSyntheticRoot(parentOf) : parentOf;
  par[rootOld] = -1;
  // Fresh memory is zeros: the child lists hold a node plus one (0: none), and the walk writes every
  // node's place it reaches, so none of these is filled first (a pass over a million nodes each; a
  // diff's NEW that is not in pre-order comes here, docs/performance.md).
  const firstChild = new Int32Array(total);
  const nextSib = new Int32Array(total);
  childLists(par, n, firstChild, nextSib);
  const newIndex = new Int32Array(total);
  const oldOf = new Int32Array(total);
  const reached = walkPreOrder(firstChild, nextSib, par, rootOld, newIndex, oldOf);
  if (reached < total) throw cycleError(input, par, reachedNodes(oldOf, reached, total), file);

  // The child lists are read no more: their memory holds the tree's parents and depths (memory
  // touched for the first time is dear on a big tree: docs/performance.md). `oldOf` becomes `from`
  // (where each node's name comes from; -1 for the synthetic root) as it is read.
  const parent = firstChild;
  const depth = nextSib;
  const from = oldOf;
  const ownSize = new Float64Array(total);
  // Rows numbered 1, 2, 3, ... in input order (a table's): each node's is where it came from plus one,
  // written over the loader's (read no more) when they have room, instead of gathered into new memory.
  const rowsInOrder = input.origin.length >= total && isCounting(input.origin, n);
  const origin = rowsInOrder
    ? new Int32Array(input.origin.buffer, input.origin.byteOffset, total)
    : new Int32Array(total);
  gatherByPlace(oldOf, par, newIndex, { parent, depth, ownSize, origin }, input, rowsInOrder);
  const fields = new Map<string, string[]>();
  for (const [key, values] of input.fields) {
    const byNode = new Array<string>(total);
    for (let k = 0; k < total; k++) byNode[k] = from[k] === -1 ? "" : (values[from[k]] ?? "");
    fields.set(key, byNode);
  }
  const slotOf = (i: number) => newIndex[i];
  // The names' places go in `par`'s memory, read no more, and in `newIndex`'s where no slotOf follows;
  // the ids' in the loader's sizes', read no more either, when they have room for both.
  const spare = input.referenceOf === undefined && input.empty === undefined;
  const places = spare
    ? {
        start: new Uint32Array(par.buffer, par.byteOffset, total),
        size: new Uint32Array(newIndex.buffer, 0, total),
      }
    : undefined;
  const idPlaces =
    input.ownSize.length >= total
      ? {
          start: new Uint32Array(input.ownSize.buffer, input.ownSize.byteOffset, total),
          size: new Uint32Array(input.ownSize.buffer, input.ownSize.byteOffset + 4 * total, total),
        }
      : undefined;
  const tree = withReferences(
    {
      length: total,
      parent,
      depth,
      name: input.name.reordered(from, input.rootName, places),
      ownSize,
      hasSizes: input.hasSizes,
      ids: input.ids === null ? null : input.ids.reordered(from, "", idPlaces),
      origin,
      originIsRow: input.originIsRow,
      fields,
      syntheticRoot: synthetic,
      ...(input.reading ? { reading: input.reading } : {}),
    },
    input.referenceOf,
    slotOf,
  );
  return withEmpty(tree, input.empty, slotOf);
}

/** The loader's parents with a synthetic root at index `n` above the top-level nodes. */
function underSyntheticRoot(parentOf: Int32Array): Int32Array {
  const n = parentOf.length;
  const par = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) par[i] = parentOf[i] === -1 ? n : parentOf[i];
  return par;
}

/**
 * Children lists in input order, made from the last node back: `firstChild[p]` and `nextSib[i]` hold a
 * node plus one, 0 for none (both all 0 before).
 */
function childLists(par: Int32Array, n: number, firstChild: Int32Array, nextSib: Int32Array): void {
  for (let i = n - 1; i >= 0; i--) {
    const p = par[i];
    if (p < 0) continue;
    nextSib[i] = firstChild[p];
    firstChild[p] = i + 1;
  }
}

/**
 * Pre-order walk without a stack: down to the first child, else across, else up until a sibling (the
 * lists as {@link childLists} makes them). Fills `newIndex` (old -> new) and `oldOf` (new -> old) for the
 * nodes it reaches; returns how many it reached.
 */
function walkPreOrder(
  firstChild: Int32Array,
  nextSib: Int32Array,
  par: Int32Array,
  rootOld: number,
  newIndex: Int32Array,
  oldOf: Int32Array,
): number {
  let next = 0;
  let cur = rootOld;
  while (cur !== -1) {
    newIndex[cur] = next;
    oldOf[next] = cur;
    next++;
    if (firstChild[cur] !== 0) {
      cur = firstChild[cur] - 1;
      continue;
    }
    while (cur !== -1 && cur !== rootOld && nextSib[cur] === 0) cur = par[cur];
    cur = cur === -1 || cur === rootOld ? -1 : nextSib[cur] - 1;
  }
  return next;
}

/** 1 for each node the walk reached (the first `reached` of `oldOf`), 0 for the others. */
function reachedNodes(oldOf: Int32Array, reached: number, total: number): Uint8Array {
  const seen = new Uint8Array(total);
  for (let k = 0; k < reached; k++) seen[oldOf[k]] = 1;
  return seen;
}

/**
 * The tree's parents, depths, sizes and origins by new place, from the loader's by old index; `oldOf`
 * becomes `from` (-1 for the synthetic root, at old index n) as it is read.
 */
function gatherByPlace(
  oldOf: Int32Array,
  par: Int32Array,
  newIndex: Int32Array,
  out: { parent: Int32Array; depth: Int32Array; ownSize: Float64Array; origin: Int32Array },
  input: PooledNodes,
  rowsInOrder: boolean,
): void {
  const { parent, depth, ownSize, origin } = out;
  const sizeOf = input.ownSize;
  const originOf = input.origin;
  const n = input.parentOf.length;
  const from = oldOf;
  for (let k = 0; k < oldOf.length; k++) {
    const o = oldOf[k];
    const p = par[o];
    const pk = p === -1 ? -1 : newIndex[p];
    parent[k] = pk;
    depth[k] = p === -1 ? 0 : depth[pk] + 1;
    if (o === n) {
      from[k] = -1;
      origin[k] = 0;
      continue;
    }
    ownSize[k] = sizeOf[o];
    origin[k] = rowsInOrder ? o + 1 : originOf[o];
  }
}

/** The tree with `empty` by slot from the loader's flags by node, when any node is empty. */
function withEmpty(tree: Tree, empty: Uint8Array | undefined, slotOf: (i: number) => number): Tree {
  if (empty === undefined) return tree;
  const bySlot = new Uint8Array(tree.length);
  for (let i = 0; i < empty.length; i++) if (empty[i] === 1) bySlot[slotOf(i)] = 1;
  return { ...tree, empty: bySlot };
}

/**
 * The tree with `referenceTo` (slot -> slot of the full entry) from the loader's `referenceOf` (node ->
 * node), when there are references; `slotOf` maps a node to its slot.
 */
function withReferences(
  tree: Tree,
  referenceOf: Int32Array | undefined,
  slotOf: (i: number) => number,
): Tree {
  if (referenceOf === undefined) return tree;
  const referenceTo = new Int32Array(tree.length).fill(-1);
  for (let i = 0; i < referenceOf.length; i++)
    if (referenceOf[i] !== -1) referenceTo[slotOf(i)] = slotOf(referenceOf[i]);
  return { ...tree, referenceTo };
}

/**
 * The tree without reordering when the nodes already come in pre-order (each node's parent is on the
 * path from the latest top-level node down to the node before it), as document-order loaders give them;
 * null otherwise. Saves the linking arrays of the general case. `tops`: how many nodes have no parent.
 */
function inPreOrder(input: PooledNodes, tops: number): Tree | null {
  const { parentOf } = input;
  const n = parentOf.length;
  const shift = tops !== 1 ? 1 : 0;
  if (shift === 0 && parentOf[0] !== -1) return null;
  const total = n + shift;
  // With one top-level node the loader's own arrays are the tree's (views, no copy: at a million nodes
  // 16 MiB less memory touched for the first time); a synthetic root shifts every node by one.
  const parent = shift === 0 ? parentOf.subarray(0, n) : new Int32Array(total);
  const depth = new Int32Array(total);
  let path = new Int32Array(64); // path[d] = the node at depth d (without the synthetic root) above i
  let top = -1;
  for (let i = 0; i < n; i++) {
    const p = parentOf[i];
    if (p === -1) {
      top = 0;
    } else {
      while (top >= 0 && path[top] !== p) top--;
      if (top < 0) return null;
      top++;
    }
    if (top === path.length) {
      const grown = new Int32Array(path.length * 2);
      grown.set(path);
      path = grown;
    }
    path[top] = i;
    if (shift === 1) parent[i + 1] = p === -1 ? 0 : p + 1;
    depth[i + shift] = top + shift;
  }
  if (shift === 1) parent[0] = -1;
  const ownSize = shift === 0 ? input.ownSize.subarray(0, n) : new Float64Array(total);
  if (shift === 1) ownSize.set(input.ownSize.subarray(0, n), 1);
  const origin = shift === 0 ? input.origin.subarray(0, n) : new Int32Array(total);
  if (shift === 1) origin.set(input.origin.subarray(0, n), 1);
  const fields = new Map<string, string[]>();
  for (const [key, values] of input.fields) fields.set(key, withFirst(values, n, shift, ""));
  return {
    length: total,
    parent,
    depth,
    name:
      shift === 0 && input.name.length === n
        ? input.name
        : input.name.reordered(firstThen(n, shift), input.rootName),
    ownSize,
    hasSizes: input.hasSizes,
    ids:
      input.ids === null
        ? null
        : shift === 0 && input.ids.length === n
          ? input.ids
          : input.ids.reordered(firstThen(n, shift), ""),
    origin,
    originIsRow: input.originIsRow,
    fields,
    syntheticRoot: shift === 1,
    ...(input.reading ? { reading: input.reading } : {}),
  };
}

/** Whether `origin[i]` is `i + 1` for each of the first `n` nodes (rows in input order). */
function isCounting(origin: Int32Array, n: number): boolean {
  for (let i = 0; i < n; i++) if (origin[i] !== i + 1) return false;
  return true;
}

function poolOf(names: NamePool | readonly string[]): NamePool {
  return names instanceof NamePool ? names : NamePool.from(names);
}

/** -1 (the synthetic root) when `shift` is 1, then 0 .. n-1: where each node's name comes from. */
function firstThen(n: number, shift: number): Int32Array {
  const from = new Int32Array(n + shift);
  for (let i = 0; i < n; i++) from[i + shift] = i;
  if (shift === 1) from[0] = -1;
  return from;
}

/** `values[0, n)` as a new array, after `first` when `shift` is 1; a missing value is "". */
function withFirst(values: readonly string[], n: number, shift: number, first: string): string[] {
  const out: string[] = new Array(n + shift);
  if (shift === 1) out[0] = first;
  for (let i = 0; i < n; i++) out[i + shift] = values[i] ?? "";
  return out;
}

function cycleError(input: PooledNodes, par: Int32Array, reached: Uint8Array, file?: string): EspalierError {
  const n = input.parentOf.length;
  let start = 0;
  while (start < n && reached[start] === 1) start++;
  // Walk up from an unreached node until a node repeats: that node is on the cycle.
  const seen = new Set<number>();
  let cur = start;
  while (!seen.has(cur)) {
    seen.add(cur);
    cur = par[cur];
  }
  const cycle: number[] = [cur];
  for (let c = par[cur]; c !== cur; c = par[c]) cycle.push(c);
  const unit = input.originIsRow ? "row" : "line";
  const where = (i: number): MessagePart[] =>
    input.ids
      ? say`${unit} ${input.origin[i]} (id ${quoted.id(input.ids.get(i))})`
      : [`${unit} ${input.origin[i]}`];
  const first = cycle.reduce((a, b) => (input.origin[a] <= input.origin[b] ? a : b));
  const pos = input.originIsRow
    ? { file, row: input.origin[first] }
    : { file, line: input.origin[first], column: 1 };
  if (cycle.length === 1)
    return new EspalierError(
      "CYCLE",
      [
        ...where(cur),
        " is its own parent",
        // Some exports write the top row so (an org chart's head, a database's root).
        input.ids
          ? `; if it is the top ${unit} (some exports write their root as its own parent), leave its parent cell empty, which makes it a top-level ${unit}`
          : "",
      ],
      pos,
    );
  const shown = cycle.slice(0, 6).flatMap((c, k) => (k === 0 ? where(c) : [" -> ", ...where(c)]));
  return new EspalierError(
    "CYCLE",
    [
      `the parent links form a cycle of ${cycle.length} nodes: `,
      ...shown,
      cycle.length > 6 ? " -> …" : "",
      // A graph's links may cycle: read so, each link that closes a cycle is a reference.
      input.ids
        ? `; correct a parent cell on it, or read the links as a graph (--graph), which reads cycles`
        : "",
    ],
    pos,
  );
}
