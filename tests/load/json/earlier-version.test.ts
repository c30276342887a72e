import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { LoadOptions } from "../../../src/load/load-options.js";
import type { NamePool } from "../../../src/model/names.js";
import { opts as allOptions } from "../helpers.js";
import {
  awkwardAt,
  cutsFor,
  expectSameTreeAndSummaries,
  loadByReference,
  loadStreamed,
  type Outcome,
  outcomeOf,
  outcomeOfAsync,
  type Rng,
  rng,
  utf8,
} from "../stream/helpers.js";

// Node objects under "children", as the reference reads them (tests/load/reference).
const opts = (overrides: Partial<LoadOptions> = {}) =>
  allOptions({ readAs: "nodes", childrenFieldNamed: true, ...overrides });

// Names repeated among siblings and cousins (a name found at another node is the same bytes), beyond
// ASCII, empty, and with characters JSON writes escaped (those names are not read as bytes).
const NAMES = ["src", "lib", "index.ts", "a.md", "é", "日本", "😀", "", 'say "hi"', "two\nlines"];

interface Node {
  name: string;
  size?: number;
  children?: Node[];
}

function nodeTree(r: Rng, depth: number): Node {
  const node: Node = { name: r.pick(NAMES), size: r.int(0, 99) };
  if (depth < 4 && r.chance(0.6)) {
    node.children = [];
    const count = r.int(0, 5);
    for (let k = 0; k < count; k++) node.children.push(nodeTree(r, depth + 1));
  }
  return node;
}

/** Every node of `root` with the array holding it (none for the root), in document order. */
function placed(root: Node): { node: Node; list: Node[] | null }[] {
  const out: { node: Node; list: Node[] | null }[] = [{ node: root, list: null }];
  const walk = (node: Node) => {
    for (const child of node.children ?? []) {
      out.push({ node: child, list: node.children! });
      walk(child);
    }
  };
  walk(root);
  return out;
}

/** A later version of `root`: subtrees removed, moved or added, nodes renamed and resized. */
function later(r: Rng, root: Node): Node {
  const copy = structuredClone(root);
  const edits = r.int(0, 6);
  for (let k = 0; k < edits; k++) {
    const all = placed(copy);
    const { node, list } = r.pick(all);
    const kind = r.int(0, 4);
    if (kind === 0 && list !== null) list.splice(list.indexOf(node), 1);
    else if (kind === 1) node.name = r.pick(NAMES);
    else if (kind === 2) node.size = r.int(0, 99);
    else if (kind === 3) {
      node.children = node.children ?? [];
      node.children.splice(r.int(0, node.children.length), 0, nodeTree(r, 3));
    } else if (list !== null) {
      // A subtree moved under a node outside it.
      const outside = all.filter((p) => !placed(node).some((q) => q.node === p.node));
      const target = r.pick(outside).node;
      list.splice(list.indexOf(node), 1);
      target.children = target.children ?? [];
      target.children.push(node);
    }
  }
  return copy;
}

function comparable(outcome: Outcome): unknown {
  return "tree" in outcome ? "tree" : { code: outcome.code };
}

describe("a JSON document read against an earlier version of itself (LoadOptions.earlierVersion)", () => {
  it("reads the tree the reference reads (JSON.parse and a walk), however the bytes are cut", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer(), async (seed) => {
        const r = rng(seed);
        const root = nodeTree(r, 0);
        const options = opts({ format: "json", file: "v2.json" });
        const oldTree = await loadStreamed(utf8(JSON.stringify(root)), options, []);
        const bytes = utf8(JSON.stringify(later(r, root), null, r.chance(0.5) ? 1 : undefined));
        const expected = outcomeOf(() => loadByReference(bytes, options));
        const cuts = cutsFor(r, bytes.length, r.int(0, 8), awkwardAt(bytes, [0x22, 0x5c, 0x7b, 0x7d]));
        const actual = await outcomeOfAsync(() =>
          loadStreamed(bytes, { ...options, earlierVersion: oldTree }, cuts),
        );
        expect(comparable(actual)).toEqual(comparable(expected));
        if ("tree" in actual && "tree" in expected) expectSameTreeAndSummaries(r, actual.tree, expected.tree);
      }),
      { numRuns: 300 },
    );
  });

  it("places names found at the earlier version's nodes in its bytes, and copies the others", async () => {
    const options = opts({ format: "json", file: "v2.json" });
    const old: Node = {
      name: "harbour",
      children: [{ name: "ledger" }, { name: "quay", children: [{ name: "tide.csv" }] }],
    };
    const oldTree = await loadStreamed(utf8(JSON.stringify(old)), options, []);
    // "ledger" removed, "quay" renamed "wharf", "bell.md" added: "harbour" and "tide.csv" are as before.
    const now: Node = {
      name: "harbour",
      children: [{ name: "wharf", children: [{ name: "tide.csv" }, { name: "bell.md" }] }],
    };
    const tree = await loadStreamed(utf8(JSON.stringify(now)), { ...options, earlierVersion: oldTree }, []);
    expect(tree.name).toEqual(["harbour", "wharf", "tide.csv", "bell.md"]);
    const runs = (names: unknown) => (names as NamePool).byteRuns()!;
    const [before, after] = [runs(oldTree.name), runs(tree.name)];
    expect(after.bytes).toBe(before.bytes);
    expect(after.start[0]).toBe(before.start[0]);
    expect(after.start[2]).toBe(before.start[3]);
    expect(after.start[1]).toBeGreaterThanOrEqual(before.start[3] + before.size[3]);
  });
});
