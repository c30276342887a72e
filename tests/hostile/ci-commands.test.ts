import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Lines CI runners read as commands (common practice, no source; from memory: GitHub Actions acts on a
// line starting "::" (blanks before it allowed here, to be safe), Azure Pipelines on "##vso[" anywhere in
// a line and on a line starting "##[", and GitHub's older syntax on "##[" anywhere).
const COMMAND_START = /^[ \t]*(::|##)/;
const COMMAND_ANYWHERE = /##(vso)?\[/i;

function expectNoCommand(output: string, what: string): void {
  for (const line of output.split(/\r\n|\r|\n|\u2028|\u2029|\u0085/)) {
    expect(line, what).not.toMatch(COMMAND_START);
    expect(line, what).not.toMatch(COMMAND_ANYWHERE);
  }
}

const FORMATS = ["text", "markdown", "json", "svg"];

// Names built from the pieces of CI commands, line breaks and blanks, so that commands can form anywhere.
const piece = fc.constantFrom(
  "::",
  ":",
  "##",
  "#",
  "[",
  "vso",
  "VSO",
  "error",
  "]",
  "\n",
  "\r",
  " ",
  "\t",
  "x",
  "/",
);
const nameArb = fc.array(piece, { minLength: 1, maxLength: 8 }).map((xs) => xs.join(""));

describe("espalier - (no line of any format is a CI command)", () => {
  it("names, labels and paths made of command pieces, in every format, summary and diff (property)", async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(nameArb, { minLength: 1, maxLength: 6 }), async (names) => {
        const tree = {
          name: names[0],
          title: names[names.length - 1],
          children: names.map((name, k) => ({
            name,
            title: name,
            size: k + 1,
            children: [{ name: `${name}/${k}` }],
          })),
        };
        const stdin = JSON.stringify(tree);
        for (const format of FORMATS) {
          for (const extra of [[], ["--label", "{title} {path}"], ["--no-chains"]]) {
            const r = await cli(["-", "--format", format, "--budget", "60", ...extra], { stdin });
            expect(r.code, r.stderr).toBe(0);
            expectNoCommand(r.stdout, `${format} ${extra.join(" ")}`);
          }
        }
      }),
      { numRuns: 25 },
    );
  });

  it("a diff of such trees, in every format", async () => {
    const before = JSON.stringify({
      name: "::r",
      children: [
        { name: "##vso[a]", size: 1 },
        { name: "::error::b", size: 2 },
      ],
    });
    const after = JSON.stringify({
      name: "::r",
      children: [
        { name: "##[error]c", size: 1 },
        { name: "::error::b", size: 5 },
      ],
    });
    const { mkdtemp, writeFile } = await import("node:fs/promises");
    const { join } = await import("node:path");
    const { tmpdir } = await import("node:os");
    const dir = await mkdtemp(join(tmpdir(), "espalier-ci-"));
    await writeFile(join(dir, "old.json"), before);
    await writeFile(join(dir, "new.json"), after);
    for (const format of FORMATS) {
      const r = await cli(["diff", join(dir, "old.json"), join(dir, "new.json"), "--format", format]);
      expect(r.code, r.stderr).toBe(0);
      expectNoCommand(r.stdout, format);
    }
  });

  it("error lines: a focus, a name or a value made of command pieces", async () => {
    for (const focus of ["##vso[task.setvariable variable=x]y", "\n::error::x", "##[error]x"]) {
      const r = await cli(["-", "--focus", focus], { stdin: "a\nb\n" });
      expect(r.code).toBe(2);
      expectNoCommand(r.stderr, focus);
    }
    const r = await cli(["-"], { stdin: "##vso[x]\n##vso[x]\n" });
    expect(r.code).toBe(2);
    expectNoCommand(r.stderr, "duplicate path");
  });
});
