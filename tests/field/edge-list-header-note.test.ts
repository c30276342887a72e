import { describe, expect, it } from "vitest";
import { defaultLoadOptions, loadTree } from "../../src/load/index.js";
import { showNote } from "../../src/model/reading-note.js";
import { summarySchema } from "../../src/render/summary-schema.js";
import { cli } from "../helpers/cli.js";

// Field test: an edge list exported with a header naming its columns in its own words (`from<TAB>to`,
// as an invented quillfeather build graph export writes it), read with --input-format edges and no
// column options, took the header for an edge: two extra nodes "from" and "to" beside the graph, exit
// 0, nothing said. The header's edge shares no node with any other line; that is now said on standard
// error (and in the JSON's input.notes), with the options that read the line as a header.
const tsv = "from\tto\nledger\tledger-core\nledger-core\tkelp-log\nledger\ttern-fmt\n";
const NOTE =
  /^espalier: note: <stdin>:1: line 1 was read as an edge from "from" to "to", which shares no node with any other line; if the line names the columns, pass --parent-field "from" --child-field "to" to read it as a header \[FIRST_LINE_APART\]\n$/;

describe("an edge list whose first line shares no node with the rest", () => {
  it("is read as an edge (exit 0) with a note on standard error naming the options", async () => {
    const r = await cli(["-", "--input-format", "edges", "--bare"], { stdin: tsv });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(NOTE);
    // The reading itself is unchanged: 7 nodes, the root espalier adds and the line's two among them.
    expect(r.stdout).toBe(
      ". (stdin)  7 nodes\n  . from / to  2 nodes\n  . ledger  4 nodes\n    . ledger-core / kelp-log  2 nodes\n    . tern-fmt\n",
    );
  });

  it("following the note reads the line as a header: 4 nodes, no note", async () => {
    const r = await cli(
      ["-", "--input-format", "edges", "--parent-field", "from", "--child-field", "to", "--bare"],
      { stdin: tsv },
    );
    expect(r.stderr).toBe("");
    expect(r.stdout).toBe(". ledger  4 nodes\n  . ledger-core / kelp-log  2 nodes\n  . tern-fmt\n");
  });

  it("the summary JSON carries the note under input.notes, and the schema accepts it", async () => {
    const r = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: tsv });
    const doc = JSON.parse(r.stdout);
    expect(doc.input.notes).toEqual([
      {
        code: "FIRST_LINE_APART",
        line: 1,
        message: expect.stringMatching(/^line 1 was read as an edge from "from" to "to"/),
      },
    ]);
    expect(summarySchema.safeParse(doc).success).toBe(true);
    // Without a note there is no notes member.
    const plain = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: tsv.slice(8) });
    expect(JSON.parse(plain.stdout).input).toEqual({ shape: "graph", sizeUnit: "number" });
  });

  it("pairs separated by spaces: the note gives tail -n +N (blank lines before it counted)", async () => {
    const r = await cli(["-", "--input-format", "edges"], {
      stdin: `\n${tsv.replaceAll("\t", " ")}`,
    });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(
      /^espalier: note: <stdin>:2: line 2 was read as an edge from "from" to "to", .* leave it out \(tail -n \+3 prints the lines after it\) or separate them with a tab .*\[FIRST_LINE_APART\]\n$/,
    );
  });

  it("no note when the first edge joins another line, or when the list is one edge", async () => {
    for (const stdin of [
      tsv.slice(8),
      "ledger\tledger-core\n",
      "kelp-log\nledger\tledger-core\ntern-fmt\tbay\n",
    ]) {
      const r = await cli(["-", "--input-format", "edges"], { stdin });
      expect(r.code).toBe(0);
      expect(r.stderr).toBe("");
    }
  });

  it("a diff says each version's note, OLD's first, naming its file", async () => {
    const files = { "old.tsv": tsv, "new.tsv": `${tsv}tern-fmt\tbay\n` };
    const r = await cli(["diff", "old.tsv", "new.tsv", "--input-format", "edges", "--bare"], { files });
    expect(r.stderr.split("\n").map((line) => line.slice(0, 32))).toEqual([
      "espalier: note: old.tsv:1: line ",
      "espalier: note: new.tsv:1: line ",
      "",
    ]);
  });

  it("under --pseudonymize the note's ids are pseudonyms, on standard error and in the JSON", async () => {
    const env = { ESPALIER_PSEUDONYM_KEY: "harbor-secret" };
    const r = await cli(["-", "--input-format", "edges", "--pseudonymize", "--format", "json"], {
      stdin: tsv,
      env,
    });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/\[FIRST_LINE_APART\]\n$/);
    expect(r.stderr).not.toMatch(/"from"|"to"/);
    expect(JSON.parse(r.stdout).input.notes[0].message).not.toMatch(/"from"|"to"/);
  });

  it("loadTree (text in one piece) gives the tree the same note as the streamed load", () => {
    const tree = loadTree(tsv, { ...defaultLoadOptions, format: "edges" });
    expect((tree.reading?.notes ?? []).map((note) => showNote(note))).toEqual([
      {
        code: "FIRST_LINE_APART",
        line: 1,
        message: expect.stringMatching(/--parent-field "from" --child-field "to"/),
      },
    ]);
  });
});
