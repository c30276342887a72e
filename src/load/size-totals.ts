import { EspalierError, type MessagePart, type SourcePos, say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import { describeNode } from "./describe-node.js";
import type { FolderSizes } from "./path-list/folder-totals.js";

/**
 * How the sizes of nested nodes and table rows count a node with children (`--folder-sizes`): `total`,
 * each is the node with all below it (`lsblk -J -b` gives a disk's size with its partitions inside it,
 * a cost roll-up gives a department with its teams), so its own size is that minus its children's;
 * `own`, each is the node alone, as espalier reads them by default. Without a mode, sizes that look
 * like totals (every node with children at least as big as they add up to, and one of them with
 * children that fill {@link FILLED} of its size) are still read as own, and a SIZES_LIKE_TOTALS note says so: unlike a path
 * list, whose `du` order tells totals apart (path-list/folder-totals.ts), nothing in node objects or
 * rows does, and a parent that costs more than its one cheap child is no total.
 * Returns the tree with own sizes and reading changed as read; trees of other shapes as they are.
 */
export function readSizeTotals(tree: Tree, mode: FolderSizes | undefined): Tree {
  const reading = tree.reading;
  if (reading === undefined || reading.shape === "paths") return tree;
  if (mode !== undefined && !kept.has(reading.shape))
    throw new EspalierError(
      "USAGE",
      `--folder-sizes reads path lists, node objects and tables only; this input is read as ${reading.shape === "values" ? "every value a node (a value's size is its own bytes)" : "a graph"}`,
    );
  if (!tree.hasSizes || !kept.has(reading.shape) || mode === "own") return tree;
  // One pre-order pass: a node's children add up on a stack of the open nodes (as deep as the tree,
  // no array as long as it), and a node is checked, and under `total` made its own, once its subtree
  // is over. A child's size is added before its own subtree changes it.
  const { length, depth, ownSize } = tree;
  let node = new Int32Array(64);
  let sum = new Float64Array(64);
  let parents = new Uint8Array(64);
  let top = -1;
  let sized = 0;
  let first = length;
  let firstSum = 0;
  // A root espalier added to join several top-level nodes has no size of its own to compare.
  const skip = tree.syntheticRoot ? 0 : -1;
  const close = (): boolean => {
    const k = node[top];
    const contents = sum[top];
    top--;
    if (parents[top + 1] === 0 || k === skip) return true;
    if (ownSize[k] < contents) {
      if (mode === "total") throw smallerThanChildren(tree, k, contents);
      return false;
    }
    if (mode === "total") ownSize[k] -= contents;
    else if (contents > 0) {
      sized++;
      if (contents >= FILLED * ownSize[k] && k < first) [first, firstSum] = [k, contents];
    }
    return true;
  };
  for (let i = 0; i < length; i++) {
    while (top >= 0 && depth[node[top]] >= depth[i]) if (!close()) return tree;
    if (top >= 0) {
      sum[top] += ownSize[i];
      parents[top] = 1;
    }
    if (++top === node.length) [node, sum, parents] = [grown(node), grown(sum), grown(parents)];
    node[top] = i;
    sum[top] = 0;
    parents[top] = 0;
  }
  while (top >= 0) if (!close()) return tree;
  if (mode === "total") return { ...tree, reading: { ...reading, folderTotals: true } };
  if (first === length) return tree;
  const note = likeTotalsNote(tree, first, firstSum, sized);
  return { ...tree, reading: { ...reading, notes: [...(reading.notes ?? []), note] } };
}

/** `a` twice as long, its values kept. */
function grown<T extends Int32Array | Float64Array | Uint8Array>(a: T): T {
  const b = new (a.constructor as new (n: number) => T)(a.length * 2);
  b.set(a);
  return b;
}

/**
 * The share of a node's size its children must fill, in one node at least, before sizes that pass the
 * test of totals get the note: totals have a node whose own part is small beside what it holds (a
 * disk's partitions fill it but for a MiB; a roll-up's top holds little of its own), where own sizes
 * that pass by chance hold little below (a folder's 4 KiB entry above a few small files). Measured on
 * every folder below /usr/share, /etc and two node_modules here as node objects of own sizes: 988 of
 * 4,179 passed the test; 201 with a node 75% full (132 at 90%, 371 at 50%).
 */
const FILLED = 0.75;

/** Shapes whose sizes are a record's field: node objects, JSON rows, tables, a map keyed by path. */
const kept = new Set(["nodes", "rows", "table", "path-map"]);

/**
 * SIZES_LIKE_TOTALS: every node with children is at least as big as its children add up to, as sizes
 * that include the children's are; read as own sizes, each level adds them up again.
 */
function likeTotalsNote(tree: Tree, first: number, contents: number, count: number): ReadingNote {
  const others = count === 1 ? "" : ` and ${count - 1} more`;
  return {
    code: "SIZES_LIKE_TOTALS",
    count,
    ...(tree.origin[first] > 0 && !tree.originIsRow ? { line: tree.origin[first] } : {}),
    parts: say`every node with children has a size at least what its children's add up to (${place(tree, first)}: ${tree.ownSize[first]}, its children ${contents}${others}), as sizes that include the children's do (lsblk -J -b gives a disk with its partitions so); read as each node's own, they are added up again at every level above: --folder-sizes total reads each as the node with all below it, --folder-sizes own as its own without this note`,
  };
}

function place(tree: Tree, i: number): MessagePart[] {
  const node = describeNode(tree.parent, tree.name, i);
  const at = tree.origin[i];
  return at > 0 ? [...node, `, ${tree.originIsRow ? "row" : "line"} ${at}`] : node;
}

function smallerThanChildren(tree: Tree, i: number, contents: number): EspalierError {
  const at = tree.origin[i];
  const pos: SourcePos = at > 0 ? (tree.originIsRow ? { row: at } : { line: at }) : {};
  return new EspalierError(
    "BAD_SIZE",
    say`${place(tree, i)} has the size ${tree.ownSize[i]}, less than the ${contents} its children add up to; with --folder-sizes total a node's size includes its children's (--folder-sizes own reads each size as the node's own)`,
    pos,
  );
}
