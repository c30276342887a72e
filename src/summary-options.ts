import type { FocusSpec, UnmatchedFoci } from "./focus/focus-spec.js";
import type { Importance } from "./interest/importance.js";
import type { SiblingOrder } from "./view/sibling-order.js";

/**
 * What one summary of a prepared tree asks for: `summarize` (a tree) and `summarizeDiff` (two
 * versions' combined tree) take the same options; where their defaults differ, it says so below.
 */
export interface SummaryOptions {
  /**
   * Focus specs: paths, ids or globs, and literal lines of a focus list (see focus/focus-spec.ts);
   * for a diff, resolved in the combined tree.
   */
  foci: readonly FocusSpec[];
  /** A focus that matches no node: an error (default), or left out and listed in `unmatchedFoci`. */
  unmatchedFoci?: UnmatchedFoci;
  /** Line budget for the text rendering, the header lines included. */
  budget: number;
  importance: Importance;
  /** Label template, e.g. "{title}, {team}"; default "{name}". */
  label?: string;
  /** Replace every printed name by a keyed pseudonym (see model/pseudonym.ts). */
  pseudonymKey?: string;
  /**
   * Lines the output spends before the tree: default 0 for a summary, `DIFF_HEADER_LINES` (the
   * totals line) for a diff.
   */
  headerLines?: number;
  /** How many of `headerLines` the output can do without when the budget is too small (see `SelectOptions.spareLines`). */
  spareLines?: number;
  /**
   * Print a run of only children as one line (see fit/select.ts lineCost; in a diff a change, like a
   * focus, keeps its only child on a line of its own); default false.
   */
  chains?: boolean;
  /** Order of shown siblings in the view; default input order (a diff: the combined tree's order). */
  siblingOrder?: SiblingOrder;
}
