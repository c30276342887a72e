import { say } from "../../errors.js";
import type { ReadingNote } from "../../model/reading-note.js";
import type { PlacedSizes } from "./folder-totals.js";

/**
 * The name `du -c` (`--total`) and `wc -c` give the line they end a listing with, the grand total of
 * the lines before it (GNU coreutils in the C locale, seen with du -abc and wc -c here; other locales
 * translate it, and such a line is read as a file).
 */
export const TOTAL_NAME = "total";

/**
 * Whether node `k`, the last node made, stands for a grand total rather than a file: a top-level leaf
 * named on the listing's last line (no other node's line comes after it), whose size is what the
 * other lines add up to, read either way (each line's own size, or folder lines as totals with their
 * contents, as `du -abc` lists them). Read as a file, it would double the listing's size.
 */
export function isGrandTotal(nodes: PlacedSizes, k: number): boolean {
  const { parentOf, ownSize } = nodes;
  if (k < 1 || k !== nodes.length - 1 || parentOf[k] !== -1 || !nodes.isListed(k)) return false;
  // Children come after their parents (no line named the root: see the caller), so one pass back
  // sums each node's contents before its parent's.
  const contents = new Float64Array(k);
  let own = 0;
  let totals = 0;
  for (let i = k - 1; i >= 0; i--) {
    // The listing's last line: no other node was made or named on a line after it.
    if (nodes.origin[i] > nodes.origin[k]) return false;
    const listed = nodes.isListed(i);
    if (listed) own += ownSize[i];
    const part = listed ? ownSize[i] : contents[i];
    if (parentOf[i] === -1) totals += part;
    else contents[parentOf[i]] += part;
  }
  return ownSize[k] === own || ownSize[k] === totals;
}

/** TOTAL_LINE_LEFT_OUT: the last line, `size<TAB>total`, read as the grand total and left out. */
export function grandTotalNote(line: number, size: number): ReadingNote {
  return {
    code: "TOTAL_LINE_LEFT_OUT",
    line,
    parts: say`line ${line} (${size} total) gives what the other lines add up to, as du -c and wc -c end a listing with a grand total: it was left out, not read as a file named total (list without -c to leave it out yourself)`,
  };
}
