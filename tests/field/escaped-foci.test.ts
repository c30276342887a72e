import { describe, expect, it } from "vitest";
import { safeText } from "../../src/model/safe-text.js";
import { cli } from "../helpers/cli.js";

// Field test: a name holding a tab prints as `c\u{9}d` (a control character never prints raw), and a
// CI script that copied that path from the header or a line into --focus got FOCUS_NO_MATCH. The check
// is espalier's own contract (docs/cli.md, --focus): every path it prints is accepted back as a focus;
// there is no published source for this round trip (common practice, no source). The names are of an
// invented harbour-ops share; U+0009 is CHARACTER TABULATION (Unicode, C0 controls).

const tab = "\t";
const listing = [
  "harbour-ops/manifests/berth 7",
  `harbour-ops/manifests/crane${tab}log`,
  // A name whose own text holds "\u{9}": it must not print as the tab's name does.
  "harbour-ops/manifests/crane\\u{9}log",
  "harbour-ops/manifests/crane\\u{9}log/archive",
  `harbour-ops/tug${tab}fleet/engine~1`,
  "harbour-ops/README",
].join("\n");
const files = { "share.txt": `${listing}\n` };

async function fociOf(focus: string): Promise<string[]> {
  const r = await cli(["share.txt", "--focus", focus, "--format", "json"], { files });
  expect(r.stderr).toBe("");
  expect(r.code).toBe(0);
  return JSON.parse(r.stdout).foci;
}

/** The header's `focus …` clause of a text run focused on `focus`. */
async function printedFocus(focus: string): Promise<string> {
  const r = await cli(["share.txt", "--focus", focus, "--width", "400"], { files });
  expect(r.code).toBe(0);
  const m = /; focus (.*?); \d+ of \d+ lines(?: \(default budget: not a terminal\))?$/.exec(
    r.stdout.split("\n")[0],
  );
  expect(m).not.toBeNull();
  return (m as RegExpExecArray)[1];
}

describe("a printed path holding an escape reads back as a focus", () => {
  it("the header's path of a name with a tab, pasted back, names that node (not the look-alike)", async () => {
    const raw = `manifests/crane${tab}log`;
    const printed = await printedFocus(raw);
    expect(printed).toBe("manifests/crane\\u{9}log");
    expect(await fociOf(printed)).toEqual([raw]);
    // Deeper, with an RFC 6901 escape in the same path (section 3: "~1" is "/", "~0" is "~").
    const deep = `tug${tab}fleet/engine~01`;
    const printedDeep = await printedFocus(deep);
    expect(printedDeep).toBe("tug\\u{9}fleet/engine~01");
    expect(await fociOf(printedDeep)).toEqual([deep]);
    // With the root's name in front, as find prints it.
    expect(await fociOf(`harbour-ops/${printed}`)).toEqual([raw]);
  });

  it("a name whose text holds \\u{ prints with that backslash escaped, and reads back as itself", async () => {
    expect(safeText("crane\\u{9}log")).toBe("crane\\u{5c}u{9}log");
    expect(safeText(`crane${tab}log`)).toBe("crane\\u{9}log");
    // A backslash that begins no escape is left as it is.
    expect(safeText("C:\\quay")).toBe("C:\\quay");
    const raw = "manifests/crane\\u{9}log/archive";
    const printed = await printedFocus(raw);
    expect(printed).toBe("manifests/crane\\u{5c}u{9}log/archive");
    expect(await fociOf(printed)).toEqual([raw]);
  });

  it("a chain copied from a printed line names the node it was printed for", async () => {
    const r = await cli(["share.txt", "--budget", "12", "--width", "400", "--no-key"], { files });
    const line = r.stdout.split("\n").find((l) => l.includes("tug"));
    expect(line).toBe("  . tug\\u{9}fleet / engine~1  2 nodes");
    expect(await fociOf("tug\\u{9}fleet / engine~1")).toEqual([`tug${tab}fleet/engine~01`]);
  });

  it("a typed path without escapes is read as typed; a wrong escape matches nothing", async () => {
    expect(await fociOf(`manifests/crane${tab}log`)).toEqual([`manifests/crane${tab}log`]);
    const r = await cli(["share.txt", "--focus", "manifests/crane\\u{a}log"], { files });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("[FOCUS_NO_MATCH]");
  });
});
