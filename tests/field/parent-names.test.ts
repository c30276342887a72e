import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: org-chart exports often write a person's manager by name, not by id (an invented
// quillfeather export below). The manager cell then matches no id: MISSING_PARENT, which said nothing
// of the way out. It now says the value is another row's name and names --id-field.
const csv = ["id,name,manager", "Q1,Ada Quill,", "Q2,Bo Tarn,Ada Quill", "Q3,Cy Venn,Bo Tarn", ""].join("\n");
const rows = JSON.stringify([
  { id: "Q1", name: "Ada Quill", manager: null },
  { id: "Q2", name: "Bo Tarn", manager: "Ada Quill" },
]);

describe("a parent column that holds names", () => {
  it.each([
    ["CSV", "org.csv", csv],
    ["JSON rows", "org.json", rows],
  ])("is MISSING_PARENT naming the row whose name it is and --id-field (%s)", async (_, file, text) => {
    const r = await cli([file, "--parent-field", "manager"], { files: { [file]: text } });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /row 2 names the manager "Ada Quill", which no row has as its id, but it is row 1's name; if the manager column holds names, say --id-field name \[MISSING_PARENT\]\n$/,
    );
  });

  it("reads with the remedy it names", async () => {
    const r = await cli(["org.csv", "--parent-field", "manager", "--id-field", "name", "--bare"], {
      files: { "org.csv": csv },
    });
    expect(r.stderr).toBe("");
    expect(r.stdout).toBe(". Ada Quill / Bo Tarn / Cy Venn  3 nodes\n");
  });

  it("without an id column, FIELD_MISSING names --id-field with the name column", async () => {
    const noIds = ["name,manager", "Ada Quill,", "Bo Tarn,Ada Quill", ""].join("\n");
    const r = await cli(["org.csv", "--parent-field", "manager"], { files: { "org.csv": noIds } });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('; if "manager" holds the rows\' names, say --id-field name;');
    const read = await cli(["org.csv", "--parent-field", "manager", "--id-field", "name", "--bare"], {
      files: { "org.csv": noIds },
    });
    expect(read.stdout).toBe(". Ada Quill / Bo Tarn  2 nodes\n");
  });

  it("names no row when the value is nobody's name either", async () => {
    const r = await cli(["org.csv", "--parent-field", "manager"], {
      files: { "org.csv": csv.replace("Bo Tarn,Ada Quill", "Bo Tarn,Q9") },
    });
    expect(r.stderr).toMatch(
      /row 2 names the manager "Q9", which no row has as its id \[MISSING_PARENT\]\n$/,
    );
  });
});
