import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: an id typed with a space after it, as a sheet's cell keeps it and CSV keeps it (RFC 4180,
// section 2.4: spaces are part of a field), while the parent cells that name it have none. It was
// MISSING_PARENT naming only the parent "3", which no row seemed to lack. Invented ferry fleet.
describe("an id with spaces around it, named by parent cells without them", () => {
  it("is MISSING_PARENT naming the row whose id it is with its spaces (CSV)", async () => {
    const csv = "id,parent,name\n1,,fleet\n3 ,1,tugs\n4,3,harbour tug\n";
    const r = await cli(["-", "--input-format", "csv"], { stdin: csv });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /row 3 names the parent "3", .*; row 2's id is the same with spaces around it: CSV and TSV keep spaces.*\[MISSING_PARENT\]\n$/,
    );
  });

  it("is MISSING_PARENT saying so for JSON rows too", async () => {
    const rows = JSON.stringify([
      { id: "1", parent: "", name: "fleet" },
      { id: " 3", parent: "1", name: "tugs" },
      { id: "4", parent: "3", name: "harbour tug" },
    ]);
    const r = await cli(["-", "--input-format", "rows"], { stdin: rows });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /row 2's id is the same with spaces around it: a JSON string keeps every character.*\[MISSING_PARENT\]\n$/,
    );
  });

  it("names no row when no id is the parent with spaces", async () => {
    const r = await cli(["-", "--input-format", "csv"], {
      stdin: "id,parent,name\n1,,fleet\n4,3,harbour tug\n",
    });
    expect(r.stderr).toMatch(/row 2 names the parent "3", which no row has as its id \[MISSING_PARENT\]\n$/);
  });
});
