import type { HierarchyNode } from "d3-hierarchy";
import type { DiffTotals } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import { diffLineParts } from "./diff-line-parts.js";
import { type DiffTextOptions, totalsLine } from "./diff-text.js";
import { lineGroups } from "./line-groups.js";
import { markdownText } from "./markdown-escape.js";
import { markdownLine } from "./markdown-line.js";

/**
 * A diff as CommonMark: the totals line as a paragraph, then one list item per line of the text
 * rendering (see `markdownLine`), the change tag leading the item in code style. Colour and width do
 * not apply.
 */
export function renderDiffMarkdown(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  const lines = [markdownText(totalsLine(totals, options)), ""];
  for (const group of lineGroups(view, options.chains ?? false))
    lines.push(markdownLine(diffLineParts(group, options)));
  return `${lines.join("\n")}\n`;
}
