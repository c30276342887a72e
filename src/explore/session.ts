import type { HierarchyNode } from "d3-hierarchy";
import { diffOrder } from "../diff/diff-order.js";
import { DIFF_HEADER_LINES, type DiffResult, summarizeDiff } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import type { PreparedDiff } from "../diff/prepared-diff.js";
import type { Selection } from "../fit/select.js";
import type { Importance } from "../interest/importance.js";
import { type NodeOrder, nodeOrder } from "../interest/order.js";
import type { Measures } from "../model/measure.js";
import type { PathIndex } from "../model/path-index.js";
import { printedNames } from "../model/printed-names.js";
import type { Tree } from "../model/tree.js";
import { diffLineParts } from "../render/diff-line-parts.js";
import type { Units } from "../render/format-size.js";
import { diffHeaderLines, type InputFacts } from "../render/header.js";
import { lineGroups } from "../render/line-groups.js";
import { layoutLine } from "../render/line-layout.js";
import { lineParts } from "../render/line-parts.js";
import type { Palette } from "../render/palette.js";
import { type Prepared, type SummarizeOptions, summarize } from "../summarize.js";
import type { ViewNode } from "../view/view-node.js";
import { NameSearch } from "./search.js";

/** How the lines of a view are printed: the options the command line's text output takes too. */
export interface LookOptions {
  units: Units;
  label?: string;
  /** Print a run of only children as one line (the fit counts lines so too). */
  chains: boolean;
  pseudonymKey?: string;
  /** Styles of marks and numbers (colour decided at the edge); none by default. */
  palette?: Palette;
  /** A diff: what its header says of the inputs, as `espalier diff` says it (see `inputFacts`). */
  inputFacts?: InputFacts;
}

/** One fitted view: its printed lines and what each line shows. */
export interface Fitted {
  /** The rendered lines, each within the width asked for. */
  readonly lines: readonly string[];
  /** Per line, the nodes it shows (top first); empty for a line that names no node (a diff's totals). */
  readonly groups: readonly (readonly number[])[];
  /** Shown nodes in pre-order. */
  readonly shown: Int32Array;
  /** 1 where a node is shown. */
  readonly isShown: Uint8Array;
  /** The one total order the fit took a prefix of. */
  readonly order: NodeOrder;
  readonly selection: Selection;
  /** Lines the view spends before the tree (a diff's totals line). */
  readonly headerLines: number;
  /** The view itself, for checks. */
  readonly view: HierarchyNode<ViewNode> | HierarchyNode<DiffViewNode>;
}

/**
 * One loaded input (or a prepared diff of two) and how its lines look: everything a screen needs that
 * no move changes. `fit` maps foci to a view through the library's own summary (or diff summary), so a
 * screen is exactly what `espalier` prints for the same foci, budget and importance.
 */
export interface Session {
  readonly kind: "summary" | "diff";
  readonly tree: Tree;
  readonly measures: Measures;
  readonly index: PathIndex;
  /** Node `i`'s printed path (pseudonymous with a key): what the command line accepts back. */
  pathOf(i: number): string;
  /** Node `i`'s printed name (pseudonymous with a key). */
  nameOf(i: number): string;
  /** Nodes that n and N visit before any search: a diff's changed nodes, in pre-order. */
  readonly landmarks: Int32Array;
  /** Lines the fit of a budget's view takes at least (the diff's totals line). */
  readonly headerLines: number;
  /** The view for these foci (sorted node indices) within `budget` lines of `width` columns. */
  fit(foci: Int32Array, budget: number, importance: Importance, width: number): Fitted;
  /** Live search over the printed names. */
  readonly search: NameSearch;
}

/** A session over one prepared tree. */
export function summarySession(prepared: Prepared, look: LookOptions): Session {
  const { tree, measures, index } = prepared;
  return {
    kind: "summary",
    ...sessionOf(tree, measures, index, look),
    landmarks: new Int32Array(0),
    headerLines: 0,
    fit: remember((foci, budget, importance, width) => {
      const result = summarize(prepared, fitOptions(index, look, foci, budget, importance));
      // The lines `espalier` prints, through the shared line layout (render/line-layout.ts).
      const numbers = { units: look.units, sizes: tree.hasSizes };
      const lineOf = lineGroups(result.view, look.chains);
      const groups = lineOf.map((g) => g.nodes.map((n) => n.index));
      const lines = lineOf.map((g) => layoutLine(lineParts(g, numbers), { width, palette: look.palette }));
      return fitted(
        lines,
        groups,
        result.selection,
        nodeOrder(tree, measures, result.scores),
        0,
        result.view,
      );
    }),
  };
}

/** A session over a prepared diff: the combined tree, whose changed nodes score as foci. */
export function diffSession(prepared: PreparedDiff, look: LookOptions): Session {
  const { combined, measures, index, changeMeasures } = prepared;
  const { tree } = combined;
  const changed: number[] = [];
  for (let i = 0; i < tree.length; i++) if (combined.kind[i] !== 0) changed.push(i);
  return {
    kind: "diff",
    ...sessionOf(tree, measures, index, look),
    landmarks: Int32Array.from(changed),
    headerLines: DIFF_HEADER_LINES,
    fit: remember((foci, budget, importance, width) => {
      const options = fitOptions(index, look, foci, budget, importance);
      const numbers = { units: look.units, sizes: tree.hasSizes };
      const head = (result: DiffResult, lines: number) =>
        diffHeaderLines(
          result.totals,
          combined.by,
          { budget, lines, foci: result.fociPaths, ...look.inputFacts },
          numbers,
          width,
        );
      // The totals header wraps at the width as `espalier diff` prints it, and the fit counts its lines.
      let result = summarizeDiff(prepared, { ...options, headerLines: DIFF_HEADER_LINES });
      const rows = head(result, budget).length;
      if (rows > DIFF_HEADER_LINES) result = summarizeDiff(prepared, { ...options, headerLines: rows });
      const header = head(result, result.selection.lines);
      // The header, then the diff's lines through the shared line layout, as `espalier diff` prints.
      const lineOf = lineGroups(result.view, look.chains);
      const lines = [
        ...header,
        ...lineOf.map((g) => layoutLine(diffLineParts(g, numbers), { width, palette: look.palette })),
      ];
      const groups = [...header.map(() => []), ...lineOf.map((g) => g.nodes.map((n) => n.index))];
      const order = diffOrder(tree, measures, result.scores, changeMeasures);
      return fitted(lines, groups, result.selection, order, header.length, result.view);
    }),
  };
}

/** What a session of either kind holds of its tree: the tree, how its nodes print, and the live search. */
function sessionOf(tree: Tree, measures: Measures, index: PathIndex, look: LookOptions) {
  const { nameOf, pathOf } = printedNames(tree, index, look.pseudonymKey);
  return { tree, measures, index, nameOf, pathOf, search: new NameSearch(tree, measures, look.pseudonymKey) };
}

/** The library's options for one fit: the foci as paths, and how the look prints lines. */
function fitOptions(
  index: PathIndex,
  look: LookOptions,
  foci: Int32Array,
  budget: number,
  importance: Importance,
): SummarizeOptions {
  return {
    foci: [...foci].map((i) => index.path(i)),
    budget,
    importance,
    label: look.label,
    pseudonymKey: look.pseudonymKey,
    chains: look.chains,
  };
}

function fitted(
  lines: string[],
  groups: number[][],
  selection: Selection,
  order: NodeOrder,
  headerLines: number,
  view: Fitted["view"],
): Fitted {
  const shown = Int32Array.from(selection.admitted).sort();
  return {
    lines,
    groups,
    shown,
    // A flag per node of the tree, made when a key first needs it (see Selection.shown).
    get isShown() {
      return selection.shown;
    },
    order,
    selection,
    headerLines,
    view,
  };
}

type FitFn = Session["fit"];

/**
 * The last few fits, by their arguments: a screen is drawn after every key, and a move is first tried
 * (does the new focus path fit?) before it is taken, so the same fit is asked for several times.
 */
function remember(compute: FitFn): FitFn {
  const recent: { key: string; value: Fitted }[] = [];
  return (foci, budget, importance, width) => {
    const key = `${foci.join(",")}|${budget}|${importance}|${width}`;
    const hit = recent.find((r) => r.key === key);
    if (hit) return hit.value;
    const value = compute(foci, budget, importance, width);
    recent.unshift({ key, value });
    if (recent.length > 4) recent.pop();
    return value;
  };
}
