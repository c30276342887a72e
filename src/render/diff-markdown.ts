import type { HierarchyNode } from "d3-hierarchy";
import type { DiffViewNode } from "../diff/diff-view.js";
import type { DiffTotals } from "../diff/prepared-diff.js";
import { diffLineParts } from "./diff-line-parts.js";
import type { DiffTextOptions } from "./diff-text.js";
import { diffHeader, markdownHeaderStyle } from "./header.js";
import { lineGroups } from "./line-groups.js";
import { markdownDocument } from "./markdown-line.js";
import { keyRiding } from "./summary-text.js";

/**
 * A diff as CommonMark: the header as a paragraph, then one list item per line of the text rendering
 * (see `markdownLine`), each change tag in code style right before its name. Colour and width do not
 * apply.
 */
export function renderDiffMarkdown(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  const said = keyRiding({ ...options, width: undefined });
  const head = said.header && diffHeader(totals, said.by, said.header, said, undefined, markdownHeaderStyle);
  const parts = lineGroups(view, said.chains ?? false).map((group) => diffLineParts(group, said));
  return markdownDocument(head, parts, "diff", said);
}
