import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { cli } from "../../helpers/cli.js";
import { caught, opts, outline } from "../helpers.js";

const csv = (text: string, overrides = {}) => loadTree(text, opts({ format: "csv", ...overrides }));

// The shape of `ps -eo pid=,ppid=,comm=` on Linux: the first processes (init and the kernel's thread
// starter) have the parent 0, which is no process (from memory: procfs reports PPid 0 for them).
const processes = [
  "id,parent,name",
  "1,0,quill-init",
  "2,0,quill-kthreads",
  "40,1,ledger-agent",
  "41,40,ledger-worker",
  "50,2,kworker",
].join("\n");

describe("--null-parent: parent cells that mean no parent", () => {
  it("loadTree(csv) without it refuses the parent 0 as MISSING_PARENT and names the option", () => {
    const error = caught(() => csv(processes));
    expect(error.code).toBe("MISSING_PARENT");
    // Line 2 (after the header), column 3: the parent cell (RFC 4180 §2 line and field layout).
    expect(error.pos).toEqual({ row: 1, line: 2, column: 3 });
    expect(error.message).toContain("--null-parent 0");
    expect(error.details).toEqual({ remedies: ["--null-parent 0"] });
  });

  it("loadTree(csv) reads the rows naming a null parent as top-level rows under the added root", () => {
    const tree = csv(processes, { nullParents: ["0"], rootName: "ps.csv" });
    expect(outline(tree)).toEqual([
      "ps.csv",
      "  quill-init",
      "    ledger-agent",
      "      ledger-worker",
      "  quill-kthreads",
      "    kworker",
    ]);
  });

  it("loadTree(csv) keeps the empty parent meaning no parent beside the named values", () => {
    // A database export's NULL written as \N (from memory: MySQL's SELECT … INTO OUTFILE default).
    const tree = csv("id,parent\na,\\N\nb,a\nc,\n", { nullParents: ["\\N"], rootName: "export" });
    expect(outline(tree)).toEqual(["export", "  a", "    b", "  c"]);
  });

  it("loadTree(csv) hints only at values that usually mean none, not at a mistyped id", () => {
    const error = caught(() => csv("id,parent\nQ1,\nQ2,Q9999\n"));
    expect(error.code).toBe("MISSING_PARENT");
    expect(error.message).not.toContain("--null-parent");
    expect(error.details?.remedies).toBeUndefined();
    const nullWord = caught(() => csv("id,parent\nQ1,NULL\n"));
    expect(nullWord.message).toContain("--null-parent NULL");
    expect(caught(() => csv("id,parent\nQ1,\\N\n")).message).toContain("--null-parent '\\N'");
  });

  it("loadTree(csv) refuses a row whose id is a null-parent value as SHAPE at its id cell", () => {
    const error = caught(() => csv("id,parent\n0,\n1,0\n", { nullParents: ["0"] }));
    expect(error.code).toBe("SHAPE");
    expect(error.pos).toEqual({ row: 1, line: 2, column: 1 });
  });

  it("loadTree(rows) reads a JSON row's parent 0 (a number) as no parent when named", () => {
    const rows = JSON.stringify([
      { id: 1, parent: 0, name: "quill-init" },
      { id: 40, parent: 1, name: "ledger-agent" },
    ]);
    const tree = loadTree(rows, opts({ format: "rows", nullParents: ["0"] }));
    expect(outline(tree)).toEqual(["quill-init", "  ledger-agent"]);
  });

  it("espalier --graph --null-parent 0 reads a null parent as a node without that edge", async () => {
    // 3 has the parents 1 and 2: counted once (3 distinct nodes), its second parent a reference.
    const stdin = "id,parent\n1,0\n2,1\n3,1\n3,2\n";
    const args = ["-", "--input-format", "csv", "--graph", "--budget", "10", "--bare"];
    const r = await cli([...args, "--null-parent", "0"], { stdin });
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toMatch(/^\S+ 1 +3 nodes/);
    const without = await cli(args, { stdin });
    expect(without.code).toBe(2);
    expect(without.stderr).toContain("--null-parent 0");
    expect(without.stderr).toContain("[MISSING_PARENT]");
  });

  it("espalier --null-parent 0 counts every row once and the root adds one node", async () => {
    const r = await cli(["-", "--input-format", "csv", "--null-parent", "0", "--budget", "10", "--bare"], {
      stdin: processes,
    });
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toMatch(/ 6 nodes/);
    const without = await cli(["-", "--input-format", "csv"], { stdin: processes });
    expect(without.code).toBe(2);
    expect(without.stderr).toContain("[MISSING_PARENT]");
  });

  it("is USAGE on an input read without a parent column, as other format options are (never ignored in silence)", async () => {
    const inputs: [string, string[]][] = [
      ['{"name":"hq","children":[{"name":"lab"}]}', ["--input-format", "json"]],
      ["10\tdocs/a.txt\n", ["--input-format", "paths"]],
      ["path,size\ndocs/a.txt,10\n", ["--input-format", "csv"]],
      ["hq lab\nlab rig\n", ["--input-format", "edges"]],
    ];
    for (const [stdin, format] of inputs) {
      const r = await cli(["-", ...format, "--null-parent", "0"], { stdin });
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/--null-parent reads a parent column.*\[USAGE\]/);
      // Without the option each of them reads (exit 0): the refusal is the option's alone.
      expect((await cli(["-", ...format], { stdin })).code).toBe(0);
    }
  });

  it("loadTree(csv) names the spaces when a parent cell holds them (a hand-written `1, , Ada`)", () => {
    // RFC 4180, section 2.4: "Spaces are considered part of a field and should not be ignored."
    const error = caught(() => csv("id, parent, name\n1, , Ada\n2, 1, Bo\n"));
    expect(error.code).toBe("MISSING_PARENT");
    expect(error.pos).toMatchObject({ row: 1, line: 2 });
    expect(error.message).toContain(
      "spaces around its value, which CSV keeps as part of it (RFC 4180, section 2.4)",
    );
    // No spaces: no such words.
    expect(caught(() => csv("id,parent\n1,\n2,9\n")).message).not.toContain("spaces");
  });

  it("loadTree names the row whose id is the parent cell without its spaces (CSV, TSV, JSON rows, a graph table)", () => {
    // RFC 4180, section 2.4: "Spaces are considered part of a field and should not be ignored."
    // Field test: "a " matched no id while row 1's id is "a", and the message did not say so.
    const fromCsv = caught(() => csv("id,parent,name\na,,root\nb,a ,kid\n"));
    expect(fromCsv.code).toBe("MISSING_PARENT");
    expect(fromCsv.pos).toMatchObject({ row: 2, line: 3 });
    expect(fromCsv.message).toContain('row 1\'s id is "a", the cell without its spaces');
    // Ids written as digits are kept as numbers: " 7" still finds row 1.
    const digits = caught(() => csv("id,parent,name\n7,,root\n8, 7,kid\n"));
    expect(digits.message).toContain('row 1\'s id is "7", the cell without its spaces');
    const tsv = caught(() => loadTree("id\tparent\na\t\nb\ta \n", opts({ format: "tsv" })));
    expect(tsv.message).toContain('row 1\'s id is "a", the cell without its spaces');
    const graph = caught(() => csv("id,parent\na,\nb,a \n", { graph: true }));
    expect(graph.code).toBe("MISSING_PARENT");
    expect(graph.message).toContain('row 1\'s id is "a", the cell without its spaces');
    // JSON rows: a string keeps its spaces (RFC 8259, section 7: every character between the quotes is
    // the string's); the words are not about CSV there.
    const rows = caught(() =>
      loadTree('[{"id":"a","parent":null},{"id":"b","parent":"a "}]', opts({ format: "rows" })),
    );
    expect(rows.code).toBe("MISSING_PARENT");
    expect(rows.message).toContain('row 1\'s id is "a", the value without its spaces');
    expect(rows.message).not.toMatch(/CSV|RFC 4180|separator/);
    // Spaces, and no id without them: the spaces are named, no row is.
    expect(caught(() => csv("id,parent\na,\nb,c \n")).message).not.toContain("row 1's id");
  });

  it("loadTree names the row whose id is a parent cell's whole number without its .0 (a spreadsheet's 12.0)", () => {
    // Common practice, no source: a spreadsheet's number column exported as 1.0, 2.0 while the id
    // column is text. Field test: "1.0" matched no id while row 1's id is "1", and nothing said so.
    const bytes = caught(() => csv("id,parent,name\n1,,root\n2,1.0,kid\n"));
    expect(bytes.code).toBe("MISSING_PARENT");
    expect(bytes.pos).toMatchObject({ row: 2, line: 3 });
    expect(bytes.message).toContain('row 1\'s id is "1", the same whole number without ".0"');
    // Ids read as strings (the name column as the id) and a graph table say it too.
    const named = caught(() =>
      csv("name,manager\n7,\n8,7.00\n", { idField: "name", parentField: "manager" }),
    );
    expect(named.message).toContain('row 1\'s name is "7", the same whole number without ".0"');
    const graph = caught(() => csv("id,parent\n1,\n2,1.0\n", { graph: true }));
    expect(graph.message).toContain('row 1\'s id is "1", the same whole number');
    // No such row, or not a whole number: no row is named.
    expect(caught(() => csv("id,parent\n1,\n2,3.0\n")).message).not.toContain("row 1's");
    expect(caught(() => csv("id,parent\n1,\n2,1.5\n")).message).not.toContain("row 1's");
  });
});
