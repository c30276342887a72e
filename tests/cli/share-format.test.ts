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

  // Field test: `share: total` in the config file and --format json printed the JSON without a word
  // that the option was left out (exit 0, standard error empty).
  it("from the config file (a preference for printed summaries) does not stop a JSON or SVG run, and says it is left out", async () => {
    for (const [format, start] of [
      ["json", "{"],
      ["svg", "<svg"],
    ]) {
      for (const args of [[DEPS], ["diff", DEPS, DEPS]]) {
        const result = await cli([...args, "--format", format, "--budget", "3"], {
          files: { ".espalier.yaml": "share: total\n" },
        });
        expect(result.code).toBe(0);
        expect(result.stdout.startsWith(start)).toBe(true);
        expect(result.stderr).toMatch(
          new RegExp(
            `^espalier: note: share: total from .*\\.espalier\\.yaml is left out: --format ${format} has no place for percentages .*\\n$`,
          ),
        );
      }
    }
    // --share none on the command line (over the config file's) prints nothing more.
    const quiet = await cli([DEPS, "--format", "json", "--budget", "3", "--share", "none"], {
      files: { ".espalier.yaml": "share: total\n" },
    });
    expect(quiet.stderr).toBe("");
    // Text keeps the config file's percentages, with no note.
    const text = await cli([DEPS, "--budget", "3"], { files: { ".espalier.yaml": "share: total\n" } });
    expect(text.stderr).toBe("");
    expect(text.stdout).toContain("100%");
  });
});
