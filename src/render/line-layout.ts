import { displayWidth, shortenEnd, shortenMiddle } from "./display-width.js";
import { noColour, type Palette } from "./palette.js";

/** Between the labels of a chain of only children printed on one line. */
export const CHAIN_JOIN = " / ";

/**
 * What one output line says, before it is laid out: every line-based format (terminal text,
 * Markdown, the interactive view's screens) starts from this. Texts are already safe to print
 * (see `safeText`); `fold` and `foldShort` are empty when nothing is folded on the line.
 */
export interface LineParts {
  /** Nesting level: the line is indented two spaces per level. */
  level: number;
  /** The mark that starts the line after the indentation; it carries the meaning without colour. */
  mark: string;
  /** Which style the mark and the label take. */
  role: "focus" | "path" | "other";
  /** A diff's change tag (`[added]`), or "". */
  tag: string;
  /** The same tag with any old path in it cut to a few columns, for narrow lines. */
  shortTag: string;
  /** The labels the line names: one node, or a chain of only children, top first. */
  labels: string[];
  /** The numbers after the label (`12 nodes, 3.0 MiB`), or "". */
  numbers: string;
  /** What is folded on the line, in full (`+3 more: 41 nodes, 2.0 MiB`). */
  fold: string;
  /** The same, shortened for narrow lines (`+3 more`). */
  foldShort: string;
}

export interface LayoutOptions {
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
  /** Colours for the marks, labels and numbers; none when undefined (see `palette(colour)`). */
  palette?: Palette;
}

/** Shortest label kept before other parts of a line give way to the width. */
const MIN_LABEL = 8;

/**
 * One line of text: `<indent><mark> <chain> / [<tag> ]<label>  <numbers>  <fold>`, within `width`
 * columns; a diff's tag stands right before the name it belongs to (a chain's last). What gives way,
 * in turn: the fold's numbers (`+3 more` stays), the tag's old path, the labels (cut in the middle,
 * down to a few columns), the numbers, the fold, and last the end of the line itself.
 */
export function layoutLine(p: LineParts, options: LayoutOptions = {}): string {
  const { width } = options;
  const pal = options.palette ?? noColour;
  const indent = "  ".repeat(p.level);
  const label = p.labels.join(CHAIN_JOIN);
  const style = p.role === "focus" ? pal.focus : p.role === "path" ? pal.path : (s: string) => s;
  const tail = (numbers: string, fold: string) =>
    `${numbers ? `  ${pal.quiet(numbers)}` : ""}${fold ? `  ${pal.quiet(fold)}` : ""}`;
  // The tag goes before the last name: split a (possibly shortened) chain text there.
  const head = (text: string, tag: string, styled: boolean) => {
    const s = styled ? style : (x: string) => x;
    if (!tag) return s(`${p.mark} ${text}`);
    const [before, last] = splitLast(text, p.labels);
    return `${s(p.mark)} ${before ? s(before) : ""}${styled ? pal.focus(tag) : tag} ${s(last)}`;
  };
  const plain = (text: string, tag: string, numbers: string, fold: string) =>
    `${indent}${head(text, tag, false)}${numbers ? `  ${numbers}` : ""}${fold ? `  ${fold}` : ""}`;
  const styled = (text: string, tag: string, numbers: string, fold: string) =>
    `${indent}${head(text, tag, true)}${tail(numbers, fold)}`;
  if (width === undefined || displayWidth(plain(label, p.tag, p.numbers, p.fold)) <= width)
    return styled(label, p.tag, p.numbers, p.fold);
  if (displayWidth(plain(label, p.tag, p.numbers, p.foldShort)) <= width)
    return styled(label, p.tag, p.numbers, p.foldShort);
  const attempts: [string, string, string][] = [
    [p.tag, p.numbers, p.foldShort],
    [p.shortTag, p.numbers, p.foldShort],
    [p.shortTag, "", p.foldShort],
    [p.shortTag, "", ""],
  ];
  for (const [tag, numbers, fold] of attempts) {
    const room = width - displayWidth(plain("", tag, numbers, fold));
    if (room >= Math.min(MIN_LABEL, displayWidth(label)))
      return styled(shortenMiddle(label, room), tag, numbers, fold);
  }
  return style(shortenEnd(plain(label, p.shortTag, "", ""), width));
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
