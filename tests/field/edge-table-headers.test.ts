import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: an edge table exported with a header naming its columns in its own words (`from,to`,
// `source<TAB>target`, `parent,child`; an invented quillfeather build graph), read without
// --input-format (edge lists are never detected). Saved as .csv/.tsv it was FIELD_MISSING naming
// --id-field/--parent-field and --input-format paths but not the edge list; without an extension (a
// pipe) a tab-separated one was BAD_SIZE "got \"from\"" naming no way out at all, a comma-separated one
// PARSE_PATHS saying the header row was missing, and with one data row it was read as two paths with
// exit 0 and nothing said. Each message now names the edge list's options, and following them reads
// the table.
const rows = ["ledger,ledger-core", "ledger-core,kelp-log", "ledger,tern-fmt"];
const table = (header: string, sep = ","): string => [header, ...rows].join("\n").replaceAll(",", sep);

describe("an edge table read without --input-format", () => {
  it.each([
    ["from.csv", "from,to", ","],
    ["from.tsv", "from,to", "\t"],
    ["source.csv", "source,target", ","],
  ])("%s: FIELD_MISSING names --input-format edges with its two columns", async (file, header, sep) => {
    const [parent, child] = header.split(",");
    const r = await cli([file], { files: { [file]: table(header, sep) } });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      `a table of edges (a parent and a child a row) reads with --input-format edges --parent-field "${parent}" --child-field "${child}"`,
    );
    expect(r.stderr).toMatch(/\[FIELD_MISSING\]\n$/);
    // Following it: the edge table, 4 nodes under ledger.
    const ok = await cli(
      [file, "--input-format", "edges", "--parent-field", parent, "--child-field", child, "--bare"],
      { files: { [file]: table(header, sep) } },
    );
    expect(ok.stderr).toBe("");
    expect(ok.stdout).toBe(". ledger  4 nodes\n  . ledger-core / kelp-log  2 nodes\n  . tern-fmt\n");
  });

  it("parent,child: the default column names, so --input-format edges alone", async () => {
    const r = await cli(["g.csv"], { files: { "g.csv": table("parent,child") } });
    expect(r.stderr).toContain("reads with --input-format edges; ");
    const ok = await cli(["g.csv", "--input-format", "edges", "--bare"], {
      files: { "g.csv": table("parent,child") },
    });
    expect(ok.stdout).toBe(". ledger  4 nodes\n  . ledger-core / kelp-log  2 nodes\n  . tern-fmt\n");
  });

  it("three or more columns: the options with COLUMN", async () => {
    const r = await cli(["g.csv"], {
      files: { "g.csv": table("from,to,weight").replace(/\n.*$/s, "\na,b,1\n") },
    });
    expect(r.stderr).toContain("--input-format edges --parent-field COLUMN --child-field COLUMN");
  });

  it("from a pipe, tab-separated: the BAD_SIZE at 1:1 names the table's and the edge list's options", async () => {
    const r = await cli(["-"], { stdin: table("from,to", "\t") });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: the size on line 1 must be a number .*got "from"; if line 1 names the columns of a tab-separated table, pass --input-format tsv with --id-field COLUMN .* --input-format edges --parent-field "from" --child-field "to" \[BAD_SIZE\]\n$/,
    );
    // A size that is no number but holds a digit (4.0K) is no header: the size hint only.
    const du = await cli(["-"], { stdin: "4.0K\tledger\n8.0K\t.\n" });
    expect(du.stderr).not.toContain("names the columns");
  });

  it("from a pipe, comma-separated: PARSE_PATHS names the edge list's options too", async () => {
    const r = await cli(["-"], { stdin: table("source,target") });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: every line holds a comma, .* --input-format edges --parent-field "source" --child-field "target"; to read each whole line as a path, pass --input-format paths \[PARSE_PATHS\]\n$/,
    );
  });

  it("a header and one row from a pipe: read as two paths (too few lines to refuse), with a note", async () => {
    const r = await cli(["-", "--bare"], { stdin: "from,to\nledger,ledger-core\n" });
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(". (stdin)  3 nodes\n  . from,to\n  . ledger,ledger-core\n");
    expect(r.stderr).toMatch(
      /^espalier: note: <stdin>:1: both lines hold a comma, as a CSV table's header and row do, and were read as two paths: .* --input-format edges --parent-field "from" --child-field "to"; --input-format paths reads the lines as paths without this note \[COMMAS_READ_AS_PATHS\]\n$/,
    );
    const asked = await cli(["-", "--input-format", "paths"], { stdin: "from,to\nledger,ledger-core\n" });
    expect(asked.stderr).toBe("");
    // Lines with different numbers of commas are paths whose names hold commas: no note.
    const names = await cli(["-"], { stdin: "notes, draft.txt\nledger.txt\n" });
    expect(names.stderr).toBe("");
  });
});
