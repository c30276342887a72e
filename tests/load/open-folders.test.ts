import { describe, expect, it } from "vitest";
import { OpenFolders } from "../../src/load/open-folders.js";
import { hashBytes, seed } from "../../src/model/child-hash.js";
import { NamePool } from "../../src/model/names.js";

const bytesOf = (name: string) => Buffer.from(name, "utf8");

/** Names `n0`, `n1`, … in a pool, node k named `${prefix}${k}`. */
function named(count: number, prefix: string): NamePool {
  const pool = new NamePool();
  for (let k = 0; k < count; k++) pool.setString(k, `${prefix}${k}`);
  return pool;
}

/** Looks `name` up at level `k` (children of `parent`); adds it as `node` when missing. */
function findOrAdd(open: OpenFolders, keys: NamePool, k: number, parent: number, name: string, node: number) {
  const b = bytesOf(name);
  const hash = hashBytes(seed(parent), b, 0, b.length);
  const found = open.find(k, hash, keys, b, 0, b.length);
  if (found === -1) open.add(k, node, hash);
  return found;
}

describe("OpenFolders", () => {
  it("new OpenFolders() has a whole top level and no other whole level", () => {
    const open = new OpenFolders();
    expect(open.isWhole(0)).toBe(true);
    expect(open.isWhole(1)).toBe(false);
    open.open(1, true);
    expect(open.isWhole(1)).toBe(true);
    open.open(1, false);
    expect(open.isWhole(1)).toBe(false);
  });

  it("find(k, …) finds every child added to the level since it was opened, past growing its table", () => {
    const keys = named(5000, "n");
    const open = new OpenFolders();
    open.open(3, true);
    for (let k = 0; k < 5000; k++) expect(findOrAdd(open, keys, 3, 7, `n${k}`, k)).toBe(-1);
    for (let k = 0; k < 5000; k++) expect(findOrAdd(open, keys, 3, 7, `n${k}`, -1)).toBe(k);
    expect(findOrAdd(open, keys, 3, 7, "n5000", -1)).toBe(-1);
  });

  it("open(k, …) forgets the level's children, of a wide folder and of a narrow one, and leaves other levels", () => {
    const keys = named(3001, "n");
    const open = new OpenFolders();
    open.open(1, true);
    open.open(2, true);
    expect(findOrAdd(open, keys, 1, 0, "n0", 0)).toBe(-1);
    for (const count of [3000, 2, 0, 200, 1]) {
      for (let k = 1; k <= count; k++) expect(findOrAdd(open, keys, 2, 0, `n${k}`, k)).toBe(-1);
      for (let k = 1; k <= count; k++) expect(findOrAdd(open, keys, 2, 0, `n${k}`, -1)).toBe(k);
      open.open(2, true);
      for (let k = 1; k <= Math.min(count, 300); k++)
        expect(findOrAdd(open, keys, 2, 0, `n${k}`, k)).toBe(-1);
      open.open(2, true);
    }
    expect(findOrAdd(open, keys, 1, 0, "n0", -1)).toBe(0);
  });

  it("open(k, …) past the levels made so far makes more", () => {
    const keys = named(2, "n");
    const open = new OpenFolders();
    open.open(200, true);
    expect(open.isWhole(200)).toBe(true);
    expect(findOrAdd(open, keys, 200, 5, "n1", 1)).toBe(-1);
    expect(findOrAdd(open, keys, 200, 5, "n1", -1)).toBe(1);
  });
});
