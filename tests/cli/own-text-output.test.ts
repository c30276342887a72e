import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const FILES = new URL("../../fixtures/tidewater-files.paths", import.meta.url).pathname;

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), "espalier-own-text-"));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** The code in the one error line: `espalier: …[CODE]`. */
function errorCode(stderr: string): string | undefined {
  return /\[([A-Z_]+)\]\n$/.exec(stderr)?.[1];
}

describe("espalier SAVED where SAVED is espalier's own text or Markdown output", () => {
  // Field defect: a CI job that saved the text summary (not --format json) as its artefact and compared
  // it with espalier diff got every line of it read as a path: "31 added, 1,711 removed", exit 1.
  const outputs: [string, string[]][] = [
    ["a summary", [FILES, "--budget", "12"]],
    ["a summary without its key", [FILES, "--budget", "12", "--no-key", "--focus", "services"]],
    ["a summary wrapped at 30 columns", [FILES, "--budget", "12", "--width", "30"]],
    ["a summary in colour", [FILES, "--budget", "12", "--color", "always"]],
    ["a summary in Markdown", [FILES, "--budget", "12", "--format", "markdown"]],
    ["a diff", ["diff", FILES, FILES, "--budget", "12"]],
  ];
  for (const [what, args] of outputs) {
    it(`is refused with PARSE_PATHS for ${what}, saved as .txt, with no extension or on standard input`, async () => {
      const saved = await cli(args);
      expect(saved.code, saved.stderr).toBe(0);
      for (const name of ["view.txt", "view.out"]) {
        const file = join(dir, name);
        await writeFile(file, saved.stdout);
        const r = await cli([file, "--budget", "8"]);
        expect(r.code, r.stdout).toBe(2);
        expect(r.stdout).toBe("");
        expect(errorCode(r.stderr)).toBe("PARSE_PATHS");
        expect(r.stderr).toContain("--format json");
      }
      const piped = await cli(["-", "--budget", "8"], { stdin: saved.stdout });
      expect(piped.code).toBe(2);
      expect(errorCode(piped.stderr)).toBe("PARSE_PATHS");
    });
  }

  it("makes espalier diff of a saved JSON summary and a saved text summary exit 2, not 1", async () => {
    const json = join(dir, "base.json");
    const text = join(dir, "head.txt");
    expect((await cli([FILES, "--budget", "12", "--format", "json", "-o", json])).code).toBe(0);
    expect((await cli([FILES, "--budget", "12", "-o", text])).code).toBe(0);
    const r = await cli(["diff", json, text, "--fail-on-change"]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(errorCode(r.stderr)).toBe("PARSE_PATHS");
  });

  it("still reads a path list whose first entry merely starts with the word summary", async () => {
    const file = join(dir, "notes.txt");
    await writeFile(file, "summary: notes\nsummary.md\n");
    const r = await cli([file, "--budget", "8", "--format", "json"]);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).totals.nodes).toBe(3);
  });
});
