// The open-addressing table both path-list readers use to find a child by (parent, name): FNV-1a
// over the name's code units (UTF-16 units in the text reader, bytes in the byte reader), seeded with
// the parent's number; slots hold node + 1, 0 when empty.

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

/** A table twice the size of `slots` holding nodes 0..n-1 by their stored hashes. */
export function rehashed(slots: Int32Array, hashes: Int32Array, n: number): Int32Array<ArrayBuffer> {
  const grown = new Int32Array(slots.length * 2);
  const mask = grown.length - 1;
  for (let node = 0; node < n; node++) {
    let h = mix(hashes[node]) & mask;
    while (grown[h] !== 0) h = (h + 1) & mask;
    grown[h] = node + 1;
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
 * The table itself: `slots[h]` = node + 1 (0 when empty), at most half full, and each node's hash so a
 * rehash reads one array. Readers probe `slots` and `hashes` directly in their own loops (on text or on
 * bytes) and call {@link ChildTable.add} at the empty slot a probe ended on.
 */
export class ChildTable {
  slots = new Int32Array(2048);
  hashes = new Int32Array(1024);

  /** Records node `node` (the `count`-th node, numbered from 0) with `hash` in empty slot `h`. */
  add(node: number, hash: number, h: number, count: number): void {
    while (node >= this.hashes.length) this.hashes = doubled(this.hashes);
    this.hashes[node] = hash;
    this.slots[h] = node + 1;
    if (count * 2 > this.slots.length) this.slots = rehashed(this.slots, this.hashes, count);
  }
}

/** `hash` stepped over `bytes[s, e)`. */
export function hashBytes(hash: number, bytes: Uint8Array, s: number, e: number): number {
  for (let k = s; k < e; k++) hash = hashStep(hash, bytes[k]);
  return hash;
}
