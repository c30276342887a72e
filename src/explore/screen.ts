import { EspalierError } from "../errors.js";
import { safeText } from "../model/safe-text.js";
import { displayWidth, shortenEnd, shortenMiddle } from "../render/display-width.js";
import { legendLines } from "../render/marks.js";
import { helpEntries } from "./key-map.js";
import type { Session } from "./session.js";
import type { ExploreState } from "./state.js";
import { INVERSE, INVERSE_OFF } from "./terminal.js";
import { fitOf, GUTTER, rowsNeeded, specFoci } from "./update.js";

/** A screenful: exactly `rows` rows, none wider than `cols` columns, and where the cursor's row is. */
export interface Screen {
  readonly rows: readonly string[];
  /** Row of the cursor's node (0-based), or null when no tree is shown (help, a screen too small). */
  readonly cursorRow: number | null;
}

/** The mark in the gutter of the cursor's row: it carries the cursor without colour. */
export const CURSOR_MARK = "@";

/**
 * Draws a state: the fitted view with a gutter (the cursor's row marked `@`) above one status row, or
 * the help. With `colour`, the cursor's row and the status row are also in negative image (SGR 7).
 */
export function draw(session: Session, state: ExploreState, colour: boolean): Screen {
  const { rows, cols } = state;
  if (state.mode.kind === "help")
    return {
      rows: helpRows(state.mode.scroll, rows, cols, colour, session.kind, session.sizeName),
      cursorRow: null,
    };
  const fitted = fitOf(session, state.spec, rows, cols);
  const out: string[] = [];
  let cursorRow: number | null = null;
  if (fitted instanceof EspalierError) {
    out.push(tooSmallRow(fitted, cols));
  } else {
    const here = state.spec.cursor;
    fitted.lines.forEach((line, r) => {
      const mine = fitted.groups[r].includes(here);
      if (mine) cursorRow = r;
      const gutter = (mine ? CURSOR_MARK : " ").padEnd(GUTTER, " ");
      if (mine && colour) {
        const pad = " ".repeat(Math.max(0, cols - GUTTER - displayWidth(stripSgr(line))));
        out.push(`${INVERSE}${gutter}${line}${pad}${INVERSE_OFF}`);
      } else out.push(`${gutter}${line}`);
    });
  }
  while (out.length < rows - 1) out.push("");
  out.length = Math.max(0, rows - 1);
  const keyWhole = !(fitted instanceof EspalierError) && fitted.keyWhole;
  out.push(statusRow(session, state, cols, colour, keyWhole));
  return { rows: out, cursorRow };
}

/**
 * Why no view is drawn, in the most words that fit `cols` (a reason cut short says nothing): `too
 * small for this view: it needs 32 columns`, then `needs 32 columns` (cut only below 16 columns).
 */
function tooSmallRow(err: EspalierError, cols: number): string {
  const reason = tooSmallReason(err);
  const tries = [`too small for this view: ${reason}`, reason.replace(/^it /, "")];
  return tries.find((t) => displayWidth(t) <= cols) ?? shortenEnd(tries[tries.length - 1], cols);
}

function tooSmallReason(err: EspalierError): string {
  if (typeof err.details.columns === "number") return `it needs ${err.details.columns} columns`;
  const need = rowsNeeded(err);
  return need !== undefined ? `it needs ${need} rows` : "enlarge the window";
}

/**
 * The bottom row: where the cursor is and how the view is set, or the search or file being typed.
 * Where the key above the lines says only part of what their marks mean, or had no room, it points
 * to the help for them too (`h: keys, marks`).
 */
function statusRow(
  session: Session,
  state: ExploreState,
  cols: number,
  colour: boolean,
  keyWhole: boolean,
): string {
  const mode = state.mode;
  let left: string;
  let right: string;
  if (mode.kind === "search") {
    left = `/${safeText(mode.query)}`;
    const n = session.tree.length;
    const hashing = session.search.searchable < n;
    const counted = mode.countedTo >= n && !hashing;
    right = mode.invalid
      ? "~ must be followed by 0 or 1"
      : mode.pattern === null
        ? "type a name or pattern"
        : counted
          ? mode.count === 0
            ? "no match"
            : `${mode.count.toLocaleString("en")} ${mode.count === 1 ? "match" : "matches"}`
          : mode.matched
            ? `${mode.count.toLocaleString("en")}+ matches, counting`
            : "searching";
    if (hashing) right += ` (names hashed: ${Math.floor(session.search.progress * 100)}%)`;
  } else if (mode.kind === "write") {
    left = `write foci to: ${safeText(mode.file)}`;
    right = "Enter writes, Esc cancels";
  } else {
    const path = session.pathOf(state.spec.cursor);
    left = path === "" ? "/" : safeText(path);
    const foci = specFoci(state.spec).length;
    const parts = [`${foci} ${foci === 1 ? "focus" : "foci"}`, state.spec.importance];
    const help = keyWhole ? "h: keys" : "h: keys, marks";
    // The pointer to the help stays whole longest: the view's settings go first on a narrow screen.
    const said = [parts, parts.slice(1), []].map((p) => [...p, help].join(" · "));
    right = state.message ?? said.find((t) => displayWidth(t) <= cols - STATUS_LEFT) ?? help;
  }
  if (state.message !== null && mode.kind !== "browse") right = state.message;
  const row = joinEnds(left, right, cols);
  return colour ? `${INVERSE}${row}${" ".repeat(Math.max(0, cols - displayWidth(row)))}${INVERSE_OFF}` : row;
}

/** Columns the status row keeps for its left end (the cursor's path) before the right is cut. */
const STATUS_LEFT = 6;

/** `left` and `right` on one row of `cols` columns; `left` gives way first (cut in the middle). */
function joinEnds(left: string, right: string, cols: number): string {
  const r = shortenEnd(right, Math.max(0, cols - STATUS_LEFT));
  const room = cols - displayWidth(r) - 2;
  if (room < 4) return shortenEnd(`${left}  ${right}`, cols);
  const l = shortenMiddle(left, room);
  return `${l}${" ".repeat(cols - displayWidth(l) - displayWidth(r))}${r}`;
}

/**
 * The help: every key and what it does, then what the marks and numbers on the lines mean (the
 * printed legend of a summary or a diff), wrapped to the width, scrolled by `scroll` rows.
 */
function helpRows(
  scroll: number,
  rows: number,
  cols: number,
  colour: boolean,
  kind: "summary" | "diff",
  sizeName?: string,
): string[] {
  const entries = helpEntries();
  const keyWidth = Math.min(18, Math.max(...entries.map((e) => e.keys.length)) + 2);
  const body: string[] = ["espalier explore: keys", ""];
  const narrow = cols < keyWidth + 20;
  for (const { keys, does } of entries) {
    if (narrow) {
      body.push(shortenEnd(keys, cols));
      for (const line of wrap(does, cols - 2)) body.push(`  ${line}`);
    } else {
      const lines = wrap(does, cols - keyWidth);
      for (const [k, line] of lines.entries())
        body.push(`${(k === 0 ? keys : "").padEnd(keyWidth, " ")}${line}`);
    }
  }
  body.push("", "the lines", ...legendLines(kind, cols, sizeName));
  const height = rows - 1;
  const top = Math.max(0, Math.min(scroll, body.length - height));
  const shown = body.slice(top, top + height).map((row) => shortenEnd(row, cols));
  while (shown.length < height) shown.push("");
  const more = top + height < body.length ? "Down: more" : "";
  const status = joinEnds("any other key closes the help", more, cols);
  shown.push(
    colour
      ? `${INVERSE}${status}${" ".repeat(Math.max(0, cols - displayWidth(status)))}${INVERSE_OFF}`
      : status,
  );
  return shown.slice(0, Math.max(0, rows));
}

/** Words wrapped to `width` columns (a word longer than that is cut). */
function wrap(text: string, width: number): string[] {
  const out: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    const next = line === "" ? word : `${line} ${word}`;
    if (displayWidth(next) <= width) line = next;
    else {
      if (line !== "") out.push(line);
      line = displayWidth(word) <= width ? word : shortenEnd(word, width);
    }
  }
  if (line !== "") out.push(line);
  return out;
}

// SGR sequences only (what the palette writes), to measure a styled line.
const SGR = /\u001b\[[0-9;]*m/g;

function stripSgr(text: string): string {
  return text.replace(SGR, "");
}
