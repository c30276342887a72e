import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { cli } from "../helpers/cli.js";

// Source: npm's own dependency listing of this project's install, `npm ls --all --json` (npm-ls(1)):
// an object with the package's name and version whose `dependencies` map each package name to an
// object of the same shape. Nothing here says "dependencies" to espalier: it must find that field.

/** The listing; npm exits non-zero when it reports problems, but prints the JSON all the same. */
function npmListing(): string {
  try {
    return execFileSync("npm", ["ls", "--all", "--json"], { encoding: "utf8", maxBuffer: 1 << 28 });
  } catch (error) {
    const stdout = (error as { stdout?: string }).stdout;
    if (typeof stdout === "string" && stdout.trim().startsWith("{")) return stdout;
    throw error;
  }
}

/** Entries of the listing counted independently: the top object and every key of every `dependencies`. */
function countEntries(value: { dependencies?: Record<string, unknown> }): number {
  let count = 1;
  for (const child of Object.values(value.dependencies ?? {})) count += countEntries(child as never);
  return count;
}

describe("loadTree(npm ls --all --json of this project)", () => {
  it("finds `dependencies` and holds one node per entry of the listing", () => {
    const listing = npmListing();
    const parsed = JSON.parse(listing);
    const tree = loadTree(listing, { ...defaultLoadOptions, file: "deps.json" });
    expect(tree.reading).toMatchObject({
      shape: "nodes",
      childrenField: "dependencies",
      childrenFieldFound: true,
    });
    expect(tree.name.get(0)).toBe(parsed.name);
    expect(tree.length).toBe(countEntries(parsed));
    // Each top-level dependency is a child of the root, by name, in the listing's order.
    const children: string[] = [];
    for (let i = 1; i < tree.length; i++) if (tree.parent[i] === 0) children.push(tree.name.get(i));
    expect(children).toEqual(Object.keys(parsed.dependencies));
  }, 120_000);
});

type Entry = { version?: string; dependencies?: Record<string, Entry> };

/** Entries whose version differs between two listings of the same packages, counted independently. */
function versionChanges(a: Entry, b: Entry): number {
  let n = a.version !== b.version ? 1 : 0;
  for (const [name, child] of Object.entries(a.dependencies ?? {}))
    if (b.dependencies?.[name]) n += versionChanges(child, b.dependencies[name]);
  return n;
}

describe("espalier diff of npm ls --all --json twice, --compare-field version", () => {
  it("exits 0 on the same listing and 1 once a version moves, with one edit per changed entry", async () => {
    const listing = npmListing();
    const before = JSON.parse(listing) as Entry;
    const after = JSON.parse(listing) as Entry;
    // One top-level dependency's version moves to 3.0.0 (3.0.1 if it is 3.0.0 already), version strings
    // as semver.org writes them; espalier compares the text, so only the difference matters.
    const [name, entry] = Object.entries(after.dependencies ?? {}).find(([, e]) => e.version)!;
    const oldVersion = entry.version;
    const newVersion = oldVersion === "3.0.0" ? "3.0.1" : "3.0.0";
    entry.version = newVersion;
    const dir = mkdtempSync(join(tmpdir(), "espalier-npm-ls-"));
    writeFileSync(join(dir, "before.json"), listing);
    writeFileSync(join(dir, "after.json"), JSON.stringify(after, null, 2));
    const args = ["--compare-field", "version", "--fail-on-change", "--format", "json"];
    const same = await cli(["diff", join(dir, "before.json"), join(dir, "before.json"), ...args]);
    expect(same.code).toBe(0);
    expect(JSON.parse(same.stdout).changes.edited).toBe(0);
    const r = await cli(["diff", join(dir, "before.json"), join(dir, "after.json"), ...args]);
    expect(r.code).toBe(1);
    const doc = JSON.parse(r.stdout);
    expect(doc.changes.edited).toBe(versionChanges(before, after));
    expect(doc.changes.edited).toBe(1);
    const node = doc.root.children.find((c: { name: string }) => c.name === name);
    expect(node.change).toBe("edited");
    expect(node.edits).toEqual([{ field: "version", old: oldVersion, new: newVersion }]);
  }, 120_000);
});
