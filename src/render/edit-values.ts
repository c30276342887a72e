import { MAX_LABEL } from "../model/safe-text.js";

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
