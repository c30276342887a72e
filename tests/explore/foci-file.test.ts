import { describe, expect, it } from "vitest";
import { parseConfig } from "../../src/cli/config-text.js";
import { EspalierError } from "../../src/errors.js";
import { configText, focusListText, isConfigName } from "../../src/explore/foci-file.js";

const what = { foci: ["services/ledger/src", "a b/~1c"], budget: 23, importance: "depth" as const };

describe("focusListText(what)", () => {
  it("writes one focus per line, read back as --focus-from reads them", () => {
    const text = focusListText(what);
    expect(text).toBe("services/ledger/src\na b/~1c\n");
    // --focus-from: one spec per line, verbatim, blank lines skipped (src/cli/summary-command.ts).
    expect(text.split(/\r?\n/).filter((l) => l !== "")).toEqual(what.foci);
  });

  it("refuses a path holding a line break, which a line-per-focus file cannot carry", () => {
    expect(() => focusListText({ ...what, foci: ["a\nb"] })).toThrow(EspalierError);
  });
});

describe("configText(existing, what)", () => {
  it("writes a config file the config reader accepts, with the foci, budget and importance", () => {
    const text = configText(null, { ...what, importance: "size" });
    expect(parseConfig(text, ".espalier.yaml")).toEqual({ focus: what.foci, budget: 23, importance: "size" });
  });

  it("keeps the other keys and the comments of an existing file", () => {
    const existing =
      "# team view\nparentField: manager # who reports to whom\nfocus: [old]\nlabel: '{title}'\n";
    const text = configText(existing, what);
    expect(text).toContain("# team view");
    expect(text).toContain("# who reports to whom");
    expect(parseConfig(text, "x.yaml")).toEqual({
      parentField: "manager",
      focus: what.foci,
      label: "{title}",
      budget: 23,
    });
  });

  it("refuses to overwrite a file that is not YAML, or not a mapping", () => {
    expect(() => configText("a: [", what)).toThrow(EspalierError);
    expect(() => configText("- a\n- b\n", what)).toThrow(EspalierError);
  });

  it("is chosen by a .yaml or .yml name", () => {
    expect(isConfigName(".espalier.yaml")).toBe(true);
    expect(isConfigName("team.YML")).toBe(true);
    expect(isConfigName("foci.txt")).toBe(false);
  });
});
