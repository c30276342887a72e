import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { cli } from "../helpers/cli.js";
import { caught, opts } from "../load/helpers.js";
import { oneErrorLine } from "./error-line.js";

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "espalier-malformed-"));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** Writes `content` to a file called `name` in the test folder and returns its path. */
async function file(name: string, content: string | Uint8Array): Promise<string> {
  const path = join(dir, name);
  await writeFile(path, content);
  return path;
}

describe("espalier FILE (malformed input): exit 2, one line naming file and position, nothing on stdout", () => {
  it("truncated JSON: PARSE_JSON at the line and column where the text ends", async () => {
    const path = await file("cut.json", '{\n  "name": "quill",\n  "children": [\n    {"name": "a"');
    const e = oneErrorLine(await cli([path]));
    expect(e).toEqual({ code: "PARSE_JSON", file: path, line: 4, column: 17 });
  });

  it("JSON with a stray character: PARSE_JSON at that character", async () => {
    const path = await file("stray.json", '{"name": "quill",\n "children": [}]}');
    expect(oneErrorLine(await cli([path]))).toEqual({ code: "PARSE_JSON", file: path, line: 2, column: 15 });
  });

  it("YAML syntax error: PARSE_YAML at the line and column of the fault", async () => {
    const path = await file("bad.yaml", "name: quill\nchildren:\n  - name: a\n   - name: b\n");
    expect(oneErrorLine(await cli([path]))).toEqual({ code: "PARSE_YAML", file: path, line: 4, column: 4 });
  });

  it("YAML with a repeated key: PARSE_YAML at the second key", async () => {
    const path = await file("dup.yaml", "name: quill\nname: feather\n");
    expect(oneErrorLine(await cli([path]))).toMatchObject({ code: "PARSE_YAML", file: path, line: 2 });
  });

  it("CSV with an unbalanced quote: PARSE_CSV at the line where the bad record starts", async () => {
    const path = await file("quote.csv", 'id,parent,name\n1,,Quill\n2,1,"Ledger\n3,1,Tide\n');
    expect(oneErrorLine(await cli([path]))).toMatchObject({ code: "PARSE_CSV", file: path, line: 3 });
  });

  it("CSV with a quote inside an unquoted field (RFC 4180, section 2): PARSE_CSV at its line", async () => {
    const path = await file("inner.csv", 'id,parent,name\n1,,Qu"ill\n');
    expect(oneErrorLine(await cli([path]))).toMatchObject({ code: "PARSE_CSV", file: path, line: 2 });
  });

  it("CSV with a ragged row: PARSE_CSV at the line of the row with too many or too few cells", async () => {
    const long = await file("long.csv", "id,parent,name\n1,,Quill\n2,1,Ledger,extra\n");
    expect(oneErrorLine(await cli([long]))).toMatchObject({ code: "PARSE_CSV", file: long, line: 3 });
    const short = await file("short.csv", "id,parent,name\n1,,Quill\n2,1\n");
    expect(oneErrorLine(await cli([short]))).toMatchObject({ code: "PARSE_CSV", file: short, line: 3 });
  });

  it("TSV with a ragged row: PARSE_CSV at its line", async () => {
    const path = await file("ragged.tsv", "id\tparent\n1\t\n2\t1\tx\n");
    expect(oneErrorLine(await cli([path]))).toMatchObject({ code: "PARSE_CSV", file: path, line: 3 });
  });

  it("an empty or blank input, in every format: INPUT_EMPTY naming the file", async () => {
    for (const name of ["e.json", "e.yaml", "e.csv", "e.tsv", "e.paths", "e.txt", "e"]) {
      for (const content of ["", "   \n\n\t\n", "\ufeff"]) {
        const path = await file(name, content);
        expect(oneErrorLine(await cli([path])), `${name} ${JSON.stringify(content)}`).toMatchObject({
          code: "INPUT_EMPTY",
          file: path,
        });
      }
    }
    expect(oneErrorLine(await cli(["-"], { stdin: "" })).code).toBe("INPUT_EMPTY");
  });

  it("a table with a header and no rows, a YAML document of only a comment: INPUT_EMPTY", async () => {
    const header = await file("header.csv", "id,parent,name\n");
    expect(oneErrorLine(await cli([header])).code).toBe("INPUT_EMPTY");
    const comment = await file("comment.yaml", "# nothing here\n");
    expect(oneErrorLine(await cli([comment])).code).toBe("INPUT_EMPTY");
  });

  it("a column that does not exist: FIELD_MISSING, listing the columns that do", async () => {
    const path = await file("cols.csv", "key,boss,title\n1,,Chief\n");
    const r = await cli([path]);
    expect(oneErrorLine(r)).toMatchObject({ code: "FIELD_MISSING", file: path });
    for (const column of ["key", "boss", "title"]) expect(r.stderr).toContain(`"${column}"`);
    const label = await cli([path, "--id-field", "key", "--parent-field", "boss", "--label", "{team}"]);
    expect(oneErrorLine(label).code).toBe("FIELD_MISSING");
    for (const column of ["key", "boss", "title"]) expect(label.stderr).toContain(column);
  });

  it("a file that does not exist or is a folder: IO naming it", async () => {
    expect(oneErrorLine(await cli([join(dir, "absent.json")])).code).toBe("IO");
    expect(oneErrorLine(await cli([dir])).code).toBe("IO");
  });

  it("a byte-order mark and CRLF line ends are accepted in every format", async () => {
    const inputs: [string, string][] = [
      ["bom.json", '{"name": "quill",\r\n "children": [{"name": "a", "size": 2}]}\r\n'],
      ["bom.yaml", "name: quill\r\nchildren:\r\n  - name: a\r\n    size: 2\r\n"],
      ["bom.csv", "id,parent,name,size\r\n1,,quill,\r\n2,1,a,2\r\n"],
      ["bom.tsv", "id\tparent\tname\tsize\r\n1\t\tquill\t\r\n2\t1\ta\t2\r\n"],
      ["bom.paths", "0\tquill\r\n2\tquill/a\r\n"],
      [
        "rows.json",
        '[{"id": "1", "parent": "", "name": "quill"},\r\n {"id": "2", "parent": "1", "name": "a", "size": 2}]',
      ],
    ];
    for (const [name, content] of inputs) {
      const path = await file(name, `\ufeff${content}`);
      const r = await cli([path, "--format", "json", "--no-chains"]);
      expect(r.code, `${name}: ${r.stderr}`).toBe(0);
      const doc = JSON.parse(r.stdout);
      expect(doc.root.name, name).toBe("quill");
      expect(
        doc.root.children.map((c: { name: string }) => c.name),
        name,
      ).toEqual(["a"]);
      expect(doc.totals.size, name).toBe(2);
    }
  });

  it("invalid UTF-8 becomes U+FFFD, the replacement character (WHATWG Encoding, UTF-8 decode)", async () => {
    const bytes = Buffer.concat([Buffer.from("quill/a"), Buffer.from([0xff, 0xc3]), Buffer.from("b\n")]);
    const path = await file("bytes.paths", bytes);
    const r = await cli([path, "--format", "json"]);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).root.children[0].name).toBe("a\ufffd\ufffdb");
  });
});

describe("loadTree(text) (malformed input, in memory)", () => {
  it("gives the same codes and positions as the command line", () => {
    const cut = caught(() =>
      loadTree('{\n  "name": "quill",\n  "children": [\n    {"name": "a"', opts({ file: "x.json" })),
    );
    expect([cut.code, cut.pos]).toEqual(["PARSE_JSON", { file: "x.json", line: 4, column: 17 }]);
    const yaml = caught(() =>
      loadTree("name: quill\nchildren:\n  - name: a\n   - name: b\n", opts({ format: "yaml" })),
    );
    expect([yaml.code, yaml.pos?.line, yaml.pos?.column]).toEqual(["PARSE_YAML", 4, 4]);
    const quote = caught(() => loadTree('id,parent,name\n1,,Quill\n2,1,"Ledger\n', opts({ format: "csv" })));
    expect([quote.code, quote.pos?.line]).toEqual(["PARSE_CSV", 3]);
    const ragged = caught(() => loadTree("id,parent\n1,\n2,1,x\n", opts({ format: "csv" })));
    expect([ragged.code, ragged.pos?.line]).toEqual(["PARSE_CSV", 3]);
    expect(caught(() => loadTree(" \r\n", opts())).code).toBe("INPUT_EMPTY");
  });
});
