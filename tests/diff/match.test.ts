import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { combineListing } from "../../src/diff/combine.js";
import { matchTreesListing } from "../../src/diff/match.js";
import { subtreeCounts } from "../../src/diff/subtree-counts.js";
import { NamePool, namesToArray } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";
import { arbEdited, withoutIds } from "./edit-script.js";

/**
 * The tree with its ids as a pool of bytes (as a table's reader keeps them), each id's UTF-8 bytes but
 * for those `odd` picks: their last byte replaced by `odd`'s byte, which is no UTF-8 and decodes as
 * U+FFFD (the WHATWG decoder's replacement, as Buffer's "utf8" decoding does). Two such ids of
 * different bytes are then the same text.
 */
function pooledIds(tree: Tree, odd: (id: string) => number | null): Tree {
  const texts = namesToArray(tree.ids!);
  const pool = new NamePool(texts.length, 16);
  pool.setLength(texts.length);
  texts.forEach((text, i) => {
    const bytes = Buffer.from(text, "utf8");
    const byte = text === "" ? null : odd(text);
    const spelled = byte === null ? bytes : Buffer.concat([bytes, Buffer.from([byte])]);
    pool.setBytes(i, spelled, 0, spelled.length);
  });
  return { ...tree, ids: pool };
}

/** Every two nodes (roots aside) whose ids are the same text, paired: the matching by id, from its rule. */
function pairsByText(oldTree: Tree, newTree: Tree): { oldToNew: number[]; newToOld: number[] } {
  const oldIds = namesToArray(oldTree.ids!);
  const newIds = namesToArray(newTree.ids!);
  const byText = new Map<string, number>();
  oldIds.forEach((id, o) => {
    if (o > 0 && id !== "") byText.set(id, o);
  });
  const oldToNew: number[] = oldIds.map((_, o) => (o === 0 ? 0 : -1));
  const newToOld = newIds.map((id, n) => {
    if (n === 0) return 0;
    const o = id === "" ? undefined : byText.get(id);
    if (o === undefined) return -1;
    oldToNew[o] = n;
    return o;
  });
  return { oldToNew, newToOld };
}

describe("matchTreesListing(old, oldCount, new, newCount)", () => {
  it("pairs ids of the same text whatever their bytes, and counts and places the old nodes left unmatched", () => {
    fc.assert(
      fc.property(
        arbEdited(40, 10),
        fc.array(fc.nat(), { maxLength: 6 }),
        fc.boolean(),
        (edited, picks, deep) => {
          // Some ids spelled with a byte that is no UTF-8, another one in each version (0xff old, 0xfe new).
          const ids = namesToArray(edited.oldTree.ids!);
          const odd = new Set(picks.map((p) => ids[p % ids.length]));
          const oldTree = pooledIds(edited.oldTree, (id) => (odd.has(id) ? 0xff : null));
          const newTree = pooledIds(edited.newTree, (id) => (odd.has(id) ? (deep ? 0xfe : 0xff) : null));
          const oldCount = subtreeCounts(oldTree);
          const newCount = subtreeCounts(newTree);
          const { matching, unmatched } = matchTreesListing(oldTree, oldCount, newTree, newCount);
          const expected = pairsByText(oldTree, newTree);
          expect(matching.by).toBe("id");
          expect([...matching.oldToNew]).toEqual(expected.oldToNew);
          expect([...matching.newToOld]).toEqual(expected.newToOld);
          const left = expected.oldToNew.flatMap((n, o) => (n < 0 ? [o] : []));
          expect(unmatched.count).toBe(left.length);
          const ranges = unmatched.ranges!;
          for (const o of left)
            expect(ranges.some((_, r) => r % 2 === 0 && ranges[r] <= o && o < ranges[r + 1])).toBe(true);
        },
      ),
    );
  });

  it("counts the old nodes left unmatched by path", () => {
    fc.assert(
      fc.property(arbEdited(40, 10), (edited) => {
        const [oldTree, newTree] = withoutIds(edited);
        const { matching, unmatched } = matchTreesListing(
          oldTree,
          subtreeCounts(oldTree),
          newTree,
          subtreeCounts(newTree),
        );
        expect(unmatched.count).toBe([...matching.oldToNew].filter((n) => n < 0).length);
        expect(unmatched.ranges).toBeNull();
      }),
    );
  });
});

/**
 * The tree with its names as a pool of bytes, each name spelled by `spell` (its UTF-8 bytes, or others
 * that decode to another text or the same one).
 */
function pooledNames(tree: Tree, spell: (name: string) => Uint8Array): Tree {
  const texts = namesToArray(tree.name);
  const pool = new NamePool(texts.length, 16);
  pool.setLength(texts.length);
  texts.forEach((text, i) => {
    const bytes = spell(text);
    pool.setBytes(i, bytes, 0, bytes.length);
  });
  return { ...tree, name: pool };
}

/**
 * The matching by path from its rule, decoding every name: the roots pair, and under two paired nodes
 * the k-th child of a name (as text) pairs with the k-th child of that name on the other side.
 */
function pairsByPath(oldTree: Tree, newTree: Tree): { oldToNew: number[]; newToOld: number[] } {
  const childrenOf = (tree: Tree) => {
    const lists: number[][] = Array.from({ length: tree.length }, () => []);
    for (let i = 1; i < tree.length; i++) lists[tree.parent[i]].push(i);
    return lists;
  };
  const oldKids = childrenOf(oldTree);
  const newKids = childrenOf(newTree);
  const oldToNew = Array.from({ length: oldTree.length }, (_, o): number => (o === 0 ? 0 : -1));
  const newToOld = Array.from({ length: newTree.length }, (_, n): number => (n === 0 ? 0 : -1));
  const stack: [number, number][] = [[0, 0]];
  while (stack.length > 0) {
    const [o, n] = stack.pop()!;
    const waiting = new Map<string, number[]>();
    for (const c of oldKids[o])
      waiting.set(oldTree.name.get(c), [...(waiting.get(oldTree.name.get(c)) ?? []), c]);
    for (const c of newKids[n]) {
      const m = waiting.get(newTree.name.get(c))?.shift();
      if (m === undefined) continue;
      oldToNew[m] = c;
      newToOld[c] = m;
      stack.push([m, c]);
    }
  }
  return { oldToNew, newToOld };
}

describe("matchTreesListing(old, new) by path", () => {
  it("pairs the k-th child of a name with the k-th, whatever the names' bytes", () => {
    const utf8 = (text: string) => Buffer.from(text, "utf8");
    fc.assert(
      fc.property(
        arbEdited(60, 12),
        fc.array(fc.constantFrom<string>("a", "b", "c", "d~", "e/f", "", "g h"), { maxLength: 3 }),
        fc.array(fc.constantFrom<string>("a", "b", "c", "d~", "e/f", "g h"), { maxLength: 3 }),
        fc.boolean(),
        (edited, wide, odd, alike) => {
          const [plainOld, plainNew] = withoutIds(edited);
          // Some names beyond ASCII; some (`odd`) spelled with a last byte that is no UTF-8 and decodes
          // as U+FFFD, in NEW another such byte (`alike`: the same text of other bytes) or none.
          const text = (name: string) => (wide.includes(name) ? `${name}é日本` : name);
          const spell = (bad: number | null) => (name: string) =>
            odd.includes(name) && bad !== null
              ? Buffer.concat([utf8(text(name)), Buffer.from([bad])])
              : utf8(text(name));
          const oldTree = pooledNames(plainOld, spell(0xff));
          const newTree = pooledNames(plainNew, spell(alike ? 0xfe : null));
          const { matching } = matchTreesListing(
            oldTree,
            subtreeCounts(oldTree),
            newTree,
            subtreeCounts(newTree),
          );
          const expected = pairsByPath(oldTree, newTree);
          expect([...matching.oldToNew]).toEqual(expected.oldToNew);
          expect([...matching.newToOld]).toEqual(expected.newToOld);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("combineListing(old, oldCount, new, newCount, matching, compared, unmatched)", () => {
  it("lays out the same combined tree with the matcher's list of unmatched old nodes as without it", () => {
    fc.assert(
      fc.property(arbEdited(40, 10), fc.boolean(), (edited, byId) => {
        const [oldTree, newTree] = byId
          ? [pooledIds(edited.oldTree, () => null), pooledIds(edited.newTree, () => null)]
          : withoutIds(edited);
        const oldCount = subtreeCounts(oldTree);
        const newCount = subtreeCounts(newTree);
        const { matching, unmatched } = matchTreesListing(oldTree, oldCount, newTree, newCount);
        const listed = combineListing(oldTree, oldCount, newTree, newCount, matching, null, unmatched);
        const found = combineListing(oldTree, oldCount, newTree, newCount, matching, null);
        for (const key of ["newIndex", "oldIndex", "kind"] as const)
          expect([...listed.combined[key]]).toEqual([...found.combined[key]]);
        for (const key of ["parent", "depth", "ownSize"] as const)
          expect([...listed.combined.tree[key]]).toEqual([...found.combined.tree[key]]);
        expect([...listed.changed]).toEqual([...found.changed]);
      }),
    );
  });
});
