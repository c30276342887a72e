import fc from "fast-check";
import { describe, expect, it, vi } from "vitest";
import { stringify } from "yaml";
import { loadTree } from "../../src/load/index.js";
import { KeptJson, LEAST_KEPT_BYTES } from "../../src/load/json/kept-json.js";
import type { LoadOptions } from "../../src/load/load-options.js";
import { NodeSink } from "../../src/load/node-sink.js";
import type { Tree } from "../../src/model/tree.js";
import { cli } from "../helpers/cli.js";
import { opts } from "./helpers.js";
import { everyByte, loadStreamed, rng, utf8 } from "./stream/helpers.js";

// The independent answer: the document parsed whole by JSON.parse (RFC 8259; for YAML, the same value
// written by the yaml package's stringify and read back by espalier), then walked here: every node
// object read (the top, and each object under "children", at any depth) is looked through for objects
// holding "name", "size" or "children" in its other fields, at any depth; those are counted, with the
// sum of their numeric "size".
function notReadByWalk(doc: unknown): { count: number; size: number; places: number } {
  let count = 0;
  let size = 0;
  let places = 0;
  const loose = (v: unknown): { count: number; size: number } => {
    let c = 0;
    let s = 0;
    if (Array.isArray(v)) {
      for (const item of v) {
        const r = loose(item);
        c += r.count;
        s += r.size;
      }
    } else if (typeof v === "object" && v !== null) {
      const o = v as Record<string, unknown>;
      if ("name" in o || "size" in o || "children" in o) {
        c++;
        if (typeof o.size === "number") s += o.size;
      }
      for (const value of Object.values(o)) {
        const r = loose(value);
        c += r.count;
        s += r.size;
      }
    }
    return { count: c, size: s };
  };
  const node = (n: Record<string, unknown>) => {
    for (const [key, value] of Object.entries(n)) {
      if (key === "name" || key === "size") continue;
      if (key === "children") {
        const list = Array.isArray(value) ? value : Object.values(value as object);
        for (const child of list) if (typeof child === "object" && child !== null) node(child as never);
        continue;
      }
      if (typeof value !== "object" || value === null) continue;
      const r = loose(value);
      if (r.count > 0) places++;
      count += r.count;
      size += r.size;
    }
  };
  if (Array.isArray(doc)) for (const top of doc) node(top);
  else node(doc as Record<string, unknown>);
  return { count, size, places };
}

const nodes = (overrides: Partial<LoadOptions> = {}) =>
  opts({ readAs: "nodes", childrenFieldNamed: true, ...overrides });

function noteOf(tree: Tree) {
  return tree.reading?.notes?.find((n) => n.code === "NODES_NOT_READ");
}

/** The input texts a note names (keys, node paths), in order. */
function named(tree: Tree): string[] {
  return (noteOf(tree)?.parts ?? []).flatMap((p) => (typeof p === "string" ? [] : [p.text]));
}

const HARBOR = {
  name: "harbor",
  children: [
    { name: "ledger", size: 10 },
    { name: "tern", size: 5 },
  ],
  extras: [
    { name: "mooring", size: 100, children: [{ name: "buoy", size: 7 }] },
    { name: "quay", size: 30 },
  ],
};

describe("NODES_NOT_READ", () => {
  it("loadTree(json) notes a second list of node objects beside the children: key, line, count, size", () => {
    const text = JSON.stringify(HARBOR, null, 1);
    const tree = loadTree(text, opts({ format: "json" }));
    expect(tree.length).toBe(3);
    const note = noteOf(tree)!;
    expect(note.count).toBe(notReadByWalk(HARBOR).count);
    expect(note.count).toBe(3);
    // The line of `"extras": [` (JSON.stringify with one space puts each member on its own line).
    expect(note.line).toBe(text.split("\n").findIndex((l) => l.includes('"extras"')) + 1);
    expect(named(tree)[0]).toBe("extras");
    expect(note.parts.join("")).toContain("137");
  });

  it("loadTree(yaml) notes the same document written as YAML alike", () => {
    const text = stringify(HARBOR);
    const tree = loadTree(text, opts({ format: "yaml" }));
    expect(tree.length).toBe(3);
    const note = noteOf(tree)!;
    expect(note.count).toBe(3);
    // The line its value starts on: the first item's, under `extras:`.
    expect(note.line).toBe(text.split("\n").findIndex((l) => l.startsWith("extras:")) + 2);
    expect(named(tree)[0]).toBe("extras");
  });

  it("loadTree(json) notes one node object under a key, and a map of them by key, at a deeper level", () => {
    const doc = {
      name: "harbor",
      children: [
        { name: "ledger", size: 1, deputy: { name: "pier", size: 2 } },
        {
          name: "tern",
          children: [{ name: "gull", extras: { a: { size: 3 }, b: { size: 4, children: [] } } }],
        },
      ],
    };
    const tree = loadTree(JSON.stringify(doc), opts({ format: "json" }));
    const note = noteOf(tree)!;
    expect(note.count).toBe(3);
    expect(note.count).toBe(notReadByWalk(doc).count);
    expect(named(tree).slice(0, 2)).toEqual(["deputy", "harbor/ledger"]);
    expect(note.parts.join("")).toContain("9 in all");
  });

  it("loadTree(json) and loadTree(yaml) say nothing when every node object is read", () => {
    const doc = {
      name: "harbor",
      meta: { owner: "ops", tags: ["a", "b"], limits: { cpu: 2 } },
      children: [{ name: "ledger", size: 1, labels: [{ key: "tier", value: "gold" }] }],
    };
    expect(noteOf(loadTree(JSON.stringify(doc), opts({ format: "json" })))).toBeUndefined();
    expect(noteOf(loadTree(stringify(doc), opts({ format: "yaml" })))).toBeUndefined();
  });

  it("loadTree(yaml) counts a node object reached again through an alias once, and none read as a node", () => {
    const text = [
      "name: harbor",
      "children:",
      "  - &l",
      "    name: ledger",
      "    size: 10",
      "extras:",
      "  - &m {name: mooring, size: 100}",
      "  - *m",
      "  - *l",
    ].join("\n");
    const note = noteOf(loadTree(text, opts({ format: "yaml" })))!;
    expect(note.count).toBe(1);
    expect(note.line).toBe(7);
  });

  it("loadTree(json) and loadTree(yaml) count a field kept for --label (or a diff) alike: shown as text, no node", () => {
    const doc = {
      name: "harbor",
      owner: { name: "ops" },
      children: [{ name: "ledger", owner: [{ size: 2 }] }],
    };
    for (const text of [JSON.stringify(doc, null, 1), stringify(doc)]) {
      const kept = loadTree(text, opts({ keepFields: ["owner"] }));
      expect(noteOf(kept)!.count).toBe(2);
      expect(noteOf(kept)!.line).toBe(noteOf(loadTree(text, opts()))!.line);
      expect(named(kept)[0]).toBe("owner");
    }
  });

  it("espalier --pseudonymize says the note, its header clause and JSON with no key or name of the input", async () => {
    const files = { "input.json": JSON.stringify(HARBOR) };
    const env = { ESPALIER_PSEUDONYM_KEY: "test-key-not-secret" };
    const text = await cli(["input.json", "--pseudonymize"], { files, env });
    expect(text.code).toBe(0);
    expect(text.stderr).toContain("[NODES_NOT_READ]");
    expect(text.stdout).toContain("3 node objects outside the children not read");
    const json = await cli(["input.json", "--pseudonymize", "--format", "json"], { files, env });
    expect(JSON.parse(json.stdout).input.notes.map((n: { code: string }) => n.code)).toEqual([
      "NODES_NOT_READ",
    ]);
    for (const out of [text.stdout, text.stderr, json.stdout])
      for (const word of ["harbor", "extras", "mooring", "quay", "ledger"]) expect(out).not.toContain(word);
  });

  it("loadTreeFromStream(json) against a kept earlier version counts them as a load alone does", async () => {
    // Kept whatever the size (16 MiB and more outside tests), so NEW takes OLD's unchanged node objects
    // from OLD's reading (json/kept-json.ts) instead of reading them.
    KeptJson.leastBytes = 0;
    const take = vi.spyOn(NodeSink.prototype, "take");
    try {
      let n = 0;
      const make = (depth: number): Record<string, unknown> => {
        const node: Record<string, unknown> = { name: `n${n++}`, size: n % 97 };
        if (depth < 4) node.children = Array.from({ length: 8 }, () => make(depth + 1));
        if (n % 37 === 0) node.extras = [{ name: `x${n}`, size: 5, children: [{ name: "y", size: 1 }] }];
        return node;
      };
      const old = make(0);
      const changed = structuredClone(old);
      (changed.children as { size: number }[])[3].size = 999;
      const oldBytes = utf8(JSON.stringify(old, null, 1));
      const newBytes = utf8(JSON.stringify(changed, null, 1));
      const options = nodes({ format: "json" });
      const oldTree = await loadStreamed(
        oldBytes,
        { ...options, keepForLaterVersion: true, inputBytes: oldBytes.length },
        [],
      );
      const tree = await loadStreamed(
        newBytes,
        { ...options, earlierVersion: oldTree, inputBytes: newBytes.length },
        [],
      );
      expect(take).toHaveBeenCalled();
      expect(noteOf(tree)!.count).toBe(notReadByWalk(changed).count);
      expect(noteOf(oldTree)!.count).toBe(notReadByWalk(old).count);
    } finally {
      take.mockRestore();
      KeptJson.leastBytes = LEAST_KEPT_BYTES;
    }
  });

  it("loadTreeFromStream(json) counts alike whatever the chunks, single bytes included", async () => {
    const text = JSON.stringify(HARBOR);
    const tree = await loadStreamed(utf8(text), nodes({ format: "json" }), everyByte(text.length));
    expect(noteOf(tree)!.count).toBe(3);
    expect(named(tree)[0]).toBe("extras");
  });

  it("loadTree(json) and loadTree(yaml) count as a walk of the parsed document does (random documents)", async () => {
    const words = ["name", "size", "children", "extras", "meta", "deputy", "x"];
    fc.assert(
      fc.property(fc.integer(), (seed) => {
        const rand = rng(seed);
        const r = { int: (n: number) => rand.int(0, n - 1) };
        let budget = 40;
        const value = (depth: number): unknown => {
          const k = r.int(6);
          if (depth > 3 || budget-- <= 0 || k === 0) return r.int(3) === 0 ? null : r.int(50);
          if (k === 1) return `s${r.int(9)}`;
          if (k <= 3) return Array.from({ length: r.int(4) }, () => value(depth + 1));
          const o: Record<string, unknown> = {};
          for (let f = r.int(4); f > 0; f--) {
            const key = words[r.int(words.length)];
            if (key === "name") o.name = `n${r.int(99)}`;
            else if (key === "size") o.size = r.int(100);
            else if (key === "children") o.children = Array.from({ length: r.int(3) }, () => node(depth + 1));
            else o[key] = value(depth + 1);
          }
          return o;
        };
        const node = (depth: number): Record<string, unknown> => {
          const n: Record<string, unknown> = { name: `n${r.int(99)}`, size: r.int(100) };
          if (r.int(3) === 0) n[words[3 + r.int(4)]] = value(depth + 1);
          // The top holds a child at least: a lone node with other fields is FIELD_MISSING (missing-field.ts).
          if (depth === 0 || (depth < 4 && budget-- > 0))
            n.children = Array.from({ length: 1 + r.int(3) }, () => node(depth + 1));
          return n;
        };
        const doc = node(0);
        const want = notReadByWalk(doc);
        for (const [format, text] of [
          ["json", JSON.stringify(doc, null, r.int(2))],
          ["yaml", stringify(doc)],
        ] as const) {
          const note = noteOf(loadTree(text, nodes({ format })));
          expect(note?.count ?? 0, `${format}\n${text}`).toBe(want.count);
          const sized = want.size > 0 ? ` of size ${want.size}` : "";
          if (note)
            expect(note.parts.join(""), text).toContain(
              `${want.count === 1 ? "1 node object" : `${want.count} node objects`}${sized} in all`,
            );
        }
      }),
      { numRuns: 300 },
    );
    // Cut into chunks at random, as a stream comes.
    const text = JSON.stringify({ ...HARBOR, children: [HARBOR, { ...HARBOR, more: HARBOR }] });
    const r = rng(7);
    const cuts = Array.from({ length: 40 }, () => r.int(1, text.length - 1));
    const tree = await loadStreamed(utf8(text), nodes({ format: "json" }), cuts);
    expect(noteOf(tree)!.count).toBe(notReadByWalk(JSON.parse(text)).count);
  });
});
