import { DOMParser } from "@xmldom/xmldom";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: `npm ls --all --json` lists a dependency it did not install (an optional build for
// another platform) as an empty object, `{}` (245 nodes, 117 of them such, in this repository's
// listing). The text format says how many are empty on the header, on the entry's own line and in every
// fold; the SVG said it only in its heading, so a block's counts could not be checked against it. The
// listing below has that shape, reduced to invented tidewater packages.
function listing(): string {
  const deps: Record<string, unknown> = {};
  for (let k = 0; k < 40; k++) {
    const inner: Record<string, unknown> = {};
    for (let j = 0; j < (k % 5) + 1; j++)
      inner[`@tidewater/part-${k}-${j}`] = j % 2 === 0 ? {} : { version: "1.0.0" };
    deps[`@tidewater/pkg-${k}`] = k % 3 === 0 ? {} : { version: "0.1.0", dependencies: inner };
  }
  return JSON.stringify({ name: "tidewater", version: "1.0.0", dependencies: deps });
}

/** The heading's count of empty entries and, per block, its kind and tooltip. */
function read(svg: string): { heading: number; blocks: { kind: string; title: string }[] } {
  const doc = new DOMParser({
    onError: (level, message) => {
      throw new Error(`${level}: ${message}`);
    },
  }).parseFromString(svg, "image/svg+xml");
  const heading = [...doc.getElementsByTagName("text")].find((t) => t.getAttribute("class") === "heading")!;
  const icicle = [...doc.getElementsByTagName("g")].find((g) => g.getAttribute("class") === "icicle")!;
  const blocks = [...icicle.getElementsByTagName("g")].map((g) => ({
    kind: g.getAttribute("class")!,
    title: g.getElementsByTagName("title")[0].textContent!,
  }));
  return {
    heading: Number(/([\d,]+) of them empty \{\}/.exec(heading.textContent!)![1].replace(/,/g, "")),
    blocks,
  };
}

/** `, 25 empty {}` in a tooltip's first line, as a number (0 when absent). */
function emptyIn(line: string): number {
  const m = /, ([\d,]+) empty \{\}/.exec(line);
  return m ? Number(m[1].replace(/,/g, "")) : 0;
}

describe("an SVG of a listing with empty entries", () => {
  it("says in each fold, group and empty entry's block how many are empty, adding up to the heading", async () => {
    for (const budget of ["8", "14", "30"]) {
      const result = await cli(["-", "--format", "svg", "--budget", budget], { stdin: listing() });
      expect(result.stderr).toBe("");
      const { heading, blocks } = read(result.stdout);
      // 14 top-level {} (k = 0, 3, ..., 39) and, under the other 26, the parts j = 0, 2, 4:
      // python3 -c "print(sum(1 for k in range(40) if k%3==0) + sum(len(range(0,(k%5)+1,2)) for k in range(40) if k%3))"
      expect(heading).toBe(61);
      let counted = 0;
      for (const { kind, title } of blocks) {
        const first = title.split("\n")[0];
        if (kind.startsWith("folded") || kind.startsWith("group")) counted += emptyIn(first);
        else if (title.split("\n").includes("empty {}")) counted += 1;
      }
      expect(counted).toBe(heading);
    }
  });
});
