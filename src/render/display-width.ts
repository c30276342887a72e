import stringWidth from "string-width";

const segmenter = new Intl.Segmenter(undefined, { granularity: "grapheme" });

/** Marker put where text was cut. U+2026 is narrow (width 1) in string-width's reading of UAX #11. */
export const ELLIPSIS = "…";

/** Display width in terminal columns, per Unicode UAX #11 (East Asian Width) via string-width. */
export function displayWidth(text: string): number {
  return stringWidth(text);
}

/**
 * Shortens text to at most `width` columns by cutting whole grapheme clusters out of the middle and
 * putting an ellipsis there, so both ends stay readable (`tidewater/serv…/ledger-core`).
 */
export function shortenMiddle(text: string, width: number): string {
  if (displayWidth(text) <= width) return text;
  if (width <= 0) return "";
  if (width === 1) return ELLIPSIS;
  const graphemes = Array.from(segmenter.segment(text), (s) => s.segment);
  const widths = graphemes.map((g) => stringWidth(g));
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
  for (const { segment } of segmenter.segment(text)) {
    const w = stringWidth(segment);
    if (used + w > width - 1) break;
    out += segment;
    used += w;
  }
  return out + ELLIPSIS;
}
