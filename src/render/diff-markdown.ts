import type { HierarchyNode } from "d3-hierarchy";
import type { DiffTotals } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import { changeSummary, changeTag, type DiffTextOptions, totalsLine } from "./diff-text.js";
import { shownLabel } from "./escape.js";
import { markdownText } from "./markdown.js";
import { amount, MARK, referenceText } from "./text.js";

/**
 * A diff as CommonMark: the totals line as a paragraph, then one list item per line of the text
 * rendering. The change tag leads the item in code style (`[moved from A]`), the focus is bold with
 * "(focus)", what is folded is in italics with the changes inside it.
 */
export function renderDiffMarkdown(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  const lines = [markdownText(totalsLine(totals, options)), ""];
  const top = view.data.depth;
  view.eachBefore(({ data: node }) => {
    const tag = changeTag(node, options);
    let label = markdownText(shownLabel(node.label), false);
    if (node.reference) {
      const where = markdownText(referenceText(node.reference));
      lines.push(
        `${"  ".repeat(node.depth - top)}- ${MARK.reference} ${tag ? `${codeSpan(tag)} ` : ""}${label} · *${where}*`,
      );
      return;
    }
    if (node.focus) label = `**${label}** (focus)`;
    else if (node.onPath) label = `**${label}**`;
    const stats = amount(node.nodes, node.change === "removed" ? 0 : node.size, {
      ...options,
      sizes: options.sizes && node.change !== "removed",
    });
    const hidden = node.hidden;
    const folded = hidden
      ? `+${hidden.children} more: ${amount(hidden.nodes, hidden.size, { ...options, always: true })}; ${changeSummary(hidden.changes, hidden.delta, options)}`
      : "";
    lines.push(
      `${"  ".repeat(node.depth - top)}- ${tag ? `${codeSpan(tag)} ` : ""}${label}` +
        `${stats ? ` · ${markdownText(stats)}` : ""}${folded ? ` · *${markdownText(folded)}*` : ""}`,
    );
  });
  return `${lines.join("\n")}\n`;
}

/** A code span that no backtick run inside can close (CommonMark 0.31, section 6.1). */
function codeSpan(text: string): string {
  const longest = Math.max(0, ...Array.from(text.matchAll(/`+/g), (m) => m[0].length));
  const fence = "`".repeat(longest + 1);
  return `${fence} ${text} ${fence}`;
}
