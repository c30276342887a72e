import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { caught, opts, outline } from "../helpers.js";

const csv = (text: string, overrides = {}) => loadTree(text, opts({ format: "csv", ...overrides }));
const tsv = (text: string, overrides = {}) => loadTree(text, opts({ format: "tsv", ...overrides }));

describe("loadTree(csv) against RFC 4180 section 2", () => {
  it("loadTree(csv) reads records on separate lines ended by CRLF", () => {
    // RFC 4180 section 2, rule 1: each record is on a separate line, delimited by a line break (CRLF).
    const tree = csv("path,size\r\naaa,1\r\nzzz,2\r\n");
    expect(outline(tree)).toEqual(["(root) 0", "  aaa 1", "  zzz 2"]);
  });

  it("loadTree(csv) accepts a last record with or without an ending line break", () => {
    // RFC 4180 section 2, rule 2: the last record may or may not have an ending line break.
    expect(outline(csv("path,size\r\naaa,1\r\nzzz,2"))).toEqual(
      outline(csv("path,size\r\naaa,1\r\nzzz,2\r\n")),
    );
  });

  it("loadTree(csv) takes the first line as the header naming the fields", () => {
    // RFC 4180 section 2, rule 3: an optional header line with the same format as records; espalier
    // requires it, since the fields are found by name.
    const tree = csv("size,path\r\n5,aaa\r\n");
    expect(outline(tree)).toEqual(["aaa 5"]);
  });

  it("loadTree(csv) keeps spaces as part of a field and requires the same number of fields per line", () => {
    // RFC 4180 section 2, rule 4: spaces are part of a field; each line should have the same number of fields.
    expect(csv("path,size\r\n a b ,1\r\n").name).toEqual([" a b "]);
    const error = caught(() => csv("path,size\r\naaa,1\r\nbbb\r\n"));
    expect(error.code).toBe("PARSE_CSV");
    // Where the short record ends, after "bbb".
    expect(error.pos).toEqual({ line: 3, column: 4 });
  });

  it("loadTree(csv) reads fields with or without enclosing double quotes alike", () => {
    // RFC 4180 section 2, rule 5: each field may or may not be enclosed in double quotes.
    expect(outline(csv('"path","size"\r\n"aaa","1"\r\nzzz,2\r\n'))).toEqual([
      "(root) 0",
      "  aaa 1",
      "  zzz 2",
    ]);
  });

  it("loadTree(csv) reads line breaks, double quotes and commas inside quoted fields", () => {
    // RFC 4180 section 2, rule 6: fields containing line breaks (CRLF), double quotes and commas are
    // enclosed in double quotes.
    const tree = csv('id,parent,name\r\n1,,"b\r\nbb"\r\n2,1,"c,c"\r\n');
    expect(tree.name).toEqual(["b\r\nbb", "c,c"]);
  });

  it("loadTree(csv) reads a doubled double quote inside a quoted field as one double quote", () => {
    // RFC 4180 section 2, rule 7: a double quote inside a quoted field is escaped by preceding it with
    // another double quote: "b""bb" is b"bb.
    expect(csv('id,parent,name\r\n1,,"b""bb"\r\n').name).toEqual(['b"bb']);
  });
});

describe("loadTree(csv) errors", () => {
  it("loadTree(csv) reports an unclosed quote as PARSE_CSV at its opening quote", () => {
    const error = caught(() => csv('id,parent\n1,\n2,"1\n3,1\n', { file: "org.csv" }));
    expect(error.code).toBe("PARSE_CSV");
    expect(error.pos).toEqual({ file: "org.csv", line: 3, column: 3 });
  });

  it("loadTree(csv) reports a stray quote inside an unquoted field as PARSE_CSV with its line", () => {
    // RFC 4180 section 2, rule 5: if fields are not enclosed with double quotes, then double quotes may
    // not appear inside the fields.
    const error = caught(() => csv('id,parent\n1,\n\n2,1"x"\n'));
    expect(error.code).toBe("PARSE_CSV");
    // Line 4 (after a blank line), column 4: the quote itself.
    expect(error.pos).toEqual({ line: 4, column: 4 });
  });

  it("loadTree(csv) reports a ragged record after a multi-line one at the line where it starts", () => {
    const error = caught(() => csv('id,parent,name\n1,,"a\nb"\n2,1\n'));
    expect(error.code).toBe("PARSE_CSV");
    // The quoted field's line break counts: "2,1" is line 4 and ends a field short at column 4.
    expect(error.pos).toEqual({ line: 4, column: 4 });
  });

  it("loadTree(csv) rejects a header naming a used column twice", () => {
    const error = caught(() => csv("id,parent,id\n1,,1\n"));
    expect(error.code).toBe("PARSE_CSV");
    // The second "id".
    expect(error.pos).toEqual({ line: 1, column: 11 });
  });

  it("loadTree(csv) rejects a header without data rows as INPUT_EMPTY", () => {
    expect(caught(() => csv("id,parent\n")).code).toBe("INPUT_EMPTY");
  });

  it("loadTree(csv) stops with LIMIT_EXCEEDED at the first row over maxNodes", () => {
    const error = caught(() => csv("id,parent\n1,\n2,1\n3,1\n4,1\n", { maxNodes: 2 }));
    expect(error.code).toBe("LIMIT_EXCEEDED");
    expect(error.pos).toEqual({ row: 3, line: 4, column: 1 });
  });
});

describe("loadTree(tsv)", () => {
  it("loadTree(tsv) splits on tabs and reads double quotes as ordinary characters", () => {
    // IANA text/tab-separated-values (from memory): fields cannot contain tabs, and there is no quoting.
    const tree = tsv('id\tparent\tname\n1\t\t"Optics" lab\n2\t1\t5" lens\n');
    expect(outline(tree)).toEqual(['"Optics" lab', '  5" lens']);
  });

  it("loadTree(tsv) reports a ragged row as PARSE_CSV with its line", () => {
    const error = caught(() => tsv("id\tparent\n1\t\n2\n"));
    expect(error.code).toBe("PARSE_CSV");
    expect(error.pos).toEqual({ line: 3, column: 2 });
  });
});
