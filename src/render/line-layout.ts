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
 * One line of text: `<indent><mark> [<tag> ]<label>  <numbers>  <fold>`, within `width` columns.
 * What gives way, in turn: the fold's numbers (`+3 more` stays), the tag's old path, the label (cut in
 * the middle, down to a few columns), the numbers, the fold, and last the end of the line itself.
 */
export function layoutLine(p: LineParts, options: LayoutOptions = {}): string {
  const { width } = options;
  const pal = options.palette ?? noColour;
  const indent = "  ".repeat(p.level);
  const label = p.labels.join(CHAIN_JOIN);
  const style = p.role === "focus" ? pal.focus : p.role === "path" ? pal.path : (s: string) => s;
  const plain = (label: string, tag: string, numbers: string, fold: string) =>
    `${indent}${p.mark} ${tag ? `${tag} ` : ""}${label}${numbers ? `  ${numbers}` : ""}${fold ? `  ${fold}` : ""}`;
  const styled = (label: string, tag: string, numbers: string, fold: string) =>
    indent +
    (tag ? `${style(p.mark)} ${pal.focus(tag)} ${style(label)}` : style(`${p.mark} ${label}`)) +
    `${numbers ? `  ${pal.quiet(numbers)}` : ""}${fold ? `  ${pal.quiet(fold)}` : ""}`;
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
