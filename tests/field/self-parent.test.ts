import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: an org chart exported with its top row as its own parent (some HR and database exports
// write the root so; common practice, no source), invented people. It is CYCLE, rightly: no row links
// it to the top; the message now says what such a row usually means and how to read it.
const chart = ["id,parent,name", "Q1,Q1,harbour master", "Q2,Q1,berth clerk", "Q3,Q2,tide reader", ""].join(
  "\n",
);

describe("a table whose top row is its own parent", () => {
  it("is CYCLE at that row, saying to leave its parent cell empty", async () => {
    const r = await cli(["-"], { stdin: chart });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:2:1: row 1 \(id "Q1"\) is its own parent; .*parent cell empty.*\[CYCLE\]\n$/,
    );
  });

  it("reads as the chart once that cell is empty", async () => {
    const r = await cli(["-", "--format", "json"], { stdin: chart.replace("Q1,Q1,", "Q1,,") });
    expect(r.code).toBe(0);
    // Source: the three rows, one root (awk -F, 'NR > 1' | wc -l gives 3).
    expect(JSON.parse(r.stdout).totals.nodes).toBe(3);
  });
});
