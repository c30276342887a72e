import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";

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
