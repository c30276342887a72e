import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const FILES = "fixtures/tidewater-files.paths";

/** The lines of standard error. */
function sideLines(stderr: string): string[] {
  return stderr.split("\n").filter((line) => line !== "");
}

describe("espalier's streams (docs/cli.md, Exit status): the result alone on standard output", () => {
  const runs: [string, string[], Parameters<typeof cli>[1]][] = [
    ["foci skipped", ["--focus", "nope/x", "--unmatched-foci", "skip"], {}],
    ["an empty focus list", ["--focus-from", "-"], { stdin: "" }],
    ["a config option JSON has no place for", [], { files: { ".espalier.yaml": "share: total\n" } }],
    // node objects each as big as its children together: SIZES_LIKE_TOTALS, a reading note (input.md)
    ["how the input was read", ["--focus", "a"], {}],
  ];
  for (const [what, args, options] of runs) {
    it(`keeps the JSON whole on standard output and says ${what} on standard error, status 0`, async () => {
      const input = what === "how the input was read" ? "-" : FILES;
      const stdin =
        what === "how the input was read"
          ? JSON.stringify({
              name: "r",
              size: 100,
              children: [
                { name: "a", size: 60 },
                { name: "b", size: 40 },
              ],
            })
          : options?.stdin;
      const r = await cli([input, ...args, "--format", "json", "--budget", "12"], { ...options, stdin });
      expect(r.code, r.stderr).toBe(0);
      expect(() => JSON.parse(r.stdout)).not.toThrow();
      const side = sideLines(r.stderr);
      expect(side.length).toBeGreaterThan(0);
      for (const line of side) expect(line).toMatch(/^espalier: (warning|note): /);
    });
  }
});
