import { describe, expect, it } from "vitest";
import { lineGroups } from "../../src/render/line-groups.js";
import { MIN_WIDTH } from "../../src/render/line-layout.js";
import { lineParts } from "../../src/render/line-parts.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { makeTree } from "../helpers/make-tree.js";

describe("lineParts(group, { share })", () => {
  // R holds 45: A 15 (A1 5, A2 10) and B 30. Percentages with one decimal: common practice, no source.
  const tree = makeTree("R{A{A1:5,A2:10},B:30}");
  const lines = (share: "total" | "parent") =>
    renderText(summarize(prepare(tree), { foci: [], budget: 10, importance: "depth" }).view, {
      units: "plain",
      sizes: true,
      share,
    })
      .trimEnd()
      .split("\n");

  it("writes each node's share of the whole tree's size after its numbers", () => {
    expect(lines("total")).toEqual([
      ". R  5 nodes, 45, 100%",
      "  . A  3 nodes, 15, 33.3%",
      "    . A1  5, 11.1%",
      "    . A2  10, 22.2%",
      "  . B  30, 66.7%",
    ]);
  });

  it("writes each node's share of the node on the line above it with share 'parent'", () => {
    expect(lines("parent")).toEqual([
      ". R  5 nodes, 45, 100%",
      "  . A  3 nodes, 15, 33.3%",
      "    . A1  5, 33.3%",
      "    . A2  10, 66.7%",
      "  . B  30, 66.7%",
    ]);
  });
});

describe("lineParts(group, options): compact numbers keep counts exact", () => {
  // Field test: a diff line at 80 columns printed `man  23.7k nodes, 36.4 MiB …  (23,705 hidden, …)`:
  // 23.7k cannot be checked as 1 + 23,705. An invented depot: one bay of 12,000 bins and a dock.
  const bins = Array.from({ length: 12_000 }, (_, k) => `b${k}:${20_000 + k}`).join(",");
  const tree = makeTree(`R{bay{${bins}},dock:7}`);
  const result = summarize(prepare(tree), { foci: [], budget: 3, importance: "depth" });
  const groups = lineGroups(result.view, false);

  it("writes plain sizes compact (`312M`) and counts whole (`12,001 nodes`) on a narrow line", () => {
    const bay = groups.find((g) => g.nodes[0].label === "bay")!;
    const parts = lineParts(bay, { units: "plain", sizes: true });
    expect(parts.compactNumbers).toBe("12,001 nodes, 312M");
    expect(parts.compactFoldSized).toBe("(12,000 hidden, 312M)");
    // Every width: the count beside the fold's still reads as 1 + 12,000.
    for (let width = MIN_WIDTH; width <= 120; width++)
      expect(renderText(result.view, { units: "plain", sizes: true, width })).not.toMatch(/[0-9]k nodes/);
  });
});
