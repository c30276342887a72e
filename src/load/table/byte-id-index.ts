import { idHash, sameBytes } from "../id-hash.js";

/** Largest id kept by number, as in IdIndex. */
const MAX_NUMBER = 0x7fffffff;
const SEED = 0x2545f491;

/** A pool's bytes with each row's start and byte length (NamePool.byteRuns). */
export interface ByteRuns {
  bytes: Uint8Array;
  start: Uint32Array;
  size: Uint32Array;
}

/**
 * Rows by id for a table whose ids are kept as bytes (a CSV table's id column in a name pool): the same
 * answers as {@link IdIndex} gives for the ids' text, with no string made per row. An id written as a
 * plain whole number below 2^31 (no leading zero) is found by its value in a table indexed by that value,
 * sized once for the rows; other ids (and larger numbers) go to an open-addressing hash table of row
 * numbers over the ids' bytes (MurmurHash3, id-hash.ts), made on first use. Two ids are one id when
 * their bytes are equal: the reader keeps an id's bytes as UTF-8 text (a cell that is no valid UTF-8 as
 * its decoded text), so equal bytes are equal text and the other way round.
 */
export class ByteIdIndex {
  private readonly bytes: Uint8Array;
  private readonly view: DataView;
  private readonly start: Uint32Array;
  private readonly size: Uint32Array;
  // byNumber[k] = row + 1 of the id k, or 0; ids of value >= byNumber.length go to the hash table.
  private readonly byNumber: Int32Array;
  // slots[h] = row + 1, or 0 when empty; at most half full.
  private slots: Int32Array | undefined;
  private hashes: Int32Array | undefined;
  private scratch = new Uint8Array(16);
  private scratchView = new DataView(this.scratch.buffer);

  /** An index over the ids of `rows` rows, which `add` fills row by row. */
  constructor(
    ids: ByteRuns,
    private readonly rows: number,
  ) {
    this.bytes = ids.bytes;
    this.view = viewOf(ids.bytes);
    this.start = ids.start;
    this.size = ids.size;
    this.byNumber = new Int32Array(Math.min(MAX_NUMBER, 2 * rows + 16));
  }

  /** Records the id of `row`; returns the earlier row with the same id, or -1. */
  add(row: number): number {
    const s = this.start[row];
    const e = s + this.size[row];
    const k = wholeNumber(this.bytes, s, e);
    if (k >= 0 && k < this.byNumber.length) {
      const earlier = this.byNumber[k] - 1;
      if (earlier !== -1) return earlier;
      this.byNumber[k] = row + 1;
      return -1;
    }
    const hash = idHash(this.view, s, e, SEED);
    const slots = this.slots ?? this.makeTable();
    const hashes = this.hashes!;
    const mask = slots.length - 1;
    let h = hash & mask;
    for (let slot = slots[h]; slot !== 0; slot = slots[h]) {
      if (hashes[slot - 1] === hash && this.isId(slot - 1, this.view, s, e)) return slot - 1;
      h = (h + 1) & mask;
    }
    slots[h] = row + 1;
    hashes[row] = hash;
    return -1;
  }

  /** The row whose id is written as the digits of `value` (a whole number from 0 to 10^15), or -1. */
  getNumber(value: number): number {
    if (value < this.byNumber.length) return this.byNumber[value] - 1;
    // Past the table by number: an id of these digits is in the hash table, by its bytes.
    let n = 0;
    for (let v = value; v >= 1; v = Math.floor(v / 10)) n++;
    if (n > this.scratch.length) return -1;
    for (let v = value, k = n - 1; k >= 0; k--, v = Math.floor(v / 10)) this.scratch[k] = 0x30 + (v % 10);
    return this.getBytes(this.scratchView, 0, n);
  }

  /** The row whose id is the bytes `[s, e)` of `view`, or -1. */
  getBytes(view: DataView, s: number, e: number): number {
    const k = wholeNumberIn(view, s, e);
    if (k >= 0 && k < this.byNumber.length) return this.byNumber[k] - 1;
    const { slots, hashes } = this;
    if (slots === undefined || hashes === undefined) return -1;
    const hash = idHash(view, s, e, SEED);
    const mask = slots.length - 1;
    let h = hash & mask;
    for (let slot = slots[h]; slot !== 0; slot = slots[h]) {
      if (hashes[slot - 1] === hash && this.isId(slot - 1, view, s, e)) return slot - 1;
      h = (h + 1) & mask;
    }
    return -1;
  }

  /** Whether row `row`'s id is the bytes `[s, e)` of `view`. */
  private isId(row: number, view: DataView, s: number, e: number): boolean {
    const n = this.size[row];
    return n === e - s && sameBytes(this.view, this.start[row], view, s, n);
  }

  private makeTable(): Int32Array {
    let size = 16;
    while (size < 2 * this.rows) size *= 2;
    this.slots = new Int32Array(size);
    this.hashes = new Int32Array(this.rows);
    return this.slots;
  }
}

/** A DataView over exactly the bytes of `bytes`. */
export function viewOf(bytes: Uint8Array): DataView {
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** The value of bytes `[s, e)` written as a whole number below 2^31 with no leading zero ("0" is 0); else -1. */
function wholeNumber(bytes: Uint8Array, s: number, e: number): number {
  const n = e - s;
  if (n === 0 || n > 10 || (n > 1 && bytes[s] === 0x30)) return -1;
  let value = 0;
  for (let k = s; k < e; k++) {
    const d = bytes[k] - 0x30;
    if (d < 0 || d > 9) return -1;
    value = value * 10 + d;
  }
  return value <= MAX_NUMBER ? value : -1;
}

/** {@link wholeNumber} of bytes read through a DataView. */
function wholeNumberIn(view: DataView, s: number, e: number): number {
  const n = e - s;
  if (n === 0 || n > 10 || (n > 1 && view.getUint8(s) === 0x30)) return -1;
  let value = 0;
  for (let k = s; k < e; k++) {
    const d = view.getUint8(k) - 0x30;
    if (d < 0 || d > 9) return -1;
    value = value * 10 + d;
  }
  return value <= MAX_NUMBER ? value : -1;
}
