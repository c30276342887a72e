import { describe, expect, it } from "vitest";
import { MAX_GLOB_LENGTH, matchGlob } from "../../src/focus/glob.js";
import { wildcardWork } from "../../src/focus/wildcard.js";
import { measure } from "../../src/model/measure.js";
import { runBin } from "../helpers/bin.js";
import { cli } from "../helpers/cli.js";
import { makeTree } from "../helpers/make-tree.js";
import { oneErrorLine } from "./error-line.js";

describe("espalier - (hostile globs)", () => {
  const long = "a".repeat(200_000);
  const stdin = `${long}\nquill/${long}\ntide/${"ab".repeat(50_000)}\n`;

  it("a crafted glob against a long name (*a*a*a*a*a*a*a*a*b) is FOCUS_NO_MATCH, through bin/espalier.js", async () => {
    // A backtracking matcher would need about n^8 / 8! steps here (n = 200,000): it would never end.
    for (const spec of ["*a*a*a*a*a*a*a*a*b", "quill/*a*a*a*a*a*a*a*a*b", `*${"a*".repeat(1000)}b`]) {
      const r = await runBin(["-", "--focus", spec], { stdin });
      expect(oneErrorLine({ code: r.code ?? -1, stdout: r.stdout, stderr: r.stderr }).code).toBe(
        "FOCUS_NO_MATCH",
      );
    }
  });

  it("the same crafted glob matches when the name fits it", async () => {
    const r = await cli(["-", "--focus", "tide/*a*a*a*a*a*a*a*a*b", "--format", "json"], { stdin });
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).foci).toHaveLength(1);
  });

  it(`a glob longer than ${MAX_GLOB_LENGTH} characters is FOCUS_SYNTAX, never INTERNAL`, async () => {
    for (const spec of [
      `*${"x".repeat(MAX_GLOB_LENGTH)}`,
      "*".repeat(1_000_000),
      `${"*a".repeat(500_000)}`,
    ]) {
      const r = await cli(["-", "--focus", spec], { stdin: "a\nb\n" });
      expect(oneErrorLine(r).code).toBe("FOCUS_SYNTAX");
      expect(r.stderr.length).toBeLessThan(500);
    }
  });

  it("a glob of more segments than the matcher holds is FOCUS_SYNTAX", async () => {
    const r = await cli(["-", "--focus", Array(40).fill("*").join("/")], { stdin: "a\nb\n" });
    expect(oneErrorLine(r).code).toBe("FOCUS_SYNTAX");
  });

  // Counted, not timed (docs/reliability.md, "Globs"): every name is tested once per live pattern
  // position, each test at most 3 comparisons per code unit of the name (+1).
  it("matchGlob's work is bounded by segments × (3 × the names' length + 1)", () => {
    const tree = makeTree(`R{${"aaaa,".repeat(50)}b{${"a".repeat(300)},${"ab".repeat(150)}}}`);
    const measures = measure(tree);
    let chars = 0;
    for (let i = 1; i < tree.length; i++) chars += tree.name.get(i).length;
    for (const spec of ["**/*a*a*a*a*a*a*a*a*b", "*/*a*a*b*", "**/**/*a*"]) {
      const segments = spec.split("/").length;
      wildcardWork.comparisons = 0;
      matchGlob(tree, measures, spec);
      expect(wildcardWork.comparisons).toBeLessThanOrEqual(segments * (3 * chars + tree.length));
    }
  });
});
