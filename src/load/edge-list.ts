import { Buffer } from "node:buffer";
import { EspalierError } from "../errors.js";
import { doubled, hashBytes, mix } from "../model/child-hash.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import { NamePool } from "../model/names.js";
import type { LoadOptions } from "./load-options.js";
import { limitExceeded } from "./node-sink.js";

const TAB = 0x09;
const SPACE = 0x20;
const LF = 0x0a;
const CR = 0x0d;
const ID_SEED = 0x811c9dc5;

/**
 * An edge list read from bytes: one `parent child` pair per line. The first non-blank line decides the
 * separator for the whole input: a tab when it holds one (ids may then hold spaces), else runs of
 * spaces. A line with one id declares a node with no edge; blank lines are skipped; a third field is
 * SHAPE at its line and column. Ids are kept as
 * bytes in one pool and found again by a hash of their bytes; a node's name is its id. Nodes are
 * numbered by first appearance; edges keep input order; a repeated edge is read once.
 */
export class EdgeListReader {
  private readonly ids = new NamePool(1 << 12, 1 << 16);
  private count = 0;
  private slots: Int32Array = new Int32Array(1 << 13); // pairs (node + 1, hash), at most half the places used
  private hashes = new Int32Array(1 << 11);
  private origin = new Int32Array(1 << 11);
  private from = new Int32Array(1 << 12);
  private to = new Int32Array(1 << 12);
  private edgeLine = new Int32Array(1 << 12);
  private edges = 0;
  private line = 0;
  private tabs: boolean | undefined;
  private lastParent = -1;

  constructor(private readonly options: Pick<LoadOptions, "maxNodes" | "rootName">) {}

  /** Reads the whole lines in `buf[s, e)` (the last may lack its "\n" only at the end of the input). */
  lines(buf: Uint8Array, s: number, e: number): void {
    let at = s;
    while (at < e) {
      let end = buf.indexOf(LF, at);
      if (end === -1 || end >= e) end = e;
      this.line++;
      this.readLine(buf, at, end > at && buf[end - 1] === CR ? end - 1 : end);
      at = end + 1;
    }
  }

  private readLine(buf: Uint8Array, s: number, e: number): void {
    let a = s;
    if (this.tabs === undefined) {
      let blank = true;
      for (let k = s; k < e && blank; k++) if (buf[k] !== SPACE && buf[k] !== TAB) blank = false;
      if (blank) return;
      this.tabs = buf.subarray(s, e).includes(TAB);
    }
    if (this.tabs) {
      let blank = true;
      for (let k = s; k < e && blank; k++) if (buf[k] !== SPACE && buf[k] !== TAB) blank = false;
      if (blank) return;
      const t1 = indexIn(buf, TAB, s, e);
      if (t1 === -1) {
        this.node(buf, s, e, s);
        return;
      }
      const t2 = indexIn(buf, TAB, t1 + 1, e);
      if (t2 !== -1) throw this.tooMany(s, t2 + 1);
      if (t1 === s || t1 + 1 === e) throw this.emptyId(s, t1 === s ? s : t1 + 1);
      this.edge(buf, s, t1, t1 + 1, e, s);
      return;
    }
    while (a < e && (buf[a] === SPACE || buf[a] === TAB)) a++;
    if (a === e) return;
    let b = a;
    while (b < e && buf[b] !== SPACE && buf[b] !== TAB) b++;
    let c = b;
    while (c < e && (buf[c] === SPACE || buf[c] === TAB)) c++;
    if (c === e) {
      this.node(buf, a, b, s);
      return;
    }
    let d = c;
    while (d < e && buf[d] !== SPACE && buf[d] !== TAB) d++;
    let f = d;
    while (f < e && (buf[f] === SPACE || buf[f] === TAB)) f++;
    if (f < e) throw this.tooMany(s, f);
    this.edge(buf, a, b, c, d, s);
  }

  private node(buf: Uint8Array, s: number, e: number, lineStart: number): void {
    if (s === e) throw this.emptyId(lineStart, s);
    this.idOf(buf, s, e);
  }

  private edge(buf: Uint8Array, ps: number, pe: number, cs: number, ce: number, _lineStart: number): void {
    // Edge lists usually list a parent's children together: the same parent as the line before costs a
    // byte comparison, not a lookup.
    const last = this.lastParent;
    const p = last !== -1 && this.ids.equalsBytes(last, buf, ps, pe) ? last : this.idOf(buf, ps, pe);
    this.lastParent = p;
    const c = this.idOf(buf, cs, ce);
    const k = this.edges;
    if (k === this.from.length) {
      this.from = doubled(this.from);
      this.to = doubled(this.to);
      this.edgeLine = doubled(this.edgeLine);
    }
    this.from[k] = p;
    this.to[k] = c;
    this.edgeLine[k] = this.line;
    this.edges = k + 1;
  }

  /**
   * The node with the id `buf[s, e)`, added on first sight. The table holds pairs (node + 1, hash) side
   * by side, so a probe reads one place, not the table and then a hash array.
   */
  private idOf(buf: Uint8Array, s: number, e: number): number {
    const hash = hashBytes(ID_SEED, buf, s, e);
    const table = this.slots;
    const mask = (table.length >> 1) - 1;
    let h = mix(hash) & mask;
    for (let slot = table[2 * h]; slot !== 0; slot = table[2 * h]) {
      if (table[2 * h + 1] === hash && this.ids.equalsBytes(slot - 1, buf, s, e)) return slot - 1;
      h = (h + 1) & mask;
    }
    const node = this.count;
    if (node >= this.options.maxNodes) throw limitExceeded(this.options.maxNodes, false, this.line);
    this.ids.setBytes(node, buf, s, e);
    if (node === this.hashes.length) {
      this.hashes = doubled(this.hashes);
      this.origin = doubled(this.origin);
    }
    this.hashes[node] = hash;
    this.origin[node] = this.line;
    table[2 * h] = node + 1;
    table[2 * h + 1] = hash;
    this.count = node + 1;
    if (this.count * 4 > table.length) this.slots = this.grown();
    return node;
  }

  /** The table with twice the places, every node entered again by its hash. */
  private grown(): Int32Array {
    const table = new Int32Array(this.slots.length * 2);
    const mask = (table.length >> 1) - 1;
    for (let node = 0; node < this.count; node++) {
      const hash = this.hashes[node];
      let h = mix(hash) & mask;
      while (table[2 * h] !== 0) h = (h + 1) & mask;
      table[2 * h] = node + 1;
      table[2 * h + 1] = hash;
    }
    return table;
  }

  private tooMany(lineStart: number, at: number): EspalierError {
    return new EspalierError("SHAPE", `line ${this.line} has more than two ids; an edge is "parent child"`, {
      line: this.line,
      column: at - lineStart + 1,
    });
  }

  private emptyId(lineStart: number, at: number): EspalierError {
    return new EspalierError("SHAPE", `line ${this.line} has an empty id`, {
      line: this.line,
      column: at - lineStart + 1,
    });
  }

  /** The nodes and edges read; INPUT_EMPTY when there are none. */
  finish(): GraphNodes {
    const n = this.count;
    if (n === 0) throw new EspalierError("INPUT_EMPTY", "the edge list has no ids");
    return {
      name: this.ids,
      ids: this.ids,
      ownSize: new Float64Array(n),
      hasSizes: false,
      sizeUnit: "number",
      origin: this.origin.slice(0, n),
      originIsRow: false,
      recordFields: [],
      fields: new Map(),
      rootName: this.options.rootName,
      edgeFrom: this.from,
      edgeTo: this.to,
      edgeOrigin: this.edgeLine,
      edgeCount: this.edges,
      repeatedEdges: "skip",
    };
  }
}

/** An edge list held as text (see {@link EdgeListReader}). */
export function loadEdgeList(text: string, options: Pick<LoadOptions, "maxNodes" | "rootName">): GraphNodes {
  const reader = new EdgeListReader(options);
  const bytes = Buffer.from(text, "utf8");
  reader.lines(bytes, 0, bytes.length);
  return reader.finish();
}

function indexIn(buf: Uint8Array, byte: number, s: number, e: number): number {
  for (let k = s; k < e; k++) if (buf[k] === byte) return k;
  return -1;
}
