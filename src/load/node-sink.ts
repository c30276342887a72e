import { EspalierError } from "../errors.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import { isEmptyName, NamePool } from "../model/names.js";
import type { TreeReading } from "../model/tree.js";

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

  constructor(maxNodes: number, originIsRow: boolean) {
    this.maxNodes = maxNodes;
    this.originIsRow = originIsRow;
    this.name = new NamePool();
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
    this.name.setBytes(i, src, s, e);
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
      ...(reading ? { reading } : {}),
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

  private grow(): void {
    const capacity = this.parentOf.length * 2;
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
    `the input has more than ${maxNodes} nodes, the configured maximum; raise the limit or load a smaller part`,
    pos,
  );
}
