import fc from "fast-check";
import jsonpointer from "jsonpointer";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../src/errors.js";
import { loadTree } from "../../src/load/index.js";
import { valueAtPointer, valueAtPointerInBytes } from "../../src/load/json/value-at-pointer.js";
import { parsePointer } from "../../src/load/json-pointer.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { cli } from "../helpers/cli.js";
import { rfc6901Document, rfc6901MemberPointers } from "../helpers/rfc6901-example.js";
import { caught, opts, outline } from "./helpers.js";

// RFC 6901, section 5: the example document and what each pointer refers to.
const rfcDocument = rfc6901Document;
const rfcExamples: [string, unknown][] = [
  ["", JSON.parse(rfcDocument)],
  ["/foo", ["bar", "baz"]],
  ["/foo/0", "bar"],
  ...rfc6901MemberPointers,
];

/** The text left of `json` when all but the value at `pointer` is blanked. */
function kept(json: string, pointer: string): string {
  const bytes = Buffer.from(json, "utf8");
  return Buffer.from(valueAtPointerInBytes(bytes, parsePointer(pointer), pointer)).toString("utf8");
}

/** The same, the text cut into chunks at `cuts` (byte offsets) and streamed. */
async function keptStreamed(json: string, pointer: string, cuts: number[]): Promise<string> {
  const bytes = Buffer.from(json, "utf8");
  const at = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
  const parts: Uint8Array[] = [];
  let from = 0;
  for (const c of [...at, bytes.length]) {
    parts.push(Uint8Array.from(bytes.subarray(from, c)));
    from = c;
  }
  async function* chunks() {
    yield* parts;
  }
  const out: Uint8Array[] = [];
  for await (const chunk of valueAtPointer(chunks(), parsePointer(pointer), pointer)) out.push(chunk);
  return Buffer.concat(out).toString("utf8");
}

describe("--start-at: the value a JSON Pointer refers to", () => {
  it("finds every value of RFC 6901's example (section 5)", () => {
    for (const [pointer, value] of rfcExamples) {
      const text = kept(rfcDocument, pointer);
      expect(JSON.parse(text), pointer).toEqual(value);
      // Blanked, not cut: every line of the file stays where it was.
      expect(text.length).toBe(rfcDocument.length);
      expect(text.split("\n").length).toBe(rfcDocument.split("\n").length);
    }
  });

  it("parses pointers as RFC 6901 section 4 decodes them (~01 is ~1, not /)", () => {
    expect(parsePointer("")).toEqual([]);
    expect(parsePointer("/")).toEqual([""]);
    expect(parsePointer("/a~1b/~01")).toEqual(["a/b", "~1"]);
    expect(caught(() => parsePointer("data")).code).toBe("USAGE");
    expect(caught(() => parsePointer("/a~2")).code).toBe("USAGE");
  });

  it("agrees with the jsonpointer package on random documents, streamed in random chunks", async () => {
    // Reference: jsonpointer 5.0.1 (npm), an RFC 6901 implementation, over JSON.parse (RFC 8259).
    const key = fc.constantFrom("a", "b", "~", "/", "a/b", "m~n", "", "é", "0", "1", "x y");
    const value = fc.letrec((tie) => ({
      node: fc.oneof(
        { depthSize: "small", withCrossShrink: true },
        fc.oneof(fc.integer(), fc.string(), fc.boolean(), fc.constant(null)),
        fc.array(tie("node"), { maxLength: 4 }),
        fc.dictionary(key, tie("node"), { maxKeys: 4 }),
      ),
    })).node;
    // The reference takes an object or array as the document.
    const documents = fc.oneof(fc.array(value, { maxLength: 5 }), fc.dictionary(key, value, { maxKeys: 5 }));
    await fc.assert(
      fc.asyncProperty(
        documents,
        fc.array(fc.nat(), { maxLength: 6 }),
        fc.array(fc.nat(), { maxLength: 5 }),
        fc.boolean(),
        async (doc, choices, cuts, pretty) => {
          // A path to a value of the document, chosen by `choices`, and one that misses when asked.
          const tokens: string[] = [];
          let at: unknown = doc;
          for (const c of choices) {
            if (Array.isArray(at) && at.length > 0) {
              tokens.push(String(c % at.length));
              at = at[c % at.length];
            } else if (at !== null && typeof at === "object" && Object.keys(at).length > 0) {
              const keys = Object.keys(at);
              tokens.push(keys[c % keys.length]);
              at = (at as Record<string, unknown>)[keys[c % keys.length]];
            } else break;
          }
          const pointer = tokens.map((t) => `/${t.replace(/~/g, "~0").replace(/\//g, "~1")}`).join("");
          const json = JSON.stringify(doc, null, pretty ? 2 : undefined);
          const expected = jsonpointer.get(JSON.parse(json), pointer);
          expect(JSON.parse(kept(json, pointer))).toEqual(expected);
          expect(JSON.parse(await keptStreamed(json, pointer, cuts))).toEqual(expected);
          const missing = `${pointer}/no~1such`;
          // The reference finds nothing there either (it throws where the path meets a null).
          let reference: unknown;
          try {
            reference = jsonpointer.get(JSON.parse(json), missing);
          } catch {
            reference = undefined;
          }
          expect(reference).toBeUndefined();
          expect(caught(() => kept(json, missing)).code).toBe("FIELD_MISSING");
        },
      ),
      { numRuns: 300 },
    );
  });

  it("says where the path stops, with the keys or the length there, at the file's line", () => {
    const json = '{\n  "meta": {"count": 2},\n  "data": [\n    {"id": "a"},\n    {"id": "b"}\n  ]\n}\n';
    const missing = caught(() => kept(json, "/items"));
    expect(missing.code).toBe("FIELD_MISSING");
    expect(missing.message).toContain('the document has no member "items" (its keys: "meta", "data")');
    expect(missing.pos?.line).toBe(7);
    const past = caught(() => kept(json, "/data/2"));
    expect(past.message).toContain("/data is an array of 2 elements, with no index 2");
    expect(past.pos?.line).toBe(6);
    expect(caught(() => kept(json, "/meta/count/x")).message).toContain("/meta/count is a single value");
    expect(caught(() => kept(json, "/data/first")).message).toContain(
      '/data is an array, and "first" is no index',
    );
  });

  it("refuses a key the path goes through that appears twice (a parser keeps the last, a stream sees the first)", () => {
    const error = caught(() => kept('{"data": [1], "data": [2]}', "/data"));
    expect(error.code).toBe("SHAPE");
    expect(error.pos).toEqual({ line: 1, column: 15 });
  });

  it("still checks the whole text: a syntax error after the value is PARSE_JSON where it is", () => {
    const error = caught(() => kept('{"data": [1, 2],\n "rest": [3,, 4]}', "/data"));
    expect(error.code).toBe("PARSE_JSON");
    expect(error.pos?.line).toBe(2);
  });
});

// An invented export of Quillfeather's team directory: rows inside a wrapper object, as an API answers.
const rows = [
  { id: "T1", parent: "", name: "Quillfeather" },
  { id: "T2", parent: "T1", name: "Ledger" },
  { id: "T3", parent: "T1", name: "Harbor" },
  { id: "T4", parent: "T2", name: "Payouts" },
];
const wrapped = JSON.stringify({ page: { next: null, total: 4 }, data: { teams: rows } }, null, 2);
const wrappedYaml = `page: {next: null, total: 4}
defaults: &team {parent: T1}
data:
  teams:
    - {id: T1, parent: "", name: Quillfeather}
    - {<<: *team, id: T2, name: Ledger}
    - {<<: *team, id: T3, name: Harbor}
    - {id: T4, parent: T2, name: Payouts}
`;

describe("--start-at in the loaders", () => {
  it("reads rows inside a wrapper as the bare array reads, from a string, a stream and YAML", async () => {
    const bare = outline(loadTree(JSON.stringify(rows), opts({ format: "rows" })));
    expect(bare).toEqual(["Quillfeather", "  Ledger", "    Payouts", "  Harbor"]);
    expect(outline(loadTree(wrapped, opts({ startAt: "/data/teams" })))).toEqual(bare);
    async function* chunks() {
      const bytes = Buffer.from(wrapped, "utf8");
      for (let k = 0; k < bytes.length; k += 7) yield Uint8Array.from(bytes.subarray(k, k + 7));
    }
    expect(outline(await loadTreeFromStream(chunks(), opts({ startAt: "/data/teams" })))).toEqual(bare);
    // YAML: the merge key (<<) and the alias reach an anchor outside the part read.
    expect(outline(loadTree(wrappedYaml, opts({ format: "yaml", startAt: "/data/teams" })))).toEqual(bare);
  });

  it("YAML: where the path stops, at the line of the node it stops in", () => {
    const error = caught(() => loadTree(wrappedYaml, opts({ format: "yaml", startAt: "/data/people" })));
    expect(error.code).toBe("FIELD_MISSING");
    expect(error.message).toContain('/data has no member "people" (its keys: "teams")');
    expect(error.pos?.line).toBe(4);
    const several = caught(() => loadTree("a: 1\n---\nb: 2\n", opts({ format: "yaml", startAt: "/a" })));
    expect(several.code).toBe("USAGE");
  });

  it("read as values, the root is the part: its size is the part's bytes, not the file's", () => {
    // RFC 6901 section 5's "/foo" is ["bar", "baz"]: 14 bytes as written there.
    const sizeOf = (tree: ReturnType<typeof loadTree>) => tree.ownSize.reduce((a, b) => a + b, 0);
    expect(sizeOf(loadTree(rfcDocument, opts({ readAs: "values", startAt: "/foo" })))).toBe(14);
    const yaml = "meta:\n  note: a long note that is not read\nfoo: [bar, baz]\n";
    // "[bar, baz]" is 10 bytes.
    expect(sizeOf(loadTree(yaml, opts({ format: "yaml", readAs: "values", startAt: "/foo" })))).toBe(10);
  });

  it("a pointer to a single value is SHAPE at it, in JSON and YAML (no one-node tree with exit 0)", async () => {
    const json = caught(() => loadTree(wrapped, opts({ startAt: "/page/total" })));
    expect(json.code).toBe("SHAPE");
    expect(json.message).toContain("point at the object or array that holds it (/page)");
    expect(json.pos?.line).toBe(4);
    async function* chunks() {
      yield Buffer.from(wrapped, "utf8");
    }
    await expect(loadTreeFromStream(chunks(), opts({ startAt: "/page/total" }))).rejects.toMatchObject({
      code: "SHAPE",
    });
    const yaml = caught(() => loadTree(wrappedYaml, opts({ format: "yaml", startAt: "/page/total" })));
    expect(yaml.code).toBe("SHAPE");
    expect(yaml.pos?.line).toBe(1);
  });

  it("is refused for input that is no JSON or YAML document", () => {
    const error = caught(() => loadTree("id,parent\na,\n", opts({ format: "csv", startAt: "/a" })));
    expect(error.code).toBe("USAGE");
    expect(error).toBeInstanceOf(EspalierError);
  });

  it("on the command line: the header names the part read, and a diff reads the same part of both", async () => {
    const next = wrapped.replace('"Payouts"', '"Settlements"');
    const files = { "teams.json": wrapped, "teams2.json": next };
    const r = await cli(["teams.json", "--start-at", "/data/teams", "--width", "120"], { files });
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toContain("read at /data/teams");
    expect(r.stdout).toContain("Payouts");
    const d = await cli(
      ["diff", "teams.json", "teams2.json", "--start-at", "/data/teams", "--width", "120"],
      {
        files,
      },
    );
    expect(d.code).toBe(0);
    expect(d.stdout.split("\n")[0]).toMatch(/0 added, 0 removed, 0 moved, 1 renamed/);
  });
});
