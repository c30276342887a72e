import { CHAIN_JOIN } from "../model/chain-join.js";
import type { HeaderOptions } from "./header.js";
import { keyContext, keyFacts, keyLine } from "./key-line.js";
import type { LineParts } from "./line-layout.js";
import { markdownText } from "./markdown-escape.js";
import { legendLines, MARK } from "./marks.js";

/**
 * One line as a CommonMark list item, at the same nesting as the text line. Every label is a code
 * span, so no name can make markup, HTML, a link, or (where GitHub's extensions run) a mention, an
 * issue reference or a bare-URL link: GitHub Flavored Markdown recognises none of them inside code.
 * The source stays readable: a code span needs no escapes inside. A diff's tag, also a code span,
 * stands right before the name it belongs to; a focus is bold with "(focus)", its ancestors bold, the
 * fold in italics.
 */
export function markdownLine(p: LineParts): string {
  const names = p.labels.map(codeSpan);
  if (p.tag) names[names.length - 1] = `${codeSpan(p.tag)} ${names[names.length - 1]}`;
  let label = names.join(CHAIN_JOIN);
  // A reference line of a graph: its mark, its label, where the full entry is in italics.
  if (p.mark === MARK.reference)
    return `${"  ".repeat(p.level)}- ${MARK.reference} ${label} · *${markdownText(p.numbers, true, true)}*`;
  if (p.role === "focus") label = `**${label}** (focus)`;
  else if (p.role === "path") label = `**${label}**`;
  return (
    `${"  ".repeat(p.level)}- ${label}` +
    `${p.numbers ? ` · ${markdownText(p.numbers, true, true)}` : ""}` +
    `${p.fold ? ` · *${markdownText(p.fold, true, true)}*` : ""}`
  );
}

/**
 * A whole Markdown rendering: the header (already Markdown, see `markdownHeaderStyle`) as a paragraph
 * with the legend or the key line (one line each, joined by hard line breaks), a blank line, then one
 * list item per line (see {@link markdownLine}); without a header, legend or key, only the list.
 */
export function markdownDocument(
  header: string | undefined,
  parts: readonly LineParts[],
  kind: "summary" | "diff",
  options: { legend?: boolean; key?: boolean; keyRides?: boolean; sizes?: boolean; header?: HeaderOptions },
): string {
  // The legend and the key are espalier's own words, never input: escaped for Markdown, never cut as a long name is.
  const key = () =>
    markdownText(keyLine(kind, keyFacts(parts, keyContext(options)), undefined, "markdown"), false);
  // A key left out of the fit rides on the header's line (see `keyRiding`): a paragraph has no width.
  const first = options.keyRides && header ? `${header}; ${key()}` : header;
  const explained = options.legend
    ? legendLines(kind, undefined, options.header?.sizeName).map((l) => markdownText(l, false))
    : options.key
      ? [key()]
      : [];
  const head = [...(first ? [first] : []), ...explained];
  const lines = head.length === 0 ? [] : [...head.map((l, k) => (k < head.length - 1 ? `${l}\\` : l)), ""];
  for (const line of parts) lines.push(markdownLine(line));
  return `${lines.join("\n")}\n`;
}

/**
 * A code span that shows `text` exactly (CommonMark 0.31, section 6.1): a fence longer than any
 * backtick run inside, and one space inside each fence, which the parser strips again (not around
 * text of spaces only, which the parser keeps whole).
 */
export function codeSpan(text: string): string {
  const longest = Math.max(0, ...Array.from(text.matchAll(/`+/g), (m) => m[0].length));
  const fence = "`".repeat(longest + 1);
  // Content made only of spaces is kept as it is, so it needs no padding (and must not get any).
  return /^ *$/.test(text) ? `${fence}${text}${fence}` : `${fence} ${text} ${fence}`;
}
