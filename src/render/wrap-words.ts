import { displayWidth, shortenEnd } from "./display-width.js";

/**
 * Text broken at spaces into lines of at most `width` terminal columns (UAX #11 widths), each line after
 * the first starting with `indent`; a word wider than a line is cut at its end ("…"), never split.
 * Some words stay together when the run fits a line: a parenthesised clause (`(compared: version)`),
 * a number with the word after it (`1 edited`, `258.3 MiB`) and with the word before it (`size 1.4`,
 * `of 40`, `-> 962`; not after a `,` or `;`), a word that leads into what follows with it (`with the
 * 346 removed`: a line ending `1,308 with` reads as if `with` were what 1,308 counts; `has room`), and, more
 * loosely, the two ends of an arrow (`1.4 MiB -> 1006.5 KiB`), so a line never ends between a number
 * and what names it.
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
  return lines.map((l) => l.replace(/ +$/, "")).map((l) => shortenEnd(l, width));
}

/** A number as a header or legend prints it: digits with group commas and a point, maybe signed. */
const NUMBER = /^[+-]?\d[\d,]*(\.\d+)?$/;

/** How strongly two neighbouring words hold together: a break goes between the weakest first. */
const LOOSE = 1;
/** A word and the number after it (`size 1.4`). */
const NAMED = 2;
/** A number and its word (`1.4 MiB`, `40 lines`). */
const UNIT = 3;
const CLAUSE = 4;

/**
 * The words in runs that break only between them, each run within `room` where it can be: all bonds
 * kept when the run fits, else the loose ones broken (an arrow's ends), then a number's from the word
 * before it, then from its own word (a clause stays whole longest), then every one.
 */
function units(words: readonly string[], room: number): string[] {
  const bonds = bondsOf(words, room);
  const out: string[] = [];
  const split = (from: number, to: number, level: number) => {
    let start = from;
    for (let k = from; k < to; k++) {
      if (k < to - 1 && bonds[k] >= level) continue;
      const run = words.slice(start, k + 1);
      const text = run.join(" ");
      if (run.length === 1 || displayWidth(text) <= room) out.push(text);
      else if (level <= CLAUSE) split(start, k + 1, level + 1);
      else out.push(...run);
      start = k + 1;
    }
  };
  split(0, words.length, LOOSE);
  return out;
}

/** The bond between each word and the next (see {@link units}); 0 where a line may break freely. */
function bondsOf(words: readonly string[], room: number): number[] {
  const bonds = new Array<number>(Math.max(0, words.length - 1)).fill(0);
  // A parenthesised clause, where it fits one line.
  let i = 0;
  while (i < words.length) {
    const start = i;
    let depth = 0;
    do {
      depth += count(words[i], "(") - count(words[i], ")");
      i++;
    } while (depth > 0 && i < words.length);
    if (i - start > 1 && displayWidth(words.slice(start, i).join(" ")) <= room)
      for (let k = start; k < i - 1; k++) bonds[k] = CLAUSE;
  }
  for (let k = 0; k < bonds.length; k++) {
    const [a, b] = [words[k], words[k + 1]];
    if (NUMBER.test(a)) bonds[k] = Math.max(bonds[k], UNIT);
    else if (NUMBER.test(b) && !/[,;:]$/.test(a)) bonds[k] = Math.max(bonds[k], NAMED);
    else if (LEADING.has(a)) bonds[k] = Math.max(bonds[k], NAMED);
    else if (b === ARROW || a === ARROW) bonds[k] = Math.max(bonds[k], LOOSE);
  }
  return bonds;
}

/**
 * Words that lead into the words after them and never end a line while the run fits one: `1,308 with
 * the 346 removed` and `--budget 19 has room` stay whole (a choice of this project, no source).
 */
const LEADING: ReadonlySet<string> = new Set(["with", "the", "has"]);

/** The arrow between an old and a new value (`6 -> 7 nodes`). */
const ARROW = "->";

function count(word: string, char: string): number {
  let n = 0;
  for (const c of word) if (c === char) n++;
  return n;
}
