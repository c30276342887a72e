import { describe, expect, it } from "vitest";
import { COMMENT_LIMIT, commentSizeNote } from "../../src/cli/comment-size.js";
import { cli } from "../helpers/cli.js";

// GitHub's 65,536-character limit on a pull-request comment: common practice, no source.

/** Two versions of a fictional harbour's services, each of 60 with 12 long fields, every one edited. */
function versions(fields: number, length: number): Record<string, string> {
  const version = (v: string) =>
    JSON.stringify({
      name: "harbour",
      children: Array.from({ length: 60 }, (_, i) => ({
        name: `berth-${i}`,
        ...Object.fromEntries(Array.from({ length: fields }, (_, k) => [`f${k}`, `${v.repeat(length)}${k}`])),
      })),
    });
  return { "old.json": version("a"), "new.json": version("b") };
}

describe("commentSizeNote(format, text)", () => {
  it("says nothing up to the limit, nor for other formats", () => {
    expect(commentSizeNote("markdown", "x".repeat(COMMENT_LIMIT))).toBeUndefined();
    expect(commentSizeNote("text", "x".repeat(COMMENT_LIMIT + 1))).toBeUndefined();
    // Counted in characters (code points): 40,000 two-unit emoji are 80,000 UTF-16 units.
    expect(commentSizeNote("markdown", "\u{1f6a2}".repeat(40_000))).toBeUndefined();
    expect(commentSizeNote("markdown", "x".repeat(COMMENT_LIMIT + 1))).toMatch(/65,537 characters/);
  });
});

describe("espalier diff --format markdown longer than a pull-request comment holds", () => {
  it("warns on standard error, prints it whole and keeps the exit status", async () => {
    const files = versions(12, 300);
    const r = await cli(["diff", "old.json", "new.json", "--format", "markdown", "--fail-on-change"], {
      files,
    });
    expect(r.code).toBe(1);
    expect(r.stdout.length).toBeGreaterThan(COMMENT_LIMIT);
    expect(r.stderr).toMatch(/^espalier: warning: the Markdown is [\d,]+ characters, more than the 65,536 /m);
  });

  it("says nothing when it fits, or for text", async () => {
    const files = versions(2, 10);
    const md = await cli(["diff", "old.json", "new.json", "--format", "markdown"], { files });
    expect(md.stdout.length).toBeLessThan(COMMENT_LIMIT);
    expect(md.stderr).not.toMatch(/warning/);
    const text = await cli(["diff", "old.json", "new.json"], { files: versions(12, 300) });
    expect(text.stderr).not.toMatch(/warning/);
  });
});
