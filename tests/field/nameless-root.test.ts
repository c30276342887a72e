import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: /usr/share/iso-codes/json/iso_3166-1.json is one object with one field, "3166-1", holding
// an array of records that have a "name" (the file as installed here), reduced to invented harbours.
// Its top object has no name, so the root printed as `""`: the one line that should say what the whole
// is told the reader nothing. It now takes the input file's base name ((stdin) from standard input), as
// a root espalier adds does; its path stays empty.
const harbours = JSON.stringify({
  harbours: [
    { code: "TW1", name: "Saltmarsh Quay" },
    { code: "TW2", name: "Brackwater Pier" },
    { code: "TW3", name: "Gullstone Wharf" },
  ],
});

/** The root's line: the first after the header and the key that starts with a mark. */
const isRoot = (line: string) => /^[.*:&] /.test(line);

describe("a nested document whose top object has no name", () => {
  it("prints the root as the file's name, in text and JSON, its path empty", async () => {
    const text = await cli(["-"], { stdin: harbours });
    expect(text.stderr).toBe("");
    expect(text.stdout.split("\n").find(isRoot)).toBe(". (stdin)  4 nodes");
    const json = JSON.parse((await cli(["-", "--format", "json"], { stdin: harbours })).stdout);
    expect(json.root.name).toBe("(stdin)");
    expect(json.root.path).toBe("");
    // 3 records and the top object (jq '."harbours" | length' gives 3).
    expect(json.totals.nodes).toBe(4);
  });

  it("names a YAML top mapping without a name the same way", async () => {
    const yaml = "harbours:\n  - name: Saltmarsh Quay\n  - name: Brackwater Pier\n";
    const result = await cli(["-", "--input-format", "yaml"], { stdin: yaml });
    expect(result.stderr).toBe("");
    expect(result.stdout.split("\n").find(isRoot)).toBe(". (stdin)  3 nodes");
  });

  it("leaves a named top object's name as it is", async () => {
    const named = JSON.stringify({
      name: "tidewater",
      dependencies: { "mooring-log": { version: "1.2.0" } },
    });
    const result = await cli(["-"], { stdin: named });
    expect(result.stdout.split("\n").find(isRoot)).toBe(". tidewater / mooring-log  2 nodes");
  });
});
