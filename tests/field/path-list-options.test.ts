import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: `--nul-separated` typed on an input that is read as another format (a JSON package
// listing, a CSV table, a fact table). Ignored, the input would be read as if the option were not
// there, with exit 0; the user who asked for NUL-ended entries must hear that it did not apply.

describe("--nul-separated on an input that is no path list", () => {
  it("is USAGE naming the format the input is read as (JSON)", async () => {
    const result = await cli(["-", "--nul-separated"], {
      stdin: '{"name": "tidewater", "children": [{"name": "ledger", "size": 4}]}\n',
    });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /--nul-separated reads path lists only; this input is read as json .*\[USAGE\]/,
    );
  });

  it("is USAGE for a table read from a file, where --folder-sizes reads the sizes", async () => {
    const result = await cli([
      "fixtures/quillfeather-org.csv",
      "--parent-field",
      "manager",
      "--nul-separated",
      "--folder-sizes",
      "own",
    ]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/: --nul-separated reads path lists only; this input is read as csv/);
  });

  it("is USAGE for a fact table (--levels), before the engine reads anything", async () => {
    const result = await cli([
      "fixtures/quillfeather-cost-export.csv",
      "--levels",
      "account,service",
      "--size-field",
      "cost",
      "--nul-separated",
    ]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /--nul-separated reads path lists only; this input is read as fact table \[USAGE\]/,
    );
  });

  it("still reads a NUL-separated path list (the option applies there)", async () => {
    const result = await cli(["-", "--input-format", "paths", "--nul-separated", "--format", "json"], {
      stdin: "harbor/a\nb.txt\0harbor/c.txt\0",
    });
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    // harbor (the one top-level folder, so the root), harbor/a\nb.txt, harbor/c.txt: 3, counted by hand.
    expect(json.totals.nodes).toBe(3);
  });
});
