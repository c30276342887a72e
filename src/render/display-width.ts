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
  const widths = graphemes.map(displayWidth);
  const room = width - 1;
  const headRoom = Math.ceil(room / 2);
  let head = 0;
  let used = 0;
  while (head < graphemes.length && used + widths[head] <= headRoom) used += widths[head++];
  let tail = graphemes.length;
  while (tail > head && used + widths[tail - 1] <= room) used += widths[--tail];
  return graphemes.slice(0, head).join("") + ELLIPSIS + graphemes.slice(tail).join("");
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
