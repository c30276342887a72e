import { Buffer, isAscii } from "node:buffer";
import { EspalierError, quoted, say } from "../errors.js";
import { doubled } from "../model/child-hash.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import { NamePool } from "../model/names.js";
import type { ReadingNote } from "../model/reading-note.js";
import { wellFormedUtf8 } from "../model/well-formed-utf8.js";
import { firstBelow, idHash, sameBytes } from "./id-hash.js";
import type { LoadOptions } from "./load-options.js";
import { limitExceeded } from "./node-sink.js";
import { notUtf8Note } from "./not-utf8-note.js";

const TAB = 0x09;
const SPACE = 0x20;
const LF = 0x0a;
const CR = 0x0d;
const ID_SEED = 0x811c9dc5;
/** The most bytes of ids one edge list may hold (a name pool's limit). */
const LONGEST_IDS = 2 ** 32 - 1;
/** Usual lines parsed before their ids are looked up together (see EdgeListReader.enterPending). */
const BATCH = 256;
/**
 * Numbers kept per pending line: parent start, end, hash; child start, end, hash; line number; 1 when
 * the parent is that of the line before.
 */
const PENDING = 8;

/**
 * An edge list read from bytes: one `parent child` pair per line. The first non-blank line decides the
 * separator for the whole input: a tab when it holds one (ids may then hold spaces), else runs of
 * spaces. A line with one id declares a node with no edge; blank lines are skipped; a third field is
 * SHAPE at its line and column. Ids are kept as
 * bytes in one pool and found again by a hash of their bytes; a node's name is its id. Nodes are
 * numbered by first appearance; edges keep input order; a repeated edge is read once.
 */
export class EdgeListReader {
  // Ids as UTF-8 bytes, one after the other in order of first appearance (node i's are
  // idBytes[idStart[i], idStart[i] + idSize[i])); the name pool adopts them at the end.
  private idBytes: Buffer = Buffer.allocUnsafe(1 << 16);
  private idView = viewOf(this.idBytes);
  private used = 0;
  private idStart: Uint32Array<ArrayBuffer> = new Uint32Array(1 << 11);
  private idSize: Uint32Array<ArrayBuffer> = new Uint32Array(1 << 11);
  private count = 0;
  // Open addressing, four numbers a place: node + 1 (0 when empty), the id's hash, where its bytes
  // start, and how many there are. A lookup that finds its id reads one place and the id's bytes;
  // at most half of the places are used.
  private table: Int32Array = new Int32Array(4 << 12);
  private origin = new Int32Array(1 << 11);
  private from = new Int32Array(1 << 12);
  private to = new Int32Array(1 << 12);
  private edgeLine = new Int32Array(1 << 12);
  private edges = 0;
  private line = 0;
  private tabs: boolean | undefined;
  private lastParent = -1;
  private lastHash = 0;
  // Usual lines read but not yet entered (at most BATCH, all in the buffer being read), PENDING numbers
  // each; and what the touches of their places added up to (kept, so that the engine keeps the loads).
  private pending = new Int32Array(BATCH * PENDING);
  private pendingCount = 0;
  private touched = 0;
  // The parent id of the usual line before in the buffer being read (start -1: none), and its hash.
  private prevStart = -1;
  private prevEnd = 0;
  private prevHash = 0;

  // Lines and their bytes at the end of the last call of lines() (for the edge arrays, see moreEdges).
  private linesDone = 0;
  private bytesDone = 0;

  constructor(private readonly options: Pick<LoadOptions, "maxNodes" | "rootName" | "inputBytes">) {}

  /** Reads the whole lines in `buf[s, e)` (the last may lack its "\n" only at the end of the input). */
  lines(buf: Uint8Array, s: number, e: number): void {
    let at = s;
    this.prevStart = -1;
    const view = viewOf(buf);
    while (at < e) {
      if (this.tabs !== undefined) {
        const next = this.usualLine(buf, view, at, e);
        if (next !== -1) {
          at = next;
          continue;
        }
      }
      if (this.pendingCount > 0) this.enterPending(buf, view);
      let end = buf.indexOf(LF, at);
      if (end === -1 || end >= e) end = e;
      this.line++;
      this.prevStart = -1;
      this.readLine(buf, view, at, end > at && buf[end - 1] === CR ? end - 1 : end);
      at = end + 1;
    }
    if (this.pendingCount > 0) this.enterPending(buf, view);
    this.linesDone = this.line;
    this.bytesDone += e - s;
  }

  /**
   * A line in the usual shape: an id, the separator (with spaces: a run of spaces; with tabs: one
   * tab), an id, then "\n" or the end of the range. Returns where the next line starts, or -1, having
   * changed nothing, for any other line (blank, one id, three, a CR, a tab among spaces, a control
   * byte), which {@link readLine} reads. The ids' ends are found and the ids hashed four bytes at a
   * time (id-hash.ts); the edge is entered with the rest of its batch ({@link enterPending}).
   */
  private usualLine(buf: Uint8Array, view: DataView, s: number, e: number): number {
    let k = s;
    let pe: number;
    let cs: number;
    if (this.tabs) {
      // A line of spaces and tabs only is blank: a first id starting with a space goes the long way.
      if (buf[k] === SPACE) return -1;
      k = tabIdEnd(view, k, e);
      pe = k;
      if (pe === s || k === e || buf[k] !== TAB) return -1;
      cs = ++k;
      k = tabIdEnd(view, k, e);
    } else {
      k = firstBelow(view, k, e, SPACE + 1);
      pe = k;
      if (pe === s || k === e || buf[k] !== SPACE) return -1;
      while (++k < e && buf[k] === SPACE);
      cs = k;
      k = firstBelow(view, k, e, SPACE + 1);
    }
    const ce = k;
    if (ce === cs || (k < e && buf[k] !== LF)) return -1;
    // Edge lists usually list a parent's children together: the parent of the usual line just before
    // (entered just before this one) is found by comparing bytes in the buffer, not hashed again.
    const before = this.prevStart;
    const same =
      before !== -1 && this.prevEnd - before === pe - s && sameBytes(view, before, view, s, pe - s);
    const hp = same ? this.prevHash : idHash(view, s, pe, ID_SEED);
    this.prevStart = s;
    this.prevEnd = pe;
    this.prevHash = hp;
    const hc = idHash(view, cs, ce, ID_SEED);
    this.line++;
    const q = PENDING * this.pendingCount++;
    const pending = this.pending;
    pending[q] = s;
    pending[q + 1] = pe;
    pending[q + 2] = hp;
    pending[q + 3] = cs;
    pending[q + 4] = ce;
    pending[q + 5] = hc;
    pending[q + 6] = this.line;
    pending[q + 7] = same ? 1 : 0;
    if (this.pendingCount === BATCH) this.enterPending(buf, view);
    return k + 1;
  }

  /**
   * Enters the pending edges, in order, each at its own line. First the table places their ids hash to
   * are read, all of them, then the kept bytes of the ids found there: loads that do not depend on each
   * other, so the processor waits for their cache misses together rather than one after another (a
   * graph's edge list names each node once per edge, so most ids are found, and finding one costs a
   * miss for its place and one for its bytes). The lookups that follow then find both in the cache.
   * The touches decide nothing: the lookups are the usual ones.
   */
  private enterPending(buf: Uint8Array, view: DataView): void {
    const pending = this.pending;
    const count = this.pendingCount;
    this.pendingCount = 0;
    const table = this.table;
    const mask = (table.length >> 2) - 1;
    let touched = 0;
    for (let i = 0; i < count; i++) {
      const q = PENDING * i;
      if (pending[q + 7] === 0) touched += table[4 * (pending[q + 2] & mask)];
      touched += table[4 * (pending[q + 5] & mask)];
    }
    const bytes = this.idBytes;
    for (let i = 0; i < count; i++) {
      const hash = pending[PENDING * i + 5];
      for (let h = hash & mask; table[4 * h] !== 0; h = (h + 1) & mask) {
        if (table[4 * h + 1] === hash) {
          touched += bytes[table[4 * h + 2] >>> 0];
          break;
        }
      }
    }
    this.touched += touched;
    const line = this.line;
    for (let i = 0; i < count; i++) {
      const q = PENDING * i;
      this.line = pending[q + 6];
      this.hashedEdge(
        buf,
        view,
        pending[q],
        pending[q + 1],
        pending[q + 2],
        pending[q + 3],
        pending[q + 4],
        pending[q + 5],
        pending[q + 7] === 1,
      );
    }
    this.line = line;
  }

  private readLine(buf: Uint8Array, view: DataView, s: number, e: number): void {
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
        this.node(buf, view, s, e, s);
        return;
      }
      const t2 = indexIn(buf, TAB, t1 + 1, e);
      if (t2 !== -1) throw this.tooMany(s, t2 + 1);
      if (t1 === s || t1 + 1 === e) throw this.emptyId(s, t1 === s ? s : t1 + 1);
      this.edge(buf, view, s, t1, t1 + 1, e);
      return;
    }
    while (a < e && (buf[a] === SPACE || buf[a] === TAB)) a++;
    if (a === e) return;
    let b = a;
    while (b < e && buf[b] !== SPACE && buf[b] !== TAB) b++;
    let c = b;
    while (c < e && (buf[c] === SPACE || buf[c] === TAB)) c++;
    if (c === e) {
      this.node(buf, view, a, b, s);
      return;
    }
    let d = c;
    while (d < e && buf[d] !== SPACE && buf[d] !== TAB) d++;
    let f = d;
    while (f < e && (buf[f] === SPACE || buf[f] === TAB)) f++;
    if (f < e) throw this.tooMany(s, f);
    this.edge(buf, view, a, b, c, d);
  }

  private node(buf: Uint8Array, view: DataView, s: number, e: number, lineStart: number): void {
    if (s === e) throw this.emptyId(lineStart, s);
    this.idOf(buf, view, s, e, idHash(view, s, e, ID_SEED));
  }

  private edge(buf: Uint8Array, view: DataView, ps: number, pe: number, cs: number, ce: number): void {
    this.hashedEdge(
      buf,
      view,
      ps,
      pe,
      idHash(view, ps, pe, ID_SEED),
      cs,
      ce,
      idHash(view, cs, ce, ID_SEED),
      false,
    );
  }

  /**
   * The edge from id `buf[ps, pe)` (hash `hp`) to id `buf[cs, ce)` (hash `hc`); `sameParent`: the
   * parent is known to be that of the edge entered just before.
   */
  private hashedEdge(
    buf: Uint8Array,
    view: DataView,
    ps: number,
    pe: number,
    hp: number,
    cs: number,
    ce: number,
    hc: number,
    sameParent: boolean,
  ): void {
    // Edge lists usually list a parent's children together: the same parent as the line before costs a
    // byte comparison, not a lookup.
    const last = this.lastParent;
    const p =
      sameParent ||
      (last !== -1 &&
        hp === this.lastHash &&
        this.sameId(this.idStart[last], this.idSize[last], view, ps, pe))
        ? last
        : this.idOf(buf, view, ps, pe, hp);
    this.lastParent = p;
    this.lastHash = hp;
    const c = this.idOf(buf, view, cs, ce, hc);
    const k = this.edges;
    if (k === this.from.length) this.moreEdges();
    this.from[k] = p;
    this.to[k] = c;
    this.edgeLine[k] = this.line;
    this.edges = k + 1;
  }

  /**
   * Longer edge arrays: twice as long, or, when the input's length is known, as long as its lines are
   * likely to be (its bytes over the bytes per line of the pieces read so far, plus 5%), between twice and 16 times as
   * long: each growth allocates and copies, and fresh memory costs its first touch, so a graph of
   * millions of edges grows two or three times rather than a dozen (a line much longer than those
   * before only makes the next growth come sooner).
   */
  private moreEdges(): void {
    const now = this.from.length;
    let length = 2 * now;
    const total = this.options.inputBytes;
    if (total !== undefined && this.linesDone > 0) {
      const likely = Math.ceil(((total / this.bytesDone) * this.linesDone * 21) / 20);
      length = Math.min(16 * now, Math.max(length, likely));
    }
    this.from = longer(this.from, length);
    this.to = longer(this.to, length);
    this.edgeLine = longer(this.edgeLine, length);
  }

  /** The node with the id `buf[s, e)` (`hash`: its {@link idHash} from ID_SEED), added on first sight. */
  private idOf(buf: Uint8Array, view: DataView, s: number, e: number, hash: number): number {
    const table = this.table;
    const mask = (table.length >> 2) - 1;
    let h = hash & mask;
    for (let slot = table[4 * h]; slot !== 0; slot = table[4 * h]) {
      if (table[4 * h + 1] === hash && this.sameId(table[4 * h + 2] >>> 0, table[4 * h + 3], view, s, e))
        return slot - 1;
      h = (h + 1) & mask;
    }
    const node = this.count;
    if (node >= this.options.maxNodes) throw limitExceeded(this.options.maxNodes, false, this.line);
    const at = this.kept(buf, s, e);
    if (node === this.idStart.length) {
      this.idStart = grownU32(this.idStart);
      this.idSize = grownU32(this.idSize);
      this.origin = doubled(this.origin);
    }
    this.idStart[node] = at;
    this.idSize[node] = e - s;
    this.origin[node] = this.line;
    table[4 * h] = node + 1;
    table[4 * h + 1] = hash;
    table[4 * h + 2] = at;
    table[4 * h + 3] = e - s;
    this.count = node + 1;
    if (this.count * 8 > table.length) this.table = this.grown();
    return node;
  }

  /** Whether the kept id at `at` (`size` bytes) is spelled by `buf[s, e)`. */
  private sameId(at: number, size: number, view: DataView, s: number, e: number): boolean {
    return size === e - s && sameBytes(this.idView, at, view, s, size);
  }

  /** Appends the bytes `buf[s, e)` to the kept ids; where they start. */
  private kept(buf: Uint8Array, s: number, e: number): number {
    const n = e - s;
    const at = this.used;
    if (at + n > this.idBytes.length) {
      if (at + n > LONGEST_IDS) {
        throw new EspalierError(
          "LIMIT_EXCEEDED",
          "the ids of the edge list take more than 4 GiB; load a smaller part of it",
        );
      }
      const grown = Buffer.allocUnsafe(Math.min(LONGEST_IDS, Math.max(at + n, this.idBytes.length * 2)));
      this.idBytes.copy(grown, 0, 0, at);
      this.idBytes = grown;
      this.idView = viewOf(grown);
    }
    const bytes = this.idBytes;
    // A loop, not set(buf.subarray(...)): an id is short, and a view object per id costs more.
    if (n <= 64) for (let k = 0; k < n; k++) bytes[at + k] = buf[s + k];
    else bytes.set(buf.subarray(s, e), at);
    this.used = at + n;
    return at;
  }

  /** The table with twice the places, every id entered again by its hash. */
  private grown(): Int32Array {
    const old = this.table;
    const table = new Int32Array(old.length * 2);
    const mask = (table.length >> 2) - 1;
    for (let q = 0; q < old.length; q += 4) {
      if (old[q] === 0) continue;
      let h = old[q + 1] & mask;
      while (table[4 * h] !== 0) h = (h + 1) & mask;
      table[4 * h] = old[q];
      table[4 * h + 1] = old[q + 1];
      table[4 * h + 2] = old[q + 2];
      table[4 * h + 3] = old[q + 3];
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
    // No line held two ids, and the first holds a comma: a CSV edge table whose header names its columns
    // otherwise (`from,to`), which would read as lone nodes, one a line, with exit 0.
    const first = this.idBytes.subarray(this.idStart[0], this.idStart[0] + this.idSize[0]);
    if (this.edges === 0 && first.includes(0x2c))
      throw new EspalierError(
        "PARSE_CSV",
        say`no line holds two ids separated by spaces or a tab, and the first, ${quoted.value(first.toString("utf8", 0, 120))}, holds commas: a CSV edge table's first line names its parent and child columns ("parent" and "child", or those --parent-field and --child-field name)`,
        { line: this.origin[0], column: 1 },
      );
    const notUtf8 = this.notUtf8Ids();
    const ids = NamePool.fromParts({
      length: n,
      bytes: this.idBytes.subarray(0, this.used),
      start: this.idStart,
      size: this.idSize,
      exact: [],
    });
    // The ids are found no more: the table's memory is the build's, given once (GraphNodes.takeSpare).
    let spare: Int32Array | undefined = this.table;
    this.table = new Int32Array(0);
    return {
      name: ids,
      ids,
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
      linkedBy: "pairs",
      takeSpare: () => {
        const given = spare;
        spare = undefined;
        return given;
      },
      ...(notUtf8 ? { notes: [notUtf8] } : {}),
    };
  }

  /**
   * UNDECODABLE_BYTES when ids hold bytes that are not UTF-8: their names read each bad sequence as
   * U+FFFD, so two ids that differ only there print alike (they stay two nodes: ids are found by their
   * bytes). One look at the ids once read, none per line; ids all ASCII end it at once.
   */
  private notUtf8Ids(): ReadingNote | undefined {
    const bytes = this.idBytes;
    if (isAscii(bytes.subarray(0, this.used))) return undefined;
    let count = 0;
    let line = 0;
    for (let i = 0; i < this.count; i++) {
      const start = this.idStart[i];
      if (wellFormedUtf8(bytes, start, start + this.idSize[i])) continue;
      count++;
      if (line === 0 || this.origin[i] < line) line = this.origin[i];
    }
    return count === 0 ? undefined : notUtf8Note("id", count, line);
  }
}

/** An Int32Array of `length` with the same prefix. */
function longer(a: Int32Array, length: number): Int32Array<ArrayBuffer> {
  const grown = new Int32Array(length);
  grown.set(a);
  return grown;
}

function grownU32(a: Uint32Array): Uint32Array<ArrayBuffer> {
  const grown = new Uint32Array(a.length * 2);
  grown.set(a);
  return grown;
}

/** An edge list held as text (see {@link EdgeListReader}). */
export function loadEdgeList(text: string, options: Pick<LoadOptions, "maxNodes" | "rootName">): GraphNodes {
  const reader = new EdgeListReader(options);
  const bytes = Buffer.from(text, "utf8");
  reader.lines(bytes, 0, bytes.length);
  return reader.finish();
}

/** A DataView of the bytes `buf` shows. */
function viewOf(buf: Uint8Array): DataView {
  return new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
}

/** With tabs: the end of an id at `k`, the first tab, "\n" or CR in `[k, e)` (or `e`). */
function tabIdEnd(view: DataView, k: number, e: number): number {
  for (;;) {
    k = firstBelow(view, k, e, CR + 1);
    if (k === e) return e;
    const c = view.getUint8(k);
    if (c === TAB || c === LF || c === CR) return k;
    k++;
  }
}

function indexIn(buf: Uint8Array, byte: number, s: number, e: number): number {
  for (let k = s; k < e; k++) if (buf[k] === byte) return k;
  return -1;
}
