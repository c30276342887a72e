import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

/** `npm ls --all` of this project, as JSON or as npm's own text, or undefined where npm does not run. */
function npmLs(args: string[]): string | undefined {
  try {
    return execFileSync("npm", ["ls", "--all", ...args], {
      encoding: "utf8",
      stdio: ["ignore", "pipe", "ignore"],
      maxBuffer: 1 << 26,
    });
  } catch (error) {
    // npm ls exits 1 on problems (an extraneous package) and still prints the listing.
    const out = (error as { stdout?: string }).stdout;
    return out !== undefined && out !== "" ? out : undefined;
  }
}

// Field test: `npm ls --all --json` (npm 11.19.1 here) lists a package again under every other package
// that requires it, as `{"version": "1.0.4"}`: its dependencies are under its full entry only, and its
// record lacks the `overridden` that every other entry but the project's has (npm's lib/commands/ls.js
// writes a deduped entry from a copy of the package without it). Each is a leaf counted as a node, and
// nothing said so: this project's listing read as 246 nodes, 30 of them such. Packages below invented.
const listing = `{
  "version": "1.0.0",
  "name": "harbour-app",
  "dependencies": {
    "tide-core": {
      "version": "2.1.0",
      "overridden": false,
      "dependencies": {
        "brine-util": { "version": "1.0.4", "overridden": false, "dependencies": { "salt": { "version": "0.2.0", "overridden": false } } }
      }
    },
    "quay-log": {
      "version": "0.3.0",
      "overridden": false,
      "dependencies": {
        "brine-util": { "version": "1.0.4" }
      }
    },
    "kelp": { "version": "3.0.0", "overridden": true }
  }
}
`;

describe("deduped entries of npm ls --all --json", () => {
  it("are counted as leaves, and a DEDUPED_ENTRIES note says how many and where the first is", async () => {
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    expect(result.code).toBe(0);
    const summary = JSON.parse(result.stdout);
    // harbour-app, tide-core, brine-util, salt, quay-log, brine-util again, kelp.
    expect(summary.totals.nodes).toBe(7);
    expect(summary.input.notes).toEqual([
      expect.objectContaining({
        code: "DEDUPED_ENTRIES",
        line: 16,
        message: expect.stringMatching(
          /^1 node object holds a "version" and no "overridden", .*quay-log\/brine-util/,
        ),
      }),
    ]);
    expect(result.stderr).toMatch(
      /^espalier: note: <stdin>:16: 1 node object holds .*\[DEDUPED_ENTRIES\]\n$/,
    );
    const text = await cli(["-", "--budget", "12"], { stdin: listing });
    expect(text.stdout.split("\n")[0]).toContain("; 1 deduped entry counted as a leaf");
  });

  it("says nothing where no entry holds overridden (another writer, an older npm)", async () => {
    const result = await cli(["-", "--format", "json"], {
      stdin: listing.replaceAll('"overridden"', '"pinned"'),
    });
    expect(result.stderr).toBe("");
    expect(JSON.parse(result.stdout).input.notes).toBeUndefined();
  });

  it("a diff counts them in both versions", async () => {
    const before = listing.replace(
      '"brine-util": { "version": "1.0.4" }',
      '"sand": { "version": "1.0.0", "overridden": false }',
    );
    const dir = mkdtempSync(join(tmpdir(), "espalier-deduped-"));
    try {
      writeFileSync(join(dir, "old.json"), before);
      writeFileSync(join(dir, "new.json"), listing);
      const result = await cli(["diff", join(dir, "old.json"), join(dir, "new.json")]);
      expect(result.stdout.split("\n")[0]).toContain("0 -> 1 deduped entry counted as a leaf");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  const json = npmLs(["--json"]);
  // Source: npm ls --all (text) prints "deduped" after each such package (none where nothing is installed).
  const marked = (npmLs([]) ?? "").split("\n").filter((line) => / deduped( |$)/.test(line)).length;
  it.skipIf(json === undefined || marked === 0)(
    "on this project's own listing, as many as npm's own text marks deduped",
    async () => {
      const result = await cli(["-", "--format", "json"], { stdin: json! });
      const notes = JSON.parse(result.stdout).input.notes ?? [];
      const note = notes.find((n: { code: string; message: string }) => n.code === "DEDUPED_ENTRIES");
      expect(Number(/^(\d+) node objects/.exec(note?.message ?? "")?.[1])).toBe(marked);
    },
  );
});
