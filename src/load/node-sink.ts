import { EspalierError } from "../errors.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import { isEmptyName, NamePool, type Names } from "../model/names.js";
import type { TreeReading } from "../model/tree.js";
import { EarlierNames } from "./earlier-names.js";

/**
 * Growable flat arrays that a loader appends nodes to, in any order, each linked to its parent by index.
 * The node limit is enforced here, as nodes arrive, so an oversized input fails before it is all built.
 */
export class NodeSink {
  length = 0;
  parentOf = new Int32Array(1024);
  ownSize = new Float64Array(1024);
  origin = new Int32Array(1024);
  readonly name: NamePool;
  hasSizes = false;
  readonly maxNodes: number;
  readonly originIsRow: boolean;

  /** With an earlier version's names given: where its nodes keep a name's bytes (see EarlierNames). */
  private readonly earlier: EarlierNames | undefined;
  /** Whether {@link nameNamelessTop} named the top node (the reading says so: `rootNamed`). */
  private namedTop = false;

  /**
   * `earlier`: the names of a version of this input loaded before it (a diff's OLD), whose bytes the
   * names set by {@link setNameBytes} are placed in where equal.
   */
  constructor(maxNodes: number, originIsRow: boolean, earlier?: Names | null) {
    this.maxNodes = maxNodes;
    this.originIsRow = originIsRow;
    const shared = earlier instanceof NamePool ? earlier.readingBytes() : null;
    this.name = shared ?? new NamePool();
    const runs = shared === null ? null : (earlier as NamePool).byteRuns();
    if (runs !== null) this.earlier = new EarlierNames(runs, (earlier as NamePool).length);
  }

  /**
   * Sets node `i`'s name to the UTF-8 bytes `src[s, e)`: where the earlier version has a node of those
   * bytes near the one expected (see EarlierNames), in its bytes; else copied.
   */
  setNameBytes(i: number, src: Uint8Array, s: number, e: number): void {
    const earlier = this.earlier;
    const at = earlier === undefined ? -1 : earlier.find(src, s, e);
    if (at === -1) this.name.setBytes(i, src, s, e);
    else this.name.placeShared(i, earlier!.names.start[at], earlier!.names.size[at]);
  }

  /** Whether names are placed in an earlier version's bytes (its pool is read by this one's). */
  get readsEarlierNames(): boolean {
    return this.earlier !== undefined;
  }

  /**
   * Appends nodes `k` to `k + count - 1` of an earlier version (its parents, own sizes and names
   * `names`, the pool this sink's names read): siblings and their subtrees, in their order, those
   * siblings under node `parent`; as a loader reading them again would add them.
   */
  take(
    parent: number,
    parentOf: Int32Array,
    ownSize: Float64Array,
    names: NamePool,
    k: number,
    count: number,
  ): void {
    const at = this.length;
    const end = at + count;
    if (end > this.maxNodes) throw new Error(`take: ${end} nodes past the limit ${this.maxNodes}`);
    while (end > this.parentOf.length) this.grow();
    const to = this.parentOf;
    const size = this.ownSize;
    const origin = this.origin;
    const shift = at - k;
    const above = parentOf[k];
    for (let t = 0; t < count; t++) {
      const p = parentOf[k + t];
      to[at + t] = p === above ? parent : p + shift;
    }
    if (count <= 16) {
      for (let t = 0; t < count; t++) {
        size[at + t] = ownSize[k + t];
        origin[at + t] = 0;
      }
    } else {
      size.set(ownSize.subarray(k, k + count), at);
      origin.fill(0, at, end);
    }
    this.name.placeSharedRun(at, names, k, count);
    this.length = end;
  }

  /** Appends a node (own size 0) named `name` and returns its index. */
  add(parent: number, name: string, origin: number): number {
    const i = this.length;
    if (i >= this.maxNodes) throw limitExceeded(this.maxNodes, this.originIsRow, origin);
    if (i === this.parentOf.length) this.grow();
    this.parentOf[i] = parent;
    this.origin[i] = origin;
    this.name.setString(i, name);
    this.length = i + 1;
    return i;
  }

  /** Appends a node (own size 0) named by the UTF-8 bytes `src[s, e)` and returns its index. */
  addBytes(parent: number, src: Uint8Array, s: number, e: number, origin: number): number {
    const i = this.length;
    if (i >= this.maxNodes) throw limitExceeded(this.maxNodes, this.originIsRow, origin);
    if (i === this.parentOf.length) this.grow();
    this.parentOf[i] = parent;
    this.origin[i] = origin;
    this.setNameBytes(i, src, s, e);
    this.length = i + 1;
    return i;
  }

  /** Drops the nodes from index `length` on (a streaming loader undoing a value a later key replaced). */
  truncate(length: number): void {
    // Nodes added later start from own size 0, as in fresh arrays.
    this.ownSize.fill(0, length, this.length);
    this.length = length;
    this.name.setLength(length);
  }

  /**
   * Names the top node `rootName` (the input file's base name, `(stdin)`) when it is the only top-level
   * node and has no name (no name field, or an empty one): printed as `""`, the root of a nested
   * document (`{"3166-1": [...]}`) told the reader nothing, where the file's name does, as it does for
   * a root espalier adds. Its path stays empty. Scans only when node 0 is such a node.
   */
  nameNamelessTop(rootName: string): void {
    if (this.length === 0 || this.parentOf[0] !== -1 || !isEmptyName(this.name, 0)) return;
    for (let i = 1; i < this.length; i++) if (this.parentOf[i] === -1) return;
    this.name.setString(0, rootName);
    this.namedTop = true;
  }

  /** The nodes so far, ready for `buildTree`. */
  finish(
    rootName: string,
    fields: Map<string, string[]>,
    ids: string[] | null = null,
    reading?: TreeReading,
  ): LinkedNodes {
    const n = this.length;
    return {
      ...(reading ? { reading: this.namedTop ? { ...reading, rootNamed: "nameless" } : reading } : {}),
      parentOf: this.parentOf.subarray(0, n),
      name: this.name,
      ownSize: this.ownSize.subarray(0, n),
      hasSizes: this.hasSizes,
      ids,
      origin: this.origin.subarray(0, n),
      originIsRow: this.originIsRow,
      fields,
      rootName,
    };
  }

  /**
   * Room for `nodes` nodes at once (a loader that can tell how many are coming: a diff's NEW, about as
   * many as its OLD), where doubling would make fresh memory and a copy a dozen times over.
   */
  makeRoom(nodes: number): void {
    if (nodes > this.parentOf.length) this.grow(nodes);
    this.name.makeRoom(nodes, 0);
  }

  private grow(atLeast = 0): void {
    const capacity = Math.max(atLeast, this.parentOf.length * 2);
    const parentOf = new Int32Array(capacity);
    parentOf.set(this.parentOf);
    this.parentOf = parentOf;
    const ownSize = new Float64Array(capacity);
    ownSize.set(this.ownSize);
    this.ownSize = ownSize;
    const origin = new Int32Array(capacity);
    origin.set(this.origin);
    this.origin = origin;
  }
}

/**
 * LIMIT_EXCEEDED at the line or row that would have added one node too many (and the column where that
 * node starts, when the loader knows it).
 */
export function limitExceeded(
  maxNodes: number,
  originIsRow: boolean,
  origin: number,
  column?: number,
): EspalierError {
  const pos =
    origin <= 0
      ? undefined
      : originIsRow
        ? { row: origin }
        : column === undefined
          ? { line: origin }
          : { line: origin, column };
  return new EspalierError(
    "LIMIT_EXCEEDED",
    `the input has more than ${maxNodes} ${maxNodes === 1 ? "node" : "nodes"}, the limit given (--max-nodes); raise it or read a smaller part`,
    pos,
  );
}
