import { createRequire } from "node:module";

/** Marker put where text was cut. U+2026 is narrow (width 1) in string-width's reading of UAX #11. */
export const ELLIPSIS = "…";

// Printable ASCII (U+0020..U+007E): one column and one grapheme cluster a character, which is
// string-width's own first rule (UAX #11: class Na). Only other text needs string-width and a grapheme
// segmenter, and both start the engine's Unicode (ICU) service, whose first use costs more than a
// small run's whole work (start-up, issue 14); so they load on the first text that needs them.
const PRINTABLE_ASCII = /^[\u0020-\u007E]*$/;

let wideText: ((text: string) => number) | undefined;
let segmenter: Intl.Segmenter | undefined;

/** Display width in terminal columns, per Unicode UAX #11 (East Asian Width) via string-width. */
export function displayWidth(text: string): number {
  if (PRINTABLE_ASCII.test(text)) return text.length;
  wideText ??= loadStringWidth();
  return wideText(text);
}

/**
 * Shortens text to at most `width` columns by cutting whole grapheme clusters out of the middle and
 * putting an ellipsis there, so both ends stay readable (`tidewater/serv…/ledger-core`).
 */
export function shortenMiddle(text: string, width: number): string {
  if (displayWidth(text) <= width) return text;
  if (width <= 0) return "";
  if (width === 1) return ELLIPSIS;
  const graphemes = graphemesOf(text);
  const { head, tail } = middleCut(graphemes, graphemes.map(displayWidth), width);
  return graphemes.slice(0, head).join("") + ELLIPSIS + graphemes.slice(tail).join("");
}

/** Of graphemes too wide for `width` (at least 2): how many stay at the start, and where the end resumes. */
function middleCut(graphemes: string[], widths: number[], width: number): { head: number; tail: number } {
  const room = width - 1;
  const headRoom = Math.ceil(room / 2);
  let head = 0;
  let used = 0;
  while (head < graphemes.length && used + widths[head] <= headRoom) used += widths[head++];
  let tail = graphemes.length;
  while (tail > head && used + widths[tail - 1] <= room) used += widths[--tail];
  return { head, tail };
}

/** Cuts text at the end to at most `width` columns, marking the cut with an ellipsis. */
export function shortenEnd(text: string, width: number): string {
  if (displayWidth(text) <= width) return text;
  if (width <= 0) return "";
  let used = 0;
  let out = "";
  for (const grapheme of graphemesOf(text)) {
    const w = displayWidth(grapheme);
    if (used + w > width - 1) break;
    out += grapheme;
    used += w;
  }
  return out + ELLIPSIS;
}

/**
 * Shortens text to at most `width` columns so that the grapheme holding code unit `at` stays, with the
 * start of the text: cut at the end when that keeps it (`ledger-linux-x…`), else in the middle when the
 * end holds it (`ledger…x64-musl`), else around it (`report-20…05-fin…`). Where a name first differs
 * from its siblings' names, so that a cut never makes two of them print the same.
 */
export function shortenKeeping(text: string, width: number, at: number): string {
  if (displayWidth(text) <= width) return text;
  if (width <= 2) return shortenEnd(text, width);
  const graphemes = graphemesOf(text);
  const widths = graphemes.map(displayWidth);
  let g = 0;
  for (let units = 0; g < graphemes.length - 1 && units + graphemes[g].length <= at; g++)
    units += graphemes[g].length;
  let upTo = 0;
  for (let k = 0; k <= g; k++) upTo += widths[k];
  if (upTo <= width - 1) return shortenEnd(text, width);
  const { head: kept, tail } = middleCut(graphemes, widths, width);
  if (tail <= g) return graphemes.slice(0, kept).join("") + ELLIPSIS + graphemes.slice(tail).join("");
  // Around it: a third of the room for the start, the rest from the grapheme before it on.
  const room = width - 2;
  const headRoom = Math.max(1, Math.floor(room / 3));
  let head = 0;
  let used = 0;
  while (head < g && used + widths[head] <= headRoom) used += widths[head++];
  let from = Math.max(head, g - 1);
  if (used + widths[from] + (from < g ? widths[g] : 0) > room) from = g;
  let end = from;
  while (end < graphemes.length && used + widths[end] <= room) used += widths[end++];
  const after = end < graphemes.length ? ELLIPSIS : "";
  return `${graphemes.slice(0, head).join("")}${ELLIPSIS}${graphemes.slice(from, end).join("")}${after}`;
}

/** The text's grapheme clusters (UAX #29). */
function graphemesOf(text: string): string[] {
  if (PRINTABLE_ASCII.test(text)) return text.split("");
  segmenter ??= new Intl.Segmenter(undefined, { granularity: "grapheme" });
  return Array.from(segmenter.segment(text), (s) => s.segment);
}

/**
 * string-width, loaded synchronously on first need. It is an ES module: `require` of an ES module
 * needs Node 20.19 or later (22.12 on 22), which package.json's engines asks for.
 */
function loadStringWidth(): (text: string) => number {
  const load = createRequire(import.meta.url);
  return (load("string-width") as typeof import("string-width")).default;
}
