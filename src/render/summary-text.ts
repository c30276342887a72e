import type { HierarchyNode } from "d3-hierarchy";
import { EspalierError } from "../errors.js";
import type { ViewNode } from "../view/view-node.js";
import type { NumberOptions } from "./amount.js";
import { type HeaderOptions, summaryHeaderLines } from "./header.js";
import {
  keyContext,
  keyExplainsSizes,
  keyFacts,
  keyInPartSays,
  keyLine,
  keyLines,
  keyRows,
  keyRowsNeeded,
} from "./key-line.js";
import { type LineGroup, lineGroups } from "./line-groups.js";
import { type LineParts, MIN_WIDTH } from "./line-layout.js";
import { lineParts } from "./line-parts.js";
import { legendLines } from "./marks.js";
import type { Palette } from "./palette.js";
import { type ScreenLines, screenLines } from "./screen-lines.js";

export interface TextOptions extends NumberOptions {
  palette?: Palette;
  /** Join an only child that is not a focus onto its parent's line (must match the fit's choice). */
  chains?: boolean;
  /** Widest line allowed, in terminal columns (UAX #11 widths), at least MIN_WIDTH; unlimited when undefined. */
  width?: number;
  /** The first line: totals, foci, budget used; none when undefined (bare lines for scripts). */
  header?: HeaderOptions;
  /** Lines explaining the marks and numbers after the header (see `legendLines`). */
  legend?: boolean;
  /** One line after the header saying what the marks on screen and the numbers mean (see `keyLine`); not with a legend. */
  key?: boolean;
  /** Lines the key takes (see `keyRowsNeeded`, counted by the fit); `keyRows(width)` when undefined. */
  keyRows?: number;
  /** The fit printed the key in part (see `KeyFacts.inPart`). */
  keyInPart?: boolean;
}

/**
 * A header line, then one line per shown node (or chain of only children), indented two spaces a
 * level: `<mark> <label>  <N nodes>, <size>  (hidden: <k> children, <N nodes>, <size>)`. What is
 * folded rides on its node's line, so every line below the header names a node and the budget buys
 * nodes. Marks: `*` a focus, `:` on the way to one, `.` any other node. See `layoutLine` for what
 * gives way to the width, and `screenLines` for when the lines leave their sizes out.
 */
export function renderText(view: HierarchyNode<ViewNode>, options: TextOptions): string {
  checkWidth(options.width);
  const said = keyRiding(options);
  const screen = screenLines(
    lineGroups(view, options.chains ?? false),
    lineParts,
    said,
    keyCheck(said, "summary"),
  );
  const lines = headLines(
    said,
    (w) => summaryHeaderLines(view.data, said.header!, said, w),
    "summary",
    screen,
  );
  lines.push(...screen.lines);
  return `${lines.join("\n")}\n`;
}

/**
 * Lines the key above `view`'s text lines takes at the options' width (see `keyRowsNeeded`): the
 * screen laid out as `renderText` lays it out, for the fit to count before the text is printed.
 */
export function summaryKeyRows(view: HierarchyNode<ViewNode>, options: TextOptions, most?: number): number {
  return screenKeyRows("summary", view, lineParts, options, most);
}

/**
 * Lines the key above a summary's or a diff's text lines takes at the options' width, its lines made
 * by `parts` (lineParts, diffLineParts) as the rendering makes them.
 */
export function screenKeyRows<T extends ViewNode>(
  kind: "summary" | "diff",
  view: HierarchyNode<T>,
  parts: (group: LineGroup<T>, options: NumberOptions) => LineParts,
  options: Parameters<typeof screenLines>[2] & Parameters<typeof keyCheck>[0] & { chains?: boolean },
  most?: number,
): number {
  // Without a width the key is one line, whatever the screen: no layout needed to know it.
  if (options.width === undefined) return keyRows(undefined);
  return keyRowsNeeded(kind, screenKeyFacts(kind, view, parts, options), options.width, most);
}

/**
 * Whether the key above a summary's or a diff's text lines, printed in part in `rows` rows at the
 * options' width, says every mark and where the rest is, or all (see `keyInPartSays`).
 */
export function screenKeyInPart<T extends ViewNode>(
  kind: "summary" | "diff",
  view: HierarchyNode<T>,
  parts: (group: LineGroup<T>, options: NumberOptions) => LineParts,
  options: Parameters<typeof screenLines>[2] & Parameters<typeof keyCheck>[0] & { chains?: boolean },
  rows: number,
): boolean {
  if (options.width === undefined) return true;
  return keyInPartSays(kind, screenKeyFacts(kind, view, parts, options), options.width, rows);
}

/** What the key must say of a summary's or a diff's text lines, laid out as the rendering lays them out. */
function screenKeyFacts<T extends ViewNode>(
  kind: "summary" | "diff",
  view: HierarchyNode<T>,
  parts: (group: LineGroup<T>, options: NumberOptions) => LineParts,
  options: Parameters<typeof screenLines>[2] & Parameters<typeof keyCheck>[0] & { chains?: boolean },
) {
  const screen = screenLines(
    lineGroups(view, options.chains ?? false),
    parts,
    options,
    keyCheck(options, kind),
  );
  return keyFacts(screen.parts, keyContext(options), screen);
}

/** {@link screenKeyInPart} of a summary's lines. */
export function summaryKeyInPart(view: HierarchyNode<ViewNode>, options: TextOptions, rows: number): boolean {
  return screenKeyInPart("summary", view, lineParts, options, rows);
}

/**
 * The header a text rendering starts with, wrapped to the width, then the legend wrapped to it, or
 * else the key line for the lines `parts` (see `keyLine`).
 */
export function headLines(
  options: {
    header?: HeaderOptions;
    legend?: boolean;
    key?: boolean;
    keyRows?: number;
    keyInPart?: boolean;
    keyRides?: boolean;
    width?: number;
    palette?: Palette;
    sizes?: boolean;
  },
  header: (width?: number) => string[],
  kind: "summary" | "diff",
  screen: ScreenLines,
): string[] {
  const quiet = options.palette?.quiet ?? ((s: string) => s);
  const lines = options.header ? header(options.width) : [];
  const facts = () => ({
    ...keyFacts(screen.parts, keyContext(options), screen),
    ...(options.keyInPart ? { inPart: true } : {}),
  });
  if (options.keyRides && lines.length > 0)
    lines[lines.length - 1] += `; ${keyLine(kind, facts(), options.width)}`;
  else if (options.legend) lines.push(...legendLines(kind, options.width, options.header?.sizeName));
  else if (options.key) lines.push(...keyLines(kind, facts(), options.width, "text", options.keyRows));
  return lines.map(quiet);
}

/**
 * The options with the key riding on the header's line (`keyRides`) where the key was left out of
 * the fit (see `HeaderOptions.keyLeftOut`) but a line has no width to run out of: the key then costs
 * no line, and the header need not say it was left out. Otherwise the options as they are.
 */
export function keyRiding<T extends { header?: HeaderOptions; width?: number; legend?: boolean }>(
  options: T,
): T & { keyRides?: boolean } {
  const { header } = options;
  if (header?.keyLeftOut === undefined || options.width !== undefined || options.legend) return options;
  const { keyLeftOut: _, ...rest } = header;
  return { ...options, header: rest, keyRides: true };
}

/**
 * Whether the key a rendering prints (none with a legend, which explains every cut) can say what the
 * width did to the sizes of a screen (see `screenLines`); undefined when no key is printed.
 */
export function keyCheck(
  options: {
    key?: boolean;
    keyRides?: boolean;
    legend?: boolean;
    width?: number;
    sizes?: boolean;
    header?: HeaderOptions;
  },
  kind: "summary" | "diff",
): ((screen: ScreenLines) => boolean) | undefined {
  if (!(options.key || options.keyRides) || options.legend) return undefined;
  return (screen) =>
    keyExplainsSizes(kind, keyFacts(screen.parts, keyContext(options), screen), options.width);
}

/** A width too narrow for a mark, a few columns of label and a fold is a usage error. */
export function checkWidth(width: number | undefined): void {
  if (width !== undefined && !(width >= MIN_WIDTH))
    throw new EspalierError(
      "USAGE",
      `a width of ${width} columns is too narrow; lines need at least ${MIN_WIDTH} (a mark, a few characters of a name and a fold)`,
    );
}
