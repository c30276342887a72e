import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { MergedNames, pooledBytes } from "../../src/model/merged-names.js";
import { indexOfName, NamePool, PrefixedNames, StringNames } from "../../src/model/names.js";

describe("MergedNames", () => {
  it("reads each node's name from the tree it came from, and finds the first node of a name as a list of them would (common practice, no source)", () => {
    const name = fc.constantFrom("", "a", "b", "é", "12", "日本");
    fc.assert(
      fc.property(
        fc.array(name, { maxLength: 12 }),
        fc.array(name, { minLength: 1, maxLength: 12 }),
        fc.array(fc.boolean(), { maxLength: 30 }),
        fc.boolean(),
        (newList, oldList, picks, prefixed) => {
          // A combined order: the new names in their order, old ones (each from anywhere) mixed in.
          const newIndex: number[] = [];
          const oldIndex: number[] = [];
          let next = 0;
          for (const [k, fromOld] of picks.entries()) {
            if (fromOld || next >= newList.length) {
              newIndex.push(-1);
              oldIndex.push(k % oldList.length);
            } else {
              newIndex.push(next++);
              oldIndex.push(-1);
            }
          }
          while (next < newList.length) {
            newIndex.push(next++);
            oldIndex.push(-1);
          }
          const fromNew = prefixed ? new PrefixedNames("", NamePool.from(newList)) : NamePool.from(newList);
          const newNames = prefixed ? ["", ...newList] : newList;
          if (prefixed) for (let k = 0; k < newIndex.length; k++) if (newIndex[k] >= 0) newIndex[k]++;
          const merged = new MergedNames(
            fromNew,
            Int32Array.from(newIndex),
            new StringNames(oldList),
            Int32Array.from(oldIndex),
          );
          const expected = newIndex.map((n, k) => (n >= 0 ? newNames[n] : oldList[oldIndex[k]]));
          expect(merged.length).toBe(expected.length);
          expect(Array.from({ length: merged.length }, (_, k) => merged.get(k))).toEqual(expected);
          for (const text of ["", "a", "b", "é", "12", "日本", "zz"]) {
            const first = text === "" ? -1 : expected.indexOf(text);
            expect(indexOfName(merged, text)).toBe(first);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("gives each name's UTF-8 bytes from the pool it came from (RFC 3629 encoding, as Buffer writes it), or null when a version keeps names as strings", () => {
    const name = fc.constantFrom("", "a", "b", "é", "12", "日本");
    fc.assert(
      fc.property(
        fc.array(name, { maxLength: 10 }),
        fc.array(name, { minLength: 1, maxLength: 10 }),
        fc.array(fc.nat(), { maxLength: 20 }),
        fc.boolean(),
        fc.boolean(),
        (newList, oldList, picks, prefixed, oldAsStrings) => {
          const newIndex = [...newList.keys()].map((n) => (prefixed ? n + 1 : n));
          const oldIndex = newList.map(() => -1);
          if (prefixed) {
            newIndex.unshift(0);
            oldIndex.unshift(-1);
          }
          for (const p of picks) {
            newIndex.push(-1);
            oldIndex.push(p % oldList.length);
          }
          const fromNew = prefixed
            ? new PrefixedNames("root é", NamePool.from(newList))
            : NamePool.from(newList);
          const fromOld = oldAsStrings ? new StringNames(oldList) : NamePool.from(oldList);
          const merged = new MergedNames(
            fromNew,
            Int32Array.from(newIndex),
            fromOld,
            Int32Array.from(oldIndex),
          );
          const bytesOf = pooledBytes(merged);
          if (oldAsStrings) {
            expect(bytesOf).toBeNull();
            return;
          }
          expect(bytesOf).not.toBeNull();
          for (let k = 0; k < merged.length; k++)
            expect(Buffer.from(bytesOf!(k)).toString("hex"), `name ${k}`).toBe(
              Buffer.from(merged.get(k), "utf8").toString("hex"),
            );
        },
      ),
      { numRuns: 200 },
    );
  });
});
