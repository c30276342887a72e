import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: one folder listed by GNU find in the ways its documentation gives (findutils manual,
// "-printf": %p is the file's name with the starting point, %P without it, so the starting point itself
// prints as an empty name; -mindepth 1 leaves the starting point out), of an invented harbour-ops
// checkout. Before, a diff of two such listings of the same folder read one root as a folder inside the
// other: every node removed and every node added.

const entries: [number, string][] = [
  [4096, ""],
  [4096, "berths"],
  [2310, "berths/north.yaml"],
  [1870, "berths/south.yaml"],
  [4096, "cranes"],
  [911, "cranes/gantry-7.json"],
  [404, "README"],
];
const listing = (
  prefix: string,
  keepStart: boolean,
  sizes: (path: string, size: number) => number = (_, s) => s,
) =>
  entries
    .filter(([, path]) => keepStart || path !== "")
    .map(([size, path]) => {
      const named = path === "" ? prefix.replace(/\/$/, "") : prefix + path;
      return `${sizes(path, size)}\t${named}\n`;
    })
    .join("");

const files = {
  "dot.tsv": listing("./", true), // find . -printf '%s\t%p\n'
  "rel.tsv": listing("", true), // find . -printf '%s\t%P\n' (the start as an empty name)
  "rel-nostart.tsv": listing("", false), // find . -mindepth 1 -printf '%s\t%P\n'
  "named.tsv": listing("harbour-ops/", true), // find harbour-ops -printf '%s\t%p\n'
  "abs.tsv": listing("/srv/harbour-ops/", true), // find /srv/harbour-ops -printf '%s\t%p\n'
};

async function diff(oldFile: string, newFile: string, extra: Record<string, string> = {}) {
  const r = await cli(["diff", oldFile, newFile, "--format", "json"], { files: { ...files, ...extra } });
  expect(r.code).toBe(0);
  return { doc: JSON.parse(r.stdout), stderr: r.stderr };
}

describe("two listings of one folder, one naming the folder and one not", () => {
  // Expected from the listings themselves: the same entries, so no node added, removed or renamed.
  const pairs: [string, string][] = [
    ["dot.tsv", "rel.tsv"],
    ["rel.tsv", "rel-nostart.tsv"],
    ["dot.tsv", "rel-nostart.tsv"],
    ["named.tsv", "rel.tsv"],
    ["rel-nostart.tsv", "named.tsv"],
    ["abs.tsv", "rel.tsv"],
    ["rel.tsv", "abs.tsv"],
  ];
  for (const [a, b] of pairs) {
    it(`${a} against ${b}: no node added, removed or renamed`, async () => {
      const { doc } = await diff(a, b);
      expect(doc.changes).toMatchObject({ added: 0, removed: 0, renamed: 0, moved: 0 });
      // The entries below the folder, and the folder: 7 nodes in each version.
      expect(doc.totals.old.nodes).toBe(entries.length);
      expect(doc.totals.new.nodes).toBe(entries.length);
    });
  }

  it("a list without the start's own line differs only in the root's own size (the folder's 4096)", async () => {
    const { doc } = await diff("rel.tsv", "rel-nostart.tsv");
    expect(doc.changes).toMatchObject({ resized: 1, edited: 0 });
    expect(doc.totals.old.size - doc.totals.new.size).toBe(4096);
  });

  it("says on standard error which folder of the named list was compared as the other's root", async () => {
    const named = await diff("named.tsv", "rel.tsv");
    expect(named.stderr).toBe(
      'espalier: note: named.tsv:1: its top folder "harbour-ops" is compared as the root of NEW (rel.tsv), which lists that folder\'s contents without its name [ROOT_IS_FOLDER]\n',
    );
    const abs = await diff("rel.tsv", "abs.tsv");
    expect(abs.stderr).toContain(
      'abs.tsv:1: read from "/srv/harbour-ops" down, compared as the root of OLD (rel.tsv), which lists that folder\'s contents without its path; the 2 folders above it are left out [ROOT_IS_FOLDER]',
    );
  });

  it("a changed file is still a change, and --fail-on-change sees it", async () => {
    const edited = {
      "abs-edited.tsv": listing("/srv/harbour-ops/", true, (p, s) => (p === "README" ? s + 10 : s)),
    };
    const { doc } = await diff("rel.tsv", "abs-edited.tsv", edited);
    expect(doc.changes).toMatchObject({ added: 0, removed: 0, resized: 1 });
    const r = await cli(["diff", "rel.tsv", "abs-edited.tsv", "--fail-on-change"], {
      files: { ...files, ...edited },
    });
    expect(r.code).toBe(1);
  });

  it("a list of one top folder beside a list of several keeps that folder as one of them", async () => {
    // Common practice, no source: harbour-ops/berths is the same path in both lists.
    const one = "harbour-ops/berths\nharbour-ops/cranes\n";
    const several = "harbour-ops/berths\ntug-fleet/engines\n";
    const { doc, stderr } = await diff("one.txt", "several.txt", { "one.txt": one, "several.txt": several });
    expect(stderr).toBe("");
    expect(doc.changes).toMatchObject({ added: 2, removed: 1, renamed: 0 });
  });
});

describe("two versions of which only one has sizes", () => {
  // `find DIR` prints paths only; `find DIR -printf '%s\t%P\n'` sizes too (findutils manual, -printf).
  const bare = entries
    .filter(([, path]) => path !== "")
    .map(([, path]) => `harbour-ops/${path}\n`)
    .join("");

  it("are compared without sizes, and a note says why: no node reads as resized from 0", async () => {
    const r = await cli(["diff", "bare.txt", "rel.tsv", "--format", "json"], {
      files: { ...files, "bare.txt": bare },
    });
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.changes).toMatchObject({ added: 0, removed: 0, resized: 0 });
    expect(doc.totals.old.size).toBe(0);
    expect(doc.totals.new.size).toBe(0);
    expect(r.stderr).toContain(
      "rel.tsv: its sizes are left out: OLD (bare.txt) has none, so no node is compared by size (give both versions sizes, or neither) [SIZES_LEFT_OUT]",
    );
    const exit = await cli(["diff", "rel.tsv", "bare.txt", "--fail-on-change"], {
      files: { ...files, "bare.txt": bare },
    });
    expect(exit.code).toBe(0);
  });
});

describe("a listing's folder compared as the other's root stays a name", () => {
  it("under --pseudonymize the folder's name prints as its pseudonym, never in clear", async () => {
    for (const [a, b] of [
      ["rel.tsv", "named.tsv"],
      ["named.tsv", "rel.tsv"],
      ["dot.tsv", "abs.tsv"],
    ]) {
      const r = await cli(["diff", a, b, "--pseudonymize", "--bare"], {
        files,
        env: { ESPALIER_PSEUDONYM_KEY: "harbour-test-key" },
      });
      expect(r.code).toBe(0);
      // Common practice, no source: a pseudonymized run prints no real name of the input.
      expect(r.stdout).not.toContain("harbour-ops");
      expect(r.stdout).not.toContain("berths");
      expect(r.stderr).not.toContain("harbour-ops");
    }
  });
});

describe("a focus copied from the list that names the folder", () => {
  it("names the node whichever version that list is (the folder's path in front is read as the root)", async () => {
    // GNU find (findutils manual, -printf %p) writes every path with the starting point in front.
    for (const [a, b] of [
      ["rel.tsv", "abs.tsv"],
      ["abs.tsv", "rel.tsv"],
    ]) {
      const r = await cli(
        ["diff", a, b, "--focus", "/srv/harbour-ops/berths/north.yaml", "--format", "json"],
        {
          files,
        },
      );
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).foci).toEqual(["berths/north.yaml"]);
    }
    const named = await cli(
      ["diff", "named.tsv", "rel.tsv", "--focus", "harbour-ops/cranes", "--format", "json"],
      {
        files,
      },
    );
    expect(JSON.parse(named.stdout).foci).toEqual(["cranes"]);
  });
});
