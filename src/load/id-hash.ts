// The byte work of the edge-list reader, four bytes at a time: where an id ends, its hash, and whether
// two ids are the same bytes. Each reads 32-bit little-endian words through a DataView (one load a
// word, where four byte loads would be four) and finishes the last bytes one by one, never reading
// past the range it is given.
//
// The hash is MurmurHash3, its 32-bit x86 variant (Austin Appleby, public domain, as published with
// SMHasher). Written out here rather than taken from a package: the reader hashes a range of the
// buffer it is reading, millions of times, and a package call would want the id as a string or a view
// of its own, which is the cost this exists to spare (FNV-1a, a multiply per byte, and byte-by-byte
// scans were most of the reader's parsing: in a one-off measurement on the bench's 3M-line graph,
// scanning and hashing took 0.14 s this way, 0.24 to 0.40 s byte by byte).

const C1 = 0xcc9e2d51;
const C2 = 0x1b873593;

/** MurmurHash3_x86_32 of the bytes `[s, e)` of `view`, with `seed`, as a signed 32-bit number. */
export function idHash(view: DataView, s: number, e: number, seed: number): number {
  let h = seed | 0;
  let k = s;
  for (const last = e - 3; k < last; k += 4) {
    let w = view.getInt32(k, true);
    w = Math.imul(w, C1);
    w = (w << 15) | (w >>> 17);
    h ^= Math.imul(w, C2);
    h = (h << 13) | (h >>> 19);
    h = (Math.imul(h, 5) + 0xe6546b64) | 0;
  }
  const rest = e - k;
  if (rest > 0) {
    let w = view.getUint8(k);
    if (rest > 1) w |= view.getUint8(k + 1) << 8;
    if (rest > 2) w |= view.getUint8(k + 2) << 16;
    w = Math.imul(w, C1);
    w = (w << 15) | (w >>> 17);
    h ^= Math.imul(w, C2);
  }
  h ^= e - s;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  return h ^ (h >>> 16);
}

/**
 * The first position in `[k, e)` of `view` holding a byte below `limit` (at most 0x80), or `e`. A word
 * at a time: (w - limit·0x01010101) & ~w & 0x80808080 marks, in its lowest marked byte, exactly the
 * first byte of w below `limit` (the borrow of a subtraction runs only upwards, so only bytes above
 * the first such byte can be marked wrongly); the test "has a byte less than n" of Anderson's Bit
 * Twiddling Hacks (Stanford, public domain).
 */
export function firstBelow(view: DataView, k: number, e: number, limit: number): number {
  const ones = Math.imul(limit, 0x01010101);
  for (; k + 4 <= e; k += 4) {
    const w = view.getInt32(k, true);
    const marked = (w - ones) & ~w & 0x80808080;
    if (marked !== 0) return k + ((31 - Math.clz32(marked & -marked)) >>> 3);
  }
  for (; k < e; k++) if (view.getUint8(k) < limit) return k;
  return e;
}

/** Whether the `n` bytes of `a` at `i` are those of `b` at `j`. */
export function sameBytes(a: DataView, i: number, b: DataView, j: number, n: number): boolean {
  let d = 0;
  for (; d + 4 <= n; d += 4) if (a.getInt32(i + d, true) !== b.getInt32(j + d, true)) return false;
  for (; d < n; d++) if (a.getUint8(i + d) !== b.getUint8(j + d)) return false;
  return true;
}
