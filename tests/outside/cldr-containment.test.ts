import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { resolveFoci } from "../../src/focus/resolve.js";
import { loadTree } from "../../src/load/index.js";
import { renderJson } from "../../src/render/summary-json.js";
import type { SummaryNode } from "../../src/render/summary-schema.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { opts } from "../load/helpers.js";

// Source: Unicode CLDR region containment (UN M.49 codes), file supplemental/territoryContainment.json of
// the npm package cldr-core, version 48.2.0 (CLDR 48), copied unchanged to
// fixtures/external/cldr-territoryContainment.json (see fixtures/external/README.md).
//
// Keys named "<code>-status-deprecated" and "<code>-status-grouping" hold containment that CLDR marks as
// deprecated or as a grouping alongside the main one (UTS #35, Part 6 Supplemental, "Territory
// Containment", from memory); they are left out here. What stays still has regions under more than one
// parent: the groupings 202 (Sub-Saharan Africa), 419 (Latin America and the Caribbean), 003 (North
// America), EU, EZ and UN contain regions and countries that also sit under 001 (World).
const fixture = fileURLToPath(
  new URL("../../fixtures/external/cldr-territoryContainment.json", import.meta.url),
);
const data = JSON.parse(readFileSync(fixture, "utf8")) as {
  supplemental: {
    version: { _cldrVersion: string };
    territoryContainment: Record<string, { _contains: string[] }>;
  };
};
const containment = Object.fromEntries(
  Object.entries(data.supplemental.territoryContainment).filter(([key]) => !key.includes("-status-")),
);
const tree = loadTree(
  JSON.stringify(containment),
  opts({ format: "json", graph: true, childrenField: "_contains", rootName: "m49" }),
);
const prepared = prepare(tree);

/** Counted here without espalier: every code reachable from `top`, as a set, split into regions
 * (codes that contain others) and countries or territories (codes that contain none). */
function reachable(top: string): { regions: Set<string>; countries: Set<string> } {
  const regions = new Set<string>();
  const countries = new Set<string>();
  const queue = [...(containment[top]?._contains ?? [])];
  while (queue.length > 0) {
    const code = queue.shift()!;
    if (regions.has(code) || countries.has(code)) continue;
    if (containment[code]) {
      regions.add(code);
      queue.push(...containment[code]._contains);
    } else countries.add(code);
  }
  return { regions, countries };
}

function summaryJson(foci: string[], budget: number) {
  const result = summarize(prepared, { foci, budget, importance: "depth" });
  const json = renderJson(result.view, {
    budget,
    lines: result.selection.lines,
    foci: result.fociPaths,
    labels: false,
  });
  const text = renderText(result.view, { units: "plain", sizes: false });
  return { root: JSON.parse(json).root as SummaryNode, text };
}

function find(
  node: SummaryNode,
  test: (n: SummaryNode) => boolean,
  path: SummaryNode[] = [],
): SummaryNode[] | null {
  if (test(node)) return [...path, node];
  for (const c of node.children) {
    const found = find(c, test, [...path, node]);
    if (found) return found;
  }
  return null;
}

describe("outside check: CLDR territory containment (cldr-core 48.2.0, UN M.49)", () => {
  it("is the data version the test names", () => {
    expect(data.supplemental.version._cldrVersion).toBe("48");
  });

  it("counts the distinct regions and countries under 001 (World) once each, as a plain set traversal does", () => {
    const { regions, countries } = reachable("001");
    const world = resolveFoci(prepared.index, ["001"])[0];
    const { count, nodes } = prepared.measures;
    // Distinct nodes in 001's subtree: 001 itself and every region and country it reaches.
    expect(nodes[world]).toBe(1 + regions.size + countries.size);
    // Regions are the entries below 001 with children (references included); countries those without.
    let shownRegions = 0;
    let shownCountries = 0;
    for (let i = world + 1; i < world + count[world]; i++) {
      if (tree.referenceTo![i] !== -1) continue;
      if (count[i] > 1) shownRegions++;
      else shownCountries++;
    }
    expect(shownRegions).toBe(regions.size);
    expect(shownCountries).toBe(countries.size);
    // The whole map: every code once, whatever contains it (plus espalier's root joining the tops).
    const all = new Set([
      ...Object.keys(containment),
      ...Object.values(containment).flatMap((v) => v._contains),
    ]);
    expect(nodes[0]).toBe(all.size + 1);
    // The summary's numbers say the same.
    const { root } = summaryJson(["001"], 40);
    expect(find(root, (n) => n.name === "001")![1].nodes).toBe(1 + regions.size + countries.size);
  });

  it("shows both parents of a region with two (011 Western Africa: 002 Africa and 202 Sub-Saharan Africa)", () => {
    // Both parents per the data: 002 and 202 list 011 in their _contains.
    const parents = Object.keys(containment).filter((k) => containment[k]._contains.includes("011"));
    expect(parents.sort()).toEqual(["002", "202"]);
    const { root, text } = summaryJson(["011"], 12);
    const entry = find(root, (n) => n.focus)!;
    expect(entry.map((n) => n.name)).toEqual(["m49", "001", "002", "011"]);
    expect(entry[3].parents).toEqual({ count: 2, hidden: 0 });
    const reference = find(root, (n) => n.reference?.path === entry[3].path)!;
    expect(reference.map((n) => n.name)).toEqual(["m49", "202", "011"]);
    expect(text).toContain("& 011  full entry at 001/002/011");
  });

  it("shows the parents of 013 Central America nearest a root first, and counts the one that does not fit", () => {
    // Three parents per the data: 019 Americas (the deepest, its full entry), 419 and 003 (groupings).
    const parents = Object.keys(containment).filter((k) => containment[k]._contains.includes("013"));
    expect(parents.sort()).toEqual(["003", "019", "419"]);
    // Forced: m49, 001, 019, 013 (4 lines); two more lines hold one grouping and its reference.
    const { root, text } = summaryJson(["013"], 6);
    const focus = find(root, (n) => n.focus)!;
    expect(focus[focus.length - 1].parents).toEqual({ count: 3, hidden: 1 });
    expect(text).toContain("3 parents, 1 not shown");
    expect(text.trimEnd().split("\n").length).toBe(6);
    const { root: roomy } = summaryJson(["013"], 9);
    expect(find(roomy, (n) => n.focus)!.at(-1)!.parents).toEqual({ count: 3, hidden: 0 });
  });
});
