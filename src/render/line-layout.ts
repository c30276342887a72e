import type { ChangeKind } from "../diff/changes.js";
import { CHAIN_JOIN } from "../model/chain-join.js";
import { displayWidth, shortenEnd, shortenKeeping, shortenMiddle } from "./display-width.js";
import { noColour, type Palette } from "./palette.js";

/**
 * What one output line says, before it is laid out: every line-based format (terminal text,
 * Markdown, the interactive view's screens) starts from this. Texts are already safe to print
 * (see `safeText`); the fold texts are empty when nothing is folded on the line.
 */
export interface LineParts {
  /** Nesting level: the line is indented two spaces per level. */
  level: number;
  /** The mark that starts the line after the indentation (see marks.ts); it reads without colour. */
  mark: string;
  /** Which style the mark and the label take. */
  role: "focus" | "path" | "other";
  /** A diff's change tag (`[added]`) of the line's last node, or "". */
  tag: string;
  /** The same tag with any old path or name in it cut to a few columns, for narrow lines. */
  shortTag: string;
  /** The tag's kind, for its colour; null without a tag. */
  tagKind: ChangeKind | null;
  /** The labels the line names: one node, or a chain of only children, top first. */
  labels: string[];
  /**
   * One name: the code units where it first differs from its shown siblings' names, which a cut
   * keeps, so siblings do not print the same; absent: none to tell apart.
   */
  distinct?: readonly number[];
  /** The numbers after the labels, the top node's (`12,121 nodes, 3.0 MiB`), or "". */
  numbers: string;
  /** The same with counts and plain sizes compact (`12.1k nodes`). */
  compactNumbers: string;
  /**
   * The count alone, compact (`12.1k nodes`), for a narrow line: "" for a single node, which a line
   * without a count is read as.
   */
  countNumbers: string;
  /** What is folded under the last node, in full (`(hidden: 3 children, 41 nodes, 2.0 MiB)`). */
  fold: string;
  /**
   * The fold's numbers without how many children it holds (`(hidden: 41 nodes, 2.0 MiB)`): the line
   * keeps every number a reader needs to check `nodes = 1 + the lines below + hidden`.
   */
  foldCounts: string;
  /** The same with compact numbers. */
  compactFold: string;
  /** The fold with only how many nodes it hides (`(hidden: 41 nodes)`). */
  foldShort: string;
  /** The fold at its shortest (`(41 hidden)`: nodes); a fold never disappears from a line. */
  foldTiny: string;
}

export interface LayoutOptions {
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
  /** Colours for the marks, labels, tags and numbers; none when undefined (see `palette(colour)`). */
  palette?: Palette;
}

/** Narrowest width a line can be laid out in: a deep line's indentation gives way to keep this much. */
export const MIN_WIDTH = 30;

/** A fold at its barest, when not even its count fits: a reader still sees that something is hidden. */
export const FOLD_SIGN = "(hidden)";

/**
 * What stands where a line's own numbers were when they do not fit: a line without numbers reads as
 * one node (the legend says so), which a folded line whose numbers gave way is not.
 */
export const NUMBERS_GONE = "?";

/** Shortest label kept before the line's own numbers give way. */
const MIN_LABEL = 8;

/**
 * One line of text, `<indent><mark> <a> / <b> / [<tag> ]<c>  <numbers>  <fold>`, within `width`
 * columns. A diff's tag stands right before the name it belongs to, the chain's last. When the line
 * is too wide, what gives way, in turn (the first that fits is used):
 *   1. the fold drops how many children it hides and keeps its numbers (`(hidden: 41 nodes, 2.0 MiB)`),
 *      so every count on the line can still be checked;
 *   2. numbers become compact (`12.1k nodes`, plain sizes `286M`), the fold with its children again;
 *   3. the fold keeps only how many nodes it hides (`(hidden: 41 nodes)`, then `(41 hidden)`: nodes,
 *      not children, so the count still adds up; in a diff with how many changed nodes it holds);
 *   4. the tag's old path or old name is cut to a few columns;
 *   5. the labels are cut, down to 8 columns: one name at its end, or around where it differs from
 *      its siblings when the end cut would lose that; a chain in its middle (its first and last names
 *      stay readable);
 *   6. the line's size goes, its count stays (`608 nodes`);
 *   7. the count goes too, `?` standing in its place (a line without a count reads as one node);
 *   8. the labels are cut further, down to one column and `…`;
 *   9. a deep line's indentation shrinks to a third of the width, then to its level in digits;
 *   10. the tag keeps only its kind (`[moved]`), then the fold only its sign (`(hidden)`).
 * A fold never goes: a reader always sees that something is hidden. At MIN_WIDTH and wider the line
 * always fits this way; narrower (which the renderers refuse), the line's start is cut instead.
 */
export function layoutLine(p: LineParts, options: LayoutOptions = {}): string {
  const { width } = options;
  const pal = options.palette ?? noColour;
  const label = p.labels.join(CHAIN_JOIN);
  const style = p.role === "focus" ? pal.focus : p.role === "path" ? pal.path : (s: string) => s;
  const tagStyle = p.tagKind ? pal.change[p.tagKind] : (s: string) => s;
  const line = (
    indent: string,
    text: string,
    tag: string,
    numbers: string,
    fold: string,
    styled: boolean,
  ) => {
    const s = styled ? style : (x: string) => x;
    const q = styled ? pal.quiet : (x: string) => x;
    let head: string;
    if (!tag) head = s(`${p.mark} ${text}`);
    else {
      const [before, last] = splitLast(text, p.labels);
      head = `${s(p.mark)} ${before ? s(before) : ""}${styled ? tagStyle(tag) : tag} ${s(last)}`;
    }
    return `${indent}${head}${numbers ? `  ${q(numbers)}` : ""}${fold ? `  ${q(fold)}` : ""}`;
  };
  const indent = "  ".repeat(p.level);
  if (width === undefined) return line(indent, label, p.tag, p.numbers, p.fold, true);
  const fits = (ind: string, text: string, tag: string, numbers: string, fold: string) =>
    displayWidth(line(ind, text, tag, numbers, fold, false)) <= width;
  const whole: [string, string, string][] = [
    [p.tag, p.numbers, p.fold],
    [p.tag, p.numbers, p.foldCounts],
    [p.tag, p.compactNumbers, p.compactFold],
    [p.tag, p.compactNumbers, p.foldShort],
    [p.tag, p.compactNumbers, p.foldTiny],
    [p.shortTag, p.compactNumbers, p.foldTiny],
  ];
  for (const [tag, numbers, fold] of whole)
    if (fits(indent, label, tag, numbers, fold)) return line(indent, label, tag, numbers, fold, true);
  const gone = p.countNumbers ? NUMBERS_GONE : "";
  const cut: [string, string, number][] = [
    [p.compactNumbers, p.foldTiny, MIN_LABEL],
    [p.countNumbers, p.foldTiny, MIN_LABEL],
    [gone, p.foldTiny, MIN_LABEL],
    [gone, p.foldTiny, 1],
  ];
  for (const ind of [indent, shortIndent(p.level, width), `${p.level} `]) {
    for (const [numbers, fold, least] of cut) {
      const room = width - displayWidth(line(ind, "", p.shortTag, numbers, fold, false));
      if (room >= Math.min(least, displayWidth(label)))
        return line(ind, cutLabels(p.labels, room, p.distinct), p.shortTag, numbers, fold, true);
    }
  }
  // Still too wide (a diff's long tag and fold on a deep line): at the shortest indentation the tag
  // keeps only its kind (`[moved]`), then the fold only its sign (`(hidden)`); the `?` of the numbers
  // goes last of all.
  const least = indent.length <= `${p.level} `.length ? indent : `${p.level} `;
  const kindTag = p.tagKind ? `[${p.tagKind}]` : "";
  for (const numbers of gone ? [gone, ""] : [""])
    for (const fewest of [MIN_LABEL, 1])
      for (const fold of [p.foldTiny, p.fold ? FOLD_SIGN : ""]) {
        const room = width - displayWidth(line(least, "", kindTag, numbers, fold, false));
        if (room >= Math.min(fewest, displayWidth(label)))
          return line(least, cutLabels(p.labels, room, p.distinct), kindTag, numbers, fold, true);
      }
  // Narrower than MIN_WIDTH (the renderers refuse such a width; a small screen may still ask for it):
  // the start of the line is cut, and the fold's sign stays at its end while the width holds it.
  const sign = p.fold ? `  ${FOLD_SIGN}` : "";
  const head = line(least, label, kindTag, "", "", false);
  const room = width - displayWidth(sign);
  if (!sign || room < 3) return style(shortenEnd(`${head}${sign}`, width));
  return `${style(shortenEnd(head, room))}${pal.quiet(sign)}`;
}

/**
 * Labels cut to `room` columns: one name at its end (its start is what a reader recognises), unless
 * that would cut away where it differs from its siblings (`distinct`): then that part stays too
 * (`ledger…x64-musl` beside `ledger…linux-x64`); a chain in its middle, so its first name and the name
 * the line's numbers belong to stay readable.
 */
export function cutLabels(labels: string[], room: number, distinct?: readonly number[]): string {
  const text = labels.join(CHAIN_JOIN);
  if (labels.length > 1) return shortenMiddle(text, room);
  return distinct === undefined ? shortenEnd(text, room) : shortenKeeping(text, room, distinct);
}

/**
 * The indentation of a line too deep for `width`: at most a third of the width, with the level in
 * digits at its end (`12 `), so the nesting can still be read.
 */
function shortIndent(level: number, width: number): string {
  const full = "  ".repeat(level);
  const most = Math.floor(width / 3);
  if (full.length <= most) return full;
  const digits = `${level} `;
  return digits.length >= most ? digits : " ".repeat(most - digits.length) + digits;
}

/**
 * A chain's text split before its last name: the part up to and including the last join, and the
 * rest. A text cut in the middle keeps its end, so the split still finds the last join when one
 * survived; otherwise all of it counts as the last name.
 */
function splitLast(text: string, labels: string[]): [string, string] {
  if (labels.length < 2) return ["", text];
  const at = text.lastIndexOf(CHAIN_JOIN);
  return at < 0 ? ["", text] : [text.slice(0, at + CHAIN_JOIN.length), text.slice(at + CHAIN_JOIN.length)];
}
