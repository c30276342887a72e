import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../src/errors.js";
import { compilePattern, NameSearch } from "../../src/explore/search.js";
import { matchGlob } from "../../src/focus/glob.js";
import { measure } from "../../src/model/measure.js";
import { namesToArray } from "../../src/model/names.js";
import { pseudonym } from "../../src/model/pseudonym.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTree } from "../helpers/random-tree.js";

const below = (n: number) => [...Array(n).keys()].slice(1);

describe("NameSearch.find(query)", () => {
  it("finds the nodes whose names contain the query, letters A-Z matching a-z", () => {
    const tree = makeTree("R{Alpha{beta,GAMMA},alphabet,zeta}");
    const search = new NameSearch(tree, measure(tree));
    const names = (q: string) => [...search.find(q)].map((i) => tree.name.get(i));
    expect(names("alpha")).toEqual(["Alpha", "alphabet"]);
    expect(names("ETA")).toEqual(["beta", "zeta"]);
    expect(names("MM")).toEqual(["GAMMA"]);
    expect(names("x")).toEqual([]);
    expect(search.find("").length).toBe(0);
  });

  it("agrees with a plain substring filter over the decoded names, on random trees", () => {
    fc.assert(
      fc.property(arbTree(50), fc.constantFrom("a", "b", "d~", "e/f", "g h", " ", "~", "/"), (tree, q) => {
        if (q.includes("/") || q === "~" || q.includes("~")) return; // patterns, tested below
        const search = new NameSearch(tree, measure(tree));
        const names = namesToArray(tree.name);
        const want = below(tree.length).filter((i) => names[i].toLowerCase().includes(q.toLowerCase()));
        expect([...search.find(q)]).toEqual(want);
      }),
    );
  });

  it("reads a query with / as the focus globs read it, and one with * alone as **/ before it", () => {
    // The reference is the --focus glob matcher (src/focus/glob.ts); the names here have no A-Z, so
    // the search's case folding cannot make a difference.
    fc.assert(
      fc.property(
        arbTree(50),
        fc.constantFrom(
          "*",
          "a*",
          "*~1*",
          "**/a",
          "a/*",
          "*/b",
          "**/d~0",
          "**/e~1f",
          "**/g*",
          "*/**/c",
          "**",
          "a/**/b",
          "**/*~0*",
        ),
        (tree, pattern) => {
          const m = measure(tree);
          const search = new NameSearch(tree, m);
          const glob = pattern.includes("/") ? pattern : `**/${pattern}`;
          const want = matchGlob(tree, m, glob).filter((i) => i !== 0);
          expect([...search.find(pattern)]).toEqual(want);
        },
      ),
    );
  });

  it("refuses a ~ not followed by 0 or 1, as a focus path does (RFC 6901 escaping)", () => {
    for (const q of ["**/x~", "**/x~2", "a~b"]) {
      expect(() => compilePattern(q)).toThrow(EspalierError);
      try {
        compilePattern(q);
      } catch (err) {
        expect((err as EspalierError).code).toBe("FOCUS_SYNTAX");
      }
    }
    expect(compilePattern("**/a~0")).not.toBeNull();
    // A trailing "/" waits for the next level: "a/" searches as "a" until more is typed.
    expect(compilePattern("services/")?.query).toBe("services");
    expect(compilePattern("/")).toBeNull();
  });

  it("finds the next and previous match from any node, and counts matches in any range of nodes", () => {
    fc.assert(
      fc.property(
        arbTree(50),
        fc.constantFrom("a", "b", "g h", "*", "**/c", "a/*", "d~0", "e~1f"),
        fc.nat(),
        (tree, q, x) => {
          const search = new NameSearch(tree, measure(tree));
          const pattern = compilePattern(q)!;
          const all = [...search.find(q)];
          const from = x % tree.length;
          expect(search.next(pattern, from, 1)).toBe(all.find((i) => i > from) ?? -1);
          expect(search.next(pattern, from, -1)).toBe([...all].reverse().find((i) => i < from) ?? -1);
          // Bounded: forwards stop before `until`, backwards after it.
          expect(search.next(pattern, 0, 1, from)).toBe(all.find((i) => i < from) ?? -1);
          expect(search.next(pattern, tree.length, -1, from)).toBe(
            [...all].reverse().find((i) => i > from) ?? -1,
          );
          const to = from + ((x >> 3) % (tree.length - from + 1));
          expect(search.countIn(pattern, from, to)).toBe(all.filter((i) => i >= from && i < to).length);
        },
      ),
    );
  });

  it("with a pseudonym key, matches the pseudonyms only, and only the names hashed so far", () => {
    const tree = makeTree("R{Rosa,Arjun{Talia},Esme}");
    const key = "secret-for-tests";
    const search = new NameSearch(tree, measure(tree), key);
    // Nothing is searchable until hashed; a real name never matches.
    expect(search.find("anon").length).toBe(0);
    expect(search.advance(2)).toBe(false);
    expect(search.progress).toBeCloseTo(2 / 5);
    expect(search.searchable).toBe(2);
    expect(search.find("anon").length).toBe(1);
    expect(search.advance(100)).toBe(true);
    expect(search.find("Rosa").length).toBe(0);
    expect(search.find("ro").length).toBe(0);
    const talia = pseudonym(key, "Talia"); // HMAC-SHA-256 keyed pseudonym, as every output prints it
    expect([...search.find(talia.slice(5, 13))]).toEqual([3]);
    expect([...search.find(`*/${talia}`)]).toEqual([3]);
    expect(search.find("anon-").length).toBe(4);
  });
});
