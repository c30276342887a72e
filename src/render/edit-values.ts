import { MAX_LABEL } from "../model/safe-text.js";
import { displayWidth, shortenAround } from "./display-width.js";

/** Code points kept before and after the part where two long values differ. */
const CONTEXT = 24;

/**
 * A compared field's old and new value as an edit shows them: when either is longer than a label is
 * shown (`MAX_LABEL`), the ends both share are left out (`[...]`) but for a few code points of context,
 * so that the part that changed shows. Cut in its middle as any long label is, a long value that
 * changed inside (an object compared by its text, a long description) printed the same on both sides
 * of the arrow. Values that fit are returned as they are.
 */
export function editValues(old: string, now: string, max = MAX_LABEL): [string, string] {
  if (old.length <= max && now.length <= max) return [old, now];
  const a = Array.from(old);
  const b = Array.from(now);
  if (a.length <= max && b.length <= max) return [old, now];
  let prefix = 0;
  const shorter = Math.min(a.length, b.length);
  while (prefix < shorter && a[prefix] === b[prefix]) prefix++;
  let suffix = 0;
  while (suffix < shorter - prefix && a[a.length - 1 - suffix] === b[b.length - 1 - suffix]) suffix++;
  const start = Math.max(0, prefix - CONTEXT);
  const tail = Math.max(0, suffix - CONTEXT);
  const shown = (points: string[]) =>
    `${start > 0 ? "[...]" : ""}${points.slice(start, points.length - tail).join("")}${tail > 0 ? "[...]" : ""}`;
  return [shown(a), shown(b)];
}

/**
 * A compared field's old and new value as shown (see `editValues`) each cut to at most `columns`
 * terminal columns (UAX #11 widths), each keeping where it differs from the other, with as much
 * text on either side of that as fits (see `shortenAround`), so `…worker-2:2.0.2` beside
 * `…worker-2:2.1.2`, never the same text on both sides of the arrow. A value that fits stays whole.
 * Cut texts that would still print alike (a value holding `…` itself) are cut less, up to whole.
 */
export function cutEditValues(old: string, now: string, columns: number): [string, string] {
  for (let room = columns; ; room++) {
    const pair = cutPair(old, now, room);
    if (old === now || pair[0] !== pair[1] || (pair[0] === old && pair[1] === now)) return pair;
  }
}

/**
 * Both values cut to `room` columns, each keeping the code units where it differs from the other and
 * the most context around them that fits, both sides in turn (see `shortenAround`).
 */
function cutPair(old: string, now: string, room: number): [string, string] {
  const [prefix, suffix] = common(old, now);
  // The changed code units [prefix, length - suffix); where one value only lost or gained text, the
  // code unit before the change (or after it, at the start) marks where.
  const cut = (text: string) => {
    if (text.length === 0) return text;
    const first = Math.min(prefix, text.length - 1);
    const last = Math.max(first, Math.min(text.length - suffix - 1, text.length - 1));
    return shortenAround(text, room, first, last);
  };
  return [cut(old), cut(now)];
}

/**
 * Columns of text a cut value keeps on each side of where it changed (where it has them): enough to
 * read the change in its place (`…dger:1.4`, `…: tier back} `). A choice of this project, no source.
 */
export const VALUE_CONTEXT = 6;

/** Most columns of a changed part a value's floor (see `editFloors`) asks for: a longer one shows its ends. */
const CHANGE_MOST = 8;

/**
 * The fewest columns each of an edit's values (as `cutEditValues` takes them) may be cut to and stay
 * readable: where it changed (up to {@link CHANGE_MOST} columns of it) and {@link VALUE_CONTEXT}
 * columns on each side, an ellipsis for each side cut; all of a value narrower than that.
 */
export function editFloors(old: string, now: string): [number, number] {
  const [prefix, suffix] = common(old, now);
  const floor = (text: string) => {
    const end = Math.max(prefix, text.length - suffix);
    const side = (part: string) => {
      const w = displayWidth(part);
      return w <= VALUE_CONTEXT ? w : VALUE_CONTEXT + 1;
    };
    const changed = Math.min(displayWidth(text.slice(prefix, end)), CHANGE_MOST);
    return Math.min(displayWidth(text), side(text.slice(0, prefix)) + changed + side(text.slice(end)));
  };
  return [floor(old), floor(now)];
}

/** Code units the two texts share at their start, and at their end after that, whole characters. */
function common(old: string, now: string): [number, number] {
  const shorter = Math.min(old.length, now.length);
  let prefix = 0;
  while (prefix < shorter && old[prefix] === now[prefix]) prefix++;
  let suffix = 0;
  while (suffix < shorter - prefix && old[old.length - 1 - suffix] === now[now.length - 1 - suffix]) suffix++;
  // Not inside a character of two code units (`📦` and `🚚` share their first).
  if (prefix > 0 && isHighSurrogate(old.charCodeAt(prefix - 1))) prefix--;
  if (suffix > 0 && isLowSurrogate(old.charCodeAt(old.length - suffix))) suffix--;
  return [prefix, suffix];
}

function isHighSurrogate(unit: number): boolean {
  return unit >= 0xd800 && unit <= 0xdbff;
}

function isLowSurrogate(unit: number): boolean {
  return unit >= 0xdc00 && unit <= 0xdfff;
}
