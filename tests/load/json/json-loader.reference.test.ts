import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { LoadOptions } from "../../../src/load/load-options.js";
import { loadTreeFromStream } from "../../../src/load/stream/index.js";
import { opts as allOptions } from "../helpers.js";
import {
  awkwardAt,
  cutsFor,
  everyByte,
  expectSameTree,
  expectSameTreeAndSummaries,
  loadByReference,
  loadStreamed,
  outcomeOf,
  outcomeOfAsync,
  type Rng,
  rng,
  utf8,
} from "../stream/helpers.js";

// The reference reads node objects under the children field (or rows): so do the byte loaders here.
// Reading by the document (values, a found children field, a path map) has its own tests in
// tests/load/shape.
const opts = (overrides: Partial<LoadOptions> = {}) =>
  allOptions({ readAs: "nodes", childrenFieldNamed: true, ...overrides });

// Names that stress the tokenizer: escapes, multi-byte characters (2, 3 and 4 bytes), a lone surrogate
// (JSON allows it escaped), names like array indices (JSON.parse puts those keys first), path characters.
const NAMES = [
  "a",
  "b",
  "é",
  "日本語",
  "😀 grin",
  "tab\there",
  'say "hi"',
  "back\\slash",
  "two\nlines",
  "",
  "~0",
  "a/b",
  "a name longer than thirteen",
  "\u2028",
  "\ud800",
  "0",
  "10",
  "2",
  "007",
  "4294967295",
  "constructor",
  "__proto__",
];
// Sizes as JSON writes them: integers, fractions, exponents, more digits than a double holds, minus zero
// (all at most 2^53 - 1: larger sizes are BAD_SIZE).
const SIZES = ["0", "7", "12345", "1.5", "1e3", "2.5E-3", "1234567890123456.78", "0.0", "-0", "1E+2", "1e-7"];
const SPACE = ["", "", "", " ", "\n", "\r\n", "\t", "  \n    "];

/** A JSON string for `s`, escaping at random (every character may be written as \uXXXX). */
function jsonString(r: Rng, s: string): string {
  let out = '"';
  for (let k = 0; k < s.length; k++) {
    const c = s.charCodeAt(k);
    const hex = () => {
      const h = c.toString(16).padStart(4, "0");
      return `\\u${r.chance(0.5) ? h : h.toUpperCase()}`;
    };
    if (c === 0x22) out += r.chance(0.5) ? '\\"' : hex();
    else if (c === 0x5c) out += "\\\\";
    else if (c === 0x0a) out += r.chance(0.5) ? "\\n" : hex();
    else if (c === 0x09) out += "\\t";
    else if (c < 0x20) out += hex();
    else if (c >= 0xd800 && c <= 0xdbff && k + 1 < s.length && s.charCodeAt(k + 1) >= 0xdc00) {
      if (r.chance(0.3)) {
        out += hex();
        const low = s.charCodeAt(k + 1).toString(16);
        out += `\\u${low}`;
      } else {
        out += s.slice(k, k + 2);
      }
      k++;
    } else if (c >= 0xd800 && c <= 0xdfff) out += hex();
    else if (c === 0x2f && r.chance(0.3)) out += "\\/";
    else if (r.chance(0.08)) out += hex();
    else out += s[k];
  }
  return `${out}"`;
}

function ws(r: Rng): string {
  return r.pick(SPACE);
}

/** Any JSON value (for fields nobody reads, and kept fields). */
function anyValue(r: Rng, depth: number): string {
  const roll = r.int(0, depth > 2 ? 4 : 6);
  switch (roll) {
    case 0:
      return jsonString(r, r.pick(NAMES));
    case 1:
      return r.pick(SIZES);
    case 2:
      return r.pick(["true", "false", "null"]);
    case 3:
      return `-${r.pick(SIZES)}`;
    case 4:
      return "[]";
    case 5: {
      const items = Array.from({ length: r.int(1, 3) }, () => ws(r) + anyValue(r, depth + 1) + ws(r));
      return `[${items.join(",")}]`;
    }
    default: {
      const items = Array.from(
        { length: r.int(1, 3) },
        () => `${ws(r)}${jsonString(r, r.pick(NAMES))}${ws(r)}:${ws(r)}${anyValue(r, depth + 1)}`,
      );
      return `{${items.join(",")}}`;
    }
  }
}

interface Budget {
  left: number;
  owners: number;
}

/** A node object of about `budget.left` nodes at most. */
function nodeObject(r: Rng, budget: Budget): string {
  budget.left--;
  // Fields by key; a key may repeat, and its values keep their order when the keys are shuffled.
  const groups = new Map<string, string[]>();
  const field = (key: string, value: string) => {
    if (!groups.has(key)) groups.set(key, []);
    groups.get(key)!.push(`${ws(r)}${jsonString(r, key)}${ws(r)}:${ws(r)}${value}${ws(r)}`);
  };
  if (r.chance(0.8)) {
    // Sometimes a first value that a repeated key replaces (JSON.parse keeps the last).
    if (r.chance(0.1)) field("name", r.pick(["{}", "[1]", '"first"', "3"]));
    field("name", r.chance(0.9) ? jsonString(r, r.pick(NAMES)) : r.pick(["12", "true", "null"]));
  }
  if (r.chance(0.6)) {
    if (r.chance(0.1)) field("size", r.pick(['"12"', "{}", "-4"]));
    field("size", r.chance(0.9) ? r.pick(SIZES) : "null");
  }
  if (r.chance(0.3)) field("meta", anyValue(r, 0));
  if (r.chance(0.2)) {
    budget.owners++;
    field("owner", anyValue(r, 1));
  }
  if (budget.left > 0 && r.chance(0.7)) {
    if (r.chance(0.1)) field("children", r.pick(['"none"', "[]", "{}", "7"]));
    field("children", children(r, budget));
  } else if (r.chance(0.2)) {
    field("children", r.pick(["null", "[]", "{}"]));
  }
  // Keys in any order: a node's name may come after its children.
  const keys = [...groups.values()];
  for (let k = keys.length - 1; k > 0; k--) {
    const j = r.int(0, k);
    [keys[k], keys[j]] = [keys[j], keys[k]];
  }
  return `{${keys.flat().join(",")}}`;
}

function children(r: Rng, budget: Budget): string {
  const count = r.int(0, Math.min(6, budget.left));
  if (r.chance(0.5)) {
    const items: string[] = [];
    for (let k = 0; k < count && budget.left > 0; k++) items.push(ws(r) + nodeObject(r, budget) + ws(r));
    return `[${items.join(",")}]`;
  }
  const items: string[] = [];
  for (let k = 0; k < count && budget.left > 0; k++) {
    const key = jsonString(r, r.pick(NAMES));
    // A repeated key: its first value (null here) is replaced by the last, in the first one's place.
    if (r.chance(0.1)) items.push(`${ws(r)}${key}${ws(r)}:${ws(r)}null`);
    let value: string;
    if (r.chance(0.3)) {
      budget.left--;
      value = r.chance(0.7) ? r.pick(SIZES) : "null";
    } else {
      value = nodeObject(r, budget);
    }
    items.push(`${ws(r)}${key}${ws(r)}:${ws(r)}${value}${ws(r)}`);
  }
  return `{${items.join(",")}}`;
}

/** A nested JSON document of up to `nodes` nodes: one node object or a top-level array of them. */
function nestedJson(r: Rng, nodes: number): { text: string; owners: number } {
  const budget = { left: nodes, owners: 0 };
  let text: string;
  if (r.chance(0.3)) {
    const roots: string[] = [];
    do roots.push(ws(r) + nodeObject(r, budget) + ws(r));
    while (budget.left > 0 && r.chance(0.5));
    text = `[${roots.join(",")}]`;
  } else {
    text = nodeObject(r, budget);
  }
  return { text: ws(r) + text + ws(r), owners: budget.owners };
}

/** Offsets where a cut is awkward: at escapes, quotes, multi-byte characters and line ends. */
const awkward = (bytes: Uint8Array) => awkwardAt(bytes, [0x5c, 0x22, 0x0d]);

describe("loadTreeFromStream(json)", () => {
  it("loadTreeFromStream(json) builds the tree the reference builds and the same summaries, however the bytes are cut", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer(), fc.integer({ min: 1, max: 50 }), async (seed, nodes) => {
        const r = rng(seed);
        const { text, owners } = nestedJson(r, nodes);
        const bytes = utf8(text);
        const options = opts({
          format: r.chance(0.5) ? "json" : undefined,
          file: "tidewater.json",
          keepFields: owners > 0 && r.chance(0.7) ? ["owner"] : [],
          rootName: "tidewater",
        });
        const cuts = cutsFor(r, bytes.length, r.int(0, 16), awkward(bytes));
        const expected = outcomeOf(() => loadByReference(bytes, options));
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cuts));
        if (!("tree" in expected)) {
          // Several faults may be reported in another order; the kind of fault is the same.
          expect("code" in actual && actual.code).toBe(expected.code);
          return;
        }
        if (!("tree" in actual)) throw new Error(`streaming failed: ${JSON.stringify(actual)}\n${text}`);
        expectSameTreeAndSummaries(r, actual.tree, expected.tree);
      }),
      { numRuns: 400 },
    );
  });

  it("loadTreeFromStream(json) reads single-byte chunks: escapes, a cut multi-byte character, CRLF", async () => {
    const text =
      '{\r\n "name": "caf\\u00e9 \\"Quill\\" é 😀",\r\n "size": 1.5e2,\r\n' +
      ' "children": {"10": 1, "2": null, "b\\\\": {"name": "x", "size": 3}, "ø": {}}\r\n}\r\n';
    const bytes = utf8(text);
    const expected = loadByReference(bytes, opts());
    const actual = await loadStreamed(bytes, opts(), everyByte(bytes.length));
    expectSameTree(actual, expected);
    // A child keyed by name takes the key as its name; its own name field is ignored.
    expect(actual.name).toEqual(['café "Quill" é 😀', "2", "10", "b\\", "ø"]);
  });

  it("loadTreeFromStream(json) orders children keyed like array indices first, as JSON.parse does", async () => {
    const text = '{"children":{"b":1,"10":2,"a":{"children":{"3":1,"1":2}},"2":3,"4294967295":4,"01":5}}';
    const tree = await loadStreamed(utf8(text), opts({ format: "json" }), [7, 20, 33]);
    expect(tree.name).toEqual(["(root)", "2", "10", "b", "a", "1", "3", "4294967295", "01"]);
    expectSameTree(tree, loadByReference(utf8(text), opts({ format: "json" })));
  });

  it("loadTreeFromStream(json) keeps a repeated key's first place and last value", async () => {
    const text =
      '{"name":"r","children":{"a":{"children":[{"name":"gone"}]},"b":2,"a":{"name":"ignored","size":5}},' +
      '"name":"root","children":{"x":1,"y":{"children":{"z":null}},"x":{"size":4}}}';
    const tree = await loadStreamed(utf8(text), opts({ format: "json" }), everyByte(text.length));
    expect(tree.name).toEqual(["root", "x", "y", "z"]);
    expect([...tree.ownSize]).toEqual([0, 4, 0, 0]);
    expectSameTree(tree, loadByReference(utf8(text), opts({ format: "json" })));
  });

  it("loadTreeFromStream(json) reads a top-level array of flat records with an id field as rows", async () => {
    const text = '[{"id":"q1","parent":"","name":"Quillfeather"},{"id":"q2","parent":"q1","meta":{"x":1}}]';
    const bytes = utf8(text);
    for (const format of [undefined, "rows"] as const) {
      const options = opts({ format, file: "org.json" });
      const tree = await loadStreamed(bytes, options, [3, 15, 40]);
      expect(tree.ids).toEqual(["q1", "q2"]);
      expectSameTree(tree, loadByReference(bytes, options));
    }
    // Forced to nested JSON, the same records are nodes.
    const nested = await loadStreamed(bytes, opts({ format: "json" }), []);
    expect(nested.name).toEqual(["(root)", "Quillfeather", ""]);
  });

  it("loadTreeFromStream(json) reports rows that are not all objects as SHAPE with the row", async () => {
    const error = await outcomeOfAsync(() => loadStreamed(utf8('[{"id":"a"},3]'), opts(), []));
    // At the element: [{"id":"a"}, is 12 characters.
    expect(error).toEqual({ code: "SHAPE", pos: { row: 2, line: 1, column: 13 } });
  });

  it("loadTreeFromStream(json) keeps an object or array field as the JSON text JSON.stringify gives", async () => {
    const text = '{"owner":{"b":[1, 2.50, "é"],"2":null},"children":[{"owner":"Mira"},{"owner":7e0}]}';
    const options = opts({ keepFields: ["owner"] });
    const tree = await loadStreamed(utf8(text), options, everyByte(text.length));
    expect(tree.fields.get("owner")).toEqual(['{"2":null,"b":[1,2.5,"é"]}', "Mira", "7"]);
    expectSameTree(tree, loadByReference(utf8(text), options));
  });

  it("loadTreeFromStream(json) keeps a field that is also the children or the name field", async () => {
    const text = '{"name":"r","children":[{"name":"a","children":{"x":1}},{"name":7}],"size":2}';
    for (const keepFields of [["children"], ["name", "size"], ["children", "name"]]) {
      const options = opts({ keepFields });
      const tree = await loadStreamed(utf8(text), options, everyByte(text.length));
      expectSameTree(tree, loadByReference(utf8(text), options));
    }
  });

  it("loadTreeFromStream(json) drops byte-order marks as a whole-text decoder does", async () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8('{"name":"a","children":[{"name":"b"}]}')]);
    const tree = await loadStreamed(bytes, opts(), [1, 2, 4]);
    expectSameTree(tree, loadByReference(bytes, opts()));
  });

  it("loadTreeFromStream(json) loads a chain 200,000 nodes deep without recursion", async () => {
    const depth = 200_000;
    const text = '{"children":['.repeat(depth - 1) + '{"name":"leaf"}' + "]}".repeat(depth - 1);
    const tree = await loadStreamed(utf8(text), opts(), [1000, 1_000_001]);
    expect(tree.length).toBe(depth);
    expect(tree.depth[depth - 1]).toBe(depth - 1);
  });
});

// Malformed JSON: the first character that makes it invalid (RFC 8259), or the end.
const BROKEN = [
  '{"a":"\\x"}',
  '{"a":"\\u12G4"}',
  '{"a":"\\u12"}',
  '{"a":"ab\u0001"}',
  '{"a":"é\u0001"}',
  '{"a":"abc',
  '{"a":"abc   ',
  '{"a":01}',
  '{"a":-x}',
  '{"a":1.}',
  '{"a":1e}',
  '{"a":1e+}',
  '{"a":1.5.3}',
  '{"a":tru}',
  '{"a":nul',
  '{"a" 1}',
  '{"a":1,}',
  '{"a":[1,]}',
  '{"a":1}x',
  "{,}",
  '{"a":"\\',
  '{"a":-}',
  '{"a":[1 2]}',
  '{"a":+1}',
  '{"a":.5}',
  "é",
  '{\n  "name": "a",\n}',
  '{\n  "name": "a",\n  "size": tru}',
  '{"name": "a",\n "children": [\n',
  '{"name": "日本😀", "x": ]}',
  '{"name": "a"}\n\n  ]',
  '{"a":"\t"}',
  '{"a"\u00a0:1}',
  "[\n  {}\n  {}\n]",
];

type Fault = { code: string; pos: unknown };

/** Whether a valid JSON text (RFC 8259) has an object with the same member name twice. */
function hasRepeatedKey(text: string): boolean {
  const stack: (Set<string> | null)[] = [];
  const expectKey: boolean[] = [];
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === "{") {
      stack.push(new Set());
      expectKey.push(true);
    } else if (c === "[") {
      stack.push(null);
      expectKey.push(false);
    } else if (c === "}" || c === "]") {
      stack.pop();
      expectKey.pop();
    } else if (c === ",") {
      if (stack.length > 0 && stack[stack.length - 1] !== null) expectKey[expectKey.length - 1] = true;
    } else if (c === '"') {
      let j = i + 1;
      while (text[j] !== '"') j += text[j] === "\\" ? 2 : 1;
      const keys = stack[stack.length - 1];
      if (keys && expectKey[expectKey.length - 1]) {
        const key = JSON.parse(text.slice(i, j + 1)) as string;
        if (keys.has(key)) return true;
        keys.add(key);
        expectKey[expectKey.length - 1] = false;
      }
      i = j;
    }
  }
  return false;
}

/**
 * The same fault, or one the byte loader met first: it stops at the first fault in document order, while
 * the reference (JSON.parse, then a walk) parses everything first and then checks nodes breadth-first.
 */
function sameFault(streamed: Fault, reference: Fault): boolean {
  if (streamed.code === reference.code && JSON.stringify(streamed.pos) === JSON.stringify(reference.pos))
    return true;
  if (streamed.code === "PARSE_JSON") return false;
  if (reference.code !== "PARSE_JSON") return reference.pos === undefined;
  const a = streamed.pos as { line: number; column: number } | undefined;
  if (a === undefined) return false;
  const b = reference.pos as { line: number; column: number };
  return a.line < b.line || (a.line === b.line && a.column <= b.column);
}

describe("loadTreeFromStream(json) errors", () => {
  it("loadTreeFromStream(json) reports PARSE_JSON at the line and column the reference reports, cut anywhere", async () => {
    for (const text of BROKEN) {
      const bytes = utf8(text);
      const expected = outcomeOf(() => loadByReference(bytes, opts({ format: "json" })));
      expect(expected, text).toMatchObject({ code: "PARSE_JSON" });
      for (const cuts of [[], everyByte(bytes.length), [Math.floor(bytes.length / 2)]]) {
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, opts({ format: "json" }), cuts));
        expect(actual, `${JSON.stringify(text)} cut at ${cuts.length} places`).toEqual(expected);
      }
    }
  });

  it("loadTreeFromStream(json) agrees with the reference on JSON broken at random", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer(), async (seed) => {
        const r = rng(seed);
        let text = nestedJson(r, r.int(1, 12)).text;
        for (let k = r.int(1, 2); k > 0; k--) {
          const at = r.int(0, text.length);
          const roll = r.int(0, 2);
          if (roll === 0) text = text.slice(0, at) + text.slice(at + 1);
          else if (roll === 1)
            text =
              text.slice(0, at) + r.pick(['"', "{", "]", ",", ":", "\\", "x", "é", "1"]) + text.slice(at);
          else text = text.slice(0, at);
        }
        const bytes = utf8(text);
        const options = opts({ format: "json" });
        const expected = outcomeOf(() => loadByReference(bytes, options));
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cutsFor(r, bytes.length, 6)));
        if ("tree" in expected) {
          // A repeated key keeps its last value (RFC 8259 §4 leaves repeated names to the reader; we
          // follow JSON.parse), but the byte loader checks every value as it reads it: an invalid first
          // value is reported even when a later one replaces it (docs/input.md). Only then may it fail.
          const checkedEarly = "code" in actual && actual.code !== "PARSE_JSON" && hasRepeatedKey(text);
          if (!("tree" in actual) && !checkedEarly)
            throw new Error(`streaming failed: ${JSON.stringify(actual)}\n${text}`);
          if (!("tree" in actual)) return;
          expectSameTree(actual.tree, expected.tree);
        } else if (!("code" in actual) || !sameFault(actual, expected)) {
          throw new Error(
            `${JSON.stringify(text)}\nreference: ${JSON.stringify(expected)}, streamed: ${JSON.stringify(actual)}`,
          );
        }
      }),
      { numRuns: 400 },
    );
  });

  it("loadTreeFromStream(json) gives structure errors the code the reference gives, with the value's position", async () => {
    const cases: [string, string][] = [
      ['{"name":"r","children":[{"name":"a/b","size":"12"}]}', "BAD_SIZE"],
      ['{"name":"r","children":{"x":-1}}', "BAD_SIZE"],
      ['{"name":"r","children":"a"}', "SHAPE"],
      ['{"name":"r","children":[1]}', "SHAPE"],
      ['{"name":"r","children":{"a":"b"}}', "SHAPE"],
      ["42", "SHAPE"],
      ['{"name":{"first":"x"}}', "SHAPE"],
      ["[]", "INPUT_EMPTY"],
      ["  \n ", "INPUT_EMPTY"],
    ];
    for (const [text, code] of cases) {
      const options = opts({ format: "json" });
      expect(outcomeOf(() => loadByReference(utf8(text), options))).toMatchObject({ code });
      expect(await outcomeOfAsync(() => loadStreamed(utf8(text), options, [5]))).toMatchObject({ code });
    }
    const bad = await outcomeOfAsync(() =>
      loadStreamed(
        utf8('{"name":"r",\n "children":[{"name":"a","size":"12"}]}'),
        opts({ file: "t.json" }),
        [],
      ),
    );
    expect(bad).toEqual({ code: "BAD_SIZE", pos: { file: "t.json", line: 2, column: 33 } });
  });

  it("loadTreeFromStream(json) stops with LIMIT_EXCEEDED once there are more than maxNodes nodes", async () => {
    const text = '{"name":"r","children":[{},{},{}]}';
    expect(await outcomeOfAsync(() => loadStreamed(utf8(text), opts({ maxNodes: 3 }), []))).toMatchObject({
      code: "LIMIT_EXCEEDED",
    });
  });

  it("loadTreeFromStream(json) reports a kept field no node has as FIELD_MISSING", async () => {
    const outcome = await outcomeOfAsync(() =>
      loadStreamed(utf8('{"name":"r"}'), opts({ keepFields: ["x"] }), []),
    );
    expect(outcome).toMatchObject({ code: "FIELD_MISSING" });
  });

  it("loadTreeFromStream(json) lets go of the input when it stops early", async () => {
    let closed = false;
    async function* input() {
      try {
        yield utf8('{"name": 1, ');
        yield utf8('"size": "x"}');
        yield utf8(" ".repeat(100));
      } finally {
        closed = true;
      }
    }
    expect(await outcomeOfAsync(() => loadTreeFromStream(input(), opts()))).toMatchObject({
      code: "BAD_SIZE",
    });
    expect(closed).toBe(true);
  });
});
