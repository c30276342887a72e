import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: configuration files such as tsconfig.json are often JSONC, JSON with comments and
// trailing commas, which their own tools read (TypeScript's tsconfig; from memory) and RFC 8259 does
// not allow. espalier's PARSE_JSON said 'expected a double-quoted property name, found "/"', which
// names neither; it now says what the file holds and what to do. Invented project settings below.
const jsonc = [
  "{",
  "  // compiler settings for the tidewater build",
  '  "compilerOptions": {',
  '    "strict": true, /* always */',
  '    "target": "ES2022",',
  "  },",
  '  "include": ["src", "tests",],',
  "}",
  "",
].join("\n");

describe("a JSONC file (comments, trailing commas)", () => {
  it("is PARSE_JSON at the comment, saying JSON has no comments", async () => {
    const result = await cli(["tsconfig.json"], { files: { "tsconfig.json": jsonc } });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: tsconfig\.json:2:3: invalid JSON: expected a double-quoted property name, found "\/"; JSON has no comments \(RFC 8259\).* \[PARSE_JSON\]\n$/,
    );
  });

  it("is PARSE_JSON at a trailing comma's bracket, in an object and in an array", async () => {
    const noComments = jsonc.replace(/ *\/\/.*\n/, "").replace(/ \/\*.*\*\//, "");
    const object = await cli(["-", "--input-format", "json"], { stdin: noComments });
    expect(object.stderr).toMatch(
      /:5:3: .*found "}"; JSON has no comma before a closing bracket .*\[PARSE_JSON\]/,
    );
    const array = await cli(["-", "--input-format", "json"], { stdin: '{"include": ["src", "tests",]}' });
    expect(array.stderr).toMatch(
      /:1:29: .*"\]" where a value was expected; JSON has no comma before a closing bracket/,
    );
  });

  it("says nothing of JSONC where a bracket is simply wrong or a value missing", async () => {
    for (const text of ['{"a": [1, 2}', '{"a": }', '{"a": 1 ]']) {
      const result = await cli(["-", "--input-format", "json"], { stdin: text });
      expect(result.code).toBe(2);
      expect(result.stderr).not.toMatch(/JSONC|comments/);
    }
  });

  it("reads once the comments and trailing commas are removed", async () => {
    const plain = JSON.stringify({
      compilerOptions: { strict: true, target: "ES2022" },
      include: ["src", "tests"],
    });
    const result = await cli(["-", "--input-format", "json", "--format", "json"], { stdin: plain });
    expect(result.code).toBe(0);
    // Every value a node: the two objects' 2 + 2 members, the array's 2 items, and the root.
    expect(JSON.parse(result.stdout).totals.nodes).toBe(7);
  });
});
