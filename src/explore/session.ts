import type { HierarchyNode } from "d3-hierarchy";
import { diffOrder } from "../diff/diff-order.js";
import { DIFF_HEADER_LINES, type DiffResult, summarizeDiff } from "../diff/diff-trees.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import type { PreparedDiff } from "../diff/prepared-diff.js";
import { EspalierError } from "../errors.js";
import { budgetTooSmall, type Selection } from "../fit/select.js";
import type { Importance } from "../interest/importance.js";
import { type NodeOrder, nodeOrder } from "../interest/order.js";
import type { Measures } from "../model/measure.js";
import type { PathIndex } from "../model/path-index.js";
import { printedNames } from "../model/printed-names.js";
import type { Tree } from "../model/tree.js";
import type { NumberOptions } from "../render/amount.js";
import { diffLineParts } from "../render/diff-line-parts.js";
import type { Units } from "../render/format-size.js";
import { diffHeaderLines, fociOf, type InputFacts, summaryHeaderLines } from "../render/header.js";
import {
  KEY_MIN_BUDGET,
  KEY_MOST_ROWS,
  keyContext,
  keyExplainsSizes,
  keyFacts,
  keyLines,
  keyPartsSaid,
  keyRows,
  keyRowsNeeded,
  keySaysAll,
} from "../render/key-line.js";
import { type LineGroup, lineGroups } from "../render/line-groups.js";
import type { LineParts } from "../render/line-layout.js";
import { lineParts } from "../render/line-parts.js";
import type { Palette } from "../render/palette.js";
import { type ScreenLines, screenLines } from "../render/screen-lines.js";
import { type Prepared, type SummarizeOptions, type SummaryResult, summarize } from "../summarize.js";
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
  /**
   * Whether the key above the lines says every mark and cut on them (see `keySaysAll`): false where
   * the screen had room for none, or for only part of it (the status row then points to the help).
   */
  readonly keyWhole: boolean;
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
  /** Lines the fit of a budget's view takes at least (the header's first line). */
  readonly headerLines: number;
  /**
   * What the header, key and help call sizes where not "size": "value size" (a diff of documents read
   * as values), a `--size-field` name (see cli/output-settings.ts `sizeNameOf`).
   */
  readonly sizeName?: string;
  /** The view for these foci (sorted node indices) within `budget` lines of `width` columns. */
  fit(foci: Int32Array, budget: number, importance: Importance, width: number): Fitted;
  /** Live search over the printed names. */
  readonly search: NameSearch;
}

function sizeNameOf(look: LookOptions): { sizeName?: string } {
  const name = look.inputFacts?.sizeName;
  return name === undefined ? {} : { sizeName: name };
}

/** A session over one prepared tree. */
export function summarySession(prepared: Prepared, look: LookOptions): Session {
  const { tree, measures, index } = prepared;
  return {
    kind: "summary",
    ...sessionOf(tree, measures, index, look),
    landmarks: new Int32Array(0),
    headerLines: 1,
    ...sizeNameOf(look),
    fit: remember(
      smallestThatFits((foci, budget, importance, width) => {
        // The header and the key take the screen's first rows as `espalier` prints them; the key gives
        // way on a small screen, and a header wider than the screen wraps, the fit counting its rows.
        const numbers = { units: look.units, sizes: tree.hasSizes };
        const head = (result: SummaryResult, lines: number, brief?: Brief) =>
          summaryHeaderLines(
            result.view.data,
            { budget, lines, foci: fociOf(result.view), ...look.inputFacts, brief },
            numbers,
            width,
          );
        const { result, lineOf, lines, groups, whole } = keyAgreed(budget, width, (key, spare) => {
          const options = {
            ...fitOptions(index, look, foci, budget, importance),
            spareLines: spare ? key : 0,
          };
          let result = summarize(prepared, { ...options, headerLines: 1 + key });
          const rows = head(result, budget).length;
          if (rows > 1) result = summarize(prepared, { ...options, headerLines: rows + key });
          const header = head(result, result.selection.lines);
          const lineOf = lineGroups(result.view, look.chains);
          const keyed = result.selection.spared ? 0 : key;
          const lay = (header: readonly string[], keyed: number, fill?: boolean) =>
            screenOf("summary", lineOf, lineParts, header, keyed, {
              numbers,
              width,
              look,
              foci: fociOf(result.view),
              most: viewKeyMostRows(budget, width),
              fill,
            });
          const laid = lay(header, keyed);
          const brief = (b: Brief) => head(result, result.selection.lines, b);
          return { result, lineOf, ...headerForKey(laid, header, keyed, width, brief, lay) };
        });
        const order = nodeOrder(tree, measures, result.scores);
        const before = lines.length - lineOf.length;
        return fitted(lines, groups, result.selection, order, before, result.view, whole);
      }),
    ),
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
    ...sizeNameOf(look),
    fit: remember(
      smallestThatFits((foci, budget, importance, width) => {
        const numbers = { units: look.units, sizes: tree.hasSizes };
        const head = (result: DiffResult, lines: number, brief?: Brief) =>
          diffHeaderLines(
            result.totals,
            combined.by,
            { budget, lines, foci: result.fociPaths, ...look.inputFacts, brief },
            numbers,
            width,
          );
        const { result, lineOf, lines, groups, whole } = keyAgreed(budget, width, (key, spare) => {
          const options = {
            ...fitOptions(index, look, foci, budget, importance),
            spareLines: spare ? key : 0,
          };
          // The totals header wraps at the width as `espalier diff` prints it, and the fit counts its lines.
          let result = summarizeDiff(prepared, { ...options, headerLines: DIFF_HEADER_LINES + key });
          const rows = head(result, budget).length;
          if (rows > DIFF_HEADER_LINES)
            result = summarizeDiff(prepared, { ...options, headerLines: rows + key });
          const header = head(result, result.selection.lines);
          // The header, the key, then the diff's lines laid out as one screen, as `espalier diff` prints.
          const lineOf = lineGroups(result.view, look.chains);
          const keyed = result.selection.spared ? 0 : key;
          const lay = (header: readonly string[], keyed: number, fill?: boolean) =>
            screenOf("diff", lineOf, diffLineParts, header, keyed, {
              numbers,
              width,
              look,
              foci: result.fociPaths,
              most: viewKeyMostRows(budget, width),
              fill,
            });
          const laid = lay(header, keyed);
          const brief = (b: Brief) => head(result, result.selection.lines, b);
          return { result, lineOf, ...headerForKey(laid, header, keyed, width, brief, lay) };
        });
        const order = diffOrder(tree, measures, result.scores, changeMeasures);
        const before = lines.length - lineOf.length;
        return fitted(lines, groups, result.selection, order, before, result.view, whole);
      }),
    ),
  };
}

/** Rows the key takes on a screen of `budget` rows for the tree (see `keyRows`); none on a small one. */
function keyRowsOf(budget: number, width: number): number {
  return budget >= KEY_MIN_BUDGET ? keyRows(width) : 0;
}

/** Rounds of fitting again with the rows the key needs before keeping the last that fitted. */
const KEY_ROUNDS = 3;

/**
 * Most rows the view's key takes on a screen of `budget` rows for the tree at `width` (`espalier`
 * takes up to `KEY_MOST_ROWS`): `keyRows(width)`, and one more for every three rows of budget above
 * `KEY_MIN_BUDGET` (a screen three rows shorter has a key too), up to `KEY_MOST_ROWS`. A screen three
 * rows taller then never gives the key more than one of them (where the shorter had no key, no more
 * than before), so it hides no node the shorter showed (guarantee 2 of docs/selection.md, as the
 * view's tests check it). Past them the key says part, and the status row points to the help. One
 * more row only left a 32-column screen of 14 rows (a file listing's deep focus), whose
 * cut names, chains, `(k more)` and `(hidden)` take six rows to explain, pointing to the help.
 */
function viewKeyMostRows(budget: number, width: number): number {
  return Math.min(KEY_MOST_ROWS, keyRows(width) + Math.max(0, Math.floor((budget - KEY_MIN_BUDGET) / 3)));
}

/**
 * A screen whose key takes the rows it needs to say all it explains, as `espalier` fits it (see
 * `fitToBudget`): laid out by `lay` with `keyRowsOf(budget, width)` rows first (which the fit may
 * spare on a small screen), then again with the rows that screen's key needs (`needed`, see
 * `keyRowsNeeded`), as long as the root and the focus paths keep their place with them; else the
 * last screen that fitted (its key in part: `h` opens the help, which explains every mark).
 */
function keyAgreed<S extends { needed: number }>(
  budget: number,
  width: number,
  lay: (key: number, spare: boolean) => S,
): S {
  let screen = lay(keyRowsOf(budget, width), true);
  for (let round = 0; round < KEY_ROUNDS && screen.needed > 0; round++) {
    try {
      screen = lay(screen.needed, false);
    } catch (err) {
      if (tooSmall(err) === undefined) throw err;
      break;
    }
  }
  return screen;
}

/** The header's shorter forms in the view (see `HeaderOptions.brief`). */
type Brief = "lines" | "foci";

type Laid = { lines: string[]; groups: number[][]; needed: number; whole: boolean; said: number };

/**
 * The screen `laid` (its header `header`, its key `keyed` rows), or where its key says only part of
 * what the lines need (or had no room), the same lines under a shorter header whose rows go to the
 * key: without the lines used, then without the foci too (see `HeaderOptions.brief`), the first that
 * lets the key say all, else the one that lets it say most. The tree keeps its lines, so the view
 * nests as it did; the header and the key take no more rows than before (docs/cli.md, explore).
 */
function headerForKey(
  laid: Laid,
  header: readonly string[],
  keyed: number,
  width: number,
  brief: (b: Brief) => readonly string[],
  lay: (header: readonly string[], keyed: number, fill?: boolean) => Laid,
): Laid {
  if (laid.whole) return laid;
  let best = laid;
  for (const b of ["lines", "foci"] as const) {
    const shorter = brief(b);
    const rows = keyed + header.length - shorter.length;
    // A screen with no key takes one row if that is all the shorter header frees: its marks said.
    if (shorter.length >= header.length || rows < (keyed === 0 ? 1 : keyRows(width))) continue;
    const tried = sameRows(lay(shorter, rows, true), laid);
    if (tried.whole) return { ...tried, needed: laid.needed };
    if (tried.said > best.said) best = { ...tried, needed: laid.needed };
  }
  return best;
}

/**
 * `tried` with as many rows as `laid` (the same tree lines under another header and key): a key that
 * says all in fewer rows than the shorter header left it gets blank rows below it, so the screen keeps
 * the rows its fit counted (the tree's lines were chosen for them: a row left over would be a line of
 * the budget neither used nor said). The header's and the key's rows show no node.
 */
function sameRows(tried: Laid, laid: Laid): Laid {
  const missing = laid.lines.length - tried.lines.length;
  if (missing <= 0) return tried;
  const at = tried.lines.length - tried.groups.filter((nodes) => nodes.length > 0).length;
  const blank = Array.from({ length: missing }, () => "");
  return {
    ...tried,
    lines: [...tried.lines.slice(0, at), ...blank, ...tried.lines.slice(at)],
    groups: [...tried.groups.slice(0, at), ...blank.map(() => []), ...tried.groups.slice(at)],
  };
}

/**
 * A screen's rows as `espalier` prints them: the header, the key (`keyed` rows, 0 for none) saying
 * what the marks and numbers below mean, then the lines laid out together (see `screenLines`: a line
 * whose sizes do not fit says `size cut`, or the whole screen leaves sizes out), each row with the
 * nodes it shows.
 */
function screenOf<T extends ViewNode>(
  kind: "summary" | "diff",
  lineOf: LineGroup<T>[],
  parts: (group: LineGroup<T>, options: NumberOptions) => LineParts,
  header: readonly string[],
  keyed: number,
  {
    numbers,
    width,
    look,
    foci,
    most,
    fill,
  }: {
    numbers: NumberOptions;
    width: number;
    look: LookOptions;
    foci: readonly string[];
    most: number;
    /** `keyed` is the most rows the key may take: it takes the fewest of them that say the most. */
    fill?: boolean;
  },
): Laid {
  const context = keyContext({
    sizes: numbers.sizes,
    header: { budget: 0, lines: 0, foci, ...look.inputFacts },
  });
  const factsOf = (s: ScreenLines) => ({ ...keyFacts(s.parts, context, s), more: "h" });
  // A `size cut` the key has no room to explain leaves sizes off every line (see `screenLines`).
  const explained = keyed > 0 ? (s: ScreenLines) => keyExplainsSizes(kind, factsOf(s), width) : undefined;
  const screen = screenLines(lineOf, parts, { ...numbers, width, palette: look.palette }, explained);
  const quiet = look.palette?.quiet ?? ((t: string) => t);
  const facts = factsOf(screen);
  const rows = fill ? Math.min(keyed, keyRowsNeeded(kind, facts, width, keyed)) : keyed;
  const said = keyed > 0 ? keyLines(kind, facts, width, "text", rows) : [];
  // The key takes the rows the fit counted for it, blank below where it says all in fewer (the
  // tree's lines were chosen for the rows left; see `sameRows`, which pads a filled key so).
  const plain = fill
    ? said
    : [...said, ...Array.from({ length: Math.max(0, keyed - said.length) }, () => "")];
  const key = plain.map(quiet);
  const lines = [...header, ...key, ...screen.lines];
  const groups = [...[...header, ...key].map(() => []), ...lineOf.map((g) => g.nodes.map((n) => n.index))];
  // More rows than it has, where those say what these cannot (see `keyRowsNeeded`); 0 for none.
  const needed = keyed > 0 ? keyRowsNeeded(kind, facts, width, most) : 0;
  const whole = keyed > 0 && keySaysAll(kind, facts, plain);
  const partsSaid = keyed > 0 ? keyPartsSaid(kind, facts, plain) : 0;
  return { lines, groups, needed: needed > keyed ? needed : 0, whole, said: partsSaid };
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
  keyWhole: boolean,
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
    keyWhole,
  };
}

type FitFn = Session["fit"];

/** Budgets above a refused one tried for the one that fits (the header's rows and the key's vary with it). */
const SMALLEST_TRIES = 8;

/**
 * A fit whose refusal (BUDGET_TOO_SMALL) names the smallest budget that fits: the fit's own smallest
 * counts the rows the header and key take at the budget refused, and another budget may wrap the
 * header otherwise (it says `9 of 9 lines`) or hold the key, so the budgets from the refused one up
 * are tried (a 40-column screen of 7 rows was told `needs 10 rows` where 8 showed the view).
 */
function smallestThatFits(compute: FitFn): FitFn {
  return (foci, budget, importance, width) => {
    try {
      return compute(foci, budget, importance, width);
    } catch (err) {
      const smallest = tooSmall(err);
      if (smallest === undefined) throw err;
      for (let b = budget + 1; b < smallest + SMALLEST_TRIES; b++) {
        try {
          compute(foci, b, importance, width);
        } catch (again) {
          if (tooSmall(again) === undefined) throw again;
          continue;
        }
        if (b === smallest) throw err;
        const { before, focused } = (err as EspalierError).details;
        throw budgetTooSmall(budget, b, Number(before ?? 0), focused !== false);
      }
      throw err;
    }
  };
}

/** The smallest budget a BUDGET_TOO_SMALL error names, or undefined for any other error. */
function tooSmall(err: unknown): number | undefined {
  if (!(err instanceof EspalierError) || err.code !== "BUDGET_TOO_SMALL") return undefined;
  const smallest = err.details.smallest;
  return typeof smallest === "number" ? smallest : undefined;
}

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
