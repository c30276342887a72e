import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: `--share total --format json` (and `--format svg`) printed the same bytes as without
// --share (md5sum of both outputs on fixtures/tidewater-deps.json), exit 0: the option was dropped.
const DEPS = "fixtures/tidewater-deps.json";

describe("--share with an output format that has no place for percentages", () => {
  for (const format of ["json", "svg"]) {
    it(`is USAGE with --format ${format}, for a summary and a diff`, async () => {
      for (const args of [[DEPS], ["diff", DEPS, DEPS]]) {
        const result = await cli([...args, "--share", "total", "--format", format]);
        expect(result.code).toBe(2);
        expect(result.stdout).toBe("");
        expect(result.stderr).toMatch(
          new RegExp(
            `^espalier: --share adds percentages to text and Markdown lines only; --format ${format} has none: .*\\[USAGE\\]\\n$`,
          ),
        );
      }
    });
  }

  it("prints percentages in text and Markdown as before", async () => {
    for (const format of ["text", "markdown"]) {
      const result = await cli([DEPS, "--share", "total", "--format", format, "--budget", "3"]);
      expect(result.stderr).toBe("");
      expect(result.stdout).toContain("100%");
    }
  });

  it("from the config file (a preference for printed summaries) does not stop a JSON run", async () => {
    const result = await cli([DEPS, "--format", "json", "--budget", "3"], {
      files: { ".espalier.yaml": "share: total\n" },
    });
    expect(result.stderr).toBe("");
    expect(JSON.parse(result.stdout).format).toBe("espalier-summary/1");
  });
});
