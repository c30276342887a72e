import { spawnSync } from "node:child_process";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { commandLine, shellQuote } from "../../src/explore/command-line.js";

/** The arguments a shell reads from `line` (printf prints each, NUL-terminated). */
function shellReads(shell: string, line: string): string[] {
  const out = spawnSync(shell, ["-c", `printf '%s\\0' ${line}`], { encoding: "utf8" });
  expect(out.status).toBe(0);
  return out.stdout.split("\0").slice(0, -1);
}

const awkward = [
  "",
  "plain",
  "two words",
  "it's",
  'a"b',
  "$HOME",
  "`x`",
  "*",
  "~0",
  "a\\b",
  "-x",
  "é漢",
  "tab\there",
  "nl\nx",
  "\u001b[31m",
  "\u202eabc",
  "'",
  "\\'",
];

describe("shellQuote(arg)", () => {
  it("reads back as the same argument in a POSIX shell (bash, the reference; dash without $'')", () => {
    // POSIX.1-2024 XCU 2.2 (quoting), 2.2.4 (dollar-single-quotes); bash implements both, dash (Debian's
    // sh, 0.5.12) only the single quotes, so it reads the arguments without control characters.
    const line = awkward.map(shellQuote).join(" ");
    expect(shellReads("bash", line)).toEqual(awkward);
    const noControls = awkward.filter((a) => !/[\u0000-\u001f\u202e]/.test(a));
    expect(shellReads("sh", noControls.map(shellQuote).join(" "))).toEqual(noControls);
  });

  it("reads back for random strings of awkward characters (bash)", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.string({
            unit: fc.constantFrom(
              "a",
              " ",
              "'",
              '"',
              "\\",
              "$",
              "\t",
              "\n",
              "\u0007",
              "é",
              "!",
              "~",
              "*",
              "\u2066",
            ),
          }),
          { minLength: 1, maxLength: 6 },
        ),
        (args) => {
          const readable = args.filter((a) => !a.includes("\u0000"));
          expect(shellReads("bash", readable.map(shellQuote).join(" "))).toEqual(readable);
        },
      ),
      { numRuns: 40 },
    );
  });

  it("never writes a control or bidi character itself", () => {
    for (const arg of awkward) expect(shellQuote(arg)).not.toMatch(/[\u0000-\u001f\u007f\u202e]/);
  });

  it("leaves plain words alone", () => {
    expect(shellQuote("services/ledger/src")).toBe("services/ledger/src");
    expect(shellQuote("--budget")).toBe("--budget");
  });
});

describe("commandLine(head, foci, budget, tail)", () => {
  it("puts one --focus per path, then the budget and --bare (the view has no header), then the tail", () => {
    expect(commandLine(["espalier", "org.csv"], ["a/b c", "d"], 23, ["--importance", "size"])).toBe(
      "espalier org.csv --focus 'a/b c' --focus d --budget 23 --bare --importance size",
    );
  });
});
