import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: `npm ls --all --json` of one project, first with everything installed, then of a
// checkout without node_modules (npm 10 on this project, 2026-12-04: exit 1, a top-level `problems`
// list and `error` object, each missing package as {"required", "missing": true, "problems": [...]}, an
// optional package for another platform as {}), reduced to the invented tidewater packages. The second
// listing has no nested dependencies, so its children field was not found and it was read as values:
// the diff compared two readings (every node removed or added, the root "renamed") and exited 0.

type Listing = { dependencies?: Record<string, Listing> } & Record<string, unknown>;

const installed: Listing = {
  version: "4.2.0",
  name: "tidewater",
  dependencies: {
    "@tidewater/ledger": {
      version: "1.3.0",
      resolved: "https://registry.example.test/@tidewater/ledger/-/ledger-1.3.0.tgz",
      overridden: false,
      dependencies: {
        "tidal-math": { version: "2.0.0", overridden: false },
        "@tidewater/ledger-linux-x64": { version: "1.3.0", overridden: false },
        "@tidewater/ledger-darwin-arm64": {},
      },
    },
    "brackish-streams": {
      version: "0.9.1",
      overridden: false,
      dependencies: { "tidal-math": { version: "2.0.0", overridden: false } },
    },
    "quay-lint": { version: "5.1.0", overridden: false },
  },
};

const problem = (name: string, version: string) => `missing: ${name}@${version}, required by tidewater@4.2.0`;
const missing: Listing = {
  version: "4.2.0",
  name: "tidewater",
  problems: [problem("@tidewater/ledger", "1.3.0"), problem("brackish-streams", "0.9.1")],
  dependencies: {
    "@tidewater/ledger": {
      required: "1.3.0",
      missing: true,
      problems: [problem("@tidewater/ledger", "1.3.0")],
    },
    "brackish-streams": { missing: true, problems: [problem("brackish-streams", "0.9.1")] },
    "quay-lint": {},
  },
  error: { code: "ELSPROBLEMS", summary: "missing: @tidewater/ledger@1.3.0", detail: "" },
};

// `npm ls --all --long --json` writes the manifest's fields first, `exports` among them: an object of
// records of another kind beside `dependencies`.
const manifest = {
  description: "Quay scheduling for the tidewater harbour",
  engines: { node: ">=20" },
  exports: { ".": { types: "./dist/index.d.ts", import: "./dist/index.js" } },
  scripts: { build: "tsc" },
};
const long = (listing: Listing): Listing => {
  const { version, name, ...rest } = listing;
  return { version, name, ...manifest, ...rest };
};

/**
 * The independent reading: the runtime's JSON.parse (RFC 8259), then every path below the root through
 * "dependencies", a name's "~" and "/" escaped as "~0" and "~1" (RFC 6901, section 3).
 */
function paths(listing: Listing, prefix = ""): string[] {
  const out: string[] = [];
  for (const [name, child] of Object.entries(listing.dependencies ?? {})) {
    const path = prefix + name.replaceAll("~", "~0").replaceAll("/", "~1");
    out.push(path, ...paths(child, `${path}/`));
  }
  return out;
}

function expected(oldListing: Listing, newListing: Listing) {
  const before = new Set(paths(oldListing));
  const after = new Set(paths(newListing));
  return {
    added: [...after].filter((p) => !before.has(p)).length,
    removed: [...before].filter((p) => !after.has(p)).length,
    oldNodes: before.size + 1,
    newNodes: after.size + 1,
  };
}

const files = {
  "installed.json": JSON.stringify(installed, null, 2),
  "missing.json": JSON.stringify(missing, null, 2),
  "long-installed.json": JSON.stringify(long(installed), null, 2),
  "long-missing.json": JSON.stringify(long(missing), null, 2),
};

/** The MISSING_ENTRIES note on the two entries of `missing` that say "missing": true. */
const missingNote = (file: string, line: number) =>
  `espalier: note: ${file}:${line}: 2 node objects hold "missing": true, as npm ls --all --json lists a dependency it did not find (the first: node "tidewater/@tidewater~1ledger"): each is counted as a node, in every total; --label '{name} {missing}' marks them on their lines [MISSING_ENTRIES]\n`;

async function diffJson(oldFile: string, newFile: string) {
  const r = await cli(["diff", oldFile, newFile, "--format", "json"], { files });
  expect(r.code).toBe(0);
  return { doc: JSON.parse(r.stdout), stderr: r.stderr };
}

describe("a dependency listing with nothing installed", () => {
  it("reads as node objects under dependencies on its own (problems lists do not hide them)", async () => {
    const r = await cli(["missing.json", "--format", "json"], { files });
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.input).toMatchObject({
      shape: "nodes",
      childrenField: "dependencies",
      childrenFieldFound: true,
    });
    // Counted independently: the root and its three entries.
    expect(doc.totals.nodes).toBe(paths(missing).length + 1);
    const text = await cli(["missing.json", "--budget", "6"], { files });
    // The entries that say "missing": true are counted on the header too (MISSING_ENTRIES).
    expect(text.stdout.split("\n")[0]).toMatch(
      /^summary: 4 nodes \(1 of them empty \{\}\); 2 missing counted as nodes; children under dependencies;/,
    );
  });

  it("diffs against the installed listing node for node: counts from the two path sets, root unrenamed", async () => {
    const want = expected(installed, missing);
    const { doc, stderr } = await diffJson("installed.json", "missing.json");
    // The only note: NEW's two entries that say "missing": true (counted as nodes, as JSON.parse reads them).
    expect(stderr).toMatch(
      /^espalier: note: missing\.json:\d+: 2 node objects hold "missing": true, [^\n]*\[MISSING_ENTRIES\]\n$/,
    );
    expect(doc.changes).toMatchObject({ added: want.added, removed: want.removed, renamed: 0, moved: 0 });
    expect(doc.totals.old.nodes).toBe(want.oldNodes);
    expect(doc.totals.new.nodes).toBe(want.newNodes);
    const text = await cli(["diff", "installed.json", "missing.json", "--fail-on-change"], { files });
    expect(text.code).toBe(1);
    expect(text.stdout.split("\n")[0]).toContain("; children under dependencies;");
    expect(text.stdout).not.toContain("renamed from");
  });
});

describe("two versions that would be read two ways are read one way", () => {
  it("a long listing with nothing installed reads as values alone, and as the installed one in a diff", async () => {
    const alone = await cli(["long-missing.json", "--format", "json"], { files });
    expect(JSON.parse(alone.stdout).input.shape).toBe("values");
    const want = expected(installed, missing);
    const { doc, stderr } = await diffJson("long-installed.json", "long-missing.json");
    expect(doc.changes).toMatchObject({ added: want.added, removed: want.removed, renamed: 0 });
    expect(doc.totals.new.nodes).toBe(want.newNodes);
    expect(stderr).toBe(
      `${missingNote("long-missing.json", 24)}espalier: note: long-missing.json: read as OLD (long-installed.json) was, as node objects with children under "dependencies"; on its own it reads as every value a node (give --read-as or --children-field to choose) [READ_AS_OTHER]\n`,
    );
  });

  it("OLD that fell to values is read as NEW was when it fits (the reverse diff counts the same nodes)", async () => {
    const want = expected(missing, installed);
    const { doc, stderr } = await diffJson("long-missing.json", "long-installed.json");
    expect(doc.changes).toMatchObject({ added: want.added, removed: want.removed, renamed: 0 });
    expect(doc.totals.old.nodes).toBe(want.oldNodes);
    expect(stderr).toContain("long-missing.json: read as NEW (long-installed.json) was");
    expect(stderr).toContain("[READ_AS_OTHER]");
  });

  it("NEW that does not fit OLD's reading is SHAPE naming both readings and --read-as values", async () => {
    const parts = JSON.stringify({
      name: "tidewater",
      parts: [{ name: "quay", parts: [{ name: "berth" }] }],
    });
    const r = await cli(["diff", "installed.json", "parts.json"], {
      files: { ...files, "parts.json": parts },
    });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: parts\.json: the two versions read differently: OLD \(installed\.json\)/,
    );
    expect(r.stderr).toContain('as node objects with children under "dependencies"');
    expect(r.stderr).toContain('NEW on its own as node objects with children under "parts"');
    expect(r.stderr).toContain("--read-as values");
    expect(r.stderr).toMatch(/\[SHAPE\]\n$/);
    // The way out it names works: both read as values.
    const values = await cli(["diff", "installed.json", "parts.json", "--read-as", "values"], {
      files: { ...files, "parts.json": parts },
    });
    expect(values.code).toBe(0);
    expect(values.stderr).toBe("");
    expect(values.stdout.split("\n")[0]).toMatch(/^diff by path: .* 0 renamed,/);
  });

  it("NEW from standard input, which cannot be read twice, is SHAPE when it reads another way", async () => {
    const r = await cli(["diff", "long-installed.json", "-"], { files, stdin: files["long-missing.json"] });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("standard input cannot be read a second time");
    expect(r.stderr).toMatch(/\[SHAPE\]\n$/);
  });

  it("versions of two formats are compared as read, and the header names each one's reading", async () => {
    const list = "tidewater/quay\ntidewater/berth\n";
    const nested = JSON.stringify({ name: "tidewater", children: [{ name: "quay" }, { name: "berth" }] });
    const r = await cli(["diff", "old.txt", "new.json", "--width", "300"], {
      files: { "old.txt": list, "new.json": nested },
    });
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toContain("; OLD: a path list, NEW: children under children;");
  });
});

describe("a header clause that holds for one version only says which", () => {
  it('no "name" field in OLD alone: the clause starts OLD:, and NEW: the other way round', async () => {
    // An export of the same tree before and after its records gained names (invented harbour units).
    const unnamed = JSON.stringify({ children: [{ children: [{ size: 1 }] }, { size: 2 }] });
    const named = JSON.stringify({
      name: "harbour",
      children: [
        { name: "quay", children: [{ name: "berth", size: 1 }] },
        { name: "tug", size: 2 },
      ],
    });
    const both = { "unnamed.json": unnamed, "named.json": named };
    const r = await cli(["diff", "unnamed.json", "named.json", "--width", "300"], { files: both });
    expect(r.stdout.split("\n")[0]).toContain(
      '; OLD: no "name" field: nodes print as "" (see --name-field);',
    );
    const back = await cli(["diff", "named.json", "unnamed.json", "--width", "300"], { files: both });
    expect(back.stdout.split("\n")[0]).toContain(
      '; NEW: no "name" field: nodes print as "" (see --name-field);',
    );
    const same = await cli(["diff", "unnamed.json", "unnamed.json", "--width", "300"], { files: both });
    expect(same.stdout.split("\n")[0]).toContain('; no "name" field: nodes print as "" (see --name-field);');
  });
});
