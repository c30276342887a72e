import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import type { NumberOptions } from "./amount.js";
import { type HeaderOptions, markdownHeaderStyle, summaryHeader } from "./header.js";
import { lineGroups } from "./line-groups.js";
import { lineParts } from "./line-parts.js";
import { markdownDocument } from "./markdown-line.js";
import { keyRiding } from "./summary-text.js";

export interface MarkdownOptions extends NumberOptions {
  /** Join an only child that is not a focus onto its parent's line (must match the fit's choice). */
  chains?: boolean;
  /** The header paragraph (as the text's first line); none when undefined. */
  header?: HeaderOptions;
  /** The legend after the header. */
  legend?: boolean;
  /** The key line after the header (see `keyLine`); not with a legend. */
  key?: boolean;
}

/**
 * The summary as CommonMark: the header as a paragraph, then a nested list, one item per line of the
 * text rendering (so the same budget holds): the focus in bold with "(focus)", its ancestors in bold,
 * the fold in italics after the numbers. For pull-request comments and wiki pages: no label can make
 * markup, a link or a mention (see `markdownText`).
 */
export function renderMarkdown(view: HierarchyNode<ViewNode>, options: MarkdownOptions): string {
  const said = keyRiding({ ...options, width: undefined });
  const head = said.header && summaryHeader(view.data, said.header, said, undefined, markdownHeaderStyle);
  const parts = lineGroups(view, said.chains ?? false).map((group) => lineParts(group, said));
  return markdownDocument(head, parts, "summary", said);
}
