/** Largest id kept by number: the direct table's size is bounded by the rows, not by this. */
const MAX_NUMBER = 0x7fffffff;

/**
 * Rows by id, for linking a table. An id is its text, but an id written as a plain whole number (digits
 * with no leading zero, below 2^31) is found by its value in a table indexed by that value, sized once
 * for the rows: no hashing, no string compared, and a parent cell kept as that number (csv-table.ts)
 * is looked up without being written out again. "12" and 12 are one id; "012" is another. Other ids
 * (and numbers too large for that table) go to an open-addressing hash table of row numbers over the
 * ids themselves, made on first use. Ten million ids take about 80 MB by number and 170 MB by hash,
 * where a Map of strings takes several times that.
 */
export class IdIndex {
  private readonly ids: string[];
  // byNumber[k] = row + 1 of the id k, or 0; ids of value >= byNumber.length go to the hash table.
  private readonly byNumber: Int32Array;
  // slots[h] = row + 1, or 0 when empty; at most half full.
  private slots: Int32Array | undefined;
  private hashes: Int32Array | undefined;

  /** An index over `ids`, which `add` fills: ids[row] = id. Its length is the most rows there are. */
  constructor(ids: string[]) {
    this.ids = ids;
    this.byNumber = new Int32Array(Math.min(MAX_NUMBER, 2 * ids.length + 16));
  }

  /** Records `id` as the id of `row`; returns the earlier row with this id, or -1. */
  add(id: string, row: number): number {
    const k = wholeNumber(id);
    if (k >= 0 && k < this.byNumber.length) {
      const earlier = this.byNumber[k] - 1;
      if (earlier !== -1) return earlier;
      this.byNumber[k] = row + 1;
      this.ids[row] = id;
      return -1;
    }
    const hash = hashOf(id);
    const slots = this.slots ?? this.makeTable();
    const hashes = this.hashes!;
    const ids = this.ids;
    const mask = slots.length - 1;
    let h = hash & mask;
    for (let slot = slots[h]; slot !== 0; slot = slots[h]) {
      if (hashes[slot - 1] === hash && ids[slot - 1] === id) return slot - 1;
      h = (h + 1) & mask;
    }
    slots[h] = row + 1;
    hashes[row] = hash;
    ids[row] = id;
    return -1;
  }

  /**
   * The row with this id, or -1. A number stands for its text (`String(id)`), as a table cell does, so
   * a cell kept as a number finds the row whose id is written with the same digits.
   */
  get(id: string | number): number {
    if (typeof id === "number") {
      if (Number.isInteger(id) && id >= 0 && id < this.byNumber.length) return this.byNumber[id] - 1;
      return this.getText(String(id));
    }
    return this.getText(id);
  }

  private getText(id: string): number {
    const k = wholeNumber(id);
    if (k >= 0 && k < this.byNumber.length) return this.byNumber[k] - 1;
    const { slots, hashes, ids } = this;
    if (slots === undefined || hashes === undefined) return -1;
    const hash = hashOf(id);
    const mask = slots.length - 1;
    let h = hash & mask;
    for (let slot = slots[h]; slot !== 0; slot = slots[h]) {
      if (hashes[slot - 1] === hash && ids[slot - 1] === id) return slot - 1;
      h = (h + 1) & mask;
    }
    return -1;
  }

  private makeTable(): Int32Array {
    let size = 16;
    while (size < 2 * this.ids.length) size *= 2;
    this.slots = new Int32Array(size);
    this.hashes = new Int32Array(this.ids.length);
    return this.slots;
  }
}

/** The value of an id written as a whole number below 2^31 with no leading zero ("0" is 0); else -1. */
function wholeNumber(id: string): number {
  const n = id.length;
  if (n === 0 || n > 10 || (n > 1 && id.charCodeAt(0) === 48)) return -1;
  let value = 0;
  for (let k = 0; k < n; k++) {
    const d = id.charCodeAt(k) - 48;
    if (d < 0 || d > 9) return -1;
    value = value * 10 + d;
  }
  return value <= MAX_NUMBER ? value : -1;
}

/** FNV-1a over UTF-16 code units, high bits folded into the low ones that pick the slot. */
function hashOf(id: string): number {
  let hash = 0x811c9dc5;
  for (let k = 0; k < id.length; k++) hash = Math.imul(hash ^ id.charCodeAt(k), 0x01000193);
  return hash ^ (hash >>> 15);
}
