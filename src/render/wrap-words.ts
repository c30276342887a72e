import { displayWidth, shortenEnd } from "./display-width.js";

/**
 * Text broken at spaces into lines of at most `width` terminal columns (UAX #11 widths), each line after
 * the first starting with `indent`; a word wider than a line is cut at its end ("…"), never split.
 * Some words stay together when the run fits a line: a parenthesised clause (`(compared: version)`),
 * and a number with the word after it (`1 edited`, `258.3 MiB`), so a line never ends inside either.
 */
export function wrapWords(text: string, width: number, indent = ""): string[] {
  const lines: string[] = [];
  let line = "";
  for (const unit of units(text.split(" "), width - displayWidth(indent))) {
    if (line === "") line = unit;
    else if (displayWidth(line) + 1 + displayWidth(unit) <= width) line = `${line} ${unit}`;
    else {
      lines.push(line);
      line = `${indent}${unit}`;
    }
  }
  lines.push(line);
  return lines.map((l) => shortenEnd(l, width));
}

/** A number as a header or legend prints it: digits with group commas and a point, maybe signed. */
const NUMBER = /^[+-]?\d[\d,]*(\.\d+)?$/;

/**
 * The words in runs that break only between them: a parenthesised clause, a number and its next word;
 * a run wider than `room` breaks into its words again (a number keeps its word where the two fit).
 */
function units(words: readonly string[], room: number): string[] {
  const out: (string | string[])[] = [];
  let i = 0;
  while (i < words.length) {
    const start = i;
    let depth = 0;
    do {
      depth += count(words[i], "(") - count(words[i], ")");
      i++;
    } while (depth > 0 && i < words.length);
    const run = words.slice(start, i);
    out.push(run.length > 1 && displayWidth(run.join(" ")) <= room ? run.join(" ") : run);
  }
  // A number and the word after it, where the pair fits (a clause's last word may be a number).
  return numbersKept(out.flat(), room);
}

/** Words with each number joined to the word after it where the two fit `room`. */
function numbersKept(words: readonly string[], room: number): string[] {
  const out: string[] = [];
  for (let k = 0; k < words.length; k++) {
    const pair = `${words[k]} ${words[k + 1]}`;
    if (NUMBER.test(words[k]) && k + 1 < words.length && displayWidth(pair) <= room) {
      out.push(pair);
      k++;
    } else out.push(words[k]);
  }
  return out;
}

function count(word: string, char: string): number {
  let n = 0;
  for (const c of word) if (c === char) n++;
  return n;
}
