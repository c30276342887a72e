import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a cloud SDK's command definitions on this machine are YAML files holding a top-level
// sequence of one mapping (`- release_tracks: [...]\n  help_text: {...}\n  request: {...}`), reduced
// here to an invented quay-service command. With --read-as nodes the one mapping has no "children"
// field, so the input was one node: one line, exit 0, where the same mapping at the top level is
// FIELD_MISSING naming its nested fields. And a field found to hold the children under --read-as nodes
// (its schema files' `properties`) was not named on the header, which names it without the option.
const command = [
  "- release_tracks: [ALPHA, GA]",
  "  help_text:",
  "    brief: Create a quay service.",
  "  request:",
  "    collection: harbor.projects.quays",
  "",
].join("\n");

describe("--read-as nodes on a top-level array of one object", () => {
  it("YAML: FIELD_MISSING naming the one mapping's nested fields, as for a top-level mapping", async () => {
    const r = await cli(["create.yaml", "--read-as", "nodes"], { files: { "create.yaml": command } });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe(
      'espalier: create.yaml: no node has the children field "children", so the input would be one node; the top-level sequence\'s one mapping\'s fields holding mappings or sequences are "release_tracks", "help_text", "request": name the one holding the children with --children-field, or read every value with --read-as values [FIELD_MISSING]\n',
    );
  });

  it("JSON: the same, streamed; a lone object without nested fields is still one node", async () => {
    const json = '[{"name": "quay", "help_text": {"brief": "Create"}, "tracks": ["GA"]}]';
    const r = await cli(["-", "--read-as", "nodes"], { stdin: json });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /the top-level array's one object's fields holding objects or arrays are "help_text", "tracks": .*\[FIELD_MISSING\]\n$/,
    );
    const leaf = await cli(["-", "--read-as", "nodes", "--bare"], { stdin: '[{"name": "quay", "size": 4}]' });
    expect(leaf.code).toBe(0);
    expect(leaf.stdout).toBe(". quay  4\n");
    // Two elements are two nodes: nothing to refuse.
    const two = await cli(["-", "--read-as", "nodes", "--bare"], {
      stdin: '[{"name": "quay", "meta": {"x": 1}}, {"name": "pier"}]',
    });
    expect(two.code).toBe(0);
  });

  it("a children field found under --read-as nodes is named on the header", async () => {
    const schema =
      "title: quay\nproperties:\n  depth:\n    type: integer\n  berths:\n    properties:\n      count: {type: integer}\n";
    const r = await cli(["s.yaml", "--read-as", "nodes"], { files: { "s.yaml": schema } });
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toMatch(/^summary: 4 nodes; children under properties; no focus; /);
  });
});
