import { Buffer } from "node:buffer";
import { Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { measure } from "../../src/model/measure.js";
import { slots } from "../helpers/graph-slots.js";
import { caught, opts } from "../load/helpers.js";

describe("loadTree(text, { format: 'edges' })", () => {
  it("gives a shared node one full entry, under its deepest parent, and a reference under each other parent", () => {
    const tree = loadTree(
      "app ui\napp core\nui widgets\nui core\ncore log\nwidgets log\n",
      opts({ format: "edges" }),
    );
    // core: parents app (depth 0) and ui (depth 1) -> under ui. log: core (2) and widgets (2) tie ->
    // the edge that comes first in the input (core log).
    expect(slots(tree)).toEqual([
      "app",
      "  ui",
      "    widgets",
      "      &log",
      "    core",
      "      log",
      "  &core",
    ]);
    const m = measure(tree);
    expect(m.nodes[0]).toBe(5); // app, ui, widgets, core, log: each counted once
    expect(m.count[0]).toBe(7); // slots, references included
    expect(tree.referenceTo![3]).toBe(5); // &log -> log's full entry
    expect(tree.referenceTo![6]).toBe(4); // &core -> core's full entry
  });

  it("reads a cycle: the edge that closes it (met last by a depth-first walk from the roots) becomes a reference", () => {
    const tree = loadTree("a b\nb c\nc a\n", opts({ format: "edges" }));
    expect(slots(tree)).toEqual(["a", "  b", "    c", "      &a"]);
    expect(measure(tree).nodes[0]).toBe(3);
  });

  it("enters a part of the graph that no edge-free node reaches at its node that comes first in the input", () => {
    const tree = loadTree("r s\nx y\ny x\n", opts({ format: "edges", rootName: "g" }));
    expect(slots(tree)).toEqual(["g", "  r", "    s", "  x", "    y", "      &x"]);
    expect(tree.syntheticRoot).toBe(true);
  });

  it("reads a self-loop as a reference of a node to itself", () => {
    const tree = loadTree("a a\na b\n", opts({ format: "edges" }));
    expect(slots(tree)).toEqual(["a", "  &a", "  b"]);
  });

  it("reads a repeated edge once, a one-id line as a node without edges, tabs when the first line has one", () => {
    const tree = loadTree(
      "top\tleft side\ntop\tleft side\nlone\n\ntop\tright\n",
      opts({ format: "edges", rootName: "g" }),
    );
    expect(slots(tree)).toEqual(["g", "  top", "    left side", "    right", "  lone"]);
  });

  it("splits on runs of spaces when the first line has no tab, and accepts CRLF line ends", () => {
    const tree = loadTree("  a    b  \r\na c\r\n", opts({ format: "edges" }));
    expect(slots(tree)).toEqual(["a", "  b", "  c"]);
  });

  it("rejects a third field with SHAPE at its line and column", () => {
    const error = caught(() => loadTree("a b\nb c d\n", opts({ format: "edges" })));
    expect(error.code).toBe("SHAPE");
    expect(error.pos).toMatchObject({ line: 2, column: 5 });
  });

  it("reads a CSV edge table by its parent and child columns (a header naming both)", () => {
    const tree = loadTree("parent,child\nx,y\nx,z\ny,z\n", opts({ format: "edges" }));
    expect(slots(tree)).toEqual(["x", "  y", "    z", "  &z"]);
  });

  it("refuses more nodes than maxNodes with LIMIT_EXCEEDED", () => {
    expect(caught(() => loadTree("a b\nb c\n", opts({ format: "edges", maxNodes: 2 }))).code).toBe(
      "LIMIT_EXCEEDED",
    );
  });
});

describe("loadTree(csv, { graph: true })", () => {
  it("lets a child id repeat with other parents; the first row gives the record", () => {
    const csv =
      "id,parent,name,size\nhq,,Head office,1\nlab,hq,Lab,2\nops,hq,Ops,3\nrig,lab,Rig,4\nrig,ops,,\n";
    const tree = loadTree(csv, opts({ format: "csv", graph: true }));
    expect(slots(tree)).toEqual(["Head office", "  Lab", "    Rig", "  Ops", "    &Rig"]);
    const m = measure(tree);
    expect(m.nodes[0]).toBe(4);
    expect(m.size[0]).toBe(10); // Rig's 4 counted once
  });

  it("keeps DUPLICATE_ID by default, and for a repeated id with another record or the same parent", () => {
    const repeated = "id,parent\na,\nb,a\nc,a\nc,b\n";
    expect(caught(() => loadTree(repeated, opts({ format: "csv" }))).code).toBe("DUPLICATE_ID");
    const renamed = "id,parent,name\na,,A\nb,a,B\nb,a,B\n";
    const same = caught(() => loadTree(renamed, opts({ format: "csv", graph: true })));
    expect(same.code).toBe("DUPLICATE_ID");
    expect(same.pos).toMatchObject({ row: 3 });
    const other = caught(() =>
      loadTree("id,parent,name\na,,A\nb,a,B\nb,a,C\n", opts({ format: "csv", graph: true })),
    );
    expect(other.code).toBe("DUPLICATE_ID");
    expect(other.pos).toMatchObject({ row: 3 });
  });

  it("reads a CSV or TSV with parent and child columns but no id column as an edge table, in memory and streamed", async () => {
    for (const [format, text] of [
      ["csv", "parent,child\nx,y\nx,z\ny,z\n"],
      ["tsv", "parent\tchild\nx\ty\nx\tz\ny\tz\n"],
    ] as const) {
      const expected = ["x", "  y", "    z", "  &z"];
      expect(slots(loadTree(text, opts({ format, graph: true })))).toEqual(expected);
      const streamed = await loadTreeFromStream(
        Readable.from([Buffer.from(text)]),
        opts({ format, graph: true }),
      );
      expect(slots(streamed)).toEqual(expected);
    }
  });

  it("counts blank lines wherever the stream's chunks end: the same lines in memory and streamed", async () => {
    const text = "a b\n\nb c\n\n\nc a\n  \nd\n\n";
    const bytes = Buffer.from(text);
    const whole = loadTree(text, opts({ format: "edges" }));
    // Slots: the root espalier adds (0), a, b, c at the lines they first appear on, the reference of
    // "c a" (it closes a cycle) at its line, d.
    expect([...whole.origin]).toEqual([0, 1, 1, 3, 6, 8]);
    const bad = `${text}e f g\n`;
    for (let cut = 1; cut < bytes.length; cut++) {
      const pieces = [bytes.subarray(0, cut), bytes.subarray(cut)];
      const streamed = await loadTreeFromStream(Readable.from(pieces), opts({ format: "edges" }));
      expect([...streamed.origin]).toEqual([...whole.origin]);
      const badBytes = Buffer.from(bad);
      const error = await loadTreeFromStream(
        Readable.from([badBytes.subarray(0, cut), badBytes.subarray(cut)]),
        opts({ format: "edges" }),
      ).catch((err: unknown) => err);
      expect(error).toMatchObject({ code: "SHAPE", pos: { line: 10, column: 5 } });
    }
  });

  it("names a parent that no row has with MISSING_PARENT", () => {
    expect(caught(() => loadTree("id,parent\na,\nb,zz\n", opts({ format: "csv", graph: true }))).code).toBe(
      "MISSING_PARENT",
    );
  });
});

describe("loadTree(json adjacency map)", () => {
  it("reads {id: [child ids]} and records with a children list, name and size", () => {
    const json = JSON.stringify({
      hq: { name: "Head office", size: 1, children: ["lab", "ops"] },
      lab: ["rig"],
      ops: { children: ["rig"], size: 2 },
      rig: { size: 5 },
    });
    const tree = loadTree(json, opts({ format: "json", graph: true }));
    expect(slots(tree)).toEqual(["Head office", "  lab", "    rig", "  ops", "    &rig"]);
    expect(measure(tree).size[0]).toBe(8);
    expect(tree.ids?.get(0)).toBe("hq");
  });

  it("reads the same map from YAML", () => {
    const tree = loadTree("hq: [lab, ops]\nlab: [rig]\nops: [rig]\n", opts({ format: "yaml", graph: true }));
    expect(slots(tree)).toEqual(["hq", "  lab", "    rig", "  ops", "    &rig"]);
  });

  it("reads a YAML map's aliased id lists as the lists they stand for", () => {
    // YAML 1.2.2 §7.1: an alias node refers to the most recent preceding node with that anchor.
    const tree = loadTree(
      "hq: &both [lab, ops]\nlab: [rig]\nops: [rig]\nrig: []\nyard: *both\n",
      opts({ format: "yaml", graph: true }),
    );
    // Two roots (hq, yard) under the added root; yard's lab and ops are references to hq's.
    expect(slots(tree)).toEqual([
      "(root)",
      "  hq",
      "    lab",
      "      rig",
      "    ops",
      "      &rig",
      "  yard",
      "    &lab",
      "    &ops",
    ]);
  });

  it("refuses a YAML alias that names no anchor before it as PARSE_YAML at the alias (was an internal error)", () => {
    // YAML 1.2.2 §7.1: it is an error for an alias node to use an anchor that does not previously occur.
    for (const [doc, line, column] of [
      ["a: *nope\n", 1, 4],
      ["a: [b]\nb: *later\nc: &later [a]\n", 2, 4],
    ] as const) {
      const error = caught(() => loadTree(doc, opts({ format: "yaml", graph: true })));
      expect(error.code).toBe("PARSE_YAML");
      expect(error.pos).toEqual({ line, column });
    }
    // Bytes the fuzzer found (seed -925501349): an alias of stray bytes.
    const fuzzed = Buffer.from([42, 187, 24, 201]).toString("utf8");
    expect(caught(() => loadTree(fuzzed, opts({ format: "yaml", graph: true }))).code).toMatch(
      /^PARSE_YAML$/,
    );
  });

  it("refuses aliases that expand past the yaml package's alias count limit as LIMIT_EXCEEDED", () => {
    // Each level aliases the one before it nine times: 9^11 values if expanded (an alias bomb).
    let doc = "a0: &a0 [x]\n";
    for (let i = 1; i < 12; i++)
      doc += `a${i}: &a${i} [${Array(9)
        .fill(`*a${i - 1}`)
        .join(", ")}]\n`;
    expect(caught(() => loadTree(doc, opts({ format: "yaml", graph: true }))).code).toBe("LIMIT_EXCEEDED");
  });

  it("reads the map as the tree of its values without graph: true (only --graph reads it as a map of ids)", () => {
    const tree = loadTree('{"hq":["lab","ops"],"lab":["rig"],"ops":["rig"]}', opts({ format: "json" }));
    expect(tree.referenceTo).toBeUndefined();
    expect(tree.reading?.shape).toBe("values");
    // RFC 8259 §4-5: the document, its 3 member values and the 4 array elements are 8 values; each value
    // is one node (RFC 6901 pointers), so "rig" is counted twice here, as two strings.
    expect(tree.length).toBe(8);
  });

  it("rejects an entry that is neither a list of ids, a record nor null, and an empty id, with SHAPE", () => {
    for (const doc of ['{"a":["b"],"b":7}', '{"a":{"children":[{"name":"x"}]}}', '{"a":["b", ""],"b":null}'])
      expect(caught(() => loadTree(doc, opts({ format: "json", graph: true }))).code).toBe("SHAPE");
    expect(caught(() => loadTree("[1, 2]\n", opts({ format: "yaml", graph: true }))).code).toBe("SHAPE");
  });

  it("refuses a kept field no record holds with FIELD_MISSING naming those they hold; an optional one is not kept", () => {
    // main's build kept such a field as a column of nothing: a label printed "", a diff compared nothing.
    const doc = '{"dock":{"children":["crane"],"owner":"quay-team"},"crane":{"checks":{"lint":true}}}';
    const error = caught(() => loadTree(doc, opts({ format: "json", graph: true, keepFields: ["team"] })));
    expect(error.code).toBe("FIELD_MISSING");
    expect(error.details).toMatchObject({ field: "team", fieldsSeen: ["owner", "checks"] });
    const optional = loadTree(
      doc,
      opts({
        format: "json",
        graph: true,
        keepFields: ["version", "owner"],
        optionalKeepFields: ["version"],
      }),
    );
    expect([...optional.fields.keys()]).toEqual(["owner"]);
  });
});
