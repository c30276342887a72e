import { Buffer } from "node:buffer";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: tables saved by a spreadsheet in Latin-1 (ISO/IEC 8859-1: 0xE9 e-acute, 0xE8 e-grave)
// rather than UTF-8, reduced to invented quillfeather names. In UTF-8 (RFC 3629 section 4) 0xE9 and
// 0xE8 lead a three-byte sequence that "l" (0x6C) does not continue, so the WHATWG UTF-8 decoder
// (Encoding Standard, section 4.1) reads each as one U+FFFD: "Ad\xe9le" and "Ad\xe8le" both read as
// "Ad\uFFFDle". A row whose parent cell wrote the one was linked to the row whose id is the other,
// exit 0; an edge table made one node of the two.

const latin1 = (text: string) => Buffer.from(text, "latin1");

describe("a table whose ids are written in Latin-1 bytes", () => {
  // Ad\xe9le leads; Ad\xe8le (another person) is no row of this export, so Tomas's manager is missing.
  const orgChart = latin1("name,manager,title\nAd\xe9le,,Director\nTomas,Ad\xe8le,Engineer\n");

  it("is DUPLICATE_ID at the parent cell that reads as another row's id, not a link to that row", async () => {
    const result = await cli(["-", "--id-field", "name", "--parent-field", "manager"], { stdin: orgChart });
    expect(result.stdout).toBe("");
    expect(result.code).toBe(2);
    // Row 2 is line 3 of the input.
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:3(:\d+)?: row 2 writes the id "Ad\uFFFDle" in other bytes than row 1 does: .*iconv -f LATIN1 -t UTF-8.*\[DUPLICATE_ID\]\n$/,
    );
    // Converted to UTF-8 (as iconv -f LATIN1 -t UTF-8 gives it), the manager is missing: MISSING_PARENT.
    const converted = await cli(["-", "--id-field", "name", "--parent-field", "manager"], {
      stdin: orgChart.toString("latin1"),
    });
    expect(converted.code).toBe(2);
    expect(converted.stderr).toMatch(/\[MISSING_PARENT\]\n$/);
  });

  it("reads the same bytes written twice as one id, as before", async () => {
    const same = latin1("name,manager,title\nAd\xe9le,,Director\nTomas,Ad\xe9le,Engineer\n");
    const result = await cli(["-", "--id-field", "name", "--parent-field", "manager", "--format", "json"], {
      stdin: same,
    });
    expect(result.stderr).toBe("");
    expect(result.code).toBe(0);
    const summary = JSON.parse(result.stdout);
    expect(summary.totals.nodes).toBe(2);
    expect(summary.root.children[0].name).toBe("Tomas");
  });

  it("is DUPLICATE_ID in a graph table and an edge table too, and names nothing under --pseudonymize", async () => {
    const graph = await cli(["-", "--graph", "--id-field", "name", "--parent-field", "manager"], {
      stdin: orgChart,
    });
    expect(graph.code).toBe(2);
    expect(graph.stderr).toMatch(/row 2 writes the id .*\[DUPLICATE_ID\]\n$/);
    // Two reports of one lead: as read, the second edge would repeat the first and be dropped (1 node).
    const edges = latin1("parent,child\nquill,Ad\xe9le\nquill,Ad\xe8le\n");
    const edgeResult = await cli(["-", "--input-format", "edges"], { stdin: edges });
    expect(edgeResult.code).toBe(2);
    expect(edgeResult.stderr).toMatch(/row 2 writes the id "Ad\uFFFDle" .*\[DUPLICATE_ID\]\n$/);
    const hidden = await cli(["-", "--id-field", "name", "--parent-field", "manager", "--pseudonymize"], {
      stdin: orgChart,
      env: { ESPALIER_PSEUDONYM_KEY: "k" },
    });
    expect(hidden.code).toBe(2);
    expect(hidden.stderr).not.toMatch(/Ad|\uFFFD/);
  });

  it("a path column: two folders written in other bytes are DUPLICATE_PATH, not one folder", async () => {
    const table = latin1("path,size\nteams/Ad\xe9le/plan.txt,3\nteams/Ad\xe8le/notes.txt,5\n");
    const result = await cli(["-"], { stdin: table });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/row 2 writes the path "teams\/Ad\uFFFDle" .*\[DUPLICATE_PATH\]\n$/);
    // Converted: teams, two folders, two files: 5 nodes, 8 in all.
    const converted = await cli(["-", "--format", "json"], { stdin: table.toString("latin1") });
    expect(JSON.parse(converted.stdout).totals).toEqual({ nodes: 5, size: 8 });
  });
});
