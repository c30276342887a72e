import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import { shownLabel } from "./escape.js";
import { displayWidth, shortenEnd, shortenMiddle } from "./fit-width.js";
import { lineGroups } from "./line-groups.js";
import { noColour, type Palette } from "./palette.js";
import { formatSize, type Units } from "./units.js";

export interface TextOptions {
  units: Units;
  /** Whether sizes are printed (the input had sizes). */
  sizes: boolean;
  palette?: Palette;
  /** Join an only child that is not below a focus onto its parent's line (must match the fit's choice). */
  chains?: boolean;
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
}

/** Line marks; they carry the meaning without colour. */
export const MARK = { focus: "*", path: ">", other: "-", reference: "&" } as const;

/** Between the labels of a chain of only children printed on one line. */
export const CHAIN_JOIN = " / ";

/** Shortest label kept before other parts of a line give way to the width. */
const MIN_LABEL = 8;

/**
 * One line per shown node, indented two spaces a level:
 *   `<mark> <label>  <N nodes>, <size>  +<k> more: <N nodes>, <size>`
 * The folded remainder rides on its parent's line, so every line names a node and the budget buys
 * nodes. Marks: `*` a focus, `>` an ancestor of a focus, `-` any other node. With `chains`, a run of
 * only children prints as one line `a / b / c` with the numbers of its top node.
 */
export function renderText(view: HierarchyNode<ViewNode>, options: TextOptions): string {
  return textLines(view, options).join("\n") + "\n";
}

/** The rendered lines, without their line ends. */
export function textLines(view: HierarchyNode<ViewNode>, options: TextOptions): string[] {
  const pal = options.palette ?? noColour;
  return lineGroups(view, options.chains ?? false).map(({ level, nodes }) => {
    const top = nodes[0];
    const last = nodes[nodes.length - 1];
    if (top.reference) {
      return composeLine(
        {
          indent: "  ".repeat(level),
          mark: MARK.reference,
          label: shownLabel(top.label),
          stats: referenceText(top.reference),
          folded: "",
          foldedShort: "",
          style: top.onPath ? pal.path : (s: string) => s,
          quiet: pal.quiet,
        },
        options.width,
      );
    }
    return composeLine(
      {
        indent: "  ".repeat(level),
        mark: last.focus ? MARK.focus : last.onPath ? MARK.path : MARK.other,
        label: nodes.map((n) => shownLabel(n.label)).join(CHAIN_JOIN),
        stats: amount(top.nodes, top.size, options),
        folded: [
          last.hidden
            ? `+${last.hidden.children} more: ${amount(last.hidden.nodes, last.hidden.size, { ...options, always: true })}${referencesText(last.hidden.references)}`
            : "",
          parentsText(last.parents),
        ]
          .filter((part) => part !== "")
          .join("  "),
        foldedShort: last.hidden ? `+${last.hidden.children} more` : "",
        style: last.focus ? pal.focus : last.onPath ? pal.path : (s: string) => s,
        quiet: pal.quiet,
      },
      options.width,
    );
  });
}

interface LineParts {
  indent: string;
  mark: string;
  label: string;
  stats: string;
  folded: string;
  foldedShort: string;
  style: (s: string) => string;
  quiet: (s: string) => string;
}

/**
 * Puts a line together within `width` columns. What gives way, in turn: the folded part's numbers
 * (`+3 more` stays), the label (cut in the middle, down to a few columns), the subtree's numbers,
 * and last the end of the line itself.
 */
function composeLine(p: LineParts, width: number | undefined): string {
  const plain = (label: string, stats: string, folded: string) =>
    `${p.indent}${p.mark} ${label}${stats ? `  ${stats}` : ""}${folded ? `  ${folded}` : ""}`;
  const styled = (label: string, stats: string, folded: string) =>
    `${p.indent}${p.style(`${p.mark} ${label}`)}${stats ? `  ${p.quiet(stats)}` : ""}${folded ? `  ${p.quiet(folded)}` : ""}`;
  if (width === undefined || displayWidth(plain(p.label, p.stats, p.folded)) <= width)
    return styled(p.label, p.stats, p.folded);
  // Keep the numbers of the fold before the whole label; keep a few columns of label before the
  // subtree's numbers.
  if (displayWidth(plain(p.label, p.stats, p.foldedShort)) <= width)
    return styled(p.label, p.stats, p.foldedShort);
  const attempts: [string, string][] = [
    [p.stats, p.foldedShort],
    ["", p.foldedShort],
    ["", ""],
  ];
  for (const [stats, folded] of attempts) {
    const room = width - displayWidth(plain("", stats, folded));
    if (room >= Math.min(MIN_LABEL, displayWidth(p.label)))
      return styled(shortenMiddle(p.label, room), stats, folded);
  }
  return p.style(shortenEnd(plain(p.label, "", ""), width));
}

/** What a reference line says after its label: where the node's full entry is (graphs). */
export function referenceText(to: { path: string; cycle: boolean }): string {
  const where = to.path === "" ? "the root" : shownLabel(to.path);
  return to.cycle ? `cycle, full entry above at ${where}` : `full entry at ${where}`;
}

/** ", 2 references" after a fold's numbers, when references are folded there (graphs). */
export function referencesText(references: number | undefined): string {
  return references ? `, ${references} ${references === 1 ? "reference" : "references"}` : "";
}

/** "3 parents, 1 not shown" on a focus with several parents (graphs); "" otherwise. */
export function parentsText(parents: { count: number; hidden: number } | undefined): string {
  if (!parents || parents.count < 2) return "";
  return `${parents.count} parents${parents.hidden > 0 ? `, ${parents.hidden} not shown` : ""}`;
}

/** "12 nodes, 3.0 MiB": the count (when above one, or `always`) and the size (when the input has sizes). */
export function amount(nodes: number, size: number, options: TextOptions & { always?: boolean }): string {
  const parts: string[] = [];
  if (nodes > 1 || options.always) parts.push(`${nodes} ${nodes === 1 ? "node" : "nodes"}`);
  if (options.sizes) parts.push(formatSize(size, options.units));
  return parts.join(", ");
}
