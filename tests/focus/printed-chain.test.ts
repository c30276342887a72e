import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../src/errors.js";
import { resolvePrintedChain } from "../../src/focus/printed-chain.js";
import { resolveFoci } from "../../src/focus/resolve.js";
import { CHAIN_JOIN } from "../../src/model/chain-join.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import { pseudonym } from "../../src/model/pseudonym.js";
import type { Tree } from "../../src/model/tree.js";
import { lineGroups } from "../../src/render/line-groups.js";
import { lineParts } from "../../src/render/line-parts.js";
import { prepare, summarize } from "../../src/summarize.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTree } from "../helpers/random-tree.js";

const indexOf = (tree: Tree) => new PathIndex(tree, measure(tree));
const paths = (index: PathIndex, nodes: ArrayLike<number>) => Array.from(nodes, (i) => index.path(i));

describe("a printed chain line read back as a focus", () => {
  const tree = makeTree("R{services{ledger{src{a,b}}},libs{tide{src{c,d}}},docs{x,y}}");
  const index = indexOf(tree);

  it("names the chain's last node, from the root or from any chain top", () => {
    expect(paths(index, resolveFoci(index, ["services / ledger / src"]))).toEqual(["services/ledger/src"]);
    // A lower part of a chain names the same node: each lower node is its parent's only child.
    expect(paths(index, resolveFoci(index, ["ledger / src"]))).toEqual(["services/ledger/src"]);
    // The same names under two chains: both nodes, as a glob naming both would (the header lists them).
    const tree2 = makeTree("R{a{lib{src{x,y}}},b{lib{src{z,w}}}}");
    const index2 = indexOf(tree2);
    expect(paths(index2, resolveFoci(index2, ["lib / src"]))).toEqual(["a/lib/src", "b/lib/src"]);
  });

  it("never joins a node that has siblings: a printed chain never does", () => {
    // docs has two children, so no printed line reads "docs / x".
    const err = (() => {
      try {
        resolveFoci(index, ["docs / x"]);
      } catch (e) {
        return e as EspalierError;
      }
    })();
    expect(err).toBeInstanceOf(EspalierError);
    expect(err?.code).toBe("FOCUS_NO_MATCH");
  });

  it("reads an absolute listing's glued root back: /usr / bin", () => {
    const abs = makeTree("/{usr{bin{a,b}}}");
    const i = indexOf(abs);
    expect(paths(i, resolveFoci(i, ["/usr / bin"]))).toEqual(["usr/bin"]);
    expect(paths(i, resolveFoci(i, ["/ / usr / bin"]))).toEqual(["usr/bin"]);
  });

  it("reads pseudonyms as --pseudonymize prints them", () => {
    const key = "a secret kept out of the log";
    const chain = ["services", "ledger", "src"].map((n) => pseudonym(key, n)).join(CHAIN_JOIN);
    expect(paths(index, resolveFoci(index, [chain], key))).toEqual(["services/ledger/src"]);
    // The real names do not read back through the pseudonyms' path.
    expect(
      resolvePrintedChain(index, "services / ledger / src", (j) => pseudonym(key, tree.name.get(j))),
    ).toEqual([]);
  });

  it("every chain line of a printed summary reads back to its last node (property, round trip)", () => {
    fc.assert(
      fc.property(arbTree(50), fc.integer({ min: 3, max: 60 }), (t, budget) => {
        const i = indexOf(t);
        const result = summarize(prepare(t), { foci: [], budget, importance: "depth", chains: true });
        for (const group of lineGroups(result.view, true)) {
          if (group.nodes.length < 2) continue;
          const printed = lineParts(group, { units: "plain", sizes: false }).labels.join(CHAIN_JOIN);
          const last = group.nodes[group.nodes.length - 1].index;
          const found = [...resolvePrintedChain(i, printed)];
          expect(found).toContain(last);
        }
      }),
    );
  });
});
