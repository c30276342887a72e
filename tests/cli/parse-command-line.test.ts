import { describe, expect, it } from "vitest";
import { parseCommandLine } from "../../src/cli/parse-command-line.js";
import { EspalierError } from "../../src/errors.js";

function usageError(argv: string[]): EspalierError {
  try {
    parseCommandLine(argv);
  } catch (err) {
    expect(err).toBeInstanceOf(EspalierError);
    expect((err as EspalierError).code).toBe("USAGE");
    return err as EspalierError;
  }
  throw new Error(`no error for ${argv.join(" ")}`);
}

describe("parseCommandLine(argv)", () => {
  it("reads a summary's input and options in any order, long and short, with = or a separate value", () => {
    expect(parseCommandLine(["-b30", "in.json", "--focus=a/b", "-f", "c", "--no-chains"])).toEqual({
      command: "summary",
      args: ["in.json"],
      given: { budget: "30", focus: ["a/b", "c"], chains: false },
    });
  });

  it("gives options written before the word diff to the diff, as those written after it", () => {
    const before = parseCommandLine(["--budget", "5", "--children-field", "deps", "diff", "a", "b"]);
    const after = parseCommandLine(["diff", "a", "b", "--budget", "5", "--children-field", "deps"]);
    expect(before).toEqual(after);
    expect(before).toEqual({
      command: "diff",
      args: ["a", "b"],
      given: { budget: "5", childrenField: "deps" },
    });
  });

  it("takes - as standard input and everything after -- as arguments", () => {
    expect(parseCommandLine(["-", "--focus", "-x"]).given.focus).toEqual(["-x"]);
    expect(parseCommandLine(["--", "--budget"]).args).toEqual(["--budget"]);
    expect(parseCommandLine(["--", "diff"]).command).toBe("summary");
  });

  it("refuses an unknown option, naming the nearest known one", () => {
    expect(usageError(["--budgt", "5", "in"]).details).toEqual({ option: "--budgt", suggestion: "--budget" });
    expect(usageError(["--zzzzzz", "in"]).details).toEqual({ option: "--zzzzzz" });
  });

  it("refuses an option without its value, a switch with one, and a value that is the next option", () => {
    expect(usageError(["in", "--budget"]).details.option).toBe("--budget");
    expect(usageError(["in", "--budget", "--focus", "x"]).details.option).toBe("--budget");
    expect(usageError(["in", "--pseudonymize=yes"]).details.option).toBe("--pseudonymize");
  });

  it("refuses one option given twice with different values, and takes it given twice alike", () => {
    expect(usageError(["in", "--budget", "5", "--budget", "9"]).details.option).toBe("--budget");
    expect(parseCommandLine(["in", "-b", "5", "--budget=5"]).given.budget).toBe("5");
  });

  it("refuses a diff-only option on a summary rather than dropping it", () => {
    expect(usageError(["in", "--fail-on-change"]).details.option).toBe("--fail-on-change");
  });
});
