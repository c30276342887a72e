import fc from "fast-check";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { EarlierBytes } from "../../../src/load/earlier-bytes.js";
import { KeptJson, LEAST_KEPT_BYTES } from "../../../src/load/json/kept-json.js";
import type { BytesAt, LoadOptions } from "../../../src/load/load-options.js";
import { NodeSink } from "../../../src/load/node-sink.js";
import { opts as allOptions } from "../helpers.js";
import {
  awkwardAt,
  cutsFor,
  expectSameTreeAndSummaries,
  loadStreamed,
  type Outcome,
  outcomeOfAsync,
  type Rng,
  rng,
  utf8,
} from "../stream/helpers.js";

// A diff's NEW read against its OLD on one thread (src/load/json/kept-json.ts): OLD's load keeps its
// bytes and where each node object lies in them, and NEW's takes the node objects whose bytes are the
// same at the same place in the tree instead of reading them. The check: NEW read so is NEW read alone
// (the same loader without an earlier version), node for node, field for field, note for note, error
// for error (code and position), however both are cut into chunks.

// A diff keeps `version` where nodes have it (cli/input.ts): kept fields are taken too.
const opts = (overrides: Partial<LoadOptions> = {}) =>
  allOptions({
    readAs: "nodes",
    childrenFieldNamed: true,
    keepFields: ["version"],
    optionalKeepFields: ["version"],
    format: "json",
    file: "v2.json",
    ...overrides,
  });

// Names repeated among siblings, beyond ASCII (columns count UTF-16 units), empty, escaped.
const NAMES = ["src", "lib", "index.ts", "a.md", "é", "日本", "😀", "", 'say "hi"', "two\nlines"];
const VERSIONS: unknown[] = ["1.2.0", "", null, 3, { major: 2 }, ["rc"], true];

const TEAMS: unknown[] = ["quay", "berth", "", null, 7, { shift: "night" }];

type Node = Record<string, unknown>;

/** A node object with what a real input's may hold: absent or odd fields, `missing`, `{}`. */
function nodeObject(r: Rng, depth: number): Node {
  if (r.chance(0.03)) return {};
  const node: Node = {};
  if (r.chance(0.92)) node.name = r.chance(0.9) ? r.pick(NAMES) : r.int(0, 9);
  if (r.chance(0.85)) node.size = r.chance(0.9) ? r.int(0, 99) : null;
  if (r.chance(0.25)) node.version = r.pick(VERSIONS);
  if (r.chance(0.03)) node.missing = true;
  // A field beside those read, as an org chart's team (compared by a diff without --compare-field).
  if (r.chance(0.2)) node.team = r.pick(TEAMS);
  // A field nobody reads, holding what looks like nodes.
  if (r.chance(0.05)) node.meta = { children: [{ name: "not a node" }], note: "é" };
  if (depth < 4 && r.chance(0.55)) {
    const children: Node[] = [];
    const count = r.int(0, 6);
    for (let k = 0; k < count; k++) children.push(nodeObject(r, depth + 1));
    // Children keyed by name now and then (put in JSON.parse's order: a number-like key first).
    node.children = r.chance(0.08)
      ? Object.fromEntries(
          children.map((child, k) => [r.chance(0.3) ? String(k) : `${r.pick(NAMES)}${k}`, child]),
        )
      : children;
  }
  return node;
}

/**
 * A document whose first child holds more nodes than are sampled for messages (FieldsSeen: the first
 * 1,000 are always read), so that what follows may be taken.
 */
function documentOf(r: Rng): Node {
  const padding = Array.from({ length: 1001 }, (_, k) => ({ name: `berth-${k}`, size: k }));
  const children: Node[] = [{ name: "berths", children: padding }];
  const count = r.int(1, 8);
  for (let k = 0; k < count; k++) children.push(nodeObject(r, 1));
  return { name: "harbour", size: 1, children };
}

/** Every node object under the padding, with the array holding it. */
function placed(root: Node): { node: Node; list: Node[] }[] {
  const out: { node: Node; list: Node[] }[] = [];
  const walk = (node: Node) => {
    const children = Array.isArray(node.children) ? (node.children as Node[]) : [];
    for (const child of children) {
      out.push({ node: child, list: children });
      walk(child);
    }
  };
  for (const child of (root.children as Node[]).slice(1)) {
    out.push({ node: child, list: root.children as Node[] });
    walk(child);
  }
  return out;
}

/** A later version: subtrees removed or added, nodes renamed, resized, versioned, emptied. */
function later(r: Rng, root: Node): Node {
  const copy = structuredClone(root);
  const edits = r.int(0, 5);
  for (let k = 0; k < edits; k++) {
    const all = placed(copy);
    if (all.length === 0) break;
    const { node, list } = r.pick(all);
    const kind = r.int(0, 5);
    if (kind === 0) list.splice(list.indexOf(node), 1);
    else if (kind === 1) node.name = r.pick(NAMES);
    else if (kind === 2) node.size = r.int(0, 99);
    else if (kind === 3) node.version = r.pick(VERSIONS);
    else if (kind === 4) list.splice(list.indexOf(node), 0, nodeObject(r, 3));
    else if (Array.isArray(node.children) || node.children === undefined) {
      const children = (node.children as Node[] | undefined) ?? [];
      node.children = children;
      children.splice(r.int(0, children.length), 0, nodeObject(r, 3));
    }
  }
  return copy;
}

function text(r: Rng, root: Node): string {
  const json = JSON.stringify(root, null, r.chance(0.4) ? r.pick([1, 2, "\t"]) : undefined);
  // A children key given twice (JSON.parse keeps the last: a REPEATED_KEY note), now and then.
  const twice = json.indexOf('"children":[{', json.length >> 1);
  return twice >= 0 && r.chance(0.15) ? `${json.slice(0, twice)}"children":[],${json.slice(twice)}` : json;
}

/** NEW with a byte made wrong in its last part (a syntax error, mostly), sometimes. */
function spoiled(r: Rng, bytes: Uint8Array): Uint8Array {
  if (!r.chance(0.2)) return bytes;
  const out = bytes.slice();
  out[r.int(Math.floor((2 * out.length) / 3), out.length - 1)] = r.pick([0x23, 0x7d, 0x5d, 0x2c, 0x22]);
  return out;
}

function comparable(outcome: Outcome): unknown {
  return "tree" in outcome ? { reading: outcome.tree.reading } : outcome;
}

/**
 * NEW read against OLD and alone, both cut alike into chunks (`cut`), or whole; OLD's bytes kept by its
 * load, or (`again`) read again as a file would be (LoadOptions.inputReadAgain, earlierInput), in reads
 * of at most `again` bytes.
 */
async function versions(
  oldBytes: Uint8Array,
  newBytes: Uint8Array,
  r: Rng,
  options = opts(),
  cut = true,
  again = 0,
) {
  const cuts = (bytes: Uint8Array) =>
    cut ? cutsFor(r, bytes.length, r.int(0, 6), awkwardAt(bytes, [0x22, 0x5c, 0x7b, 0x7d, 0x0a])) : [];
  const oldTree = await loadStreamed(
    oldBytes,
    { ...options, keepForLaterVersion: true, inputBytes: oldBytes.length, inputReadAgain: again > 0 },
    cuts(oldBytes),
  );
  const earlierInput: BytesAt = {
    read(into, offset, length, position) {
      const part = oldBytes.subarray(position, position + Math.min(length, again));
      into.set(part, offset);
      return part.length;
    },
  };
  const newCuts = cuts(newBytes);
  const alone = await outcomeOfAsync(() =>
    loadStreamed(newBytes, { ...options, inputBytes: newBytes.length }, newCuts),
  );
  const against = await outcomeOfAsync(() =>
    loadStreamed(
      newBytes,
      {
        ...options,
        earlierVersion: oldTree,
        inputBytes: newBytes.length,
        ...(again > 0 ? { earlierInput } : {}),
      },
      newCuts,
    ),
  );
  return { alone, against };
}

describe("a JSON document read against the kept earlier version of itself (kept-json.ts)", () => {
  // Inputs of a few KiB: kept as any size is (16 MiB and more outside tests, LEAST_KEPT_BYTES).
  beforeEach(() => {
    KeptJson.leastBytes = 0;
  });
  afterEach(() => {
    vi.restoreAllMocks();
    EarlierBytes.windowBytes = 4 << 20;
    KeptJson.leastBytes = LEAST_KEPT_BYTES;
  });

  it("keeps nothing of an input shorter than LEAST_KEPT_BYTES outside tests", async () => {
    KeptJson.leastBytes = LEAST_KEPT_BYTES;
    const take = vi.spyOn(NodeSink.prototype, "take");
    const r = rng(3);
    const bytes = utf8(JSON.stringify(documentOf(r)));
    await versions(bytes, bytes, r, opts(), false);
    expect(take).not.toHaveBeenCalled();
  });

  it("reads what it reads alone, however the bytes are cut, and takes nodes where they are the same", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    await fc.assert(
      fc.asyncProperty(fc.integer(), async (seed) => {
        const r = rng(seed);
        const root = documentOf(r);
        const oldBytes = utf8(text(r, root));
        const newBytes = spoiled(r, utf8(text(r, later(r, root))));
        const { alone, against } = await versions(oldBytes, newBytes, r);
        expect(comparable(against)).toEqual(comparable(alone));
        if ("tree" in against && "tree" in alone) expectSameTreeAndSummaries(r, against.tree, alone.tree);
      }),
      { numRuns: 250 },
    );
    // Not a test that passes by never taking anything.
    expect(take.mock.calls.length).toBeGreaterThan(100);
  }, 60_000);

  it("keeps the other fields of the nodes it takes, as NEW read alone keeps them (keepOtherFields)", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    // NEW's other fields are kept in OLD's order where OLD kept them first: a diff lists OLD's first.
    const sorted = (outcome: Outcome) =>
      "tree" in outcome
        ? {
            reading: {
              ...outcome.tree.reading,
              otherFields: [...(outcome.tree.reading?.otherFields ?? [])].sort(),
            },
            fields: [...outcome.tree.fields].sort(([a], [b]) => (a < b ? -1 : 1)),
          }
        : outcome;
    await fc.assert(
      fc.asyncProperty(fc.integer(), async (seed) => {
        const r = rng(seed);
        const root = documentOf(r);
        const oldBytes = utf8(text(r, root));
        const newBytes = spoiled(r, utf8(text(r, later(r, root))));
        const { alone, against } = await versions(oldBytes, newBytes, r, opts({ keepOtherFields: true }));
        expect(sorted(against)).toEqual(sorted(alone));
      }),
      { numRuns: 150 },
    );
    expect(take.mock.calls.length).toBeGreaterThan(100);
  }, 60_000);

  it("reads the same with OLD's file read again through a window, however small, not kept", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    await fc.assert(
      fc.asyncProperty(fc.integer(), async (seed) => {
        const r = rng(seed);
        // A window of a few hundred bytes to a few KiB: moved along, and too short for some ranges;
        // reads short of what was asked, now and then (a file read may return less).
        EarlierBytes.windowBytes = r.pick([256, 1024, 4096]);
        const root = documentOf(r);
        const oldBytes = utf8(text(r, root));
        const newBytes = spoiled(r, utf8(text(r, later(r, root))));
        const { alone, against } = await versions(
          oldBytes,
          newBytes,
          r,
          opts(),
          true,
          r.pick([100, 1 << 30]),
        );
        expect(comparable(against)).toEqual(comparable(alone));
        if ("tree" in against && "tree" in alone) expectSameTreeAndSummaries(r, against.tree, alone.tree);
      }),
      { numRuns: 120 },
    );
    // Not a test that passes by never taking anything: 85 to 185 takes seen in six runs of the 120
    // cases (fewer than with the bytes kept: short windows and reads leave more ranges uncompared).
    expect(take.mock.calls.length).toBeGreaterThan(20);
  }, 60_000);

  it("takes a run of unchanged siblings in one piece and reads the one that changed", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    const r = rng(7);
    const root = documentOf(r);
    const berths = (root.children as Node[])[0].children as Node[];
    const oldBytes = utf8(JSON.stringify(root));
    berths[600].size = 12345;
    const { alone, against } = await versions(oldBytes, utf8(JSON.stringify(root)), r);
    if (!("tree" in against) || !("tree" in alone)) throw new Error("both should load");
    expectSameTreeAndSummaries(r, against.tree, alone.tree);
    // The padding's nodes are read up to the 1,000th (sampled); after berth 600 changed, the rest of
    // its siblings come in one piece; the document's other children after them.
    const taken = take.mock.calls.map((call) => call[5]);
    expect(taken.reduce((a, b) => a + b, 0)).toBeGreaterThan(0);
    expect(against.tree.ownSize[1 + 1 + 600]).toBe(12345);
  });

  it("reads again the node objects whose reading did more than add nodes", async () => {
    const r = rng(5);
    const berths = Array.from({ length: 1001 }, (_, k) => ({ name: `berth-${k}`, size: k }));
    // Each after the padding, unchanged: the only `version` (null: read back as no such field), a
    // children key given twice (a REPEATED_KEY note counts it), `"missing": true` (MISSING_ENTRIES),
    // an empty entry `{}` (counted as such), and one leaf that changes.
    const parts = (size: number) => [
      JSON.stringify({ name: "harbour", children: berths }).slice(0, -2),
      ',{"name":"crane","version":null,"size":4}',
      ',{"name":"dock","children":[],"children":[{"name":"bollard","size":2}]}',
      ',{"name":"pier","missing":true},{}',
      `,{"name":"tug","size":${size}}]}`,
    ];
    const oldBytes = utf8(parts(1).join(""));
    const newBytes = utf8(parts(22).join(""));
    const { alone, against } = await versions(oldBytes, newBytes, r, opts(), false);
    if (!("tree" in against) || !("tree" in alone)) throw new Error("both should load");
    expect(alone.tree.reading?.notes?.map((n) => n.code)).toEqual(["REPEATED_KEY", "MISSING_ENTRIES"]);
    expect(alone.tree.fields.get("version")).toBeDefined();
    expectSameTreeAndSummaries(r, against.tree, alone.tree);
    expect(against.tree.reading).toEqual(alone.tree.reading);
  });

  it("keeps nothing without the input's length, or for a tree read as totals", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    const r = rng(11);
    const berths = Array.from({ length: 1010 }, (_, k) => ({ name: `berth-${k}`, size: k }));
    const bytes = utf8(JSON.stringify({ name: "harbour", size: 10 ** 7, children: berths }));
    const oldTree = await loadStreamed(bytes, { ...opts(), keepForLaterVersion: true }, []);
    await loadStreamed(bytes, { ...opts(), earlierVersion: oldTree, inputBytes: bytes.length }, []);
    expect(take).not.toHaveBeenCalled();
    const totals = opts({ folderSizes: "own" });
    const { against } = await versions(bytes, bytes, r, totals, false);
    expect("tree" in against).toBe(true);
    expect(take).toHaveBeenCalled();
    take.mockClear();
    await versions(bytes, bytes, r, opts({ folderSizes: "total" }), false);
    expect(take).not.toHaveBeenCalled();
  });
});
