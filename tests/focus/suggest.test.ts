import fc from "fast-check";
import { distance } from "fastest-levenshtein";
import { describe, expect, it } from "vitest";
import { boundedDistance, distanceWork } from "../../src/focus/bounded-distance.js";
import { resolveFoci } from "../../src/focus/resolve.js";
import { editsAllowed, MAX_SUGGEST_WORK, suggestFoci } from "../../src/focus/suggest.js";
import { buildTree } from "../../src/model/build-tree.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import { printedNames } from "../../src/model/printed-names.js";
import { pseudonym } from "../../src/model/pseudonym.js";
import type { Tree } from "../../src/model/tree.js";
import { makeTree, nodeNamed } from "../helpers/make-tree.js";
import { caught } from "../load/helpers.js";

const indexOf = (tree: Tree) => new PathIndex(tree, measure(tree));
const suggest = (tree: Tree, spec: string) => {
  const index = indexOf(tree);
  return suggestFoci(index, spec, printedNames(tree, index, undefined));
};

// The tidewater monorepo (invented): two "src" folders far apart.
const repo = makeTree(
  "tidewater{libs{brackish-streams{src{index.ts}},ajv-shim{src}},services{ledger{src{book.ts},test},ledgers-archive{src}}}",
);

describe("boundedDistance(a, b, max)", () => {
  // The reference: fastest-levenshtein (npm), a general-purpose Levenshtein implementation.
  it("is min(Levenshtein distance, max + 1), as fastest-levenshtein computes it (property)", () => {
    const text = fc
      .array(fc.constantFrom("a", "b", "c", "\u00e9", "\u{1F600}"), { maxLength: 40 })
      .map((x) => x.join(""));
    fc.assert(
      fc.property(text, text, fc.integer({ min: 0, max: 45 }), (a, b, max) => {
        expect(boundedDistance(a, b, max)).toBe(Math.min(distance(a, b), max + 1));
      }),
      { numRuns: 3000 },
    );
  });

  it("compares only the first 128 code units of each text", () => {
    expect(boundedDistance(`${"a".repeat(128)}xyz`, "a".repeat(128), 5)).toBe(0);
  });
});

describe("suggestFoci(index, spec, view)", () => {
  it("ranks whole paths by edit distance: services/ledgr/src suggests services/ledger/src first", () => {
    const near = suggest(repo, "services/ledgr/src");
    expect(near[0]).toBe("services/ledger/src");
    expect(near).not.toContain("libs/brackish-streams/src");
  });

  it("offers candidates nearest first (distances by fastest-levenshtein, the library the ranking uses)", () => {
    const near = suggest(repo, "services/ledger/srx");
    expect(near.length).toBeGreaterThan(1);
    // Each suggestion's distance to the typed text never falls below an earlier one's.
    const d = near.map((s) => distance(s.toLowerCase(), "services/ledger/srx"));
    for (let k = 1; k < d.length; k++) expect(d[k]).toBeGreaterThanOrEqual(d[k - 1]);
    expect(near[0]).toBe("services/ledger/src");
  });

  it("breaks a tie in distance by the nearer length: vitset suggests vitest before vite", () => {
    // Both are 2 edits from "vitset" (fastest-levenshtein, the library the ranking is checked against);
    // "vite" comes first in the input, so input order alone would put it first.
    const deps = makeTree("tidewater{vite,vitest}");
    expect(distance("vitset", "vite")).toBe(2);
    expect(distance("vitset", "vitest")).toBe(2);
    expect(suggest(deps, "vitset")).toEqual(["vitest", "vite"]);
  });

  it("suggests nothing rather than something unrelated (**/chia is not ajv-shim)", () => {
    expect(suggest(repo, "**/chia")).toEqual([]);
    expect(suggest(repo, "quillfeather/payroll")).toEqual([]);
    expect(suggest(repo, "zzzzzzzz")).toEqual([]);
  });

  it("finds a node by its last segments when an ancestor is missing or wrong", () => {
    expect(suggest(repo, "ledger/src")[0]).toBe("services/ledger/src");
    expect(suggest(repo, "servics/ledger/src/book.ts")[0]).toBe("services/ledger/src/book.ts");
    expect(suggest(repo, "brackish-stream")[0]).toBe("libs/brackish-streams");
    expect(suggest(repo, "**/brackish-stream")[0]).toBe("libs/brackish-streams");
  });

  it("compares case-insensitively, ids too: q2417 suggests the id Q2417 before any person", () => {
    const t = buildTree({
      parentOf: Int32Array.from([-1, 0, 0, 1]),
      name: ["Rosa Istrian", "Q2417 Team", "Q2471x", "Marit Okonkwo-Lund"],
      ownSize: new Float64Array(4),
      hasSizes: false,
      ids: ["Q1", "Q2", "Q3", "Q2417"],
      origin: Int32Array.from([1, 2, 3, 4]),
      originIsRow: true,
      fields: new Map(),
      rootName: "(root)",
    });
    expect(suggest(t, "q2417")[0]).toBe("Q2417");
    expect(suggest(t, "SERVICES/LEDGER")).toEqual([]);
    expect(suggest(repo, "SERVICES/LEDGER")[0]).toBe("services/ledger");
  });

  it("accepts ./ and / before a spec, as find and RFC 6901 write paths", () => {
    expect(suggest(repo, "./services/ledgr")[0]).toBe("services/ledger");
    expect(suggest(repo, "/services/ledgr")[0]).toBe("services/ledger");
  });

  it("allows a third of the typed length in edits, at least one", () => {
    expect(editsAllowed(1)).toBe(1);
    expect(editsAllowed(4)).toBe(2);
    expect(editsAllowed(18)).toBe(6);
  });

  it("fills at most MAX_SUGGEST_WORK cells of distance tables (counted, not timed), here on a chain 100,000 deep", () => {
    const n = 100_000;
    const t = buildTree({
      parentOf: Int32Array.from({ length: n }, (_, i) => i - 1),
      name: Array.from({ length: n }, (_, i) => `n${i % 10}`),
      ownSize: new Float64Array(n),
      hasSizes: false,
      ids: null,
      origin: Int32Array.from({ length: n }, (_, i) => i + 1),
      originIsRow: false,
      fields: new Map(),
      rootName: "(root)",
    });
    const spec = Array.from({ length: 80 }, (_, i) => `n${(i + 1) % 10}`).join("/");
    for (const typed of [`${spec}x`, spec.replaceAll("n", "m"), "n1/n2/n4"]) {
      const before = distanceWork.cells;
      suggest(t, typed);
      // One comparison past the budget at most: 4 texts of 128 code units in a band of 2 * 128 + 1.
      expect(distanceWork.cells - before).toBeLessThanOrEqual(MAX_SUGGEST_WORK + 4 * 128 * 257);
    }
    expect(suggest(t, `${spec}x`)[0]).toBe(spec);
  });
});

describe("resolveFoci(index, specs) with foci that match nothing", () => {
  const index = indexOf(repo);

  it("accepts a ./ prefix on paths and globs", () => {
    expect([...resolveFoci(index, ["./services/ledger/src"])]).toEqual([nodeNamed(repo, "book.ts") - 1]);
    expect([...resolveFoci(index, ["./services/**/book.ts"])]).toEqual([nodeNamed(repo, "book.ts")]);
  });

  it("names the nearest foci in FOCUS_NO_MATCH", () => {
    const err = caught(() => resolveFoci(index, ["services/ledgr/src"]));
    expect(err.code).toBe("FOCUS_NO_MATCH");
    expect(err.details.suggestions).toContain("services/ledger/src");
  });

  it("with pseudonyms: does not repeat the typed focus and is no oracle for real names", () => {
    // Guessing real names (exactly, nearly, in other case) gets the same answer as guessing nonsense.
    const answers = new Set<string>();
    for (const guess of ["services/ledger/srcc", "Services/Ledgr", "ledger", "qqqqqq/zzzz"]) {
      const err = caught(() => resolveFoci(index, ["libs", guess], "k"));
      expect(err.code).toBe("FOCUS_NO_MATCH");
      expect(err.message).not.toContain(guess);
      expect(err.message).not.toMatch(/ledger|services|src/i);
      answers.add(err.message);
    }
    expect(answers.size).toBe(1);
  });

  it("with pseudonyms: a mistyped pseudonymous path suggests the pseudonymous path it was near", () => {
    const seg = (name: string) => pseudonym("k", name);
    const printed = `${seg("services")}/${seg("ledger")}`;
    const typo = `${printed.slice(0, -1)}x`;
    const err = caught(() => resolveFoci(index, [typo], "k"));
    expect(err.details.suggestions).toContain(printed);
    expect(err.message).not.toContain(typo);
    expect(err.message).not.toMatch(/ledger|services/);
  });
});
