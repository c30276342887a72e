import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: an edge table whose header names its columns otherwise than the options say (`from,to`
// with --parent-field src --child-field dst, an invented quillfeather export) was read as a plain edge
// list: each line one id, three lone nodes, exit 0. Column options on a plain edge list (pairs
// separated by spaces) were ignored the same way.
const table = "from,to\nledger,ledger-core\nledger-core,kelp-log\n";

describe("column options on an edge list", () => {
  it("naming columns the header lacks is FIELD_MISSING at line 1, quoting the header", async () => {
    const r = await cli(["-", "--input-format", "edges", "--parent-field", "src", "--child-field", "dst"], {
      stdin: table,
    });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: .*names no src and dst columns.*"from,to".*\[FIELD_MISSING\]\n$/,
    );
  });

  it("naming the header's columns reads the table (2 edges, 3 nodes in one chain)", async () => {
    const r = await cli(
      ["-", "--input-format", "edges", "--parent-field", "from", "--child-field", "to", "--bare"],
      {
        stdin: table,
      },
    );
    expect(r.stderr).toBe("");
    expect(r.stdout).toBe(". ledger / ledger-core / kelp-log  3 nodes\n");
  });

  it("without options, a table whose header names no parent and child is PARSE_CSV, not lone nodes", async () => {
    const r = await cli(["-", "--input-format", "edges"], { stdin: `\n${table}` });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:2:1: no line holds two ids .*"from,to", holds commas.*\[PARSE_CSV\]\n$/,
    );
    // One id a line without commas still declares lone nodes (docs/input.md).
    const lone = await cli(["-", "--input-format", "edges", "--bare"], { stdin: "ledger\nkelp-log\n" });
    expect(lone.stdout).toBe(". (stdin)  3 nodes\n  . ledger\n  . kelp-log\n");
  });

  it("another link option on pairs separated by spaces is USAGE naming it", async () => {
    const r = await cli(["-", "--input-format", "edges", "--path-field", "p"], {
      stdin: "ledger ledger-core\nledger-core kelp-log\n",
    });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /^espalier: <stdin>: --path-field does not apply: an edge list is read .*\[USAGE\]\n$/,
    );
  });
});
