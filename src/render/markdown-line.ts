import { CHAIN_JOIN, type LineParts } from "./line-layout.js";
import { MARK } from "./line-parts.js";
import { markdownText } from "./markdown-escape.js";

/**
 * One line as a CommonMark list item, at the same nesting as the text line: a diff's tag first in code
 * style, the label (a focus bold with "(focus)", its ancestors bold), the numbers after a middle dot,
 * what is folded in italics.
 */
export function markdownLine(p: LineParts): string {
  let label = p.labels.map((l) => markdownText(l, false)).join(markdownText(CHAIN_JOIN));
  // A reference line of a graph: its mark, its label, where the full entry is in italics.
  if (p.mark === MARK.reference)
    return `${"  ".repeat(p.level)}- ${MARK.reference} ${p.tag ? `${codeSpan(p.tag)} ` : ""}${label} · *${markdownText(p.numbers)}*`;
  if (p.role === "focus") label = `**${label}** (focus)`;
  else if (p.role === "path") label = `**${label}**`;
  return (
    `${"  ".repeat(p.level)}- ${p.tag ? `${codeSpan(p.tag)} ` : ""}${label}` +
    `${p.numbers ? ` · ${markdownText(p.numbers)}` : ""}${p.fold ? ` · *${markdownText(p.fold)}*` : ""}`
  );
}

/** A code span that no backtick run inside can close (CommonMark 0.31, section 6.1). */
function codeSpan(text: string): string {
  const longest = Math.max(0, ...Array.from(text.matchAll(/`+/g), (m) => m[0].length));
  const fence = "`".repeat(longest + 1);
  return `${fence} ${text} ${fence}`;
}
