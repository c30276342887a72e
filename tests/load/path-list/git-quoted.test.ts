import { describe, expect, it } from "vitest";
import { gitUnquoted } from "../../../src/load/path-list/git-quoted.js";
import { cli } from "../../helpers/cli.js";

const inner = (quoted: string) => {
  const bytes = Buffer.from(quoted, "latin1");
  return gitUnquoted(bytes, 1, bytes.length - 1)?.toString("utf8");
};

describe("gitUnquoted(bytes, start, end)", () => {
  it("gitUnquoted reads octal bytes and letter escapes as git writes them (C style, from memory)", () => {
    expect(inner('"docs/\\346\\275\\256.md"')).toBe("docs/潮.md");
    expect(inner('"a\\tb\\n\\"c\\"\\\\"')).toBe('a\tb\n"c"\\');
  });

  it("gitUnquoted gives undefined for no escape, an unescaped quote or an escape git never writes", () => {
    expect(inner('"quay"')).toBeUndefined();
    expect(inner('"a"b\\t"')).toBeUndefined();
    expect(inner('"a\\qb"')).toBeUndefined();
    expect(inner('"a\\4"')).toBeUndefined();
    expect(inner('"end\\"')).toBeUndefined();
  });
});

describe("quoted names in a path list", () => {
  it("a name in quotes with no escape is read as written; a quoted name that is not UTF-8 is PARSE_PATHS", async () => {
    const r = await cli(["-", "--format", "json"], { stdin: 'quay/"north"\nquay/south\n' });
    expect(JSON.parse(r.stdout).root.children.map((c: { name: string }) => c.name)).toEqual([
      '"north"',
      "south",
    ]);
    const latin = await cli(["-"], { stdin: 'quay/a\n"quay/caf\\351"\n' });
    expect(latin.code).toBe(2);
    expect(latin.stderr).toMatch(
      /^espalier: <stdin>:2:1: .*git ls-files -z.*--nul-separated.*\[PARSE_PATHS\]\n$/,
    );
  });
});
