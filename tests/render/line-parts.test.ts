import { describe, expect, it } from "vitest";
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
