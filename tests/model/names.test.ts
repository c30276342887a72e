import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  copyName,
  indexOfName,
  isEmptyName,
  NamePool,
  namesToArray,
  PrefixedNames,
  StringNames,
  sameName,
} from "../../src/model/names.js";

const utf8 = (text: string) => new TextEncoder().encode(text);

describe("NamePool", () => {
  it("reads back every string it was given, set in any order and set again", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.nat(40), fc.string({ unit: "grapheme" })), { maxLength: 200 }),
        (sets) => {
          const pool = new NamePool(1, 16);
          const expected: string[] = [];
          for (const [i, text] of sets) {
            pool.setString(i, text);
            for (let k = expected.length; k < i; k++) expected[k] = "";
            expected[i] = text;
          }
          expect(pool.length).toBe(expected.length);
          for (let i = 0; i < expected.length; i++) expect(pool.get(i)).toBe(expected[i]);
        },
      ),
    );
  });

  it("keeps a lone surrogate as it was set (UTF-8 cannot carry it)", () => {
    // ECMA-262 String.prototype.isWellFormed: "\ud800" alone is not well formed; JSON's "\ud800" spells it.
    const pool = new NamePool();
    pool.setString(0, "a\ud800b");
    pool.setString(1, "\udfff");
    expect(pool.get(0)).toBe("a\ud800b");
    expect(pool.get(1)).toBe("\udfff");
    pool.setString(0, "plain");
    expect(pool.get(0)).toBe("plain");
  });

  it("decodes raw bytes as the WHATWG UTF-8 decoder does, invalid sequences included", () => {
    // Reference: TextDecoder (WHATWG Encoding Standard, "utf-8" decode with replacement).
    fc.assert(
      fc.property(fc.array(fc.uint8Array({ maxLength: 12 }), { maxLength: 30 }), (list) => {
        const pool = new NamePool(2, 16);
        list.forEach((bytes, i) => {
          pool.setBytes(i, bytes, 0, bytes.length);
        });
        list.forEach((bytes, i) => {
          expect(pool.get(i)).toBe(new TextDecoder().decode(bytes));
        });
      }),
    );
  });

  it("compares names by their text, across pools and kinds of storage", () => {
    const a = new NamePool();
    const b = new NamePool();
    a.setBytes(0, Uint8Array.of(0x61, 0xff), 0, 2); // "a\ufffd"
    b.setBytes(0, Uint8Array.of(0x61, 0xfe), 0, 2); // also "a\ufffd"
    a.setString(1, "Ærø");
    b.setBytes(1, utf8("Ærø"), 0, utf8("Ærø").length);
    a.setString(2, "x");
    b.setString(2, "y");
    for (let i = 0; i < 3; i++) expect(sameName(a, i, b, i)).toBe(a.get(i) === b.get(i));
    expect(sameName(a, 0, b, 0)).toBe(true);
    expect(sameName(new StringNames(["q"]), 0, b, 2)).toBe(false);
    expect(a.equalsBytes(1, utf8("Ærø"), 0, utf8("Ærø").length)).toBe(true);
    expect(a.equalsBytes(2, utf8("xx"), 0, 2)).toBe(false);
  });

  it("drops the names of truncated nodes and reorders without copying bytes", () => {
    const pool = new NamePool(1, 1024); // room to spare: appends after reordering must not need a bigger pool
    ["r", "a", "b", "c"].forEach((name, i) => {
      pool.setString(i, name);
    });
    pool.setLength(2);
    expect(namesToArray(pool)).toEqual(["r", "a"]);
    pool.setLength(3);
    expect(pool.get(2)).toBe("");
    pool.setString(2, "\ud800");
    pool.setString(3, "d");
    const moved = pool.reordered(Int32Array.of(-1, 3, 2, 0), "(root)");
    expect(namesToArray(moved)).toEqual(["(root)", "d", "\ud800", "r"]);
    expect(namesToArray(new PrefixedNames("top", moved))).toEqual(["top", "(root)", "d", "\ud800", "r"]);
    // The two pools share bytes: names set later in either never change the other's.
    pool.setString(0, "x");
    moved.setString(3, "later");
    expect(namesToArray(moved)).toEqual(["(root)", "d", "\ud800", "later"]);
    expect(pool.get(0)).toBe("x");
    expect(pool.get(3)).toBe("d");
    expect(namesToArray(pool.reordered(Int32Array.of(-1, 3), "x\udc00"))).toEqual(["x\udc00", "d"]);
  });

  it("finds a name by its text and tells the empty name, pooled or not", () => {
    const texts = ["", "emp-0042", "Ærø", "emp-0042", "a\ud800"];
    const pool = new NamePool(1, 16);
    texts.forEach((t, i) => {
      pool.setString(i, t);
    });
    for (const names of [pool, new StringNames(texts)]) {
      expect(indexOfName(names, "emp-0042")).toBe(1);
      expect(indexOfName(names, "Ærø")).toBe(2);
      expect(indexOfName(names, "a\ud800")).toBe(4);
      expect(indexOfName(names, "")).toBe(-1);
      expect(indexOfName(names, "emp-004")).toBe(-1);
      expect(texts.map((_, i) => isEmptyName(names, i))).toEqual([true, false, false, false, false]);
    }
  });

  it("finds a name by its bytes only where a whole name starts: not inside another, nor across two", () => {
    const pool = new NamePool(1, 16);
    ["xemp-0042", "ab", "cd", "bc", "emp-0042", "b"].forEach((t, i) => {
      pool.setString(i, t);
    });
    expect(indexOfName(pool, "emp-0042")).toBe(4); // also inside name 0
    expect(indexOfName(pool, "bc")).toBe(3); // also across names 1 and 2
    expect(indexOfName(pool, "b")).toBe(5);
    expect(indexOfName(pool, "abc")).toBe(-1);
    // A reordered pool shares the bytes: several nodes start at the same place; the first wins.
    const moved = pool.reordered(Int32Array.of(2, 4, -1, 4, 3), "emp-0042");
    expect(indexOfName(moved, "emp-0042")).toBe(1);
    expect(indexOfName(moved, "bc")).toBe(4);
    // A name found in more places than the search keeps: every name is compared.
    const many = new NamePool(1, 16);
    for (let i = 0; i < 200; i++) many.setString(i, `a${i % 7 === 0 ? "a" : "b"}`);
    many.setString(200, "a");
    expect(indexOfName(many, "a")).toBe(200);
    expect(indexOfName(many, "ab")).toBe(1);
  });

  it("finds the same name by bytes as comparing every name does (property)", () => {
    const name = fc.stringMatching(/^[abé]{0,4}$/);
    fc.assert(
      fc.property(fc.array(name, { maxLength: 120 }), name, (texts, target) => {
        const pool = new NamePool(1, 16);
        texts.forEach((t, i) => {
          pool.setString(i, t);
        });
        const expected = target === "" ? -1 : texts.indexOf(target);
        expect(indexOfName(pool, target)).toBe(expected);
      }),
    );
  });

  it("merges in another tree's names, copying only theirs, and never changes either pool", () => {
    const mine = new NamePool(1, 1024); // room to spare: the other names go in place
    ["r", "a", "b\ud800"].forEach((t, i) => {
      mine.setString(i, t);
    });
    const theirs = new NamePool(1, 64);
    ["R", "gone", "Ærø", "x\udc00"].forEach((t, i) => {
      theirs.setString(i, t);
    });
    const from = Int32Array.of(0, -1, 1, -1, 2, -1);
    const otherFrom = Int32Array.of(-1, 1, -1, 2, -1, 3);
    const merged = mine.mergedWith(from, theirs, otherFrom);
    expect(namesToArray(merged)).toEqual(["r", "gone", "a", "Ærø", "b\ud800", "x\udc00"]);
    // Through a tree put under a new root, as copyName reads it.
    const wrapped = mine.mergedWith(
      Int32Array.of(-1, 0),
      new PrefixedNames("top", theirs),
      Int32Array.of(2, 0),
    );
    expect(namesToArray(wrapped)).toEqual(["gone", "r"]);
    mine.setString(1, "later");
    merged.setString(0, "again");
    expect(namesToArray(mine)).toEqual(["r", "later", "b\ud800"]);
    expect(namesToArray(merged)).toEqual(["again", "gone", "a", "Ærø", "b\ud800", "x\udc00"]);
    expect(namesToArray(wrapped)).toEqual(["gone", "r"]);
    expect(namesToArray(theirs)).toEqual(["R", "gone", "Ærø", "x\udc00"]);
  });

  it("keeps every pool's names when pools share bytes and each goes on writing (property)", () => {
    // Model: a plain array of strings per pool. Pools made by reordered/mergedWith share bytes with
    // their source; whichever writes next, no other pool's names may change.
    const op = fc.oneof(
      fc.record({ kind: fc.constant("set" as const), pool: fc.nat(), i: fc.nat(12), text: fc.string() }),
      fc.record({
        kind: fc.constant("reorder" as const),
        pool: fc.nat(),
        from: fc.array(fc.integer({ min: -1, max: 12 }), { maxLength: 10 }),
        extra: fc.string(),
      }),
      fc.record({
        kind: fc.constant("merge" as const),
        pool: fc.nat(),
        other: fc.nat(),
        from: fc.array(fc.integer({ min: -1, max: 12 }), { maxLength: 10 }),
        otherFrom: fc.array(fc.nat(12), { minLength: 10, maxLength: 10 }),
      }),
    );
    fc.assert(
      fc.property(fc.nat(64), fc.array(op, { maxLength: 40 }), (room, ops) => {
        const first = new NamePool(1, 16 + room);
        first.setString(0, "root");
        const pools: NamePool[] = [first];
        const model: string[][] = [["root"]];
        for (const step of ops) {
          const p = step.pool % pools.length;
          const pool = pools[p];
          const names = model[p];
          if (step.kind === "set") {
            pool.setString(step.i, step.text);
            for (let k = names.length; k < step.i; k++) names[k] = "";
            names[step.i] = step.text;
          } else if (step.kind === "reorder") {
            const from = Int32Array.from(step.from, (i) => (i >= names.length ? -1 : i));
            pools.push(pool.reordered(from, step.extra));
            model.push([...from].map((i) => (i === -1 ? step.extra : names[i])));
          } else {
            const o = step.other % pools.length;
            const other = model[o];
            if (other.length === 0) continue;
            const from = Int32Array.from(step.from, (i) => (i >= names.length ? -1 : i));
            const otherFrom = Int32Array.from(step.otherFrom.slice(0, from.length), (i) => i % other.length);
            pools.push(pool.mergedWith(from, pools[o], otherFrom));
            model.push([...from].map((i, k) => (i === -1 ? other[otherFrom[k]] : names[i])));
          }
          pools.forEach((q, k) => {
            expect(namesToArray(q)).toEqual(model[k]);
          });
        }
      }),
    );
  });

  it("copies names between pools, through a new root, without changing their text", () => {
    const src = new NamePool(1, 64);
    ["root", "Ærø", "b\ud800", ""].forEach((t, i) => {
      src.setString(i, t);
    });
    const wrapped = new PrefixedNames("top", src);
    const out = new NamePool(1, 8);
    for (let i = 0; i < wrapped.length; i++) copyName(out, i, wrapped, i);
    copyName(out, 5, new StringNames(["x", "plain"]), 1);
    expect(namesToArray(out)).toEqual(["top", "root", "Ærø", "b\ud800", "", "plain"]);
  });
});
