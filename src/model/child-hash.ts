// The open-addressing table both path-list readers use to find a child by (parent, name): FNV-1a
// over the name's code units (UTF-16 units in the text reader, bytes in the byte reader), seeded with
// the parent's number; each slot holds node + 1 (0 when empty) and the node's hash side by side.

/** The starting hash of a child of `parent`. */
export function seed(parent: number): number {
  return Math.imul(parent + 1, 0x9e3779b1) ^ 0x811c9dc5;
}

/** One FNV-1a step over a code unit or byte. */
export function hashStep(hash: number, c: number): number {
  return Math.imul(hash ^ c, 0x01000193);
}

/** Spreads the high bits into the low ones, which pick the slot. */
export function mix(hash: number): number {
  return hash ^ (hash >>> 15);
}

/**
 * The table with twice the slots, holding the same nodes: the old slots are read in order, and each
 * node lands at (or just past) its old slot or that plus the old size, so both tables are read and
 * written almost in order. (Read in node order, as it was, a table of tens of millions of slots is
 * written at random, a cache and TLB miss a node: in a CPU profile the rehashes of a 10M-line listing
 * took 27 times those of 1M lines; issue 14.)
 */
export function rehashed(entries: Int32Array): Int32Array<ArrayBuffer> {
  const grown = new Int32Array(entries.length * 2);
  const mask = (grown.length >> 1) - 1;
  for (let i = 0; i < entries.length; i += 2) {
    const slot = entries[i];
    if (slot === 0) continue;
    const hash = entries[i + 1];
    let h = mix(hash) & mask;
    while (grown[2 * h] !== 0) h = (h + 1) & mask;
    grown[2 * h] = slot;
    grown[2 * h + 1] = hash;
  }
  return grown;
}

/** An Int32Array twice as long with the same prefix. */
export function doubled(a: Int32Array): Int32Array<ArrayBuffer> {
  const grown = new Int32Array(a.length * 2);
  grown.set(a);
  return grown;
}

/**
 * The table itself: slot `h` is `entries[2h]` = node + 1 (0 when empty) and `entries[2h + 1]` = its
 * hash, at most half the slots full. A probe reads a slot's node and hash from one place, so a slot
 * of another name costs no look at that node (no second cache miss). Readers probe `entries` directly
 * in their own loops (on text or on bytes) and call {@link ChildTable.add} at the empty slot a probe
 * ended on.
 */
export class ChildTable {
  entries = new Int32Array(4096);

  /** Records node `node` with `hash`, the table then holding `count` nodes. */
  insert(node: number, hash: number, count: number): void {
    const { entries } = this;
    const mask = (entries.length >> 1) - 1;
    let h = mix(hash) & mask;
    while (entries[2 * h] !== 0) h = (h + 1) & mask;
    this.add(node, hash, h, count);
  }

  /** Records node `node` with `hash` in empty slot `h`, the table then holding `count` nodes. */
  add(node: number, hash: number, h: number, count: number): void {
    this.entries[2 * h] = node + 1;
    this.entries[2 * h + 1] = hash;
    if (count * 4 > this.entries.length) this.entries = rehashed(this.entries);
  }
}

/** `hash` stepped over `bytes[s, e)`. */
export function hashBytes(hash: number, bytes: Uint8Array, s: number, e: number): number {
  for (let k = s; k < e; k++) hash = hashStep(hash, bytes[k]);
  return hash;
}
