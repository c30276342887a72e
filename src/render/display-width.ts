import { createRequire } from "node:module";

/** Marker put where text was cut. U+2026 is narrow (width 1) in string-width's reading of UAX #11. */
export const ELLIPSIS = "…";

// Printable ASCII (U+0020..U+007E): one column and one grapheme cluster a character, which is
// string-width's own first rule (UAX #11: class Na); and the ellipsis every cut leaves, U+2026, one
// column too (UAX #11 class A, narrow outside East Asian contexts, as string-width reads it). Only
// other text needs string-width and a grapheme segmenter, and both start the engine's Unicode (ICU)
// service, whose first use costs more than a small run's whole work (start-up, issue 14); so they
// load on the first text that needs them. The ellipsis here: a narrow screen's cut lines were most
// of string-width's calls (a `find /usr/share` listing at 32 columns, key rows and render: 21% of the
// time in it).
const PRINTABLE_ASCII = /^[\u0020-\u007E\u2026]*$/;

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
  return `${graphemes.slice(0, head).join("").trimEnd()}${ELLIPSIS}${graphemes.slice(tail).join("").trimStart()}`;
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

/** Cuts text at the end to at most `width` columns, marking the cut with an ellipsis right after the last character kept (no space before it). */
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
  // A cut after a space reads as a word cut away: `size …` would say less than `size…`.
  return out.trimEnd() + ELLIPSIS;
}

/**
 * Shortens text to at most `width` columns so that it keeps, for every code unit in `needs`, the
 * grapheme holding it (where a name first differs from each of its siblings' names:
 * a cut that keeps one such place per sibling never makes two of them print the same): cut at the end
 * when that keeps them (`ledger-linux-x…`), else in the middle when its start and end keep them
 * (`ledger…x64-musl`), else a window around those past the start (`@ti…android-a…`), the start
 * given up when the window would not reach the last of them.
 */
export function shortenKeeping(text: string, width: number, needs: readonly number[]): string {
  if (displayWidth(text) <= width) return text;
  if (width <= 2 || needs.length === 0) return shortenEnd(text, width);
  const graphemes = graphemesOf(text);
  const widths = graphemes.map(displayWidth);
  // The grapheme holding each needed code unit, ascending.
  const starts: number[] = [];
  for (let g = 0, units = 0; g < graphemes.length; units += graphemes[g].length, g++) starts.push(units);
  const need = [...new Set(needs.map((u) => graphemeAt(starts, u)))].sort((a, b) => a - b);
  const lastNeed = need[need.length - 1];
  let upTo = 0;
  for (let k = 0; k <= lastNeed; k++) upTo += widths[k];
  if (upTo <= width - 1) return shortenEnd(text, width);
  const { head: kept, tail } = middleCut(graphemes, widths, width);
  if (need.every((g) => g < kept || g >= tail))
    return graphemes.slice(0, kept).join("") + ELLIPSIS + graphemes.slice(tail).join("");
  const room = width - 2;
  for (const headRoom of [Math.floor(room / 3), 0]) {
    let head = 0;
    let used = 0;
    while (head < graphemes.length && used + widths[head] <= headRoom) used += widths[head++];
    const from = need.find((g) => g >= head);
    if (from === undefined) break;
    let start = from;
    if (start > head && used + widths[start - 1] + widths[start] <= room) start--;
    let end = start;
    while (end < graphemes.length && used + widths[end] <= room) used += widths[end++];
    if (end <= lastNeed && headRoom > 0) continue;
    const before = start > 0 ? ELLIPSIS : "";
    const after = end < graphemes.length ? ELLIPSIS : "";
    return `${graphemes.slice(0, head).join("")}${before}${graphemes.slice(start, end).join("")}${after}`;
  }
  return shortenEnd(text, width);
}

/**
 * Shortens text to at most `width` columns around the code units `from` to `to` (inclusive): the
 * graphemes holding them and as many on each side as fit, one side and the other in turn, an
 * ellipsis at each end cut away (`…ger:1.4`, `…r: back}`); where even those graphemes do not fit,
 * as `shortenKeeping` keeps both ends of them.
 */
export function shortenAround(text: string, width: number, from: number, to: number): string {
  if (displayWidth(text) <= width) return text;
  if (width <= 2) return shortenEnd(text, width);
  const graphemes = graphemesOf(text);
  const widths = graphemes.map(displayWidth);
  const starts: number[] = [];
  for (let g = 0, units = 0; g < graphemes.length; units += graphemes[g].length, g++) starts.push(units);
  let start = graphemeAt(starts, Math.max(0, Math.min(from, to)));
  let end = graphemeAt(starts, Math.max(from, to)) + 1;
  const n = graphemes.length;
  let used = 0;
  for (let g = start; g < end; g++) used += widths[g];
  const cost = (s: number, e: number, u: number) => u + (s > 0 ? 1 : 0) + (e < n ? 1 : 0);
  if (cost(start, end, used) > width) return shortenKeeping(text, width, [from, to]);
  for (let grew = true; grew; ) {
    grew = false;
    if (end < n && cost(start, end + 1, used + widths[end]) <= width) {
      used += widths[end++];
      grew = true;
    }
    if (start > 0 && cost(start - 1, end, used + widths[start - 1]) <= width) {
      used += widths[--start];
      grew = true;
    }
  }
  const before = start > 0 ? ELLIPSIS : "";
  const after = end < n ? ELLIPSIS : "";
  return `${before}${graphemes.slice(start, end).join("")}${after}`;
}

/** The index of the grapheme whose code units (starting at `starts[g]`) hold code unit `unit`. */
function graphemeAt(starts: readonly number[], unit: number): number {
  let g = 0;
  while (g + 1 < starts.length && starts[g + 1] <= unit) g++;
  return g;
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
