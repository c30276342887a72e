import { displayWidth, shortenEnd } from "./display-width.js";

/**
 * Text broken at spaces into lines of at most `width` terminal columns (UAX #11 widths), each line after
 * the first starting with `indent`; a word wider than a line is cut at its end ("…"), never split.
 */
export function wrapWords(text: string, width: number, indent = ""): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    if (line === "") line = word;
    else if (displayWidth(line) + 1 + displayWidth(word) <= width) line = `${line} ${word}`;
    else {
      lines.push(line);
      line = `${indent}${word}`;
    }
  }
  lines.push(line);
  return lines.map((l) => shortenEnd(l, width));
}
