import { safeText } from "../model/safe-text.js";
import { displayWidth, ELLIPSIS, shortenEnd } from "./display-width.js";
import type { HeaderOptions } from "./header.js";
import { FOLD_SIGN, type LineParts, moreNames, NUMBERS_GONE, SIZE_CUT } from "./line-layout.js";
import { MARK } from "./marks.js";

/**
 * Fewest lines a budget must have for the key line to be printed by default: below it, the screen is
 * kept for the tree (the key would take a sixth of the lines or more). A choice of this project, no source.
 */
export const KEY_MIN_BUDGET = 6;

/** What the lines under the key show, so that the key explains those and nothing else. */
export interface KeyFacts {
  /** The marks at the start of the printed lines. */
  readonly marks: ReadonlySet<string>;
  /** Whether a line holds a chain of only children (`a / b`). */
  readonly chains: boolean;
  /** Whether the lines print sizes (the input has them); default true. */
  readonly sizes?: boolean;
  /** What the size measures, as the input calls it (`cost`); default `size`. */
  readonly sizeName?: string;
  /** Whether a printed path writes a `/` or `~` inside a name as `~1` or `~0` (JSON Pointer). */
  readonly pathEscapes?: boolean;
  /** Whether the lines leave the input's sizes out to fit the width (see `screenLines`). */
  readonly sizesLeftOut?: boolean;
  /** Whether a line's sizes did not fit the width (`size cut` stands in their place, see `screenLines`). */
  readonly sizesCut?: boolean;
  /** Whether a line's count did not fit the width (`?` stands in its place). */
  readonly countsCut?: boolean;
  /** Whether a fold's count did not fit (`(hidden)` alone). */
  readonly foldsCut?: boolean;
  /** Whether a line left its count out for its fold's to say it (`mime  (665 hidden)`: 666 nodes). */
  readonly countsInFolds?: boolean;
  /** Whether a name was cut to fit the width (`…` marks the cut). */
  readonly namesCut?: boolean;
  /** Whether a diff tag's old path, old name or value was cut to fit (`…ger:1.4`). */
  readonly valuesCut?: boolean;
  /** Whether a diff's fold left out how many changed nodes it holds (`(41 hidden)`). */
  readonly changesCut?: boolean;
  /**
   * A line too deep to indent prints its level in digits before its mark (`8 : name`): the first such
   * line's level and mark, for the key's example.
   */
  readonly depthInDigits?: { readonly level: number; readonly mark: string };
  /** Whether a chain left names out of its middle (`a / (3 more) / b`). */
  readonly namesLeftOut?: boolean;
  /** Where the reader finds more (the interactive view's help key); default `--legend`. */
  readonly more?: string;
  /**
   * The fit printed the key in part (see `fitToBudget`): in its fewest rows it then says where the
   * rest is (`rest: --legend`) where that and every mark fit.
   */
  readonly inPart?: boolean;
}

/** What the width took away from the laid-out lines (see `ScreenLines`), for the key. */
export type WidthCuts = Pick<
  KeyFacts,
  | "sizesLeftOut"
  | "sizesCut"
  | "countsCut"
  | "foldsCut"
  | "countsInFolds"
  | "namesCut"
  | "valuesCut"
  | "changesCut"
  | "depthInDigits"
  | "namesLeftOut"
>;

/** What the rest of the screen says that the key speaks of: the sizes, their name, the foci's paths. */
export interface KeyContext {
  /** Whether the lines print sizes (the input has them); default true. */
  readonly sizes?: boolean;
  /** What the size measures, as the input calls it (`cost`); default `size`. */
  readonly sizeName?: string;
  /** The foci's paths as the header prints them. */
  readonly foci?: readonly string[];
}

/** The facts a key needs, read off the lines it stands above and the header. */
export function keyFacts(
  lines: readonly LineParts[],
  context: KeyContext = {},
  cuts: WidthCuts = {},
): KeyFacts {
  // A printed path (a reference's full entry, a focus in the header) writes a / inside a name as ~1
  // (RFC 6901, section 3).
  const escaped = (text: string) => /~[01]/.test(text);
  return {
    marks: new Set(lines.map((l) => l.mark)),
    chains: lines.some((l) => l.labels.length > 1),
    sizes: context.sizes ?? true,
    ...(context.sizeName === undefined ? {} : { sizeName: context.sizeName }),
    pathEscapes:
      lines.some((l) => l.mark === MARK.reference && escaped(l.numbers)) ||
      (context.foci ?? []).some(escaped),
    ...(cuts.sizesLeftOut ? { sizesLeftOut: true } : {}),
    ...(cuts.sizesCut ? { sizesCut: true } : {}),
    ...(cuts.countsCut ? { countsCut: true } : {}),
    ...(cuts.foldsCut ? { foldsCut: true } : {}),
    ...(cuts.countsInFolds ? { countsInFolds: true } : {}),
    ...(cuts.namesCut ? { namesCut: true } : {}),
    ...(cuts.valuesCut ? { valuesCut: true } : {}),
    ...(cuts.changesCut ? { changesCut: true } : {}),
    ...(cuts.depthInDigits ? { depthInDigits: cuts.depthInDigits } : {}),
    ...(cuts.namesLeftOut ? { namesLeftOut: true } : {}),
  };
}

/**
 * Whether the key for `facts` at `width` (see `keyLines`) says what the sizes on screen are (totals
 * with all below), that they were left out (`sizes cut`), or that a line's were cut (`'size cut'`).
 */
export function keyExplainsSizes(kind: "summary" | "diff", facts: KeyFacts, width?: number): boolean {
  if (facts.sizes === false) return true;
  const text = keyLines(kind, facts, width).join("\n");
  const [numbers, ...rest] = explanations(kind, facts);
  const says = (e: Explanation, least: string) => [e[0], e[1], e[2], least].some((w) => text.includes(w));
  // The numbers' words say what the sizes are (or that they were left out), in any of their forms.
  if (!says(numbers, facts.sizesLeftOut ? SIZES_GONE : numbers[2])) return false;
  return rest.filter((e) => e[3] === "sizes").every((e) => says(e, SIZE_CUT_LEAST));
}

/** Narrowest width whose key is one line; a narrower screen's key takes two (see `keyRows`). */
export const KEY_ONE_ROW = 60;

/**
 * The fewest lines the key takes at `width`: one, or two below {@link KEY_ONE_ROW} columns, where one
 * line holds the marks and little else. Known before the fit, so the budget counts it as it counts
 * the header; where they cannot say all the screen needs, the CLI fits again with more (see
 * {@link keyRowsNeeded}).
 */
export function keyRows(width?: number): 1 | 2 {
  return width !== undefined && width < KEY_ONE_ROW ? 2 : 1;
}

/**
 * The key under the header (see `keyLine`) in `keyRows(width)` lines: below {@link KEY_ONE_ROW}
 * columns the marks on the first line and, on the second (indented as a wrapped header line is), what
 * the numbers mean and what the width took away: `no sizes: width`, `'?' count cut`, `'…' cut name`.
 * Each line within the width; the second says less (shorter words, then fewer of its parts, the
 * width's first) before it is cut at its end.
 */
export function keyLines(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width?: number,
  style: "text" | "markdown" = "text",
  rows: number = keyRows(width),
): string[] {
  // One row where a narrow screen has no more for it (the interactive view's header gave it one):
  // the one-line key, which says the marks in their fewest words before any part.
  if (rows < keyRows(width)) return [keyLine(kind, facts, width, style)];
  if (rows > keyRows(width) && width !== undefined && style === "text") {
    const packed = packedKey(kind, facts, width, rows) ?? packedKey(kind, facts, width, rows, true);
    if (packed !== null) return packed;
  }
  const least = leastKey(kind, facts, width, style);
  // Printed in part in its fewest rows (see `fitToBudget`), it says where the rest is where that fits.
  if (facts.inPart && width !== undefined && style === "text" && !saysAll(kind, facts, least)) {
    const part = packedKey(kind, facts, width, rows, true);
    if (part?.join("\n").includes(KEY_REST)) return part;
  }
  return least;
}

/**
 * Whether the key for `facts` in `rows` rows, printed in part (see `KeyFacts.inPart`), says all it
 * explains, or every mark and where the rest is.
 */
export function keyInPartSays(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width: number,
  rows: number,
): boolean {
  const lines = keyLines(kind, { ...facts, inPart: true }, width, "text", rows);
  if (saysAll(kind, facts, lines)) return true;
  const text = lines.join("\n");
  return text.includes(KEY_REST) && [...facts.marks].every((m) => text.includes(`'${m}'`));
}

/** The key in `keyRows(width)` lines (see `keyLines`). */
function leastKey(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width: number | undefined,
  style: "text" | "markdown",
): string[] {
  if (keyRows(width) === 1) return [keyLine(kind, facts, width, style)];
  const room = width!;
  const marks = markWords(kind, facts.marks, style);
  const compact = markWords(kind, facts.marks, style, true);
  const tiny = markWords(kind, facts.marks, style, "tiny");
  const fitting = [marks, compact, tiny].map((m) => `key: ${m}`).find((t) => displayWidth(t) <= room);
  // Marks too many for the first line in their fewest words: those that do not fit open the second,
  // so every mark on screen is said (a cut `'.'…` says nothing).
  const [first, over] = fitting === undefined ? splitMarks(kind, facts.marks, style, room) : [fitting, ""];
  const parts = explanations(kind, facts);
  const tries: string[][] = [0, 1, 2].map((tier) => parts.map((p) => p[tier]));
  // Fewer parts, from the end, while every part said however short the key stays (see `vitalWords`).
  const lastVital = parts.findLastIndex((p) => p[3] === "sizes" || p[3] === "depth");
  for (let n = parts.length - 1; n >= Math.max(2, lastVital + 1); n--)
    tries.push(parts.slice(0, n).map((p) => p[2]));
  // What the sizes on screen are, or that they were cut, stays longest (see `vitalWords`); then the
  // counts alone, then what no sum on screen can do without in fewest words, then the leftover marks.
  const vital = vitalWords(facts, parts);
  // Nothing vital (no sizes, no deep line): the next tries say the counts; an empty row says nothing.
  if (vital.length > 0) tries.push(vital);
  if (facts.sizesCut && !facts.sizesLeftOut) tries.push([parts[0][2], SIZE_CUT_LEAST]);
  if (!(facts.sizes ?? true)) {
    // A `?` on screen reads as nothing without its words: they go before what the counts are.
    const countCut = parts.find((p) => p[0].startsWith(`'${NUMBERS_GONE}'`));
    if (countCut) tries.push([countCut[2]]);
    tries.push([parts[0][2]]);
  }
  const depth = depthWords(parts);
  const least = [
    ...(facts.sizesLeftOut ? [SIZES_GONE] : []),
    ...(facts.sizesCut ? [SIZE_CUT_LEAST] : []),
    ...depth,
  ];
  if (least.length > 0) tries.push(least);
  // A deep line misreads without its digits explained; what the sizes are can go first.
  if (depth.length > 0) tries.push(depth);
  // Then each alone, the first on screen first (a deep line's digits before a chain's names).
  if (depth.length > 1) for (const d of depth) tries.push([d]);
  if (over !== "") tries.push([]);
  const row = (t: string[]) => `${ROW_INDENT}${[...(over ? [over] : []), ...t].join("; ")}`;
  const second = tries.map(row).find((t) => displayWidth(t) <= room);
  const two = [first, second ?? shortenEnd(row([parts[0][2]]), room)];
  // The first line holds the marks alone: where parts packed on both lines say more, those.
  if (style === "markdown") return two;
  const packed = packedKey(kind, facts, room, 2) ?? packedKey(kind, facts, room, 2, true);
  return packed !== null && partsSaid(kind, facts, packed) > partsSaid(kind, facts, two) ? packed : two;
}

/** The key's second line starts as a wrapped header line does. */
const ROW_INDENT = "  ";

/**
 * Most rows a key takes where fewer cannot say every part on screen (see {@link keyRowsNeeded}); past
 * them it says less, as the one- and two-row keys do. Eight hold every part a 30-column diff of a
 * tree can need; a screen of every mark (a graph's `&` too) and every cut needs nine at 32 columns and
 * says the marks, the numbers, the sizes and a deep line's digits first (see `packedKey`). A choice
 * of this project, no source.
 */
export const KEY_MOST_ROWS = 8;

/**
 * Most lines the key may take in a budget of `budget` lines at `width`: {@link KEY_MOST_ROWS}, never
 * more than the budget, never fewer than `keyRows(width)`. A screen whose marks go unexplained reads
 * wrongly, so the key takes from the tree what it needs; where that leaves no room for the root and
 * the focus paths, the CLI leaves it out and says so (see `fitToBudget`).
 */
export function keyMostRows(budget: number, width?: number): number {
  return Math.max(keyRows(width), Math.min(KEY_MOST_ROWS, budget));
}

/**
 * Rows the key for `facts` takes at `width`: `keyRows(width)` when those say every mark and part on
 * screen (see `keyLines`), else the fewest up to {@link KEY_MOST_ROWS} that do (a diff's three marks
 * and its cuts at 32 columns, a cut name beside `size cut` at 80); `keyRows(width)` when none does.
 * The fit counts them, so the CLI fits again with them once it has laid a screen out.
 */
export function keyRowsNeeded(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width?: number,
  most: number = KEY_MOST_ROWS,
): number {
  const least = keyRows(width);
  if (width === undefined || saysAll(kind, facts, keyLines(kind, facts, width))) return least;
  for (let rows = least + 1; rows <= most; rows++)
    if (packedKey(kind, facts, width, rows) !== null) return rows;
  // No key of `most` lines says it all: the lines that say the most, the fewest of them.
  let best: number = least;
  let said = partsSaid(kind, facts, keyLines(kind, facts, width));
  for (let rows = least + 1; rows <= most; rows++) {
    const key = packedKey(kind, facts, width, rows, true);
    const says = key === null ? -1 : partsSaid(kind, facts, key);
    if (says > said) [best, said] = [rows, says];
  }
  return best;
}

/** How many of the parts `facts` call for (marks, then the rest but the pointer) `lines` say. */
export function keyPartsSaid(kind: "summary" | "diff", facts: KeyFacts, lines: readonly string[]): number {
  return partsSaid(kind, facts, lines);
}

function partsSaid(kind: "summary" | "diff", facts: KeyFacts, lines: readonly string[]): number {
  const text = lines.join("\n");
  const marks = [...facts.marks].filter((m) => text.includes(`'${m}'`)).length;
  const parts = explanations(kind, facts)
    .filter((p) => p[3] !== "more" && p[3] !== "hint")
    .filter((p) => [p[0], p[1], p[2]].some((w) => text.includes(w))).length;
  return marks + parts;
}

/**
 * Whether the key `lines` (see `keyLines`) say every mark in `facts` and every part but the pointer
 * to more, in any of its forms.
 */
export function keySaysAll(kind: "summary" | "diff", facts: KeyFacts, lines: readonly string[]): boolean {
  return saysAll(kind, facts, lines);
}

/** Whether `lines` say every mark in `facts` and every part but the pointer to more, in any of its forms. */
function saysAll(kind: "summary" | "diff", facts: KeyFacts, lines: readonly string[]): boolean {
  const text = lines.join("\n");
  if (![...facts.marks].every((m) => text.includes(`'${m}'`))) return false;
  return explanations(kind, facts)
    .filter((p) => p[3] !== "more" && p[3] !== "hint")
    .every((p) => [p[0], p[1], p[2]].some((w) => text.includes(w)));
}

/**
 * The key in exactly `rows` lines within `width`: every mark and part said, in the longest words that
 * fit (the pointer to `--legend` while it fits), then fewer; failing that (`partial`), the marks and
 * as many parts as fit in their fewest words, the least needed left out first (a later part said
 * where it fits though one before it did not). Null when not even that fits, or too few parts are
 * left to fill `rows` lines.
 */
function packedKey(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width: number,
  rows: number,
  partial = false,
): string[] | null {
  const all = explanations(kind, facts);
  const said = all.filter((p) => p[3] !== "more" && p[3] !== "hint");
  const hint = all.filter((p) => p[3] === "hint");
  const more = moreWords(facts);
  const looks = [
    [false, 0],
    [false, 1],
    [true, 1],
    [false, 2],
    [true, 2],
    ["tiny", 2],
  ] as const;
  for (const [compact, tier] of looks) {
    const marks = markItems(kind, facts.marks, "text", compact);
    const words = said.map((p) => p[tier]);
    const hints = hint.map((p) => p[tier]);
    for (const clauses of [[...words, ...hints, more], [...words, ...hints], [...words, more], words]) {
      const packed = packRows(marks, clauses, width, rows);
      if (packed !== null) return packed;
    }
  }
  if (!partial) return null;
  const tiny = markItems(kind, facts.marks, "text", "tiny");
  // What the counts and sizes are and a level in digits go last: a line misreads without them; with
  // no sizes, a `?` goes after them (its words before the counts', as in `keyLines`).
  const countCut = (p: Explanation) => facts.sizes === false && p[0].startsWith(`'${NUMBERS_GONE}'`);
  const vital = (p: Explanation) => p[3] === "numbers" || p[3] === "sizes" || p[3] === "depth" || countCut(p);
  const kept = [...said.filter(countCut), ...said.filter((p) => vital(p) && !countCut(p))];
  kept.push(...said.filter((p) => !vital(p)));
  // Printed in part, the key ends saying where the rest is; the interactive view's status row says
  // it there instead (`h: keys, marks`), leaving the key its rows.
  const rest = facts.more === undefined ? [KEY_REST] : [];
  const vitals = said.filter(vital).length;
  // The pointer goes before the vital parts do (none of them goes while it stays), but in a key
  // printed in part (see `fitToBudget`), which says every mark and where the rest is however few its
  // rows: there the vital parts go, the last first, down to the marks and the pointer alone.
  const stages: (readonly [readonly string[], number])[] = [[rest, vitals]];
  if (facts.inPart && rest.length > 0) stages.push([rest, 0]);
  stages.push([[], 0]);
  for (const [end, least] of stages) {
    for (let n = kept.length - 1; n >= least; n--) {
      const chosen = kept.slice(0, n).map((p) => p[2]);
      let packed = packRows(tiny, [...chosen, ...end], width, rows);
      if (packed === null) continue;
      // Every vital part said, or the pointer kept: a later part that still fits is said too, though
      // one before it did not.
      for (const p of n >= vitals || end.length > 0 ? kept.slice(n + 1) : []) {
        const more = packRows(tiny, [...chosen, p[2], ...end], width, rows);
        if (more === null) continue;
        packed = more;
        chosen.push(p[2]);
      }
      return packed;
    }
  }
  return null;
}

/** The last words of a printed key that says only part of what its lines need. */
export const KEY_REST = "rest: --legend";

/**
 * `marks` (joined by `, `) then `clauses` (by `; `) in `rows` lines of at most `width` columns, the
 * first after `key: `, the others indented (a line break stands for a separator, as in a two-line
 * key). The marks in order, a line after another; each clause on the first line from the marks' last
 * that has room for it, else a new one; then the last line holding two items or more gives its last
 * to a line of its own until there are `rows`. Null when they take more lines, or too few items to
 * fill them.
 */
function packRows(
  marks: readonly string[],
  clauses: readonly string[],
  width: number,
  rows: number,
): string[] | null {
  // Each item measured once; a line's width is its start, its items and `, ` or `; ` between them.
  type Item = { text: string; sep: string; width: number };
  type Line = { items: Item[]; width: number };
  const item = (text: string, sep: string): Item => ({ text, sep, width: displayWidth(text) });
  const start = (k: number) => (k === 0 ? 5 : ROW_INDENT.length); // `key: ` or the indent
  const lines: Line[] = [{ items: [], width: start(0) }];
  const room = (line: Line, it: Item) => line.width + (line.items.length === 0 ? 0 : 2) + it.width;
  const put = (line: Line, it: Item) => {
    line.width = room(line, it);
    line.items.push(it);
  };
  marks.forEach((mark, k) => {
    const it = item(mark, k === 0 ? "" : ",");
    const last = lines[lines.length - 1];
    if (last.items.length === 0 || room(last, it) <= width) put(last, it);
    else {
      const line = { items: [], width: start(lines.length) };
      lines.push(line);
      put(line, it);
    }
  });
  const from = lines.length - 1;
  for (const clause of clauses) {
    const it = item(clause, ";");
    let k = from;
    while (k < lines.length && !(lines[k].items.length === 0 || room(lines[k], it) <= width)) k++;
    if (k === lines.length) lines.push({ items: [], width: start(k) });
    put(lines[k], it);
  }
  if (lines.length > rows || lines.some((line) => line.width > width)) return null;
  while (lines.length < rows) {
    const k = lines.findLastIndex((line) => line.items.length > 1);
    if (k < 0) return null;
    const moved = lines[k].items.pop()!;
    lines[k].width -= 2 + moved.width;
    lines.splice(k + 1, 0, { items: [moved], width: start(k + 1) + moved.width });
  }
  return lines.map(
    (line, k) =>
      (k === 0 ? "key: " : ROW_INDENT) +
      line.items.map((it, j) => (j === 0 ? it.text : `${it.sep} ${it.text}`)).join(""),
  );
}

/**
 * One line under the header that says what the marks on the screen and its numbers mean, so a reader
 * without the docs can read the screen: printed by default (not with `--bare`, `--legend` or
 * `--no-key`, nor for a budget under {@link KEY_MIN_BUDGET}); the budget counts it. One line: within
 * `width` it says less, everything on screen said in ever fewer words (no pointer to `--legend`, then
 * shorter words for every part, then the marks in a word or two and every part in its fewest) before
 * any part is left out (then only the marks and what the width took away, cut at the end), never
 * wraps, so it can be counted before the fit. Below
 * {@link KEY_ONE_ROW} columns the CLI prints `keyLines` instead.
 */
export function keyLine(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width?: number,
  style: "text" | "markdown" = "text",
): string {
  const marks = markWords(kind, facts.marks, style);
  const compact = style === "markdown" ? marks : markWords(kind, facts.marks, style, true);
  const tiny = style === "markdown" ? marks : markWords(kind, facts.marks, style, "tiny");
  const [numbers, ...rest] = explanations(kind, facts);
  const cuts = rest.filter((p) => p[3] === "cut");
  // Sizes shown, left out, or cut from a line, stay said however short the key (see `vitalWords`).
  const sized = [...rest.filter((p) => p[3] === "sizes"), ...rest.filter((p) => p[3] === "depth")];
  const must = vitalWords(facts, [numbers, ...rest]);
  const chain = rest.filter((p) => p[3] === "chain");
  const hint = rest.filter((p) => p[3] === "hint");
  const more = moreWords(facts);
  const long = (ps: Explanation[]) => ps.map((p) => p[0]);
  const short = (ps: Explanation[]) => ps.map((p) => p[1]);
  const least = (ps: Explanation[]) => ps.map((p) => p[2]);
  // Everything on screen said, in ever fewer words, before anything is left unsaid: the pointer to
  // --legend goes first, then each thing in shorter words, the marks too; only then do parts go.
  const every = [...sized, ...cuts, ...chain];
  const tries = [
    // A hint (see `Explanation`) while the marks keep their words: before the pointer to --legend.
    ...(hint.length === 0
      ? []
      : [
          [marks, numbers[0], ...long(every), ...long(hint), more],
          [marks, numbers[1], ...short(sized), ...short(cuts), ...long(chain), ...short(hint), more],
          [marks, numbers[1], ...short(every), ...short(hint), more],
          [marks, numbers[1], ...short(every), ...short(hint)],
          [marks, numbers[1], ...short(every), ...least(hint)],
          [compact, numbers[1], ...short(every), ...least(hint)],
          [compact, numbers[2], ...least(every), ...least(hint)],
        ]),
    [marks, numbers[0], ...long(every), more],
    [marks, numbers[1], ...short(sized), ...short(cuts), ...long(chain), more],
    [marks, numbers[1], ...short(every), more],
    [marks, numbers[1], ...short(every)],
    [compact, numbers[1], ...short(every)],
    [compact, numbers[2], ...least(every)],
    [tiny, numbers[2], ...least(every)],
    [marks, numbers[1], ...short(sized), ...short(cuts)],
    [marks, ...must, ...short(cuts)],
    // A narrow terminal: each mark in a word or two, so all of them fit before any is cut.
    [compact, numbers[1], ...short(sized), ...short(cuts)],
    [compact, ...must, ...short(cuts)],
  ];
  for (let n = cuts.length - 1; n >= 0; n--) tries.push([compact, ...must, ...short(cuts.slice(0, n))]);
  // Fewer letters still for the marks, and what no sum on screen can do without said in fewest words.
  const depth = depthWords(rest);
  const fewest = [
    ...(facts.sizesLeftOut ? [SIZES_GONE] : []),
    ...(facts.sizesCut ? [SIZE_CUT_LEAST] : []),
    ...depth,
  ];
  const vitalLeast = [...(facts.sizes === false ? [] : [numbers[2]]), ...fewest];
  tries.push([tiny, ...must], [tiny, ...vitalLeast], [tiny, ...fewest]);
  if (depth.length > 0) tries.push([tiny, ...depth]);
  for (const parts of tries) {
    const text = `key: ${parts.filter((part) => part !== "").join("; ")}`;
    if (width === undefined || displayWidth(text) <= width) return text;
  }
  return shortenEnd(`key: ${tiny}`, width!);
}

/**
 * What a key says however short it is, besides the marks: what the sizes on screen are (totals with
 * all below), that they were left out to fit, or that a line's were cut (`size cut`), each in fewest
 * words (nothing of sizes for an input without them), and a deep line's level in digits.
 */
function vitalWords(facts: KeyFacts, parts: readonly Explanation[]): string[] {
  const depth = depthWords(parts);
  if (!(facts.sizes ?? true)) return depth;
  return [parts[0][2], ...parts.filter((p) => p[3] === "sizes").map((p) => p[2]), ...depth];
}

/** A deep line's level in digits, in fewest words (`'8 :' depth`), if one is on screen. */
function depthWords(parts: readonly Explanation[]): string[] {
  return parts.filter((p) => p[3] === "depth").map((p) => p[2]);
}

/** A line's sizes cut, in fewest words: the line above it does not add up by size. */
const SIZE_CUT_LEAST = `'${SIZE_CUT}': sum above off`;

/** Sizes left out of every line, in fewest words. */
const SIZES_GONE = "sizes cut";

/**
 * One thing the key explains, in long, short and shortest words, and what it is: the numbers, what
 * the width took away from the lines (`cut`), a deep line's level in digits (`depth`, said however short
 * the key: the line reads wrongly without it), a chain or a path's escapes (`chain`), a reading the
 * lines make plain themselves, said where the rows the key takes have room (`hint`), or the pointer
 * to the legend.
 */
type Explanation = readonly [
  string,
  string,
  string,
  "numbers" | "sizes" | "depth" | "cut" | "chain" | "hint" | "more",
];

/** What the key explains besides the marks, most needed first (see `Explanation`). */
function explanations(kind: "summary" | "diff", facts: KeyFacts): Explanation[] {
  // Sizes left out at this width: the lines' counts are explained as counts (see `screenLines`).
  const sizes = (facts.sizes ?? true) && !facts.sizesLeftOut;
  // The size's name comes from the options or a config file: made safe and short as the header does.
  const size = `a ${facts.sizeName === undefined ? "size" : safeText(facts.sizeName, 40)}`;
  const numbers =
    kind === "diff"
      ? `N nodes: the node with all below it (removed ones too)${sizes ? `; ${size}: NEW's, with all below; net: its change` : ""}`
      : `N nodes${sizes ? ` and ${size}` : ""}: the node with all below it`;
  // Sizes the lines left out are said with the numbers, so no shorter key loses it.
  const said: Explanation[] = [
    facts.sizesLeftOut
      ? [
          `${numbers}; sizes left out to fit the width`,
          "counts include all below; sizes left out (width)",
          "counts: all below; sizes cut",
          "numbers",
        ]
      : [
          numbers,
          `${sizes ? "totals" : "counts"} include all below`,
          `${sizes ? "totals" : "N nodes"}: all below`,
          "numbers",
        ],
  ];
  // A line whose sizes did not fit says `size cut`; the line above it then does not add up by size.
  if (facts.sizesCut)
    said.push([
      `'${SIZE_CUT}' a line's sizes did not fit, so the sizes of the line above it do not add up`,
      `'${SIZE_CUT}': so the line above's sizes do not add up`,
      // Within a 30-column row after its indentation: `'size cut': above won't add up` is 29.
      SIZE_CUT_LEAST,
      "sizes",
    ]);
  if (facts.depthInDigits) {
    // The screen's own first such line is the example: `'8 :'` reads as it is printed.
    const { level, mark } = facts.depthInDigits;
    const seen = `'${level} ${mark}'`;
    said.push([
      `${seen} a line ${level} levels down, too deep to indent`,
      `${seen} ${level} levels down`,
      `${seen} depth`,
      "depth",
    ]);
  }
  if (facts.namesLeftOut)
    said.push([
      `a / ${moreNames(3)} / b: 3 more names between a and b, each a node of the count`,
      "(k more): k names left out",
      "(k more): k names",
      "depth",
    ]);
  if (facts.countsCut)
    said.push([
      `'${NUMBERS_GONE}' a count that did not fit`,
      `'${NUMBERS_GONE}' count cut`,
      `'${NUMBERS_GONE}' count cut`,
      "cut",
    ]);
  if (facts.foldsCut)
    said.push([
      `'${FOLD_SIGN}' nodes hidden, their count the line's less its names and the lines below`,
      `'${FOLD_SIGN}' count cut`,
      `'${FOLD_SIGN}' count cut`,
      "cut",
    ]);
  if (facts.changesCut)
    said.push([
      "(k hidden) alone: how many of them changed did not fit",
      "(k hidden): changes cut",
      "changes cut",
      "cut",
    ]);
  if (facts.chains)
    said.push(["a / b: b is a's only child", "a / b: only child", "a / b: only child", "chain"]);
  if (facts.pathEscapes)
    said.push([
      "in a path ~1 is a / inside a name, ~0 a ~",
      "~1: a / in a name",
      "~1: a / in a name",
      "chain",
    ]);
  if (facts.valuesCut)
    said.push([
      `'${ELLIPSIS}' a name or value cut to fit`,
      `'${ELLIPSIS}' cut text`,
      `'${ELLIPSIS}' cut`,
      "cut",
    ]);
  else if (facts.namesCut)
    said.push([`'${ELLIPSIS}' a name cut to fit`, `'${ELLIPSIS}' cut name`, `'${ELLIPSIS}' cut`, "cut"]);
  // Said where the key has room, never taking a row of its own: `(41 hidden)` says its own number.
  if (facts.countsInFolds)
    said.push([
      "no count: 1 node + the k of its (k hidden)",
      "no count: 1 + hidden",
      "no count: 1+hidden",
      "hint",
    ]);
  const more = moreWords(facts);
  said.push([more, more, more, "more"]);
  return said;
}

/**
 * The marks present, each with its meaning, in a fixed order; `compact`: in a word or two each, for a
 * narrow line (`"tiny"`: fewer letters still, for a diff's ':' in a two-line key). Markdown shows them otherwise (see `markdownLine`), and never narrow: a focus says
 * "(focus)" and is bold, a line on the way to one is bold.
 */
function markWords(
  kind: "summary" | "diff",
  marks: ReadonlySet<string>,
  style: "text" | "markdown",
  compact: boolean | "tiny" = false,
): string {
  return markItems(kind, marks, style, compact).join(", ");
}

/** The marks of {@link markWords}, each with its meaning, as a list. */
function markItems(
  kind: "summary" | "diff",
  marks: ReadonlySet<string>,
  style: "text" | "markdown",
  compact: boolean | "tiny" = false,
): string[] {
  const md = style === "markdown";
  const diff = kind === "diff";
  const words: string[] = [];
  // A mark is quoted: after "key:" a bare `:` would read as punctuation.
  const say = (mark: string, meaning: string) => words.push(`'${mark}' ${meaning}`);
  if (marks.has(MARK.focus) && !md) say(MARK.focus, compact ? "focus" : "a focus");
  if (marks.has(MARK.path)) {
    const meaning = compact
      ? diff
        ? compact === "tiny"
          ? "changed/above"
          : "change or above one"
        : compact === "tiny"
          ? "on path"
          : "above a focus"
      : pathWords(kind, marks.has(MARK.focus));
    if (md) words.push(`bold = ${meaning}`);
    else say(MARK.path, meaning);
  }
  // In a diff a line marked `.` holds no change, in it or below it (a change marks every node above it).
  if (marks.has(MARK.other) && (diff || !md)) {
    const meaning = diff
      ? compact
        ? "unchanged"
        : "nothing changed in it"
      : marks.size === 1
        ? "a node"
        : "other";
    if (md) words.push(`not bold = ${meaning}`);
    else say(MARK.other, meaning);
  }
  if (marks.has(MARK.reference)) say(MARK.reference, compact ? "elsewhere" : "shown in full elsewhere");
  return words;
}

/**
 * The marks in their fewest words split over two key lines: as many as fit `room` after `key: ` on
 * the first, the rest (joined) to open the second (see `keyLines`).
 */
function splitMarks(
  kind: "summary" | "diff",
  marks: ReadonlySet<string>,
  style: "text" | "markdown",
  room: number,
): [string, string] {
  // Each mark's fewest words hold no comma of their own.
  const said = markWords(kind, marks, style, "tiny").split(", ");
  let k = said.length;
  while (k > 1 && displayWidth(`key: ${said.slice(0, k).join(", ")}`) > room) k--;
  const first = shortenEnd(`key: ${said.slice(0, k).join(", ")}`, room);
  return [first, said.slice(k).join(", ")];
}

function pathWords(kind: "summary" | "diff", focus: boolean): string {
  if (kind === "summary") return "on the way to a focus";
  return focus ? "a change, or on the way to a change or a focus" : "a change or on the way to one";
}

/** The key's context from a rendering's options: its sizes, and the header's size name and foci. */
export function keyContext(options: { sizes?: boolean; header?: HeaderOptions }): KeyContext {
  return {
    ...(options.sizes === undefined ? {} : { sizes: options.sizes }),
    ...(options.header?.sizeName === undefined ? {} : { sizeName: options.header.sizeName }),
    ...(options.header ? { foci: options.header.foci } : {}),
  };
}

/** The key's pointer to more: `--legend explains more`, or where a screen keeps its own legend. */
function moreWords(facts: KeyFacts): string {
  return `${facts.more ?? "--legend"} explains more`;
}
