import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import type { NumberOptions } from "./amount.js";
import { lineGroups } from "./line-groups.js";
import { lineParts } from "./line-parts.js";
import { markdownLine } from "./markdown-line.js";

export interface MarkdownOptions extends NumberOptions {
  /** Join an only child that is not a focus onto its parent's line (must match the fit's choice). */
  chains?: boolean;
}

/**
 * The summary as a CommonMark nested list, one item per line of the text rendering (so the same
 * budget holds): the focus in bold with "(focus)", its ancestors in bold, the folded remainder in
 * italics after the numbers. For pull-request comments and wiki pages.
 */
export function renderMarkdown(view: HierarchyNode<ViewNode>, options: MarkdownOptions): string {
  const lines = lineGroups(view, options.chains ?? false).map((g) => markdownLine(lineParts(g, options)));
  return `${lines.join("\n")}\n`;
}
