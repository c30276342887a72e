import type { Tree } from "../../src/model/tree.js";
import { renderJson } from "../../src/render/summary-json.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";

/** Summarise a tree and render it both ways, as the CLI does. */
export function summaryOf(tree: Tree, foci: string[], budget: number, label?: string) {
  const result = summarize(prepare(tree), { foci, budget, importance: "depth", label });
  const text = renderText(result.view, { units: "bytes", sizes: tree.hasSizes });
  const json = renderJson(result.view, {
    budget,
    lines: result.selection.lines,
    foci: result.fociPaths,
    labels: false,
  });
  return { result, text, json };
}

/** A deterministic tree of `n` nodes with the given branching, using a linear congruential generator. */
export function generatedTree(
  n: number,
  seed = 7,
): { parentOf: Int32Array; name: string[]; size: Float64Array } {
  let s = seed >>> 0;
  const rand = () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
  const parentOf = new Int32Array(n);
  const name: string[] = [];
  const size = new Float64Array(n);
  parentOf[0] = -1;
  name.push("root");
  for (let i = 1; i < n; i++) {
    // Prefer recent nodes as parents so the tree grows deep as well as wide.
    const back = Math.floor(rand() ** 3 * i) + 1;
    parentOf[i] = Math.max(0, i - back);
    name.push(`n${i}`);
    size[i] = Math.floor(rand() * 10000);
  }
  return { parentOf, name, size };
}
