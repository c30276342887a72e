import type { HierarchyNode } from "d3-hierarchy";
import type { DiffViewNode } from "../diff/diff-view.js";
import type { DiffTotals } from "../diff/prepared-diff.js";
import type { NumberOptions } from "./amount.js";
import { diffLineParts } from "./diff-line-parts.js";
import { diffHeaderLines, type HeaderOptions } from "./header.js";
import { lineGroups } from "./line-groups.js";
import type { Palette } from "./palette.js";
import { screenLines } from "./screen-lines.js";
import {
  checkWidth,
  headLines,
  keyCheck,
  keyRiding,
  screenKeyInPart,
  screenKeyRows,
} from "./summary-text.js";

export interface DiffTextOptions extends NumberOptions {
  /** How nodes were matched, named on the header. */
  by: "id" | "path";
  palette?: Palette;
  /** Join an only child that is neither a focus nor a change onto its parent's line (as the fit did). */
  chains?: boolean;
  /** Widest line allowed, in terminal columns (UAX #11 widths), at least MIN_WIDTH; unlimited when undefined. */
  width?: number;
  /** The first line: how nodes were matched, counts per kind, totals, foci, budget used; none when undefined. */
  header?: HeaderOptions;
  /** Lines explaining the marks, numbers and change tags after the header. */
  legend?: boolean;
  /** One line after the header saying what the marks on screen and the numbers mean (see `keyLine`); not with a legend. */
  key?: boolean;
  /** Lines the key takes (see `keyRowsNeeded`, counted by the fit); `keyRows(width)` when undefined. */
  keyRows?: number;
  /** The fit printed the key in part (see `KeyFacts.inPart`). */
  keyInPart?: boolean;
}

/** Lines the key above a diff's text lines takes at the options' width (see `screenKeyRows`). */
export function diffKeyRows(
  view: HierarchyNode<DiffViewNode>,
  options: DiffTextOptions,
  most?: number,
): number {
  return screenKeyRows("diff", view, diffLineParts, options, most);
}

/** Whether a diff's key printed in part in `rows` rows says enough (see `screenKeyInPart`). */
export function diffKeyInPart(
  view: HierarchyNode<DiffViewNode>,
  options: DiffTextOptions,
  rows: number,
): boolean {
  return screenKeyInPart("diff", view, diffLineParts, options, rows);
}

/**
 * The summary's layout (see `renderText`) after a header. A changed node carries a tag in square
 * brackets right before its name: `[added]`, `[removed]`, `[moved from OLD/PARENT]`,
 * `[renamed from OLD]`, `[resized]`, with its own size change signed (`[resized +12 B]`), each kind
 * in its own colour. A fold says what changed inside it
 * (`(hidden: 3 children, 41 nodes, 2.0 MiB; 2 added, net +1.0 KiB)`) or that nothing did
 * (`…; none changed)`).
 */
export function renderDiffText(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffTextOptions,
): string {
  checkWidth(options.width);
  const said = keyRiding(options);
  const screen = screenLines(
    lineGroups(view, options.chains ?? false),
    diffLineParts,
    said,
    keyCheck(said, "diff"),
  );
  const lines = headLines(
    said,
    (w) => diffHeaderLines(totals, said.by, said.header!, said, w),
    "diff",
    screen,
  );
  lines.push(...screen.lines);
  return `${lines.join("\n")}\n`;
}
