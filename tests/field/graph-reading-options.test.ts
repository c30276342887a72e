import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: link options on graphs other than plain edge lists were ignored with exit 0 (an
// adjacency map given --parent-field or --read-as values printed the same tree as without them), and
// --id-field naming the id column of --nodes records was USAGE on a plain edge list (the records
// could not be keyed by another column). Invented quillfeather data; expected readings from
// docs/input.md (common practice, no source).
const map = '{"ledger": ["ledger-core", "kelp-log"], "ledger-core": ["kelp-log"]}';
const yamlMap = "ledger: [ledger-core, kelp-log]\nledger-core: [kelp-log]\n";
const table = "id,parent\nledger,\nledger-core,ledger\nkelp-log,ledger\nkelp-log,ledger-core\n";
const pairs = "ledger ledger-core\nledger kelp-log\nledger-core kelp-log\n";
const records = "package,size\nledger,10\nledger-core,20\nkelp-log,30\n";

async function usage(args: string[], stdin: string, options: string, reading: string) {
  const r = await cli(["-", ...args], { stdin });
  expect(r.code).toBe(2);
  expect(r.stdout).toBe("");
  expect(r.stderr).toMatch(
    new RegExp(
      `^espalier: <stdin>: ${options} do(es)? not apply: this input is read as ${reading}.*\\[USAGE\\]\\n$`,
    ),
  );
}

describe("link options on a graph that does not read them", () => {
  it("on a JSON or YAML adjacency map, every option but --children-field is USAGE", async () => {
    for (const [stdin, format] of [
      [map, "json"],
      [yamlMap, "yaml"],
    ]) {
      const args = ["--input-format", format, "--graph"];
      await usage([...args, "--parent-field", "up"], stdin, "--parent-field", "an adjacency map");
      await usage([...args, "--child-field", "c"], stdin, "--child-field", "an adjacency map");
      await usage([...args, "--path-field", "p"], stdin, "--path-field", "an adjacency map");
      await usage([...args, "--id-field", "pid"], stdin, "--id-field", "an adjacency map");
      await usage([...args, "--read-as", "values"], stdin, "--read-as", "an adjacency map");
      const ok = await cli(["-", ...args, "--children-field", "deps", "--bare"], { stdin });
      expect(ok.stderr).toBe("");
      // 3 nodes: ledger, ledger-core, kelp-log (once), its second parent a reference.
      expect(ok.stdout.split("\n")[0]).toBe(". ledger  3 nodes");
    }
  });

  it("on a --graph table, --path-field, --child-field, --children-field and --read-as are USAGE", async () => {
    const args = ["--input-format", "csv", "--graph"];
    const reading = "a graph linked by id and parent columns";
    await usage([...args, "--path-field", "p"], table, "--path-field", reading);
    await usage([...args, "--child-field", "c"], table, "--child-field", reading);
    await usage([...args, "--children-field", "c"], table, "--children-field", reading);
    await usage([...args, "--read-as", "values"], table, "--read-as", reading);
    const ok = await cli(["-", ...args, "--id-field", "id", "--parent-field", "parent", "--bare"], {
      stdin: table,
    });
    expect(ok.stderr).toBe("");
    expect(ok.stdout.split("\n")[0]).toBe(". ledger  3 nodes");
  });

  it("on a plain edge list, --read-as is USAGE", async () => {
    await usage(["--input-format", "edges", "--read-as", "values"], pairs, "--read-as", "an edge list");
  });

  it("--id-field naming the id column of --nodes records is read on a plain edge list", async () => {
    const r = await cli(
      ["-", "--input-format", "edges", "--nodes", "records.csv", "--id-field", "package", "--bare"],
      { stdin: pairs, files: { "records.csv": records } },
    );
    expect(r.stderr).toBe("");
    // Sizes 10 + 20 + 30 = 60, each package counted once (kelp-log's second parent is a reference).
    expect(r.stdout.split("\n")[0]).toBe(". ledger  3 nodes, 60");
    // Without --nodes it names no column the edge list has: USAGE as before.
    const alone = await cli(["-", "--input-format", "edges", "--id-field", "package"], { stdin: pairs });
    expect(alone.code).toBe(2);
    expect(alone.stderr).toMatch(
      /^espalier: <stdin>: --id-field does not apply: an edge list .*\[USAGE\]\n$/,
    );
  });

  it("--nodes records without the id column: FIELD_MISSING names the records' file (its header), not the graph's", async () => {
    const csv = await cli(["-", "--input-format", "edges", "--nodes", "records.csv"], {
      stdin: pairs,
      files: { "records.csv": "package,size\nledger,10\n" },
    });
    expect(csv.code).toBe(2);
    expect(csv.stderr).toMatch(
      /^espalier: records\.csv:1:1: the node records need an "id" column; .*\[FIELD_MISSING\]\n$/,
    );
    const json = await cli(["-", "--input-format", "edges", "--nodes", "records.json"], {
      stdin: pairs,
      files: { "records.json": '[{"package": "ledger", "size": 10}]' },
    });
    expect(json.stderr).toMatch(
      /^espalier: records\.json: the node records need an "id" column; .*\[FIELD_MISSING\]\n$/,
    );
  });

  it("--nodes records that are not JSON (RFC 8259): PARSE_JSON at the line and column in the records' file", async () => {
    // A bare word where a value belongs, on line 3 column 9; the engine's own JSON.parse gives no place.
    const r = await cli(["-", "--input-format", "edges", "--nodes", "records.json"], {
      stdin: pairs,
      files: { "records.json": '[{"id": "ledger",\n  "size": 10},\n {"id": kelp-log}]' },
    });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^espalier: records\.json:3:9: .*\[PARSE_JSON\]\n$/);
  });
});
