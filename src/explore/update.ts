import { EspalierError } from "../errors.js";
import type { Importance } from "../interest/importance.js";
import { MIN_WIDTH } from "../render/line-layout.js";
import { actionOf } from "./key-map.js";
import type { Key } from "./keys.js";
import { compilePattern, type Pattern } from "./search.js";
import type { Fitted, Session } from "./session.js";
import { type ExploreState, type ExtraFocus, type Mode, UNDO_DEPTH, type ViewSpec } from "./state.js";

/** Nodes a counting slice looks at: one `work` event's share (see needsWork). */
export const COUNT_SLICE = 8192;

/** Columns left of every tree line for the cursor mark. */
export const GUTTER = 2;
/** Narrowest terminal a view is drawn in: the gutter and the narrowest lines the renderers lay out. */
export const MIN_COLUMNS = GUTTER + MIN_WIDTH;
/** Rows under the tree: the status bar. */
export const STATUS_ROWS = 1;

/**
 * Something that happened at the terminal: a key, a new size, a finished write, or a moment of quiet
 * to go on counting a search's matches (and look again where pseudonyms were hashed meanwhile).
 */
export type ExploreEvent =
  | Key
  | { readonly kind: "resize"; readonly rows: number; readonly cols: number }
  | { readonly kind: "written"; readonly file: string; readonly foci: number }
  | { readonly kind: "write-failed"; readonly file: string; readonly reason: string }
  | { readonly kind: "work" };

export interface StartOptions {
  rows: number;
  cols: number;
  /** The foci the command line gave, resolved (sorted node indices). */
  foci: Int32Array;
  importance: Importance;
  /** The file `w` offers to write. */
  fociFile: string;
}

/** The first state: the cursor on the first given focus (every given focus pinned), else on the root. */
export function startState(session: Session, start: StartOptions): ExploreState {
  const given = [...start.foci].filter((i) => i !== 0);
  const spec: ViewSpec = {
    cursor: given[0] ?? 0,
    extra: given.map((node) => ({ node, how: "pinned" as const })),
    importance: start.importance,
  };
  return {
    rows: start.rows,
    cols: start.cols,
    spec,
    undo: [],
    mode: { kind: "browse" },
    found:
      session.landmarks.length > 0 ? { kind: "list", label: "changes", matches: session.landmarks } : null,
    message: null,
    request: null,
    fociFile: start.fociFile,
  };
}

/** The foci of a spec, as the fit takes them: the cursor (unless on the root) and the extra foci. */
export function specFoci(spec: ViewSpec): Int32Array {
  const all = new Set<number>(spec.extra.map((e) => e.node));
  if (spec.cursor !== 0) all.add(spec.cursor);
  return Int32Array.from(all).sort();
}

/** The view a spec gives on a screen of this size, or the reason it cannot be shown. */
export function fitOf(session: Session, spec: ViewSpec, rows: number, cols: number): Fitted | EspalierError {
  const budget = rows - STATUS_ROWS;
  // Narrower than the lines' floor the key and the lines would be cut short of what they explain:
  // the screen says how wide it must be instead (docs/cli.md, explore).
  if (cols < MIN_COLUMNS)
    return new EspalierError("BUDGET_TOO_SMALL", "the terminal is too narrow", undefined, {
      columns: MIN_COLUMNS,
    });
  if (budget < 1 + session.headerLines)
    return new EspalierError("BUDGET_TOO_SMALL", "the terminal is too small");
  try {
    return session.fit(specFoci(spec), budget, spec.importance, cols - GUTTER);
  } catch (err) {
    if (err instanceof EspalierError && err.code === "BUDGET_TOO_SMALL") return err;
    throw err;
  }
}

/**
 * The next state. Pure: the same session, state and event give the same state. A move whose focus
 * paths would not fit on the screen is refused with a message, so every state shown is a valid fit.
 */
export function update(session: Session, state: ExploreState, event: ExploreEvent): ExploreState {
  const s: ExploreState = { ...state, message: null, request: null };
  if ("kind" in event) {
    if (event.kind === "resize") return { ...s, rows: event.rows, cols: event.cols };
    if (event.kind === "written")
      return { ...s, message: `wrote ${event.foci} ${event.foci === 1 ? "focus" : "foci"} to ${event.file}` };
    if (event.kind === "write-failed")
      return { ...s, message: `could not write ${event.file}: ${event.reason}` };
    return work(session, s);
  }
  const mode = s.mode;
  if (mode.kind === "help") return helpKey(s, mode.scroll, event);
  if (mode.kind === "search") return searchKey(session, s, mode, event);
  if (mode.kind === "write") return writeKey(s, mode.file, event);
  return browseKey(session, s, event);
}

function browseKey(session: Session, s: ExploreState, key: Key): ExploreState {
  const action = actionOf(key);
  if (action === null) return { ...s, message: "h shows the keys" };
  const { spec } = s;
  const { tree, measures } = session;
  const here = spec.cursor;
  const go = (cursor: number) => move(session, s, { ...spec, cursor });
  switch (action) {
    case "next":
    case "previous": {
      const shown = shownOf(session, s);
      if (shown === null) return s;
      const at = indexIn(shown, here);
      const to = action === "next" ? at + 1 : at - 1;
      if (to < 0 || to >= shown.length)
        return { ...s, message: action === "next" ? "the last shown node" : "the root" };
      return go(shown[to]);
    }
    case "parent":
      return here === 0 ? { ...s, message: "the root" } : go(tree.parent[here]);
    case "child": {
      if (measures.count[here] === 1) return { ...s, message: "a leaf" };
      const f = fitOrNull(session, s);
      if (f === null) return s;
      const at = indexIn(f.shown, here);
      const next = f.shown[at + 1];
      if (next !== undefined && next < here + measures.count[here]) return go(next);
      return go(bestChildren(session, f, here, 1)[0]);
    }
    case "root":
      return here === 0 ? s : go(0);
    case "last": {
      const shown = shownOf(session, s);
      return shown === null ? s : go(shown[shown.length - 1]);
    }
    case "open":
      return open(session, s);
    case "pin":
      if (here === 0) return { ...s, message: "the root is always shown" };
      if (spec.extra.some((e) => e.node === here)) return { ...s, message: "already an extra focus" };
      return move(
        session,
        s,
        { ...spec, extra: [...spec.extra, { node: here, how: "pinned" }] },
        "pinned: stays a focus when you move on",
      );
    case "unpin": {
      const mine = spec.extra.findIndex((e) => e.node === here);
      if (mine < 0 && spec.extra.length === 0) return { ...s, message: "no extra foci" };
      const drop = mine >= 0 ? mine : spec.extra.length - 1;
      return move(
        session,
        s,
        { ...spec, extra: spec.extra.filter((_, k) => k !== drop) },
        mine >= 0
          ? "unpinned: leaves the foci when you move on"
          : `dropped ${session.pathOf(spec.extra[drop].node)}`,
      );
    }
    case "clear":
      return spec.extra.length === 0
        ? { ...s, message: "no extra foci" }
        : move(session, s, { ...spec, extra: [] });
    case "next-extra":
    case "previous-extra": {
      const nodes = Int32Array.from(new Set(spec.extra.map((e) => e.node))).sort();
      if (nodes.length === 0) return { ...s, message: "no extra foci" };
      return go(around(nodes, here, action === "next-extra" ? 1 : -1));
    }
    case "search":
      return {
        ...s,
        mode: {
          kind: "search",
          query: "",
          before: spec,
          pattern: null,
          invalid: false,
          matched: false,
          count: 0,
          countedTo: 0,
        },
      };
    case "next-match":
    case "previous-match": {
      const found = s.found;
      if (found === null) return { ...s, message: "no search yet: / searches" };
      const dir = action === "next-match" ? 1 : -1;
      if (found.kind === "list") {
        if (found.matches.length === 0) return { ...s, message: `no ${found.label}` };
        return go(around(found.matches, here, dir));
      }
      const to = nextMatch(session, found.pattern, here, dir);
      return to < 0 ? { ...s, message: `no match for ${found.pattern.query}` } : go(to);
    }
    case "importance":
      return move(session, s, { ...spec, importance: spec.importance === "depth" ? "size" : "depth" });
    case "undo": {
      if (s.undo.length === 0) return { ...s, message: "nothing to undo" };
      return { ...s, spec: s.undo[s.undo.length - 1], undo: s.undo.slice(0, -1) };
    }
    case "help":
      return { ...s, mode: { kind: "help", scroll: 0 } };
    case "write":
      return { ...s, mode: { kind: "write", file: s.fociFile } };
    case "print":
      return { ...s, request: { kind: "print" } };
    case "quit":
      return { ...s, request: { kind: "quit" } };
    case "interrupt":
      return { ...s, request: { kind: "interrupt" } };
    case "redraw":
      return s;
  }
}

/** Takes `next` when its view fits the screen, remembering the current spec for undo. */
function move(
  session: Session,
  s: ExploreState,
  next: ViewSpec,
  message: string | null = null,
): ExploreState {
  const fitted = fitOf(session, next, s.rows, s.cols);
  if (fitted instanceof EspalierError) return { ...s, message: tooSmall(fitted) };
  const undo = [...s.undo, s.spec];
  return { ...s, spec: next, undo: undo.length > UNDO_DEPTH ? undo.slice(1) : undo, message };
}

function tooSmall(err: EspalierError): string {
  const need = rowsNeeded(err);
  if (typeof err.details.columns === "number") return `no room: that needs ${err.details.columns} columns`;
  return need !== undefined ? `no room: that needs ${need} rows` : "no room on this screen";
}

/** The rows a screen needs for a view the fit refused (BUDGET_TOO_SMALL's smallest budget and the status row). */
export function rowsNeeded(err: EspalierError): number | undefined {
  const smallest = err.details.smallest;
  return typeof smallest === "number" ? smallest + STATUS_ROWS : undefined;
}

/** Opens the fold on the cursor's line: its best hidden children (in the fit's order) join the foci. */
function open(session: Session, s: ExploreState): ExploreState {
  const f = fitOrNull(session, s);
  if (f === null) return s;
  const here = s.spec.cursor;
  const room = Math.max(1, Math.floor((s.rows - STATUS_ROWS) / 4));
  const best = bestChildren(session, f, here, room);
  if (best.length === 0) return { ...s, message: "nothing folded here" };
  // As many as fit: halve until the new focus paths leave room on the screen.
  for (let k = best.length; k >= 1; k = k === 1 ? 0 : Math.ceil(k / 2)) {
    const extra: ExtraFocus[] = [
      ...s.spec.extra,
      ...best.slice(0, k).map((node) => ({ node, how: "opened" as const })),
    ];
    const next = move(session, s, { ...s.spec, extra }, `opened ${k} of ${hiddenChildren(session, f, here)}`);
    if (next.spec !== s.spec) return next;
  }
  return { ...s, message: "no room to open this fold" };
}

/** Up to `k` hidden children of `p`, best first in the fit's order. */
function bestChildren(session: Session, f: Fitted, p: number, k: number): number[] {
  const { count } = session.measures;
  const best: number[] = [];
  for (let c = p + 1, end = p + count[p]; c < end; c += count[c]) {
    if (f.isShown[c]) continue;
    if (best.length < k) {
      best.push(c);
      best.sort(f.order);
    } else if (f.order(c, best[k - 1]) < 0) {
      best[k - 1] = c;
      best.sort(f.order);
    }
  }
  return best;
}

function hiddenChildren(session: Session, f: Fitted, p: number): number {
  const { count } = session.measures;
  let n = 0;
  for (let c = p + 1, end = p + count[p]; c < end; c += count[c]) if (!f.isShown[c]) n++;
  return n;
}

function searchKey(
  session: Session,
  s: ExploreState,
  mode: Extract<Mode, { kind: "search" }>,
  key: Key,
): ExploreState {
  if ("char" in key) return follow(session, s, mode.query + key.char, mode.before);
  switch (key.name) {
    case "backspace":
      if (mode.query === "") return { ...s, mode: { kind: "browse" }, spec: mode.before };
      return follow(session, s, Array.from(mode.query).slice(0, -1).join(""), mode.before);
    case "escape":
    case "ctrl-c":
      return { ...s, mode: { kind: "browse" }, spec: mode.before };
    case "enter": {
      const kept: ExploreState = {
        ...s,
        mode: { kind: "browse" },
        found: mode.pattern === null ? s.found : { kind: "query", pattern: mode.pattern },
      };
      if (s.spec === mode.before) return kept;
      const undo = [...s.undo, mode.before];
      return { ...kept, undo: undo.length > UNDO_DEPTH ? undo.slice(1) : undo };
    }
    default:
      return s;
  }
}

/**
 * The search's state for `query`: the view follows the first match at or after the node where the
 * search began (wrapping), and the first slice of matches is counted.
 */
function follow(session: Session, s: ExploreState, query: string, before: ViewSpec): ExploreState {
  let pattern: Pattern | null = null;
  let invalid = false;
  try {
    pattern = compilePattern(query);
  } catch (err) {
    if (!(err instanceof EspalierError)) throw err;
    invalid = true;
  }
  const mode = {
    kind: "search",
    query,
    before,
    pattern,
    invalid,
    matched: false,
    count: 0,
    countedTo: 1,
  } as const;
  return countSlice(session, look(session, { ...s, spec: before, mode }));
}

/** Moves the view to the first match at or after where the search began, when there is one. */
function look(session: Session, s: ExploreState): ExploreState {
  const mode = s.mode;
  if (mode.kind !== "search" || mode.pattern === null) return s;
  const { before } = mode;
  let target = session.search.next(mode.pattern, before.cursor - 1, 1);
  if (target < 0) target = session.search.next(mode.pattern, 0, 1, before.cursor);
  if (target < 0) return s;
  const next: ViewSpec = { ...before, cursor: target };
  const fitted = fitOf(session, next, s.rows, s.cols);
  if (fitted instanceof EspalierError)
    return { ...s, mode: { ...mode, matched: true }, message: tooSmall(fitted) };
  return { ...s, spec: next, mode: { ...mode, matched: true } };
}

/** Counts the matches of the next slice of nodes. */
function countSlice(session: Session, s: ExploreState): ExploreState {
  const mode = s.mode;
  if (mode.kind !== "search" || mode.pattern === null) return s;
  const to = Math.min(mode.countedTo + COUNT_SLICE, session.search.searchable);
  if (to <= mode.countedTo) return s;
  const count = mode.count + session.search.countIn(mode.pattern, mode.countedTo, to);
  return { ...s, mode: { ...mode, count, countedTo: to } };
}

/** Whether a search still has matches to count or names to wait for: the edge then sends `work`. */
export function needsWork(session: Session, s: ExploreState): boolean {
  const mode = s.mode;
  return (
    mode.kind === "search" &&
    mode.pattern !== null &&
    (mode.countedTo < session.tree.length || session.search.searchable < session.tree.length)
  );
}

/** A quiet moment: count on, and look for a first match among names hashed since. */
function work(session: Session, s: ExploreState): ExploreState {
  const mode = s.mode;
  if (mode.kind !== "search") return s;
  return countSlice(session, mode.matched ? s : look(session, s));
}

/** The next match after (dir 1) or before (dir -1) node `x`, wrapping; -1 when nothing matches. */
function nextMatch(session: Session, pattern: Pattern, x: number, dir: 1 | -1): number {
  const { search } = session;
  const found = search.next(pattern, x, dir);
  if (found >= 0) return found;
  return dir === 1 ? search.next(pattern, 0, 1, x + 1) : search.next(pattern, search.searchable, -1, x - 1);
}

function writeKey(s: ExploreState, file: string, key: Key): ExploreState {
  if ("char" in key) return { ...s, mode: { kind: "write", file: file + key.char } };
  switch (key.name) {
    case "backspace":
      return { ...s, mode: { kind: "write", file: Array.from(file).slice(0, -1).join("") } };
    case "escape":
    case "ctrl-c":
      return { ...s, mode: { kind: "browse" } };
    case "enter":
      if (file === "") return { ...s, message: "type a file name" };
      return { ...s, mode: { kind: "browse" }, fociFile: file, request: { kind: "write", file } };
    default:
      return s;
  }
}

function helpKey(s: ExploreState, scroll: number, key: Key): ExploreState {
  if ("name" in key && (key.name === "down" || key.name === "page-down"))
    return { ...s, mode: { kind: "help", scroll: scroll + (key.name === "down" ? 1 : s.rows - 2) } };
  if ("name" in key && (key.name === "up" || key.name === "page-up"))
    return {
      ...s,
      mode: { kind: "help", scroll: Math.max(0, scroll - (key.name === "up" ? 1 : s.rows - 2)) },
    };
  return { ...s, mode: { kind: "browse" } };
}

function fitOrNull(session: Session, s: ExploreState): Fitted | null {
  const f = fitOf(session, s.spec, s.rows, s.cols);
  return f instanceof EspalierError ? null : f;
}

function shownOf(session: Session, s: ExploreState): Int32Array | null {
  return fitOrNull(session, s)?.shown ?? null;
}

/** Position of `x` in the sorted `list` (which holds it). */
function indexIn(list: Int32Array, x: number): number {
  let lo = 0;
  let hi = list.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (list[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The next (dir 1) or previous (dir -1) element of the sorted `list` around `x`, wrapping. */
function around(list: Int32Array, x: number, dir: 1 | -1): number {
  const at = indexIn(list, x);
  if (dir === 1) return list[at] > x ? list[at] : list[(at + 1) % list.length];
  return list[at] < x ? list[at] : list[(at - 1 + list.length) % list.length];
}
