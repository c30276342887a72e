import { quoted, say } from "../../errors.js";
import type { ReadingNote } from "../../model/reading-note.js";
import type { PlacedSizes } from "./folder-totals.js";

/**
 * The names `du -c` (`--total`) and `wc -c` give the line they end a listing with, the grand total of
 * the lines before it: "total" in the C locale (seen with du -abc and wc -c here), and its translation
 * in every GNU coreutils message catalog on this machine (/usr/share/locale/LANG/LC_MESSAGES/coreutils.mo,
 * msgid "total", read here; du prints "insgesamt" under LANGUAGE=de, seen here). du, wc and df share
 * that message.
 */
export const TOTAL_NAMES: ReadonlySet<string> = new Set([
  "total",
  "totaal",
  "усяго",
  "общо",
  "celkem",
  "totalt",
  "insgesamt",
  "σύνολο",
  "totalo",
  "kokku",
  "guztira",
  "yhteensä",
  "iomlán",
  "sveukupno",
  "összesen",
  "totale",
  "合計",
  "합계",
  "omugatte",
  "viso",
  "jumlah",
  "razem",
  "итого",
  "celkom",
  "skupno",
  "укупно",
  "toplam",
  "загалом",
  "tổng",
  "总计",
  "總用量",
]);

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

/** TOTAL_LINE_LEFT_OUT: the last line, `size<TAB>total` (or the word in another language), read as the grand total and left out. */
export function grandTotalNote(line: number, size: number, name: string): ReadingNote {
  return {
    code: "TOTAL_LINE_LEFT_OUT",
    line,
    parts: say`line ${line} (${size} ${quoted.name(name)}) gives what the other lines add up to, as du -c and wc -c end a listing with a grand total: it was left out, not read as a file of that name (du without -c leaves it out itself)`,
  };
}

/**
 * Nodes before a last line in an unknown word that may make it a grand total: three lines add up so by
 * chance ('1 a/x', '2 a/y', '3 b', the package test's listing), eight rarely.
 */
export const LIKE_TOTAL_EVIDENCE = 8;

/**
 * LAST_LINE_LIKE_TOTAL: the last line names a top-level entry, in a word espalier does not know as
 * du's, whose size is what the other lines add up to, as a grand total in another language (or a
 * catalog newer than the one read) would be: read as a file, and said, since a total doubles the size.
 */
export function likeTotalNote(line: number, size: number, name: string): ReadingNote {
  return {
    code: "LAST_LINE_LIKE_TOTAL",
    line,
    parts: say`line ${line} (${size} ${quoted.name(name)}) gives what the other lines add up to, as the grand total du -c and wc -c end a listing with does (in the C locale named total): it was read as an entry, so the listing's size counts it twice if it is one (list without -c, or with LC_ALL=C, to leave it out)`,
  };
}
