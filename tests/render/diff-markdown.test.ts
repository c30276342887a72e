import { Parser } from "commonmark";
import { describe, expect, it } from "vitest";
import { legendLines } from "../../src/render/marks.js";
import { cli } from "../helpers/cli.js";

const OLD = "id,parent,name,size\n1,,R,0\n2,1,A,5\n3,2,x,1\n4,2,y,2\n5,1,B,0\n6,5,z,3\n";
const NEW = "id,parent,name,size\n1,,R,0\n2,1,A,5\n4,2,y,2\n5,1,B,0\n6,5,z,3\n3,5,x`s,1\n7,1,C,4\n";

describe("renderDiffMarkdown(view, totals, options) through espalier diff --format markdown", () => {
  it("writes valid CommonMark: a header paragraph, then one list item per text line, tags and names as code spans", async () => {
    const { writeFileSync, mkdtempSync } = await import("node:fs");
    const { join } = await import("node:path");
    const { tmpdir } = await import("node:os");
    const dir = mkdtempSync(join(tmpdir(), "espalier-md-"));
    writeFileSync(join(dir, "old.csv"), OLD);
    writeFileSync(join(dir, "new.csv"), NEW);
    const md = await cli(["diff", join(dir, "old.csv"), join(dir, "new.csv"), "--format", "markdown"]);
    const text = await cli(["diff", join(dir, "old.csv"), join(dir, "new.csv")]);
    expect(md.code, md.stderr).toBe(0);
    // Parsed with commonmark.js, the CommonMark reference implementation in JavaScript.
    const doc = new Parser().parse(md.stdout);
    const kinds: string[] = [];
    const codes: string[] = [];
    const walker = doc.walker();
    for (let ev = walker.next(); ev; ev = walker.next()) {
      if (!ev.entering) continue;
      kinds.push(ev.node.type);
      if (ev.node.type === "code") codes.push(ev.node.literal ?? "");
    }
    expect(doc.firstChild?.type).toBe("paragraph");
    // Every text line but the header's and the key's.
    expect(kinds.filter((k) => k === "item")).toHaveLength(text.stdout.trimEnd().split("\n").length - 2);
    // One kind per node (moved outranks renamed, and the tag still says the old name), each tag a
    // literal code span right before its name, which is a code span too, despite the backtick in x`s.
    // A "size" column is a plain number (bytes only when the input says so, docs/input.md "Units").
    expect(codes).toEqual([
      "R",
      "A",
      "y",
      "B",
      "z",
      "[moved from A, renamed from x]",
      "x`s",
      "[added +4]",
      "C",
    ]);
    expect(kinds).not.toContain("html_inline");
  });

  it("prints the legend whole under the header, however long its lines (espalier's words are never cut)", async () => {
    const md = await cli(["diff", "old.csv", "new.csv", "--format", "markdown", "--legend"], {
      files: { "old.csv": OLD, "new.csv": NEW },
    });
    expect(md.code, md.stderr).toBe(0);
    // Read back by commonmark.js (the CommonMark reference implementation in JavaScript): the header
    // paragraph's text holds each legend line as the legend writes it.
    const paragraph = new Parser().parse(md.stdout).firstChild;
    let text = "";
    const walker = paragraph!.walker();
    for (let ev = walker.next(); ev; ev = walker.next())
      if (ev.entering && ev.node.type === "text") text += ev.node.literal;
    for (const line of legendLines("diff")) {
      expect(line.length).toBeGreaterThan(0);
      expect(text).toContain(line);
    }
    expect(legendLines("diff").some((line) => line.length > 256)).toBe(true);
  });
});
