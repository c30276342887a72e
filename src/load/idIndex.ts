/**
 * Rows by id, for linking a table: an open-addressing hash table of row numbers over the ids themselves,
 * sized once for the rows. Ten million ids take about 170 MB here, where a Map of strings takes
 * several times that.
 */
export class IdIndex {
  private readonly ids: string[];
  // slots[h] = row + 1, or 0 when empty; at most half full.
  private readonly slots: Int32Array;
  private readonly hashes: Int32Array;

  /** An index over `ids`, which `add` fills: ids[row] = id. Its length is the most rows there are. */
  constructor(ids: string[]) {
    let size = 16;
    while (size < 2 * ids.length) size *= 2;
    this.slots = new Int32Array(size);
    this.hashes = new Int32Array(ids.length);
    this.ids = ids;
  }

  /** Records `id` as the id of `row`; returns the earlier row with this id, or -1. */
  add(id: string, row: number): number {
    const hash = hashOf(id);
    const { slots, hashes, ids } = this;
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

  /** The row with this id, or -1. */
  get(id: string): number {
    const hash = hashOf(id);
    const { slots, hashes, ids } = this;
    const mask = slots.length - 1;
    let h = hash & mask;
    for (let slot = slots[h]; slot !== 0; slot = slots[h]) {
      if (hashes[slot - 1] === hash && ids[slot - 1] === id) return slot - 1;
      h = (h + 1) & mask;
    }
    return -1;
  }
}

/** FNV-1a over UTF-16 code units, high bits folded into the low ones that pick the slot. */
function hashOf(id: string): number {
  let hash = 0x811c9dc5;
  for (let k = 0; k < id.length; k++) hash = Math.imul(hash ^ id.charCodeAt(k), 0x01000193);
  return hash ^ (hash >>> 15);
}
