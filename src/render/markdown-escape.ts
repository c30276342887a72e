import { safeText } from "../model/safe-text.js";

// Any ASCII punctuation may be backslash-escaped (CommonMark 0.31, section 2.4). Escaped here: what
// can open inline markup, HTML, entities or links anywhere (CommonMark and GitHub's extensions:
// tables, strikethrough, math), and what can open a block at the start of an item.
const INLINE = /[\\`*_[\]<&|~$#]/g;
const BLOCK_START = /^([+\-=>]|[0-9]+[.)])/;

/**
 * Text as CommonMark inline content that renders literally: no markup, HTML or entity survives. A
 * piece that goes in the middle of a line (`inside`) needs no guard for block starts or for spaces at
 * its ends. Names go in code spans instead (see `codeSpan`), which also keeps GitHub's mentions and
 * autolinks off; this is for espalier's own words and numbers.
 */
export function markdownText(text: string, controls = true, inside = false): string {
  const escaped = (controls ? safeText(text) : text).replace(INLINE, (ch) => `\\${ch}`);
  if (inside) return escaped;
  return escaped
    .replace(BLOCK_START, (m) => `${m.slice(0, -1)}\\${m.slice(-1)}`)
    .replace(/^ +| +$/g, (spaces) => "&#32;".repeat(spaces.length));
}
