import { describe, expect, it } from "vitest";
import { interest } from "../../src/interest/doi.js";
import { importance } from "../../src/interest/importance.js";
import { measure } from "../../src/model/measure.js";
import { makeTree, nodeNamed } from "../helpers/make-tree.js";

const SPEC = "R{A{A1{A1a,A1b},A2{A2a}},B{B1{B1a},B2}}";

function scoresFor(spec: string, foci: string[], kind: "depth" | "size" = "depth") {
  const tree = makeTree(spec);
  const api = importance(tree, measure(tree), kind);
  const f = Int32Array.from(foci.map((n) => nodeNamed(tree, n)).sort((a, b) => a - b));
  const s = interest(tree, api, f);
  return { tree, s, at: (n: string) => s.value[nodeNamed(tree, n)] };
}

describe("interest(tree, api, foci)", () => {
  it("gives the check values of the design brief for focus A1", () => {
    // Check values derived from Furnas (1986), DOI(x|y) = API(x) - D(x,y) with API = -depth, shifted by -API(y).
    const { at } = scoresFor(SPEC, ["A1"]);
    for (const n of ["R", "A", "A1"]) expect(at(n)).toBe(0);
    for (const n of ["A1a", "A1b", "A2", "B"]) expect(at(n)).toBe(-2);
    for (const n of ["A2a", "B1", "B2"]) expect(at(n)).toBe(-4);
    expect(at("B1a")).toBe(-6);
  });

  it("equals max over foci of API(x) - D(x,y) - API(y), computed directly", () => {
    // Furnas (1986) DOI with the per-focus shift: brute force over every node and focus.
    const { tree, s } = scoresFor(SPEC, ["A1b", "B1"]);
    const dist = (x: number, y: number) => {
      const up = (a: number) => {
        const chain = [a];
        while (tree.parent[chain[chain.length - 1]] >= 0) chain.push(tree.parent[chain[chain.length - 1]]);
        return chain;
      };
      const ax = up(x);
      const ay = new Set(up(y));
      const lca = ax.find((a) => ay.has(a))!;
      return tree.depth[x] + tree.depth[y] - 2 * tree.depth[lca];
    };
    const foci = [nodeNamed(tree, "A1b"), nodeNamed(tree, "B1")];
    for (let x = 0; x < tree.length; x++) {
      const expected = Math.max(...foci.map((y) => -tree.depth[x] - dist(x, y) + tree.depth[y]));
      expect(s.value[x]).toBe(expected);
    }
  });

  it("scores -depth for every node when there is no focus", () => {
    const tree = makeTree(SPEC);
    const s = interest(tree, importance(tree, measure(tree), "depth"), new Int32Array(0));
    for (let i = 0; i < tree.length; i++) expect(s.value[i]).toBe(0 - tree.depth[i]);
  });

  it("marks the root, the foci and their ancestors as forced, and counts edges to the nearest focus", () => {
    const { tree, s } = scoresFor(SPEC, ["A1"]);
    const forced = [...s.forced.keys()].filter((i) => s.forced[i]).map((i) => tree.name.get(i));
    expect(forced).toEqual(["R", "A", "A1"]);
    expect(s.distance[nodeNamed(tree, "A1a")]).toBe(1);
    expect(s.distance[nodeNamed(tree, "A2")]).toBe(2);
    expect(s.distance[nodeNamed(tree, "B1a")]).toBe(5);
  });

  it("keeps interest non-increasing from parent to child under size importance", () => {
    const { tree, s } = scoresFor("R{A:5{A1:100,A2:1},B:1{B1:3{B1a:0}}}", ["A2"], "size");
    for (let i = 1; i < tree.length; i++) {
      if (!s.forced[i]) expect(s.value[i]).toBeLessThan(s.value[tree.parent[i]]);
    }
    expect(s.value[nodeNamed(tree, "A2")]).toBe(0);
  });
});
