import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { errorCodes } from "../../src/errors.js";
import { readingNoteCodes } from "../../src/model/reading-note.js";

// A reader who meets a code has only the shipped docs: docs/reliability.md says what every error
// code and every reading note code means and what to do, one table row each, in the code's order.
const page = readFileSync("docs/reliability.md", "utf8").split("\n");

/** The codes in the first cells of the table under `## heading`, in order. */
function tableCodes(heading: string): string[] {
  const at = page.indexOf(`## ${heading}`);
  expect(at, `docs/reliability.md has a section "## ${heading}"`).toBeGreaterThanOrEqual(0);
  const codes: string[] = [];
  for (let k = at + 1; k < page.length && !page[k].startsWith("## "); k++) {
    const row = /^\| `([A-Z_]+)` \| (.+) \| (.+) \|$/.exec(page[k]);
    if (row) codes.push(row[1]);
  }
  return codes;
}

describe("docs/reliability.md", () => {
  it("says what every error code of src/errors.ts means and what to do, in its order", () => {
    expect(tableCodes("Error codes")).toEqual([...errorCodes]);
  });

  it("says what every reading note code of src/model/reading-note.ts means and what to do, in its order", () => {
    expect(tableCodes("Reading notes")).toEqual([...readingNoteCodes]);
  });
});
