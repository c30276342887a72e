import { describe, expect, it } from "vitest";
import { loadTreeFromStream } from "../../../src/load/stream/index.js";
import { opts } from "../helpers.js";
import { expectSameTree, loadByReference, loadStreamed, outcomeOfAsync, utf8 } from "./helpers.js";

describe("loadTreeFromStream", () => {
  it("loadTreeFromStream(bytes) detects each format from the name and the first bytes as loadTree does", async () => {
    const inputs: [string, string][] = [
      ["org.csv", "id,parent,name\n1,,Quillfeather\n2,1,Optics\n"],
      ["org.tsv", "id\tparent\n1\t\n2\t1\n"],
      ["stdin", "id,parent\n1,\n2,1\n"],
      ["stdin", "path\tsize\ntidewater/a\t3\n"],
      ["deps.json", '{"name":"tidewater","children":{"ledger":12}}'],
      ["stdin", '[{"id":"1","parent":""},{"id":"2","parent":"1"}]'],
      ["stdin", "name: tidewater\nchildren:\n  - name: ledger\n"],
      ["files.txt", "./a\n./a/b\n"],
      ["stdin", "tidewater/services\ntidewater/docs\n"],
    ];
    for (const [file, text] of inputs) {
      const options = opts({ file: file === "stdin" ? undefined : file });
      const bytes = utf8(text);
      const tree = await loadStreamed(bytes, options, [1, 5, 9]);
      expectSameTree(tree, loadByReference(bytes, options));
    }
  });

  it("loadTreeFromStream(bytes) passes chunks beyond the first 64 KiB through in order", async () => {
    const children = Array.from({ length: 6000 }, (_, k) => `{"name":"n${k}","size":${k}}`).join(",");
    const bytes = utf8(`{"name":"tidewater","children":[${children}]}`);
    expect(bytes.length).toBeGreaterThan(1 << 17);
    const cuts = Array.from({ length: 200 }, (_, k) => 997 * (k + 1));
    const tree = await loadStreamed(bytes, opts(), cuts);
    expectSameTree(tree, loadByReference(bytes, opts()));
    const lines = utf8(Array.from({ length: 9000 }, (_, k) => `${k}\tdocs/d${k % 7}/f${k}`).join("\n"));
    expectSameTree(await loadStreamed(lines, opts(), cuts), loadByReference(lines, opts()));
  });

  it("loadTreeFromStream(bytes) reports input holding only white space or byte-order marks as INPUT_EMPTY", async () => {
    for (const bytes of [utf8(""), utf8(" \n\t "), new Uint8Array([0xef, 0xbb, 0xbf, 0xef, 0xbb, 0xbf])]) {
      for (const format of [undefined, "json", "csv", "paths"] as const) {
        expect(
          await outcomeOfAsync(() => loadStreamed(bytes, opts({ format, file: "x.json" }), [1])),
        ).toEqual({
          code: "INPUT_EMPTY",
          pos: { file: "x.json" },
        });
      }
    }
  });

  it("loadTreeFromStream(bytes) names the file in every error position", async () => {
    const outcome = await outcomeOfAsync(() => loadStreamed(utf8('{"a":}'), opts({ file: "deps.json" }), []));
    expect(outcome).toEqual({ code: "PARSE_JSON", pos: { file: "deps.json", line: 1, column: 6 } });
  });

  it("loadTreeFromStream(chunks) takes any async iterable of byte arrays", async () => {
    async function* source() {
      yield new Uint8Array([0x7b, 0x22]);
      yield utf8('name":"tidewater"}');
    }
    const tree = await loadTreeFromStream(source(), opts());
    expect(tree.name).toEqual(["tidewater"]);
  });
});
