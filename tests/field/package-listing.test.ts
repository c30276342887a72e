import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a dependency listing shaped as `npm ls --all --json` prints it (checked against the
// output of npm 10 on this project: children under "dependencies", keyed by package name, a scoped
// name holding "/", and a dependency that is not installed -- an optional one for another platform --
// written as an empty object `{}`), reduced to the invented tidewater packages.
const listing = JSON.stringify({
  version: "4.2.0",
  name: "tidewater",
  dependencies: {
    "@tidewater/ledger": {
      version: "1.3.0",
      dependencies: {
        "@tidewater/ledger-darwin-arm64": {},
        "@tidewater/ledger-linux-x64": { version: "1.3.0" },
        "@tidewater/ledger-win32-x64": {},
      },
    },
    "brackish-streams": {
      version: "0.9.1",
      dependencies: { "tidal-math": { version: "2.0.0" } },
    },
  },
});

describe("a glob focus with a scoped name typed unescaped", () => {
  it("matches nothing and suggests the glob with the scope escaped as ~1 (RFC 6901, section 3)", async () => {
    const result = await cli(["-", "--focus", "@tidewater/ledger/*"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('did you mean "@tidewater~1ledger/*"?');
  });

  it("suggests the escaped form below a ** too, and the suggestion matches when typed", async () => {
    const typed = await cli(["-", "--focus", "**/@tidewater/ledger/*linux*"], { stdin: listing });
    expect(typed.stderr).toContain('did you mean "**/@tidewater~1ledger/*linux*"?');
    const result = await cli(["-", "--focus", "**/@tidewater~1ledger/*linux*", "--format", "json"], {
      stdin: listing,
    });
    expect(result.code).toBe(0);
    expect(JSON.parse(result.stdout).foci).toEqual(["@tidewater~1ledger/@tidewater~1ledger-linux-x64"]);
  });

  it("joins a scope with the pattern after it: @tidewater/* below a package is @tidewater~1*", async () => {
    const result = await cli(["-", "--focus", "@tidewater~1ledger/@tidewater/*linux*"], { stdin: listing });
    expect(result.stderr).toContain('did you mean "@tidewater~1ledger/@tidewater~1*linux*"?');
  });

  it("offers no joined glob when no join matches (a glob of unrelated names stays without it)", async () => {
    const result = await cli(["-", "--focus", "harbor/quay/*"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).not.toContain("~1");
  });
});

describe("entries that are empty objects ({}), as a listing writes a dependency it did not install", () => {
  interface JsonNode {
    path: string;
    empty?: true;
    children: JsonNode[];
    hidden: { empty?: number } | null;
  }
  // The independent count: JSON.parse and a walk of "dependencies", counting objects with no key.
  function emptyObjects(value: { dependencies?: Record<string, object> }): number {
    let n = Object.keys(value).length === 0 ? 1 : 0;
    for (const child of Object.values(value.dependencies ?? {})) n += emptyObjects(child);
    return n;
  }
  const marked = (node: JsonNode): number =>
    (node.empty ? 1 : 0) + (node.hidden?.empty ?? 0) + node.children.reduce((s, c) => s + marked(c), 0);

  it("count as nodes, and the header, each line and each fold say how many are empty", async () => {
    expect(emptyObjects(JSON.parse(listing))).toBe(2);
    const text = await cli(["-", "--budget", "3"], { stdin: listing });
    expect(text.stderr).toBe("");
    const lines = text.stdout.split("\n");
    // tidewater, @tidewater/ledger and its 3 entries, brackish-streams and tidal-math: 7 nodes.
    expect(lines[0]).toMatch(/^summary: 7 nodes \(2 of them empty \{\}\); children under dependencies;/);
    expect(lines[2]).toBe("  . @tidewater/ledger  4 nodes  (hidden: 3 children, 3 nodes, 2 empty {})");
    const focused = await cli(["-", "--focus", "@tidewater~1ledger/*"], { stdin: listing });
    expect(focused.stdout).toContain("* @tidewater/ledger-darwin-arm64  empty {}\n");
    expect(focused.stdout).toContain("* @tidewater/ledger-linux-x64\n");
  });

  it("add up in JSON: empty lines plus folds' empties is input.emptyEntries, at any budget (YAML too)", async () => {
    const yaml = [
      "name: tidewater",
      "dependencies:",
      "  '@tidewater/ledger':",
      "    version: 1.3.0",
      "    dependencies:",
      "      '@tidewater/ledger-darwin-arm64': {}",
      "      '@tidewater/ledger-linux-x64': {version: 1.3.0}",
      "      '@tidewater/ledger-win32-x64': {}",
      "  brackish-streams:",
      "    version: 0.9.1",
      "    dependencies: {tidal-math: {version: 2.0.0}}",
      "",
    ].join("\n");
    for (const [stdin, format] of [
      [listing, "json"],
      [yaml, "yaml"],
    ])
      for (const budget of ["2", "3", "5", "20"]) {
        const result = await cli(["-", "--input-format", format, "--budget", budget, "--format", "json"], {
          stdin,
        });
        expect(result.stderr).toBe("");
        const json = JSON.parse(result.stdout);
        expect(json.totals.nodes).toBe(7);
        expect(json.input.emptyEntries).toBe(2);
        expect(marked(json.root)).toBe(2);
      }
  });

  it("leave an input without empty objects as it was: no word in the header, no field in JSON", async () => {
    const full = listing.replaceAll("{}", '{"version":"1.3.0"}');
    const result = await cli(["-", "--format", "json"], { stdin: full });
    const json = JSON.parse(result.stdout);
    expect(json.input.emptyEntries).toBeUndefined();
    expect(result.stdout).not.toContain('"empty"');
    const text = await cli(["-"], { stdin: full });
    expect(text.stdout.split("\n")[0]).toMatch(/^summary: 7 nodes; /);
  });
});

describe("espalier diff of two listings with empty entries", () => {
  it("says how many of each version's nodes are empty, and marks removed ones on their lines", async () => {
    const after = JSON.parse(listing);
    delete after.dependencies["@tidewater/ledger"].dependencies["@tidewater/ledger-win32-x64"];
    after.dependencies["@tidewater/ledger"].dependencies["@tidewater/ledger-darwin-arm64"] = {
      version: "1.3.0",
    };
    const result = await cli(["diff", "a.json", "b.json", "--budget", "10"], {
      files: { "a.json": listing, "b.json": JSON.stringify(after) },
    });
    expect(result.stderr).toBe("");
    // Old: 7 nodes, 2 of them {}; new: 6 nodes, none ({} of darwin-arm64 now has a version).
    // The lines count the removed one too: 6 + 1.
    expect(result.stdout.split("\n")[0]).toMatch(
      /; 7 -> 6 nodes \(2 -> 0 of them empty \{\}\), 7 with the 1 removed;/,
    );
    expect(result.stdout).toContain("[removed] @tidewater/ledger-win32-x64  empty {}\n");
    const json = JSON.parse(
      (
        await cli(["diff", "a.json", "b.json", "--format", "json"], {
          files: { "a.json": listing, "b.json": JSON.stringify(after) },
        })
      ).stdout,
    );
    expect(json.totals.old).toMatchObject({ nodes: 7, empty: 2 });
    expect(json.totals.new.empty).toBeUndefined();
  });
});

// `npm ls --all --parseable --long` (npm 11.19.1 here): each package's folder, ":" and its
// name@version. Read as paths, the project's own line made a folder "app:tidewater@0.4.0" beside the
// project, and each scoped package three more nodes: 149 nodes for 117 folders, exit 0, nothing said.
describe("npm ls --all --parseable --long", () => {
  const long = [
    "/srv/tidewater:tidewater@0.4.0",
    "/srv/tidewater/node_modules/@reef/tide-core:@reef/tide-core@2.1.0",
    "/srv/tidewater/node_modules/kelp-log:kelp-log@3.0.1",
    "/srv/tidewater/node_modules/kelp-log/node_modules/brine:brine@0.4.2",
    "",
  ].join("\n");

  it("is PARSE_PATHS at line 1 naming the folders-only and JSON listings", async () => {
    const result = await cli(["-"], { stdin: long });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:1:1: every line is a folder, a colon and a name@version, .*npm ls --all --parseable\).*npm ls --all --json.*--input-format paths \[PARSE_PATHS\]\n$/,
    );
  });

  it("reads the folders alone (npm ls --all --parseable) as one node each, below the project", async () => {
    const folders = long.replace(/:[^\n]*/g, "");
    const result = await cli(["-", "--format", "json"], { stdin: folders });
    expect(result.code).toBe(0);
    // The 4 folders, and those their paths pass through: "/", srv, node_modules twice, @reef.
    expect(JSON.parse(result.stdout).totals.nodes).toBe(4 + 5);
  });

  it("reads the same lines as paths under --input-format paths", async () => {
    const result = await cli(["-", "--input-format", "paths"], { stdin: long });
    expect(result.code).toBe(0);
  });
});

describe("npm ls --all as text (a tree already drawn)", () => {
  // Shaped as npm 11 prints it here (`npm ls --all`, and `--unicode=false`), the packages invented: read
  // as a path list each line was one path named with the drawing, a scope's "/" splitting it, exit 0
  // (or DUPLICATE_PATH where a deduped line repeated another, saying nothing of what the input was).
  const drawn = [
    "tidewater@4.2.0 /srv/tidewater",
    "├─┬ @tidewater/ledger@1.3.0",
    "│ └── brackish-streams@0.9.1 deduped",
    "├─┬ brackish-streams@0.9.1",
    "│ └── tidal-math@2.0.0",
    "└── UNMET OPTIONAL DEPENDENCY @tidewater/ledger-darwin-arm64@1.3.0",
    "",
  ].join("\n");
  const ascii = drawn
    .replace(/├─┬ |├── /g, "+-- ")
    .replace(/└── /g, "`-- ")
    .replace(/│ /g, "| ");

  it.each([
    ["drawn with lines", drawn],
    ["drawn with ASCII", ascii],
    ["with a deduped line repeated", `${drawn}${drawn.split("\n")[2]}\n`],
  ])("%s is PARSE_PATHS at its first drawn line, naming npm ls --all --json", async (_, text) => {
    const result = await cli(["-"], { stdin: text });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(/^espalier: <stdin>:2:1: .*npm ls --all --json .*\[PARSE_PATHS\]\n$/);
  });

  it("paths that start with a bar or a plus are read when most lines do not", async () => {
    const result = await cli(["-", "--format", "json"], { stdin: "| notes.txt\ntide/a\ntide/b\nquay/c\n" });
    expect(result.code).toBe(0);
    expect(JSON.parse(result.stdout).totals.nodes).toBe(7);
  });
});
