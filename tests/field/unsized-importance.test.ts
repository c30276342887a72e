import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: a process table (ps -eo pid,ppid,comm as TSV, invented tidewater processes) has no
// sizes. With --importance size, API(x) = -depth(x) + log2((size(x) + 1) / (size(root) + 1)) (the
// size-weighted a-priori importance of docs/interest.md, after Furnas 1986) is -depth(x) for every
// node, Furnas's own choice for trees: the run ranked exactly as --importance depth and said nothing.
const table =
  "id\tparent\tname\n1\t\tinit\n20\t1\ttidewaterd\n21\t20\tledger-worker\n22\t20\tledger-worker\n23\t20\tgauge\n30\t1\tsshd\n31\t30\tbash\n32\t31\tharbor-cli\n";

describe("--importance size on an input without sizes", () => {
  it("prints what --importance depth prints, with an UNSIZED_IMPORTANCE note on standard error and in JSON", async () => {
    const args = ["-", "--focus", "32", "--budget", "7"];
    const bySize = await cli([...args, "--importance", "size"], { stdin: table });
    const byDepth = await cli([...args, "--importance", "depth"], { stdin: table });
    expect(bySize.code).toBe(0);
    // The same lines, the header saying the ranking it used in place of the one asked for.
    expect(bySize.stdout).toBe(
      byDepth.stdout.replace("; focus 32", "; ranked by depth (no sizes); focus 32"),
    );
    expect(byDepth.stderr).toBe("");
    expect(bySize.stderr).toMatch(
      /^espalier: note: <stdin>: --importance size .* no sizes: .*\[UNSIZED_IMPORTANCE\]\n$/,
    );
    const json = await cli([...args, "--importance", "size", "--format", "json"], { stdin: table });
    expect(JSON.parse(json.stdout).input.notes).toEqual([
      expect.objectContaining({ code: "UNSIZED_IMPORTANCE" }),
    ]);
  });

  it("says nothing when the input has sizes, and notes a diff once, on NEW", async () => {
    // One folder's entries say no unit (UNIT_NOT_SAID): --units bytes says it.
    const sized = await cli(["-", "--importance", "size", "--units", "bytes"], {
      stdin: "3\tharbor/a\n5\tharbor/b\n",
    });
    expect(sized.stderr).toBe("");
    const diff = await cli(["diff", "old.tsv", "-", "--importance", "size", "--bare"], {
      stdin: table.replace("gauge", "gauge-v2"),
      files: { "old.tsv": table },
    });
    expect(diff.code).toBe(0);
    expect(diff.stderr.match(/UNSIZED_IMPORTANCE/g)).toHaveLength(1);
    expect(diff.stderr).toMatch(/^espalier: note: <stdin>: /);
  });
});
