import { EspalierError } from "../errors.js";
import { budgetTooSmall, type Selection } from "../fit/select.js";
import type { KeyLeftOut } from "../render/header.js";

/** What a command fits under a line budget, and how its lines before the tree are counted. */
export interface BudgetFit<R extends { selection: Selection }> {
  /**
   * The fit at `budget` with `before` lines before the tree, of which the key's `spare` may be left
   * out rather than refuse the budget (throws BUDGET_TOO_SMALL).
   */
  fit(budget: number, before: number, spare: number): R;
  /** Rows the header takes for `result` at `budget` (0 with --bare), saying `keyLeftOut` when given. */
  headerRows(result: R, budget: number, keyLeftOut: KeyLeftOut | undefined): number;
  /** Lines before the tree besides the header and the key (the legend's). */
  fixed: number;
  /** Whether a header is printed (not with --bare): it takes a row at least. */
  header: boolean;
  /** Rows the key takes at `budget`: 0 where it is not printed at that budget (see `showsKey`). */
  keyRows(budget: number): number;
  /** Rows the key above `result`'s lines needs to say all it explains (see `keyRowsNeeded`). */
  keyRowsOf(result: R, budget: number): number;
  /** Whether the key above `result`'s lines, in part in `rows` rows, says every mark and where the rest is. */
  keyInPartSays(result: R, budget: number, rows: number): boolean;
  /** Whether a key is asked for (not --no-key, --bare or --legend), though a budget may have no room. */
  keyWanted: boolean;
  /** Whether fits at budgets above the asked one are valid (a fact table's tree holds only the asked one's nodes). */
  canGrow: boolean;
}

/** A fit, the rows its key takes, and whether the key was left out of it (the header then says so). */
export interface Fitted<R> {
  result: R;
  /** Rows the fit counted for the key: 0 when it was left out. */
  keyRows: number;
  keyLeftOut: KeyLeftOut | undefined;
  /** Whether the key was printed in part (see `inPart`). */
  keyInPart?: boolean;
}

/** Budgets above the asked one tried for the smallest that works, or the smallest that holds the key. */
const TRIES = 24;

/** Rounds of fitting again with the header's rows counted before giving up on them agreeing. */
const ROUNDS = 8;

/**
 * The fit at `budget` whose header takes the rows it counted: the header's rows depend on the fit (it
 * says `12 of 40 lines`, and whether the key was left out), so it is fitted again with them counted
 * until the two agree. When the budget holds the root and the focus paths but not the key (or not the
 * rows it needs to say all it explains), the key is left out and the header says so, with the smallest
 * budget that holds it (see `KeyLeftOut`); when it holds not even those words, or not the root and
 * the focus paths, BUDGET_TOO_SMALL names the smallest budget that works, found by fitting.
 */
export function fitToBudget<R extends { selection: Selection }>(f: BudgetFit<R>, budget: number): Fitted<R> {
  // The smallest budget that holds the key, by budget: asked once for each budget tried.
  const holds = new Map<number, number | undefined>();
  const attempt = (b: number, spare: boolean) =>
    fitAt(f, b, spare, (at) => {
      if (!holds.has(at)) holds.set(at, holdsKey(f, at, attempt));
      return holds.get(at);
    });
  try {
    return attempt(budget, true);
  } catch (err) {
    const smallest = smallestOf(err);
    if (smallest === undefined || !f.canGrow) throw err;
    // The refused fit's smallest counts the key and the header's first guess: the key may be left out
    // and the header wrap otherwise at another budget, so the budgets from below it up are tried.
    const from = Math.max(budget + 1, smallest - f.keyRows(smallest) - 1);
    for (let b = from; b < from + TRIES; b++) {
      let fit: Fitted<R>;
      try {
        fit = attempt(b, true);
      } catch (again) {
        if (smallestOf(again) === undefined) throw again;
        continue;
      }
      const { before, focused, keySaid } = (err as EspalierError).details;
      let lines = Number(before ?? 0);
      let said = keySaid === true;
      // Counted at the budget asked, the lines before the tree may hold a key that the smallest
      // budget leaves out, its header saying so: more than that budget holds with the root (`cannot
      // hold the 10 lines before the tree and the root; the smallest budget that works is 10`). The
      // smallest budget's own lines before its tree then, which the reader can count on its screen.
      if (lines + 1 + (said ? 1 : 0) > b) {
        lines = f.fixed + f.headerRows(fit.result, b, fit.keyLeftOut) + fit.keyRows;
        said = false;
      }
      throw budgetTooSmall(budget, b, lines, focused !== false, said);
    }
    throw err;
  }
}

/**
 * The fit at `budget` with the header's rows agreed (see `fitToBudget`); the key may give way when
 * `spare`, and the header then says so, naming `holds(budget)`, the smallest budget that prints it
 * whole. The key gives way too where the rows that say all it explains would cost the root and the
 * focus paths their place (a part of it would leave marks unexplained). A budget with no room for
 * those words either is refused (BUDGET_TOO_SMALL), as one too small for the root and the focus paths.
 */
function fitAt<R extends { selection: Selection }>(
  f: BudgetFit<R>,
  budget: number,
  spare: boolean,
  holds: (budget: number) => number | undefined,
): Fitted<R> {
  const key = f.keyRows(budget);
  const plain = agreed(f, budget, key, spare, undefined, f.header ? 1 : 0);
  const printed = key > 0 && !plain.result.selection.spared;
  // A fact table's fits cannot grow to find a budget with room for the whole key: its part stays.
  const keyed = printed && (!plain.partial || !f.canGrow);
  if (!f.keyWanted || keyed)
    return { result: plain.result, keyRows: keyed ? plain.key : 0, keyLeftOut: undefined };
  const refused = () => {
    const { forcedCount } = plain.result.selection;
    return budgetTooSmall(budget, budget + 1, f.fixed + plain.rows, forcedCount > 1, true);
  };
  // Asked whether this budget prints the whole key: it does not.
  if (!spare) throw refused();
  // The rows that say all would cost the root and the focus paths their place: the key takes every
  // row they leave, saying the marks and what it can (and where the rest is, see `keyLines`). A budget
  // one larger gives it one more, never taking a line from the tree, so the screens nest.
  const part = printed ? inPart(f, budget, plain) : null;
  if (part !== null) return part;
  // Said in fewer words where the longer ones would take a line the budget has not got; the tree then
  // takes the key's rows.
  const said = holds(budget);
  for (const keyLeftOut of [{ budget: said }, { budget: said, short: true }]) {
    try {
      return { result: agreed(f, budget, 0, spare, keyLeftOut, plain.rows).result, keyRows: 0, keyLeftOut };
    } catch (err) {
      if (smallestOf(err) === undefined) throw err;
    }
  }
  // Neither the key nor a word that it was left out has room: a screen whose marks nothing explains
  // is refused, as a budget too small for the root and the focus paths is (a fact table's fits cannot
  // grow to find the smallest budget that says it: its screen stays as it was).
  if (!f.canGrow) return { result: plain.result, keyRows: 0, keyLeftOut: undefined };
  throw refused();
}

/**
 * The key in part (see `fitAt`): the most rows below those that say all (`plain.wanted`), down to its
 * fewest, with which the root and the focus paths keep their place and the key says every mark and
 * where the rest is (`rest: --legend`); null where none does (the key is then left out, and the
 * header says so).
 */
function inPart<R extends { selection: Selection }>(
  f: BudgetFit<R>,
  budget: number,
  plain: { result: R; rows: number; key: number; wanted?: number },
): Fitted<R> | null {
  for (let k = (plain.wanted ?? plain.key) - 1; k >= plain.key; k--) {
    try {
      const { result } = headerAgreed(f, budget, k, false, undefined, plain.rows);
      if (!result.selection.spared && f.keyInPartSays(result, budget, k))
        return { result, keyRows: k, keyLeftOut: undefined, keyInPart: true };
    } catch (err) {
      if (smallestOf(err) === undefined) throw err;
    }
  }
  return null;
}

/**
 * The fit whose header (saying `keyLeftOut` when given) and key take the rows it counted. The key
 * takes the fewest rows, from `key` up, that say all it explains on the screen fitted with them (see
 * `keyRowsNeeded`; more rows for the key, fewer lines for the tree, so the screen changes with them),
 * unless more than `key` would cost the key its place: then `key`, and `partial` (the key says only
 * part of what the screen needs).
 */
function agreed<R extends { selection: Selection }>(
  f: BudgetFit<R>,
  budget: number,
  key: number,
  spare: boolean,
  keyLeftOut: KeyLeftOut | undefined,
  rows: number,
): { result: R; rows: number; key: number; partial?: boolean; wanted?: number } {
  // The rows that say all (`wanted`) cost the key its place: the fewest, which say only part of it.
  const fewest = (wanted: number) => ({
    ...headerAgreed(f, budget, key, spare, keyLeftOut, rows),
    key,
    partial: true,
    wanted,
  });
  // The header's rows do not depend on the key's, so each try starts from the last one's.
  let counted = rows;
  for (let keyed = key; ; ) {
    let fitted: { result: R; rows: number };
    try {
      fitted = headerAgreed(f, budget, keyed, spare, keyLeftOut, counted);
    } catch (err) {
      if (keyed === key || smallestOf(err) === undefined) throw err;
      return fewest(keyed);
    }
    if (keyed > key && fitted.result.selection.spared) return fewest(keyed);
    if (!f.keyWanted || keyed === 0 || fitted.result.selection.spared) return { ...fitted, key: keyed };
    const needed = f.keyRowsOf(fitted.result, budget);
    if (needed <= keyed) return { ...fitted, key: keyed };
    // One row more, not straight to the rows this screen needs: the screen with one row fewer for
    // the tree may need fewer (its lines are the budget below's), and the fewest rows that say all
    // of their own screen keep the budgets nested (a diff at 32 columns, --budget 21, jumped from 3
    // rows to 4 and showed a node fewer than --budget 20, whose screen 3 rows said all of).
    [keyed, counted] = [keyed + 1, fitted.rows];
  }
}

/**
 * The fit whose header (saying `keyLeftOut` when given) takes no more rows than it counted, from
 * `rows` up, with `key` rows for the key: more rows leave the key out sooner and never take the
 * header's words away, so they agree within a few rounds.
 */
function headerAgreed<R extends { selection: Selection }>(
  f: BudgetFit<R>,
  budget: number,
  key: number,
  spare: boolean,
  keyLeftOut: KeyLeftOut | undefined,
  rows: number,
): { result: R; rows: number } {
  let counted = rows;
  for (let round = 0; ; round++) {
    const result = f.fit(budget, f.fixed + counted + key, spare ? key : 0);
    const actual = f.headerRows(result, budget, keyLeftOut);
    if (actual <= counted || round === ROUNDS) return { result, rows: counted };
    counted = actual;
  }
}

/**
 * The smallest budget above `budget` whose fit prints the key whole, if one within reach does: one
 * whose rows say all it explains, or whose key in part (see `inPart`) says all on the screen its rows
 * leave (fewer lines for the tree, fewer cuts to explain).
 */
function holdsKey<R extends { selection: Selection }>(
  f: BudgetFit<R>,
  budget: number,
  attempt: (budget: number, spare: boolean) => Fitted<R>,
): number | undefined {
  if (!f.canGrow || !f.keyWanted) return undefined;
  for (let b = budget + 1; b <= budget + TRIES; b++) {
    if (f.keyRows(b) === 0) continue;
    try {
      attempt(b, false);
      return b;
    } catch (err) {
      if (smallestOf(err) === undefined) throw err;
    }
    try {
      const { result, keyRows } = attempt(b, true);
      if (keyRows > 0 && f.keyRowsOf(result, b) <= keyRows) return b;
    } catch (err) {
      if (smallestOf(err) === undefined) throw err;
    }
  }
  return undefined;
}

/** The smallest budget a BUDGET_TOO_SMALL error names, or undefined for any other error. */
function smallestOf(err: unknown): number | undefined {
  if (!(err instanceof EspalierError) || err.code !== "BUDGET_TOO_SMALL") return undefined;
  const smallest = err.details.smallest;
  return typeof smallest === "number" ? smallest : undefined;
}
