import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: two versions of an administrative-division table linked by code and parent code, in which
// a district moved to another city and got a new name (invented names here). A node has one kind, and
// moved wins; the old name was then shown nowhere: `[moved from a] leaf2`, JSON without it, while a
// moved node's field edits and size change were shown.
const oldCsv = "id,parent,name,version\n1,,harbor,1\n2,1,north-quay,1\n3,1,south-quay,1\n4,2,berth-7,1\n";
const newCsv = "id,parent,name,version\n1,,harbor,1\n2,1,north-quay,1\n3,1,south-quay,1\n4,3,berth-9,2\n";

describe("a node both moved and renamed", () => {
  it("counts as moved and says its old name, in text, Markdown and JSON", async () => {
    const files = { "old.csv": oldCsv, "new.csv": newCsv };
    const text = await cli(["diff", "old.csv", "new.csv", "--bare"], { files });
    expect(text.stdout).toContain(
      ": south-quay / [moved from north-quay, renamed from berth-7, version 1 -> 2] berth-9  2 nodes\n",
    );
    const md = await cli(["diff", "old.csv", "new.csv", "--bare", "--format", "markdown"], { files });
    expect(md.stdout).toContain("[moved from north-quay, renamed from berth-7, version 1 -> 2]");
    const json = JSON.parse(
      (await cli(["diff", "old.csv", "new.csv", "--format", "json"], { files })).stdout,
    );
    // One kind each (docs/diff.md): moved, not renamed, in the counts.
    expect(json.changes).toMatchObject({ moved: 1, renamed: 0, edited: 0 });
    const berth = json.root.children[1].children[0];
    expect(berth).toMatchObject({ change: "moved", movedFrom: "north-quay", renamedFrom: "berth-7" });
  });

  it("a move that keeps the name says no old name", async () => {
    const files = { "old.csv": oldCsv, "new.csv": newCsv.replace("berth-9,2", "berth-7,1") };
    const text = await cli(["diff", "old.csv", "new.csv", "--bare"], { files });
    expect(text.stdout).toContain(": south-quay / [moved from north-quay] berth-7  2 nodes\n");
  });
});
