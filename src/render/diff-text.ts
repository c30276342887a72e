import type { HierarchyNode } from "d3-hierarchy";
import { type ChangeCounts, changeKinds, treeChangeKinds } from "../diff/changes.js";
import type { DiffTotals } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import { safeText, shownLabel } from "./escape.js";
import { displayWidth, shortenEnd, shortenMiddle } from "./fit-width.js";
import { noColour, type Palette } from "./palette.js";
import { amount, MARK, referenceText } from "./text.js";
import { formatSize, type Units } from "./units.js";

export interface DiffTextOptions {
  units: Units;
  /** Whether sizes are printed (either version had sizes). */
  sizes: boolean;
  /** How nodes were matched, named on the totals line. */
  by: "id" | "path";
  palette?: Palette;
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
}

/** Shortest label kept before other parts of a line give way to the width. */
const MIN_LABEL = 8;

/**
 * The summary's layout (see `renderText`, one line per node) after one line of totals. A changed
 * node carries a tag in square brackets before its label: `[added]`, `[removed]`,
 * `[moved from OLD/PARENT]`, `[renamed from OLD]`, `[resized]`, with its own size change signed
 * (`[resized +12 B]`). Marks: `*` a focus, `>` a change or an ancestor of a focus or change, `-` any
 * other node. A folded remainder says what changed inside it (`+3 more: 41 nodes, 2.0 MiB; 2 added,
 * net +1.0 KiB`) or that nothing did (`unchanged`).
 */
export function renderDiffText(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  const pal = options.palette ?? noColour;
  const { width } = options;
  const head = totalsLine(totals, options);
  const lines = [width === undefined ? head : shortenEnd(head, width)];
  const top = view.data.depth;
  view.eachBefore(({ data: node }) => {
    const stats = node.reference
      ? [referenceText(node.reference)]
      : [
          amount(node.nodes, node.change === "removed" ? 0 : node.size, {
            ...options,
            sizes: options.sizes && node.change !== "removed",
          }),
        ];
    if (options.sizes && node.nodes > 1 && node.net !== 0) stats.push(`net ${signed(node.net, options)}`);
    const inside = node.hidden ? changeSummary(node.hidden.changes, node.hidden.delta, options) : "";
    const hidden = node.hidden;
    lines.push(
      composeLine(
        {
          indent: "  ".repeat(node.depth - top),
          mark: node.reference
            ? MARK.reference
            : node.focus
              ? MARK.focus
              : node.onPath
                ? MARK.path
                : MARK.other,
          tag: (from) => changeTag(node, options, from),
          label: shownLabel(node.label),
          stats: stats.filter((s) => s !== "").join(", "),
          folded: hidden
            ? `+${hidden.children} more: ${amount(hidden.nodes, hidden.size, { ...options, always: true })}; ${inside}`
            : "",
          foldedShort: hidden ? `+${hidden.children} more; ${inside}` : "",
          style: node.focus ? pal.focus : node.onPath ? pal.path : (s: string) => s,
          pal,
        },
        width,
      ),
    );
  });
  return `${lines.join("\n")}\n`;
}

interface LineParts {
  indent: string;
  mark: string;
  /** The change tag with the old parent's path shortened to `from` columns (unlimited: undefined). */
  tag: (from?: number) => string;
  label: string;
  stats: string;
  folded: string;
  foldedShort: string;
  style: (s: string) => string;
  pal: Palette;
}

/**
 * Puts a line together within `width` columns. What gives way, in turn: the folded part's numbers
 * (its count of hidden children and the changes inside stay), the label and the old parent's path
 * (cut in the middle, down to a few columns), the subtree's numbers, and last the end of the line.
 */
function composeLine(p: LineParts, width: number | undefined): string {
  const plain = (label: string, tag: string, stats: string, folded: string) =>
    `${p.indent}${p.mark} ${tag ? `${tag} ` : ""}${label}${stats ? `  ${stats}` : ""}${folded ? `  ${folded}` : ""}`;
  const styled = (label: string, tag: string, stats: string, folded: string) =>
    `${p.indent}${p.style(p.mark)} ${tag ? `${p.pal.focus(tag)} ` : ""}${p.style(label)}` +
    `${stats ? `  ${p.pal.quiet(stats)}` : ""}${folded ? `  ${p.pal.quiet(folded)}` : ""}`;
  const tag = p.tag();
  if (width === undefined || displayWidth(plain(p.label, tag, p.stats, p.folded)) <= width)
    return styled(p.label, tag, p.stats, p.folded);
  if (displayWidth(plain(p.label, tag, p.stats, p.foldedShort)) <= width)
    return styled(p.label, tag, p.stats, p.foldedShort);
  const shortTag = p.tag(MIN_LABEL);
  const attempts: [string, string, string][] = [
    [tag, p.stats, p.foldedShort],
    [shortTag, p.stats, p.foldedShort],
    [shortTag, "", p.foldedShort],
  ];
  for (const [t, stats, folded] of attempts) {
    const room = width - displayWidth(plain("", t, stats, folded));
    if (room >= Math.min(MIN_LABEL, displayWidth(p.label)))
      return styled(shortenMiddle(p.label, room), t, stats, folded);
  }
  return shortenEnd(plain(p.label, shortTag, "", p.foldedShort), width);
}

/** `matched by id: 1 added, 0 removed, 1 moved, 0 renamed, 0 resized; 6 -> 7 nodes; size …`. */
export function totalsLine(totals: DiffTotals, options: DiffTextOptions): string {
  // A diff of graphs counts edges linked and unlinked too; a diff of trees has none to count.
  const kinds = (totals.graph ? changeKinds : treeChangeKinds)
    .map((k) => `${totals.changes[k]} ${k}`)
    .join(", ");
  let line = `matched by ${options.by}: ${kinds}; ${totals.old.nodes} -> ${totals.new.nodes} nodes`;
  if (options.sizes) {
    const { units } = options;
    const sizes = `${formatSize(totals.old.size, units)} -> ${formatSize(totals.new.size, units)}`;
    line += `; size ${sizes} (${signed(totals.delta, options)})`;
  }
  return line;
}

export function changeTag(node: DiffViewNode, options: DiffTextOptions, fromWidth?: number): string {
  if (node.change === null) return "";
  const parts: string[] = [node.change];
  if (node.movedFrom !== null) {
    const from = node.movedFrom === "" ? "the root" : safeText(node.movedFrom);
    parts[0] += ` from ${fromWidth === undefined ? from : shortenMiddle(from, fromWidth)}`;
  }
  if (node.renamedFrom !== null) {
    const from = shownLabel(node.renamedFrom);
    parts[0] += ` from ${fromWidth === undefined ? from : shortenMiddle(from, fromWidth)}`;
  }
  if (options.sizes && node.delta !== 0) parts.push(signed(node.delta, options));
  return `[${parts.join(node.movedFrom !== null || node.renamedFrom !== null ? ", " : " ")}]`;
}

/** `2 added, 1 resized, net +1.0 KiB`, or `unchanged`. */
export function changeSummary(changes: ChangeCounts, delta: number, options: DiffTextOptions): string {
  const parts = changeKinds.filter((k) => changes[k] > 0).map((k) => `${changes[k]} ${k}`);
  if (options.sizes && delta !== 0) parts.push(`net ${signed(delta, options)}`);
  return parts.length > 0 ? parts.join(", ") : "unchanged";
}

/** A size change with its sign: `+12 B`, `-3.0 KiB`. */
function signed(value: number, options: DiffTextOptions): string {
  return value < 0 ? formatSize(value, options.units) : `+${formatSize(Math.abs(value), options.units)}`;
}
