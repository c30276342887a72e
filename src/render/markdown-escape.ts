import { safeText } from "./safe-text.js";

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
