import { mix } from "../model/child-hash.js";
import type { NamePool } from "../model/names.js";

/** Slots of a level's table when it is made or made again (3 numbers a slot). */
const SMALL = 64;

/**
 * The children of the folders on a path walk's stack, by level: level 0 holds the top-level names, level
 * k + 1 the children of the folder at depth k. A level is *whole* when its folder was made while at that
 * depth and has not left it since, so every child it has was made there and is in the level's table; a
 * folder the walk came back to after leaving it (the listing named something elsewhere in between) is
 * not whole, and its children must be found another way (`PathPlacer`'s table of every node).
 *
 * Listings keep each folder's entries together (`find`, `du -a`, `git ls-files`, an object store's
 * sorted keys), so nearly every name is looked up in a small table of its folder's children, which stays
 * in the processor's cache, where a table of every node is read at a random place for each new name (a
 * cache miss each, about 170 ns on the development machine; issue 14).
 *
 * A table's slot holds a node, its name's hash and the level's generation when written: giving the level
 * a new folder only moves the generation on, so a file (a folder with no children) costs nothing.
 */
export class OpenFolders {
  private tables: Int32Array[] = [];
  private generation = new Int32Array(0);
  private count = new Int32Array(0);
  private whole = new Uint8Array(0);
  /** The empty slot the last {@link find} that found nothing ended on. */
  private free = 0;

  constructor() {
    this.reach(64);
    // The top level's folder (above every top-level name) is there from the start, holding nothing.
    this.whole[0] = 1;
  }

  /** Whether level `k`'s table holds every child of its folder. */
  isWhole(k: number): boolean {
    return this.whole[k] === 1;
  }

  /**
   * The child named `bytes[s, e)` (hash `hash`, names in `keys`) in level `k`'s table, or -1; after -1,
   * {@link add} puts a node in the slot it ended on.
   */
  find(k: number, hash: number, keys: NamePool, bytes: Uint8Array, s: number, e: number): number {
    const table = this.tables[k];
    const g = this.generation[k];
    const mask = table.length / 3 - 1;
    for (let h = mix(hash) & mask; ; h = (h + 1) & mask) {
      const at = 3 * h;
      if (table[at + 2] !== g) {
        this.free = h;
        return -1;
      }
      if (table[at + 1] === hash && keys.equalsBytes(table[at], bytes, s, e)) return table[at];
    }
  }

  /** Adds `node` (hash `hash`) to level `k`, in the slot the last {@link find} there ended on. */
  add(k: number, node: number, hash: number): void {
    let table = this.tables[k];
    const at = 3 * this.free;
    table[at] = node;
    table[at + 1] = hash;
    table[at + 2] = this.generation[k];
    const count = ++this.count[k];
    // At most half the slots full.
    if (count * 6 > table.length) {
      table = grown(table, this.generation[k]);
      this.tables[k] = table;
    }
  }

  /**
   * Gives level `k` a new folder (the folder at depth `k - 1` changed): `whole` when it was just made, so
   * its children will all be added here; else its children are not known here.
   */
  open(k: number, whole: boolean): void {
    if (k >= this.tables.length) this.reach(2 * k);
    this.whole[k] = whole ? 1 : 0;
    if (this.count[k] === 0) return;
    const table = this.tables[k];
    // A table grown for a big folder is not kept for the next ones: a small one stays in the cache.
    if (table.length > 3 * SMALL && this.count[k] * 24 < table.length) {
      this.tables[k] = new Int32Array(3 * SMALL);
      this.generation[k] = 1;
    } else if (this.generation[k] === 0x7fffffff) {
      table.fill(0);
      this.generation[k] = 1;
    } else {
      this.generation[k]++;
    }
    this.count[k] = 0;
  }

  /** Makes levels up to `levels - 1`, each with an empty table, not whole. */
  private reach(levels: number): void {
    const had = this.tables.length;
    for (let k = had; k < levels; k++) this.tables.push(new Int32Array(3 * SMALL));
    const generation = new Int32Array(levels).fill(1);
    generation.set(this.generation);
    this.generation = generation;
    const count = new Int32Array(levels);
    count.set(this.count);
    this.count = count;
    const whole = new Uint8Array(levels);
    whole.set(this.whole);
    this.whole = whole;
  }
}

/** The table with twice the slots, holding its entries of generation `g`, still marked `g`. */
function grown(table: Int32Array, g: number): Int32Array {
  const out = new Int32Array(table.length * 2);
  const mask = out.length / 3 - 1;
  for (let at = 0; at < table.length; at += 3) {
    if (table[at + 2] !== g) continue;
    let h = mix(table[at + 1]) & mask;
    while (out[3 * h + 2] === g) h = (h + 1) & mask;
    out[3 * h] = table[at];
    out[3 * h + 1] = table[at + 1];
    out[3 * h + 2] = g;
  }
  return out;
}
