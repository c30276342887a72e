import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { caught, opts, outline } from "../helpers.js";

const csv = (text: string, overrides = {}) => loadTree(text, opts({ format: "csv", ...overrides }));
const rows = (value: unknown, overrides = {}) =>
  loadTree(JSON.stringify(value), opts({ format: "rows", ...overrides }));

const org = [
  "id,parent,name,title,size",
  "ceo,,Wren Halloway,Chief Executive,1",
  "cto,ceo,Odile Marchetti,Chief Technology Officer,1",
  "opt,cto,Tamsin Vey,Optics Lead,1",
  "cfo,ceo,Barnaby Okonkwo,Chief Financial Officer,1",
].join("\n");

describe("linkTable by id and parent", () => {
  it("loadTree(csv) links rows by id and parent", () => {
    const tree = csv(org, { keepFields: ["title"] });
    expect(outline(tree)).toEqual([
      "Wren Halloway 1",
      "  Odile Marchetti 1",
      "    Tamsin Vey 1",
      "  Barnaby Okonkwo 1",
    ]);
    expect(tree.ids).toEqual(["ceo", "cto", "opt", "cfo"]);
    expect(tree.originIsRow).toBe(true);
    expect([...tree.origin]).toEqual([1, 2, 3, 4]);
    expect(tree.fields.get("title")).toEqual([
      "Chief Executive",
      "Chief Technology Officer",
      "Optics Lead",
      "Chief Financial Officer",
    ]);
  });

  it("loadTree(csv) names a row by its id when its name cell is empty", () => {
    expect(csv("id,parent,name\na,,Alpha\nb,a,\n").name).toEqual(["Alpha", "b"]);
  });

  it("loadTree(csv) names rows by id when there is no name column, children before their parents too", () => {
    const tree = csv("id,parent\nb,a\na,\nc,a\n");
    expect(outline(tree)).toEqual(["a", "  b", "  c"]);
    expect([...tree.origin]).toEqual([2, 1, 3]);
  });

  it("loadTree(csv) puts several rows with an empty parent under a synthetic root", () => {
    const tree = csv("id,parent\na,\nb,\n", { rootName: "Quillfeather Instruments" });
    expect(outline(tree)).toEqual(["Quillfeather Instruments", "  a", "  b"]);
    expect(tree.ids).toEqual(["", "a", "b"]);
  });

  it("loadTree(csv) rejects a repeated id as DUPLICATE_ID at the second row, naming the first", () => {
    const error = caught(() => csv("id,parent\na,\nb,a\na,b\n"));
    expect(error.code).toBe("DUPLICATE_ID");
    // Line 4 (the header is line 1), column 1: the id cell (RFC 4180 §2.1-2.4 line and field layout).
    expect(error.pos).toEqual({ row: 3, line: 4, column: 1 });
    expect(error.details).toEqual({ firstRow: 1 });
  });

  it("loadTree(csv) rejects a parent id no row has as MISSING_PARENT at that row", () => {
    const error = caught(() => csv("id,parent\na,\nb,zz\n", { file: "org.csv" }));
    expect(error.code).toBe("MISSING_PARENT");
    // The parent cell "zz": line 3, after "b," (RFC 4180 §2.4 fields).
    expect(error.pos).toEqual({ file: "org.csv", row: 2, line: 3, column: 3 });
  });

  it("loadTree(csv) reports rows whose parents form a loop as CYCLE", () => {
    const error = caught(() => csv("id,parent\nr,\na,b\nb,a\n"));
    expect(error.code).toBe("CYCLE");
    expect(error.pos).toEqual({ row: 2, line: 3, column: 1 });
  });

  it("loadTree(csv) rejects a size that is not a number >= 0 as BAD_SIZE at its row", () => {
    for (const size of ["-1", "12KB", "0x10", "NaN", "Infinity"]) {
      const error = caught(() => csv(`id,parent,size\na,,1\nb,a,${size}\n`));
      expect(error.code).toBe("BAD_SIZE");
      // The size cell, after "b,a,".
      expect(error.pos).toEqual({ row: 2, line: 3, column: 5 });
    }
    expect([...csv("id,parent,size\na,,\nb,a, 2.5e1 \n").ownSize]).toEqual([0, 25]);
  });

  it("loadTree(csv) lists the existing columns when the linking columns are missing", () => {
    const error = caught(() => csv("key,boss\na,\n"));
    expect(error.code).toBe("FIELD_MISSING");
    // Detection cannot tell a headerless listing from a table: the error names the option to pass.
    expect(error.details).toEqual({
      fieldsNeeded: ["id", "parent", "path"],
      fieldsSeen: ["key", "boss"],
      remedies: [
        "--id-field",
        "--parent-field",
        "--path-field",
        "--input-format edges",
        "--input-format paths",
      ],
    });
    // The reader has no docs: the message itself names the options that read other-named columns.
    expect(error.message).toContain("--id-field COLUMN and --parent-field COLUMN, or --path-field COLUMN");
    // One column (another separator, or a bare list): no column to name, so no such hint.
    const one = caught(() => csv("key;boss\na;\n"));
    expect(one.message).not.toContain("--id-field");
    expect(one.details?.remedies).toEqual(["--input-format paths"]);
  });

  it("loadTree(csv) rejects a kept column that does not exist as FIELD_MISSING", () => {
    expect(caught(() => csv(org, { keepFields: ["email"] })).code).toBe("FIELD_MISSING");
  });

  it("loadTree(csv) names the nearest column for a misspelt kept one (a --label field), else none", () => {
    const typo = caught(() => csv("id,parent,title\na,,x\n", { keepFields: ["ttile"] }));
    const seen = ["id", "parent", "title"];
    expect([typo.code, typo.details]).toEqual([
      "FIELD_MISSING",
      { field: "ttile", suggestion: "title", fieldsSeen: seen },
    ]);
    const far = caught(() => csv("id,parent,title\na,,x\n", { keepFields: ["email"] }));
    expect(far.details).toEqual({ field: "email", fieldsSeen: seen });
    // The message's sentences end where they should, with or without a suggestion.
    expect(far.message).toContain('no column "email" to keep. The columns are "id", "parent", "title"');
    expect(typo.message).toContain('no column "ttile" to keep; did you mean "title"? The columns are');
  });

  it("loadTree(csv) uses the column names from the options", () => {
    const tree = csv("key,boss,label\n1,,top\n2,1,low\n", {
      idField: "key",
      parentField: "boss",
      nameField: "label",
    });
    expect(outline(tree)).toEqual(["top", "  low"]);
  });

  it("loadTree(csv) rejects an empty id as SHAPE at its row", () => {
    expect(caught(() => csv("id,parent\na,\n,a\n")).pos).toEqual({ row: 2, line: 3, column: 1 });
  });
});

describe("linkTable by path", () => {
  it("loadTree(csv) links rows by a path column, creating ancestors implicitly", () => {
    const tree = csv(
      "path,size,owner\ntidewater/services/ledger,40,ops\ntidewater/services,4,\ntidewater/README.md,7,docs\n",
      {
        keepFields: ["owner"],
      },
    );
    expect(outline(tree)).toEqual(["tidewater 0", "  services 4", "    ledger 40", "  README.md 7"]);
    expect(tree.fields.get("owner")).toEqual(["", "", "ops", "docs"]);
    expect(tree.ids).toBeNull();
    expect([...tree.origin]).toEqual([1, 2, 1, 3]);
  });

  it("loadTree(csv) takes a name column over the last path segment, unless the cell is empty", () => {
    expect(csv("path,name\na,Alpha\na/b,Beta\na/c,\n").name).toEqual(["Alpha", "Beta", "c"]);
  });

  it("loadTree(csv) rejects a path repeated by a later row as DUPLICATE_PATH naming both rows", () => {
    const error = caught(() => csv("path\na/b\na\na/b/\n"));
    expect(error.code).toBe("DUPLICATE_PATH");
    expect(error.pos).toEqual({ row: 3, line: 4, column: 1 });
    expect(error.details).toEqual({ firstRow: 1 });
  });

  it("loadTree(csv) prefers id and parent over path when a table has all three", () => {
    expect(outline(csv("id,parent,path\na,,x/y\nb,a,x/z\n"))).toEqual(["a", "  b"]);
  });
});

describe("linkTable from JSON rows", () => {
  it("loadTree(rows) links JSON records by id and parent, numbers and text ids alike", () => {
    const tree = rows([
      { id: 1, name: "Quillfeather Instruments", size: 3 },
      { id: 2, parent: "1", name: "Optics" },
      { id: 3, parent: 1, name: "Firmware", size: null },
    ]);
    expect(outline(tree)).toEqual(["Quillfeather Instruments 3", "  Optics 0", "  Firmware 0"]);
    expect(tree.ids).toEqual(["1", "2", "3"]);
  });

  it("loadTree(rows) links JSON records by path", () => {
    expect(outline(rows([{ path: "a/b" }, { path: "a/c" }]))).toEqual(["a", "  b", "  c"]);
  });

  it("loadTree(rows) rejects a text size as BAD_SIZE at its row", () => {
    const error = caught(() => rows([{ id: "a" }, { id: "b", parent: "a", size: "12" }]));
    expect(error.code).toBe("BAD_SIZE");
    // The row's "{": [{"id":"a"}, is 12 characters.
    expect(error.pos).toEqual({ row: 2, line: 1, column: 13 });
  });

  it("loadTree(rows) rejects an element that is not an object as SHAPE at its row", () => {
    const error = caught(() => rows([{ id: "a" }, 7]));
    expect(error.code).toBe("SHAPE");
    expect(error.pos).toEqual({ row: 2, line: 1, column: 13 });
  });
});
