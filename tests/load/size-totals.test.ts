import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions, type LoadOptions } from "../../src/load/load-options.js";
import { loadStreamed, utf8 } from "./stream/helpers.js";

/** A random tree of own sizes: each node a size and its children. */
interface Own {
  size: number;
  children: Own[];
}

/** Up to 30 nodes, each below a random earlier one (node 0 the root), with sizes of 0 to 1000. */
const ownTree: fc.Arbitrary<Own> = fc
  .array(fc.tuple(fc.nat({ max: 1000 }), fc.nat()), { minLength: 1, maxLength: 30 })
  .map((rows) => {
    const nodes: Own[] = rows.map(([size]) => ({ size, children: [] }));
    rows.forEach(([, pick], i) => {
      if (i > 0) nodes[pick % i].children.push(nodes[i]);
    });
    return nodes[0];
  });

/** The tree as nested JSON whose sizes are totals: each node's own size plus everything below it. */
function withTotals(t: Own, name = "n"): { name: string; size: number; children: object[]; total: number } {
  const children = t.children.map((c, k) => withTotals(c, `${name}.${k}`));
  const total = t.size + children.reduce((s, c) => s + c.total, 0);
  return { name, size: total, children, total };
}

const preOrderOwn = (t: Own): number[] => [t.size, ...t.children.flatMap(preOrderOwn)];
const json = (t: Own) => JSON.stringify(withTotals(t), (k, v) => (k === "total" ? undefined : v));
const load = (text: string, options: Partial<LoadOptions> = {}) =>
  loadTree(text, { ...defaultLoadOptions, format: "json", rootName: "r", ...options });

describe("readSizeTotals(tree, mode) through loadTree", () => {
  it("with folderSizes total gives back every node's own size from sizes written as totals", () => {
    fc.assert(
      fc.property(ownTree, (t) => {
        const tree = load(json(t), { folderSizes: "total" });
        expect(Array.from(tree.ownSize)).toEqual(preOrderOwn(t));
      }),
    );
  });

  it("without a mode keeps the sizes as given, and notes them when some node's children have a size", () => {
    fc.assert(
      fc.property(ownTree, (t) => {
        const tree = load(json(t));
        const given: number[] = [];
        const walk = (n: ReturnType<typeof withTotals>) => {
          given.push(n.size);
          for (const c of n.children as ReturnType<typeof withTotals>[]) walk(c);
        };
        walk(withTotals(t));
        expect(Array.from(tree.ownSize)).toEqual(given);
        // Totals of sizes of 0 and up: every parent is at least its children's sum, so the note is due
        // exactly when some node with children has children of some size.
        // and said when some node's children fill 75% of it (a small own part).
        const due = (n: ReturnType<typeof withTotals>): boolean => {
          const kids = n.children as ReturnType<typeof withTotals>[];
          const held = kids.reduce((s, c) => s + c.size, 0);
          return (held > 0 && held >= 0.75 * n.size) || kids.some(due);
        };
        const notes = tree.reading?.notes?.map((n) => n.code) ?? [];
        expect(notes.includes("SIZES_LIKE_TOTALS")).toBe(due(withTotals(t)));
      }),
    );
  });

  it("reads alike from a stream", async () => {
    const text = json({ size: 5, children: [{ size: 2, children: [{ size: 1, children: [] }] }] });
    for (const folderSizes of [undefined, "total"] as const) {
      const options = {
        ...defaultLoadOptions,
        format: "json" as const,
        rootName: "r",
        ...(folderSizes ? { folderSizes } : {}),
      };
      const streamed = await loadStreamed(utf8(text), options, [3, 9]);
      const whole = loadTree(text, options);
      expect(Array.from(streamed.ownSize)).toEqual(Array.from(whole.ownSize));
      expect(streamed.reading?.notes?.map((n) => n.code)).toEqual(whole.reading?.notes?.map((n) => n.code));
    }
  });

  it("leaves a synthetic root out: several top-level rows, each a total", () => {
    const table = "id,parent,size\na,,10\nb,,7\na1,a,4\nb1,b,7\n";
    const tree = loadTree(table, { ...defaultLoadOptions, rootName: "r", folderSizes: "total" });
    expect(tree.syntheticRoot).toBe(true);
    expect(Array.from(tree.ownSize)).toEqual([0, 6, 4, 0, 7]);
  });
});
