import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import { safeText, shownLabel } from "./escape.js";
import { lineGroups } from "./line-groups.js";
import {
  amount,
  CHAIN_JOIN,
  MARK,
  parentsText,
  referencesText,
  referenceText,
  type TextOptions,
} from "./text.js";

// Any ASCII punctuation may be backslash-escaped (CommonMark 0.31, section 2.4). Escaped here: what
// can open inline markup, HTML, entities or links anywhere (CommonMark and GitHub's extensions:
// tables, strikethrough, math), and what can open a block at the start of an item.
const INLINE = /[\\`*_[\]<&|~$#]/g;
const BLOCK_START = /^([+\-=>]|[0-9]+[.)])/;

/** Text as CommonMark inline content that renders literally: no markup, HTML or entity survives. */
export function markdownText(text: string, controls = true): string {
  return (controls ? safeText(text) : text)
    .replace(INLINE, (ch) => `\\${ch}`)
    .replace(BLOCK_START, (m) => `${m.slice(0, -1)}\\${m.slice(-1)}`)
    .replace(/^ +| +$/g, (spaces) => "&#32;".repeat(spaces.length));
}

/**
 * The summary as a CommonMark nested list, one item per line of the text rendering (so the same
 * budget holds): the focus in bold with "(focus)", its ancestors in bold, the folded remainder in
 * italics after the numbers. For pull-request comments and wiki pages.
 */
export function renderMarkdown(view: HierarchyNode<ViewNode>, options: TextOptions): string {
  const lines = lineGroups(view, options.chains ?? false).map(({ level, nodes }) => {
    const top = nodes[0];
    const last = nodes[nodes.length - 1];
    if (top.reference) {
      const text = `${MARK.reference} ${markdownText(shownLabel(top.label), false)}`;
      return `${"  ".repeat(level)}- ${text} · *${markdownText(referenceText(top.reference))}*`;
    }
    let label = nodes.map((n) => markdownText(shownLabel(n.label), false)).join(markdownText(CHAIN_JOIN));
    if (last.focus) label = `**${label}** (focus)`;
    else if (last.onPath) label = `**${label}**`;
    const stats = amount(top.nodes, top.size, options);
    const folded = last.hidden
      ? `+${last.hidden.children} more: ${amount(last.hidden.nodes, last.hidden.size, { ...options, always: true })}${referencesText(last.hidden.references)}`
      : "";
    const parents = parentsText(last.parents);
    return `${"  ".repeat(level)}- ${label}${stats ? ` · ${markdownText(stats)}` : ""}${folded ? ` · *${markdownText(folded)}*` : ""}${parents ? ` · ${markdownText(parents)}` : ""}`;
  });
  return `${lines.join("\n")}\n`;
}
