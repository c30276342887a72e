import type { HierarchyNode } from "d3-hierarchy";
import {
  type ChangeCounts,
  type ChangeKind,
  changeKinds,
  noChanges,
  treeChangeKinds,
} from "../diff/changes.js";
import { shownLabel } from "../model/safe-text.js";
import type { ViewNode } from "../view/view-node.js";
import { amount, formatCount, type NumberOptions } from "./amount.js";
import { displayWidth, shortenEnd } from "./display-width.js";
import { formatSize, type Units } from "./format-size.js";
import { type IcicleBlock, type IcicleLayout, type IcicleMember, icicle } from "./icicle-layout.js";
import { EMPTY_WORDS } from "./line-parts.js";
import { MARK as LINE_MARK } from "./marks.js";
import { parentsText, referenceText } from "./reference-text.js";
import { checkWidth } from "./summary-text.js";
import { xmlEscape } from "./xml-escape.js";

export interface SvgOptions<T extends ViewNode = ViewNode> {
  units: Units;
  /** Whether the input has sizes: block widths follow size when it does, node counts when not. */
  sizes: boolean;
  /** Width of the picture in pixels; default 1200, at least 200. */
  width?: number;
  /** A diff's change of each node, marked by shape and colour; omit for a plain summary. */
  changeOf?: (node: T) => ChangeKind | null;
  /** The heading above the picture: the text rendering's header (totals, foci, lines); none if undefined. */
  heading?: string;
  /**
   * A diff's words for a node's change in its tooltip (e.g. the text format's change tag, which names
   * moved-from parents and field edits); default: the kind alone.
   */
  changeNote?: (node: T) => string;
  /**
   * A diff's changed nodes per kind in a shown node's subtree, or (with `folded`) in its folded
   * remainder: a group of narrow siblings says what changed among them.
   */
  changesIn?: (node: T, folded: boolean) => ChangeCounts;
}

/** Pixels per terminal column of `--width` when it sizes a picture. */
export const SVG_PX_PER_COLUMN = 8;

/**
 * The picture's width in pixels for `--width COLUMNS` ({@link SVG_PX_PER_COLUMN} a column), or
 * undefined for the default; a width under MIN_WIDTH columns is the same usage error as for text,
 * rather than a picture of another width than asked for.
 */
export function svgWidth(columns: number | undefined): number | undefined {
  checkWidth(columns);
  return columns === undefined ? undefined : columns * SVG_PX_PER_COLUMN;
}

/** The look: calm greens and a warm focus; every meaning also has a shape, so colour is never alone. */
const LOOK = {
  background: "#fbfaf6",
  ink: "#26302b",
  quiet: "#46524b",
  other: "#e3e8e2",
  path: "#c4d5c9",
  pathBar: "#3f5f4b",
  focus: "#f2d9a6",
  focusEdge: "#7b4f17",
  foldGround: "#f2efe7",
  group: "#ebe7dc",
  groupComb: "#8d8676",
  foldLine: "#cbc3b1",
  referenceEdge: "#6b7a70",
  change: {
    added: { fill: "#d4e9d3", mark: "#3c7443" },
    removed: { fill: "#f1dad4", mark: "#984636" },
    moved: { fill: "#d9ddef", mark: "#44508b" },
    renamed: { fill: "#eadcee", mark: "#744a82" },
    edited: { fill: "#d5e8ea", mark: "#2f6a70" },
    resized: { fill: "#eee6c9", mark: "#76642a" },
    linked: { fill: "#d3e8e6", mark: "#2f6e69" },
    unlinked: { fill: "#e6e1dc", mark: "#6b5a4c" },
  },
} as const;

const FONT = `ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace`;
const LABEL_PX = 12;
const NUMBER_PX = 10.5;
// Assumed advance of one terminal column (UAX #11 width 1) in the monospace font: 0.6 em is common
// practice for monospace faces (no source); a little more keeps a label inside its block.
const COLUMN = 0.62;
const ROW = 38;
const PAD = 5;
const MARK = 8;
/** Room a diff's change mark takes from a label. */
const MARK_ROOM = MARK + 3;
const MARGIN = 10;
/**
 * The narrowest block drawn, in pixels: room for five columns of label (a name cut to `Rosa…`, a
 * count `+123`) beside a diff's change mark, which leaves seven columns of numbers (`1.2 MiB`,
 * `58.3M`). Siblings narrower than this are drawn as one group.
 */
export const MIN_BLOCK = 2 * PAD + 5 * LABEL_PX * COLUMN + MARK_ROOM;
/**
 * The narrowest block of a diff picture, in pixels: its numbers line also holds `999 changed`
 * (eleven columns), so that a narrow fold or group says what changed inside it before its size.
 */
export const MIN_DIFF_BLOCK = Math.max(MIN_BLOCK, 2 * PAD + 11 * NUMBER_PX * COLUMN);

/** The narrowest block drawn: {@link MIN_DIFF_BLOCK} in a diff picture, else {@link MIN_BLOCK}. */
export function minBlockOf(options: { changesIn?: unknown }): number {
  return options.changesIn ? MIN_DIFF_BLOCK : MIN_BLOCK;
}
const MIN_WIDTH = 200;
/** Columns of label a block on a focus path is widened to hold. */
const PATH_COLUMNS = 40;
/**
 * Most of the picture's width that all widening together (labels on the path to a focus or change,
 * blocks raised to `MIN_BLOCK`) may take from the shares by size; the legend states it.
 */
export const WIDENING_CAP = 1 / 3;
const HEADING_PX = 13;
/** Longest path, in UTF-16 code units, a tooltip shows whole. */
const TOOLTIP_PATH = 960;
/** Members of a group its tooltip lists by name. */
const TOOLTIP_MEMBERS = 40;
const HEADING_ROW = 24;
/** Distance between the lines of a wrapped heading. */
const HEADING_LINE = 17;
const PATTERN = "espalier-folded";

/**
 * The summary as an SVG icicle: a row per depth, each shown node a block as wide as its size (or
 * node count) and each folded remainder a hatched block `+41 hidden` (nodes) after its parent's children, so
 * the row beneath a block fills it exactly. A focus has a thick outline and a warm fill; a node on
 * the path to one a darker fill and a bar along its bottom edge. In a diff, each change kind has a
 * tint and a shape (see docs/svg.md). Every block carries a tooltip with its full label and numbers.
 * No script and no outside reference; every name is escaped.
 */
export function renderSvg<T extends ViewNode>(view: HierarchyNode<T>, options: SvgOptions<T>): string {
  const width = pictureWidth(options);
  const inner = width - 2 * MARGIN;
  const { blocks, widened, pathGrouped } = pictureLayout(view, options);
  // The heading wraps at spaces (its facts are separated by "; "), so that nothing of it is lost.
  const heading = options.heading
    ? wrapWords(options.heading, Math.floor(inner / (HEADING_PX * COLUMN)))
    : [];
  const top = heading.length > 0 ? HEADING_ROW + (heading.length - 1) * HEADING_LINE : 0;
  const rowsHeight = blocks.reduce((h, b) => Math.max(h, b.y1), 0);
  const changed = new Set(
    blocks.map((b) => (b.folded ? null : (options.changeOf?.(b.node) ?? null))).filter((k) => k !== null),
  );
  const drawn = new Set<BlockKind>(blocks.map(kindOf));
  if (blocks.some((b) => b.members && focusesIn(b.members).length > 0)) drawn.add("focus-group");
  const legend = legendItems(options, drawn, changed, widened / inner, pathGrouped);
  const legendTop = MARGIN + top + rowsHeight + 14;
  const legendRows = layoutLegend(legend, inner);
  const height = legendTop + legendRows * LEGEND_ROW + MARGIN;

  // Foci last, so that their outlines lie over their neighbours' edges.
  const ordered = [
    ...blocks.filter((b) => b.folded || !b.node.focus),
    ...blocks.filter((b) => !b.folded && b.node.focus),
  ];
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${num(width)}" height="${num(height)}" ` +
      `viewBox="0 0 ${num(width)} ${num(height)}" role="img" font-family="${xmlEscape(FONT)}">`,
    `<title>${xmlEscape(`Summary of ${shownLabel(view.data.label)}`)}</title>`,
    defs(),
    `<rect width="100%" height="100%" fill="${LOOK.background}"/>`,
    ...heading.map(
      (line, k) =>
        `<text class="heading" x="${MARGIN}" y="${MARGIN + 15 + k * HEADING_LINE}" font-size="${HEADING_PX}" fill="${LOOK.ink}">` +
        `${xmlEscape(line)}</text>`,
    ),
    `<g class="icicle" transform="translate(${MARGIN} ${MARGIN + top})">`,
    ...ordered.map((b) => block(b, options)),
    "</g>",
    `<g class="legend" transform="translate(${MARGIN} ${num(legendTop)})" font-size="${LABEL_PX}" fill="${LOOK.ink}">`,
    ...legend.map(legendItem),
    "</g>",
    "</svg>",
  ];
  return `${out.join("\n")}\n`;
}

/** The picture's width in pixels: `options.width`, default 1,200, at least 200. */
export function pictureWidth(options: { width?: number }): number {
  return Math.max(MIN_WIDTH, options.width ?? 1200);
}

/** The icicle the picture draws (coordinates inside the margins, below the heading). */
export function pictureLayout<T extends ViewNode>(
  view: HierarchyNode<T>,
  options: SvgOptions<T>,
): IcicleLayout<T> {
  return icicle(view, {
    weight: options.sizes ? "size" : "nodes",
    width: pictureWidth(options) - 2 * MARGIN,
    rowHeight: ROW,
    floor: (node) => floorOf(node, options),
    cap: WIDENING_CAP,
    minBlock: minBlockOf(options),
  });
}

/**
 * The width a block is widened to: a focus and its ancestors room for their label (up to 40
 * columns); anything else none (it is drawn by size, or grouped with its narrow siblings). All
 * widening together takes at most {@link WIDENING_CAP} of the width (the floors give way first, see
 * `icicle`); the legend says how much is widened.
 */
function floorOf<T extends ViewNode>(node: T, options: SvgOptions<T>): number {
  if (!(node.focus || node.onPath)) return 0;
  const label = Math.min(displayWidth(shownLabel(node.label)), PATH_COLUMNS) * LABEL_PX * COLUMN;
  // Room for the numbers too, written compact (the shortest that still has count and size).
  const change = options.changeOf?.(node) ?? null;
  const shortest = numbers({ node, folded: false }, options, change)[1] ?? "";
  const figures = Math.min(displayWidth(shortest), PATH_COLUMNS) * NUMBER_PX * COLUMN;
  return Math.max(minBlockOf(options), Math.max(label + (change ? MARK_ROOM : 0), figures) + 2 * PAD);
}

function defs(): string {
  return (
    `<defs><pattern id="${PATTERN}" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">` +
    `<rect width="6" height="6" fill="${LOOK.foldGround}"/><path d="M0 0V6" stroke="${LOOK.foldLine}" stroke-width="2"/>` +
    "</pattern></defs>"
  );
}

type BlockKind = "focus" | "path" | "other" | "folded" | "reference" | "group" | "focus-group";

function kindOf<T extends ViewNode>({ node, folded, members }: IcicleBlock<T>): BlockKind {
  return members
    ? "group"
    : folded
      ? "folded"
      : node.reference
        ? "reference"
        : node.focus
          ? "focus"
          : node.onPath
            ? "path"
            : "other";
}

/** One block: a group with its tooltip, its rectangle, its marks and the labels that fit. */
function block<T extends ViewNode>(b: IcicleBlock<T>, options: SvgOptions<T>): string {
  const { node, folded } = b;
  const w = b.x1 - b.x0;
  const h = b.y1 - b.y0;
  const change = folded || b.members ? null : (options.changeOf?.(node) ?? null);
  const kind = kindOf(b);
  const parts: string[] = [
    `<g class="${kind}${change ? ` ${change}` : ""}">`,
    `<title>${xmlEscape(tooltip(b, options, change))}</title>`,
  ];
  // Width from the rounded ends, so that neighbours share an edge exactly.
  const box = `x="${num(b.x0)}" y="${num(b.y0)}" width="${num(round2(b.x1) - round2(b.x0))}" height="${num(h)}"`;
  const dash = change === "removed" ? ` stroke-dasharray="5 3"` : "";
  if (b.members) {
    // A group that holds a focus (drawn inside it to keep the widening within the cap) has its outline.
    const edge =
      focusesIn(b.members).length > 0
        ? `stroke="${LOOK.focusEdge}" stroke-width="3"`
        : `stroke="${LOOK.background}" stroke-width="1"`;
    parts.push(`<rect ${box} fill="${LOOK.group}" ${edge}/>`);
    parts.push(comb(b.x0, b.x1, b.y1));
  } else if (folded)
    parts.push(`<rect ${box} fill="url(#${PATTERN})" stroke="${LOOK.background}" stroke-width="1"/>`);
  else if (node.reference)
    parts.push(
      `<rect ${box} fill="${change ? LOOK.change[change].fill : LOOK.background}" stroke="${LOOK.referenceEdge}" stroke-width="1.5" stroke-dasharray="2 2"/>`,
    );
  else if (node.focus)
    parts.push(`<rect ${box} fill="${LOOK.focus}" stroke="${LOOK.focusEdge}" stroke-width="3"${dash}/>`);
  else {
    const fill = change ? LOOK.change[change].fill : node.onPath ? LOOK.path : LOOK.other;
    const edge =
      change === "removed"
        ? `stroke="${LOOK.change.removed.mark}" stroke-width="1.5"`
        : `stroke="${LOOK.background}" stroke-width="1"`;
    parts.push(`<rect ${box} fill="${fill}" ${edge}${dash}/>`);
    if (node.onPath && !change && h > 6)
      parts.push(`<path d="M${num(b.x0)} ${num(b.y1 - 3)}h${num(w)}v3h${num(-w)}z" fill="${LOOK.pathBar}"/>`);
  }
  if (change && w >= MARK + 6 && h >= MARK + 6)
    parts.push(changeMark(change, b.x1 - MARK - 3, b.y0 + 3, MARK));
  parts.push(...labels(b, options, change));
  parts.push("</g>");
  return parts.join("");
}

/** The label and, beneath it, the numbers, each only when it fits the block. */
function labels<T extends ViewNode>(
  b: IcicleBlock<T>,
  options: SvgOptions<T>,
  change: ChangeKind | null,
): string[] {
  const marked = change !== null && change !== "removed";
  const { node, folded } = b;
  const room = b.x1 - b.x0 - 2 * PAD - (marked ? MARK + 3 : 0);
  const out: string[] = [];
  const x = num(b.x0 + PAD);
  const first = b.members
    ? fitted(groupNames(b.members), room, LABEL_PX, true)
    : folded
      ? fitted(foldNames(node.hidden!.nodes), room, LABEL_PX, true)
      : fitted(
          [`${node.reference ? `${LINE_MARK.reference} ` : ""}${shownLabel(node.label)}`],
          room,
          LABEL_PX,
          true,
        );
  // The numbers (and a diff's change in words) keep their own line whatever the label's cut.
  if (first === null) return out;
  const weight = !folded && !b.members && node.focus ? ` font-weight="700"` : "";
  const style = folded || b.members ? ` font-style="italic"` : "";
  out.push(
    `<text x="${x}" y="${num(b.y0 + 15)}" font-size="${LABEL_PX}" fill="${LOOK.ink}"${weight}${style}>${xmlEscape(first)}</text>`,
  );
  const second = fitted(
    b.members ? groupNumbers(b.members, options) : numbers(b, options, change),
    b.x1 - b.x0 - 2 * PAD,
    NUMBER_PX,
  );
  if (second !== null)
    out.push(
      `<text x="${x}" y="${num(b.y0 + 29)}" font-size="${NUMBER_PX}" fill="${LOOK.quiet}">${xmlEscape(second)}</text>`,
    );
  return out;
}

/**
 * The block's numbers, longest first: count and size, then the size alone, then the count alone.
 * A removed node holds nothing now, so only its count is shown.
 */
function numbers<T extends ViewNode>(
  { node, folded }: { node: T; folded: boolean },
  options: SvgOptions<T>,
  change: ChangeKind | null,
): string[] {
  if (!folded && node.reference) return [referenceText(node.reference)];
  const { nodes, size } = folded ? node.hidden! : node;
  const sizes = options.sizes && change !== "removed";
  const always = folded;
  const plain = withEmpty(
    numberTexts(nodes, size, { ...options, sizes }, always),
    folded ? (node.hidden!.empty ?? 0) : 0,
    !folded && node.empty === true,
  );
  // A diff's fold says what changed inside it, as the text format's fold does.
  if (folded) return withChanges(plain, [{ node, folded }], options);
  // A diff's change shows in words inside its block, before the numbers, and alone when they do not fit.
  const texts = change ? [...plain.map((t) => (t ? `${change}: ${t}` : change)), change] : plain;
  return texts.filter((t, k) => t !== "" && texts.indexOf(t) === k);
}

/**
 * A block's numbers, longest first: count and size, then both compact (`12.1k nodes, 286M`), then
 * the size alone, compact, then in whole units of bytes (`18 MiB`), then the count alone, compact;
 * the first that fits is drawn, so a narrow block keeps its size when its name is cut.
 */
function numberTexts(nodes: number, size: number, options: NumberOptions, always: boolean): string[] {
  // Small option objects of one shape: this runs for every block, 100,000 times on a deep chain.
  const { units, sizes } = options;
  const texts = [
    amount(nodes, size, { units, sizes, always }),
    amount(nodes, size, { units, sizes, always, compact: true }),
  ];
  // Bytes rounded to whole units (`18 MiB`) last: a narrow block keeps a size (the tooltip is exact).
  if (sizes)
    texts.push(
      formatSize(size, units),
      amount(0, size, { units, sizes, compact: true }),
      formatSize(size, units, 0),
    );
  texts.push(
    amount(nodes, size, { units, sizes: false, always }),
    amount(nodes, size, { units, sizes: false, always, compact: true }),
  );
  return texts.filter((t, k) => t !== "" && texts.indexOf(t) === k);
}

/**
 * Nested input with empty entries (`{}`): the longest numbers first with how many of the block's nodes
 * are such (`26 nodes, 25 empty {}`, as the text format's fold says it), or `empty {}` on an empty
 * entry's own block, so the counts in the picture add up to the heading's as the text's do; the
 * shorter texts follow for a narrow block (its tooltip always says it).
 */
function withEmpty(texts: string[], hiddenEmpty: number, ownEmpty: boolean): string[] {
  const words = ownEmpty ? EMPTY_WORDS : hiddenEmpty > 0 ? `${formatCount(hiddenEmpty)} ${EMPTY_WORDS}` : "";
  if (words === "") return texts;
  return [texts.length > 0 ? `${texts[0]}, ${words}` : words, ...texts];
}

/**
 * A fold's label, longest first: `+17,847 hidden`, `+17,847`, `+17.8k`: how many nodes it hides, as
 * the text format's narrow fold counts them (`(17,847 hidden)`), so the node counts in the picture add
 * up to the block above's (a count of its children would not; the tooltip says those).
 */
function foldNames(nodes: number): string[] {
  return [`+${formatCount(nodes)} hidden`, `+${formatCount(nodes)}`, `+${formatCount(nodes, true)}`];
}

/** `3 children` (or `1 child`) a fold holds. */
function childWords(children: number): string {
  return `${formatCount(children)} ${children === 1 ? "child" : "children"}`;
}

/** How many siblings a group holds: its shown nodes and the hidden children of a folded remainder. */
function groupCount<T extends ViewNode>(members: IcicleMember<T>[]): number {
  return members.reduce((n, m) => n + (m.folded ? m.node.hidden!.children : 1), 0);
}

/** A group's label, longest first: `12 grouped`, then `12`. */
function groupNames<T extends ViewNode>(members: IcicleMember<T>[]): string[] {
  const k = formatCount(groupCount(members));
  return [`${k} grouped`, k];
}

/** A group's numbers (nodes and size together), or in a diff what changed among them first. */
function groupNumbers<T extends ViewNode>(members: IcicleMember<T>[], options: SvgOptions<T>): string[] {
  const totals = groupTotals(members);
  const plain = withEmpty(numberTexts(totals.nodes, totals.size, options, true), totals.empty, false);
  return withChanges(plain, members, options);
}

/**
 * In a diff, what changed among `members` (`2 removed, 1 added`, then `3 changed`), or `none changed`
 * (then `0 changed`), before the numbers, so that a block as narrow as {@link MIN_DIFF_BLOCK} still
 * says it; the numbers alone in a summary.
 */
function withChanges<T extends ViewNode>(
  plain: string[],
  members: IcicleMember<T>[],
  options: SvgOptions<T>,
): string[] {
  if (!options.changesIn) return plain;
  const changes = noChanges();
  for (const m of members) {
    const c = options.changesIn(m.node, m.folded);
    for (const kind of changeKinds) changes[kind] += c[kind];
  }
  const words = changeKinds.filter((k) => changes[k] > 0).map((k) => `${formatCount(changes[k])} ${k}`);
  const total = changeKinds.reduce((n, k) => n + changes[k], 0);
  return total > 0
    ? [words.join(", "), `${formatCount(total)} changed`, `${formatCount(total, true)} changed`, ...plain]
    : ["none changed", "0 changed", ...plain];
}

/** The foci inside a group's members (shown nodes and everything below them), in pre-order. */
function focusesIn<T extends ViewNode>(members: IcicleMember<T>[]): ViewNode[] {
  const found: ViewNode[] = [];
  const stack: ViewNode[] = members.filter((m) => !m.folded && m.node.onPath).map((m) => m.node);
  stack.reverse();
  for (let n = stack.pop(); n !== undefined; n = stack.pop()) {
    if (n.focus) found.push(n);
    for (let k = n.children.length - 1; k >= 0; k--) if (n.children[k].onPath) stack.push(n.children[k]);
  }
  return found;
}

function groupTotals<T extends ViewNode>(
  members: IcicleMember<T>[],
): { nodes: number; size: number; empty: number } {
  let nodes = 0;
  let size = 0;
  let empty = 0;
  for (const m of members) {
    const n = m.folded ? m.node.hidden! : m.node;
    nodes += n.nodes;
    size += n.size;
    empty += (m.folded ? m.node.hidden!.empty : m.node.emptyBelow) ?? 0;
  }
  return { nodes, size, empty };
}

/** `, 25 empty {}` after a tooltip's numbers (nested input with empty entries), or nothing. */
function emptyNote(count: number | undefined): string {
  return count ? `, ${formatCount(count)} ${EMPTY_WORDS}` : "";
}

/** Short ticks along a group's bottom edge, one every 5 pixels: the group's own pattern. */
function comb(x0: number, x1: number, y1: number): string {
  let d = "";
  for (let x = x0 + 3; x < x1 - 2; x += 5) d += `M${num(x)} ${num(y1)}v-5`;
  return d ? `<path d="${d}" stroke="${LOOK.groupComb}" stroke-width="1"/>` : "";
}

/** The first text that fits `room` pixels; with `shorten`, the last cut at its end; else null. */
function fitted(texts: string[], room: number, px: number, shorten = false): string | null {
  // A hair of slack: a block widened to exactly its label must still take it whole.
  const columns = Math.floor(room / (px * COLUMN) + 1e-6);
  for (const t of texts) if (displayWidth(t) <= columns) return t;
  return shorten && columns >= 2 ? shortenEnd(texts[texts.length - 1], columns) : null;
}

/** Full label, path, numbers and marks, one per line. */
function tooltip<T extends ViewNode>(
  b: IcicleBlock<T>,
  options: SvgOptions<T>,
  change: ChangeKind | null,
): string {
  const { node } = b;
  const label = shownLabel(node.label);
  const always = { ...options, always: true };
  if (b.members) {
    const totals = groupTotals(b.members);
    const lines = [
      `${formatCount(groupCount(b.members))} grouped under ${label}: ${amount(totals.nodes, totals.size, always)}${emptyNote(totals.empty)}`,
    ];
    for (const m of b.members.slice(0, TOOLTIP_MEMBERS)) {
      const n = m.folded ? m.node.hidden! : m.node;
      const name = m.folded
        ? `+${formatCount(m.node.hidden!.nodes)} hidden (${childWords(m.node.hidden!.children)})`
        : shownLabel(m.node.label);
      const change = m.folded ? null : (options.changeOf?.(m.node) ?? null);
      const note = change
        ? ` [${options.changeNote ? options.changeNote(m.node).replace(/^\[|\]$/g, "") : change}]`
        : "";
      // A shown member says the empty entries in its subtree, so the members' add up to the group's.
      const empty = m.folded
        ? emptyNote(m.node.hidden!.empty)
        : m.node.empty
          ? `, ${EMPTY_WORDS}`
          : emptyNote(m.node.emptyBelow);
      lines.push(`${name}: ${amount(n.nodes, n.size, always)}${empty}${note}`);
    }
    if (b.members.length > TOOLTIP_MEMBERS)
      lines.push(`… and ${formatCount(b.members.length - TOOLTIP_MEMBERS)} more`);
    const foci = focusesIn(b.members);
    if (foci.length > 0)
      lines.push(
        `holds ${foci.length === 1 ? "the focus" : `${formatCount(foci.length)} foci:`} ${foci
          .slice(0, TOOLTIP_MEMBERS)
          .map((f) => shownLabel(f.label))
          .join(", ")}${foci.length > TOOLTIP_MEMBERS ? ", …" : ""}`,
      );
    return lines.join("\n");
  }
  if (b.folded) {
    const { children, nodes, size, empty } = node.hidden!;
    return `+${formatCount(nodes)} hidden under ${label} (${childWords(children)} and all below them): ${amount(nodes, size, always)}${emptyNote(empty)}`;
  }
  const lines = [label];
  // A deep node's path is long (a chain's grow with the square of its depth): past a few lines, the
  // tooltip names the depth and the node instead of reading the whole path.
  const path =
    node.path.length > TOOLTIP_PATH
      ? `… (depth ${formatCount(node.depth)}) / ${shownLabel(node.name)}`
      : shownLabel(node.path);
  if (node.path !== "" && path !== label) lines.push(path);
  if (node.reference) {
    lines.push(`reference, counted at its ${referenceText(node.reference)}`);
    if (change) lines.push(change);
    return lines.join("\n");
  }
  lines.push(amount(node.nodes, node.size, always));
  if (node.empty) lines.push(EMPTY_WORDS);
  const parents = parentsText(node.parents);
  if (parents) lines.push(parents);
  if (node.focus) lines.push("focus");
  else if (node.onPath)
    lines.push(options.changeOf ? "on the path to a focus or change" : "on the path to a focus");
  if (change) lines.push(options.changeNote ? options.changeNote(node) : change);
  return lines.join("\n");
}

/** A shape per change kind, `s` pixels square at (x, y); removed has its dashed outline instead. */
function changeMark(kind: ChangeKind, x: number, y: number, s: number): string {
  const fill = LOOK.change[kind].mark;
  const h = s / 2;
  switch (kind) {
    case "added": // a triangle in the corner
      return `<path d="M${num(x)} ${num(y)}h${num(s)}v${num(s)}z" fill="${fill}"/>`;
    case "moved": // a diamond
      return `<path d="M${num(x + h)} ${num(y)}l${num(h)} ${num(h)}l${num(-h)} ${num(h)}l${num(-h)} ${num(-h)}z" fill="${fill}"/>`;
    case "renamed": // a circle
      return `<circle cx="${num(x + h)}" cy="${num(y + h)}" r="${num(h)}" fill="${fill}"/>`;
    case "edited": // a small square
      return `<path d="M${num(x + 1)} ${num(y + 1)}h${num(s - 2)}v${num(s - 2)}h${num(2 - s)}z" fill="${fill}"/>`;
    case "resized": // a bar, like a ruler mark
      return `<path d="M${num(x)} ${num(y + h - 1.5)}h${num(s)}v3h${num(-s)}z" fill="${fill}"/>`;
    case "linked": // a ring: a new link
      return `<circle cx="${num(x + h)}" cy="${num(y + h)}" r="${num(h - 1)}" fill="none" stroke="${fill}" stroke-width="2"/>`;
    case "unlinked": // a slash: a link cut
      return `<path d="M${num(x)} ${num(y + s)}L${num(x + s)} ${num(y)}" stroke="${fill}" stroke-width="2.5"/>`;
    case "removed":
      return "";
  }
}

interface LegendItem {
  swatch: string;
  text: string;
  /** The text wrapped to the legend's width (set by `layoutLegend`). */
  lines?: string[];
  x: number;
  y: number;
}

const SWATCH = 16;
const LEGEND_ROW = 24;

/** What the marks mean: the kinds of block drawn, every change kind of a diff, and what widths show. */
function legendItems<T extends ViewNode>(
  options: SvgOptions<T>,
  drawn: Set<BlockKind>,
  changed: Set<ChangeKind>,
  widened: number,
  pathGrouped: number,
): LegendItem[] {
  const s = SWATCH;
  const box = `width="${s}" height="${s}"`;
  const near = options.changeOf ? "a focus or change" : "a focus";
  const kinds: [BlockKind, string, string][] = [
    ["focus", `<rect ${box} fill="${LOOK.focus}" stroke="${LOOK.focusEdge}" stroke-width="3"/>`, "focus"],
    [
      "path",
      `<rect ${box} fill="${LOOK.path}"/><path d="M0 ${s - 3}h${s}v3h${-s}z" fill="${LOOK.pathBar}"/>`,
      `on the path to ${near}`,
    ],
    ["other", `<rect ${box} fill="${LOOK.other}"/>`, "other shown node"],
    [
      "folded",
      `<rect ${box} fill="url(#${PATTERN})"/>`,
      "+N hidden: N nodes not drawn, children of the block above and all below them (how many children in the tooltip)",
    ],
    [
      "group",
      `<rect ${box} fill="${LOOK.group}"/>${comb(0, s, s)}`,
      "N grouped: N siblings too narrow to label one by one, hidden ones of a fold included, with all below them (names in the tooltip)",
    ],
    [
      "focus-group",
      `<rect ${box} fill="${LOOK.group}" stroke="${LOOK.focusEdge}" stroke-width="3"/>${comb(0, s, s)}`,
      "a group with a focus inside",
    ],
    [
      "reference",
      `<rect ${box} fill="${LOOK.background}" stroke="${LOOK.referenceEdge}" stroke-width="1.5" stroke-dasharray="2 2"/>`,
      "reference: a node whose full entry (and count) is elsewhere",
    ],
  ];
  const items = kinds.filter(([kind]) => drawn.has(kind)).map(([, swatch, text]) => ({ swatch, text }));
  if (options.changeOf) {
    // Every kind of a tree's diff; the edge kinds of a graph's diff when some block has one.
    for (const kind of changeKinds.filter((k) => treeChangeKinds.includes(k) || changed.has(k))) {
      const { fill, mark } = LOOK.change[kind];
      const edge = kind === "removed" ? ` stroke="${mark}" stroke-width="1.5" stroke-dasharray="5 3"` : "";
      items.push({
        swatch: `<rect ${box} fill="${fill}"${edge}/>${changeMark(kind, s - 9, 1, 8)}`,
        text: kind,
      });
    }
  }
  // The widening, measured: what the blocks have beyond their share by weight, as a share of the width.
  const percent = widened * 100;
  const cap = Math.round(WIDENING_CAP * 100);
  const wider =
    percent >= 0.05
      ? `; ${percent < 1 ? percent.toFixed(1) : Math.round(percent)}% of the width is widened to fit labels (the path to ${near}, narrow blocks; at most ${cap}%)`
      : "";
  // What gave way to keep the cap: nodes with room of their own that are drawn inside a group.
  const grouped =
    pathGrouped > 0
      ? `; to keep to ${cap}%, ${formatCount(pathGrouped)} ${pathGrouped === 1 ? "node" : "nodes"} on the path to ${near} ${pathGrouped === 1 ? "is" : "are"} drawn inside groups`
      : "";
  items.push({ swatch: "", text: `width: ${options.sizes ? "size" : "node count"}${wider}${grouped}` });
  return items.map((item) => ({ ...item, x: 0, y: 0 }));
}

/**
 * Places the legend's items left to right, wrapping at `width`; an item wider than the whole width
 * has its words wrapped onto lines of its own. Returns the legend's height in rows.
 */
function layoutLegend(items: LegendItem[], width: number): number {
  let x = 0;
  let row = 0;
  let rowLines = 1;
  for (const item of items) {
    const lead = item.swatch ? SWATCH + 6 : 0;
    const columns = Math.max(4, Math.floor((width - lead) / (LABEL_PX * COLUMN)));
    item.lines = wrapWords(item.text, columns);
    const w = lead + Math.max(...item.lines.map(displayWidth)) * LABEL_PX * COLUMN + 22;
    if (x > 0 && x + w > width) {
      x = 0;
      row += rowLines;
      rowLines = 1;
    }
    item.x = x;
    item.y = row * LEGEND_ROW;
    rowLines = Math.max(rowLines, item.lines.length);
    x += w;
  }
  return row + rowLines;
}

/**
 * `text` in lines of at most `columns` (UAX #11 widths), broken at spaces; a word longer than a
 * line is cut at its end.
 */
function wrapWords(text: string, columns: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    const next = line === "" ? word : `${line} ${word}`;
    if (displayWidth(next) <= columns) line = next;
    else {
      if (line !== "") lines.push(line);
      line = displayWidth(word) <= columns ? word : shortenEnd(word, columns);
    }
  }
  lines.push(line);
  return lines;
}

function legendItem(item: LegendItem): string {
  const textX = item.swatch ? SWATCH + 6 : 0;
  return (
    `<g transform="translate(${num(item.x)} ${num(item.y)})">${item.swatch}` +
    (item.lines ?? [item.text])
      .map((line, k) => `<text x="${textX}" y="${SWATCH - 4 + k * LEGEND_ROW}">${xmlEscape(line)}</text>`)
      .join("") +
    "</g>"
  );
}

/** A coordinate with at most two decimals, so the output is the same on every run and machine. */
function num(x: number): string {
  const r = round2(x);
  return Object.is(r, -0) ? "0" : String(r);
}

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}
