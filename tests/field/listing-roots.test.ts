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

describe("two listings of one folder that both name it, at other paths", () => {
  // GNU find (findutils manual, -printf %p) writes every path with the starting point in front, so
  // `find harbour-ops`, `find /srv/harbour-ops` and `find /home/ci/harbour-ops` of one checkout differ
  // only in that front; -type f lists files only, so no line names a folder. Before, the roots' chains
  // parted above the folder ('harbour-ops' against '/', or '/srv' against '/home'): every node of one
  // removed and every node of the other added, exit 1 under --fail-on-change with nothing changed.
  const filesOnly = (prefix: string) =>
    entries
      .filter(([size, path]) => path !== "" && size !== 4096)
      .map(([size, path]) => `${size}\t${prefix}${path}\n`)
      .join("");
  const more = {
    "ci.tsv": listing("/home/ci/harbour-ops/", true), // find /home/ci/harbour-ops -printf '%s\t%p\n'
    "ci-du.tsv": listing("/home/ci/harbour-ops/", true).split("\n").reverse().join("\n").slice(1), // each folder after its contents
    "named-files.tsv": filesOnly("harbour-ops/"), // find harbour-ops -type f -printf '%s\t%p\n'
    "abs-files.tsv": filesOnly("/srv/harbour-ops/"),
  };
  const pairs: [string, string][] = [
    ["named.tsv", "abs.tsv"],
    ["abs.tsv", "named.tsv"],
    ["abs.tsv", "ci.tsv"],
    ["ci-du.tsv", "named.tsv"],
    ["abs-files.tsv", "named-files.tsv"],
    ["named-files.tsv", "abs-files.tsv"],
  ];
  for (const [a, b] of pairs) {
    it(`${a} against ${b}: no change, exit 0 under --fail-on-change`, async () => {
      const { doc } = await diff(a, b, more);
      expect(doc.changes).toEqual({ added: 0, removed: 0, moved: 0, renamed: 0, edited: 0, resized: 0 });
      // The listings' own lines: the folder and its entries, or the files alone.
      const lines = (f: string) => ({ ...files, ...more })[f as keyof typeof files].trim().split("\n").length;
      expect(doc.totals.old.nodes).toBe(a.includes("files") ? lines(a) + 3 : lines(a));
      expect(doc.totals.new.nodes).toBe(b.includes("files") ? lines(b) + 3 : lines(b));
      const r = await cli(["diff", a, b, "--fail-on-change"], { files: { ...files, ...more } });
      expect(r.code).toBe(0);
    });
  }

  it("says which folders were left out above each start, on standard error and the header", async () => {
    const r = await cli(["diff", "abs.tsv", "ci.tsv", "--budget", "4"], { files: { ...files, ...more } });
    expect(r.stderr).toContain(
      'abs.tsv:1: read from "/srv/harbour-ops" down, compared with "/home/ci/harbour-ops", the folder NEW (ci.tsv) lists, which holds mostly the same names; the 2 folders above it are left out [ROOT_IS_FOLDER]',
    );
    expect(r.stderr).toContain('ci.tsv:1: read from "/home/ci/harbour-ops" down');
    expect(r.stdout.split("\n")[0]).toContain("OLD: 2 folders above the start left out; NEW: 3 folders");
  });

  it("a folder named otherwise in the other place is renamed, its contents compared", async () => {
    const renamed = {
      "ci-2.tsv": listing("/home/ci/harbour-ops-2/", true, (p, s) => (p === "README" ? s + 1 : s)),
    };
    const { doc } = await diff("abs.tsv", "ci-2.tsv", renamed);
    expect(doc.changes).toMatchObject({ added: 0, removed: 0, renamed: 1, resized: 1 });
    expect(doc.root).toMatchObject({ name: "harbour-ops-2", renamedFrom: "harbour-ops", change: "renamed" });
  });

  it("files only, everything moved one folder down: the deepest shared folder is not read as the start", async () => {
    // Common practice, no source: harbour-ops/berths/north.yaml and harbour-ops/fleet/berths/north.yaml
    // are two paths; with no folder line, which folder was listed is not known, so nothing is left out.
    const moved = { "fleet-files.tsv": filesOnly("harbour-ops/fleet/") };
    const { doc, stderr } = await diff("named-files.tsv", "fleet-files.tsv", { ...more, ...moved });
    expect(stderr).toBe("");
    expect(doc.changes).toMatchObject({ renamed: 0, removed: 6, added: 7 });
  });

  it("a listing of the folder above is compared as it is: its start holds other names", async () => {
    // find /srv -printf '%s\t%p\n' lists harbour-ops as one folder of /srv beside another.
    const above = { "srv.tsv": `4096\t/srv\n4096\t/srv/tug-fleet\n${listing("/srv/harbour-ops/", true)}` };
    const { doc, stderr } = await diff("named.tsv", "srv.tsv", above);
    expect(stderr).toBe("");
    expect(doc.changes.removed).toBe(entries.length - 1); // all but the root, which is matched
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
