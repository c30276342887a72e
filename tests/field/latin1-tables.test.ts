import { Buffer } from "node:buffer";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
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
    // Only the note that two rows hold bytes that are not UTF-8 (each read as U+FFFD).
    expect(result.stderr).toMatch(
      /^espalier: note: <stdin>:2: 2 rows hold bytes that are not UTF-8 .*\[UNDECODABLE_BYTES\]\n$/,
    );
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

// U+FFFD written as itself (EF BF BD, its UTF-8 encoding: RFC 3629 section 3) reads as the same
// character as any byte sequence the WHATWG decoder (Encoding Standard, section 4.1) replaces: "\xff"
// is no UTF-8 at all (RFC 3629 section 1: 0xFF never appears), so it reads as one U+FFFD too.
describe("a table whose id writes U+FFFD itself and whose other cell writes bytes that are not UTF-8", () => {
  const bytes = (...parts: (string | number[])[]) =>
    Buffer.concat(parts.map((p) => (typeof p === "string" ? Buffer.from(p, "utf8") : Buffer.from(p))));
  const replacement = [0xef, 0xbf, 0xbd];

  it("is DUPLICATE_ID at the parent cell written in other bytes (CSV, ids kept as bytes)", async () => {
    const table = bytes("id,parent,name\n", replacement, ",,root\nx,", [0xff], ",kid\n");
    const result = await cli(["-"], { stdin: table });
    expect(result.stdout).toBe("");
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /row 2 writes the id "\uFFFD" in other bytes than row 1 does: .*\[DUPLICATE_ID\]\n$/,
    );
  });

  it("is DUPLICATE_ID the other way round too: the bytes that are not UTF-8 first", async () => {
    const table = bytes("id,parent,name\n", [0xff], ",,root\nx,", replacement, ",kid\n");
    const result = await cli(["-"], { stdin: table });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/row 2 writes the id "\uFFFD" .*\[DUPLICATE_ID\]\n$/);
  });

  it("is DUPLICATE_ID in TSV, with ids read from the name column, in a graph table and an edge table", async () => {
    const tsv = bytes("id\tparent\tname\n", replacement, "\t\troot\nx\t", [0xff], "\tkid\n");
    const fromTsv = await cli(["-", "--input-format", "tsv"], { stdin: tsv });
    expect(fromTsv.code).toBe(2);
    expect(fromTsv.stderr).toMatch(/row 2 writes the id "\uFFFD" .*\[DUPLICATE_ID\]\n$/);
    // The name column as the ids: kept as strings, not as bytes.
    const byName = bytes("name,manager\n", replacement, ",\nkid,", [0xff], "\n");
    const named = await cli(["-", "--id-field", "name", "--parent-field", "manager"], { stdin: byName });
    expect(named.code).toBe(2);
    expect(named.stderr).toMatch(/row 2 writes the id "\uFFFD" .*\[DUPLICATE_ID\]\n$/);
    const table = bytes("id,parent,name\n", replacement, ",,root\nx,", [0xff], ",kid\n");
    const graph = await cli(["-", "--graph"], { stdin: table });
    expect(graph.code).toBe(2);
    expect(graph.stderr).toMatch(/row 2 writes the id "\uFFFD" .*\[DUPLICATE_ID\]\n$/);
    const edges = bytes("parent,child\nquill,", replacement, "\n", [0xff], ",kid\n");
    const edgeResult = await cli(["-", "--input-format", "edges"], { stdin: edges });
    expect(edgeResult.code).toBe(2);
    expect(edgeResult.stderr).toMatch(/row 2 writes the id "\uFFFD" .*\[DUPLICATE_ID\]\n$/);
  });

  it("is DUPLICATE_ID in a diff's NEW whose ids are read against OLD's bytes", async () => {
    const old = bytes("id,parent,name\n", replacement, ",,root\nx,", replacement, ",kid\n");
    const next = Buffer.concat([old, bytes("y,", [0xff], ",kid2\n")]);
    const dir = mkdtempSync(join(tmpdir(), "espalier-replacement-diff-"));
    writeFileSync(join(dir, "old.csv"), old);
    writeFileSync(join(dir, "new.csv"), next);
    const result = await cli(["diff", join(dir, "old.csv"), join(dir, "new.csv")]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/new\.csv:4(:\d+)?: row 3 writes the id "\uFFFD" .*\[DUPLICATE_ID\]\n$/);
  });

  it("reads U+FFFD written as itself in every cell as one id, as before", async () => {
    const table = bytes("id,parent,name\n", replacement, ",,root\nx,", replacement, ",kid\n");
    const result = await cli(["-", "--format", "json"], { stdin: table });
    expect(result.stderr).toBe("");
    expect(result.code).toBe(0);
    expect(JSON.parse(result.stdout).root.children[0].name).toBe("kid");
  });
});
