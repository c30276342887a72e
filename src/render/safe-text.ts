// C0 and C1 controls, DEL, line and paragraph separators, the Unicode bidirectional controls (Unicode
// UAX #9; the "Trojan Source" attack is CVE-2021-42574), and lone surrogates (with the u flag a range
// of surrogates matches only unpaired ones; UTF-8 output cannot carry them, so they would print as
// U+FFFD and two different names would look the same).
const UNSAFE =
  /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069\ud800-\udfff]/gu;

/** Longest label shown, in code points; longer ones keep both ends around a marker. */
export const MAX_LABEL = 240;

/**
 * Makes input text safe to print: every control, separator or bidi control becomes a visible `\u{..}`
 * escape, so a name can never start a new line or emit a terminal control sequence; very long names
 * are cut in the middle.
 */
export function safeText(text: string, max = MAX_LABEL): string {
  // Only the two ends of a very long text can show: escape those, not the whole of it, so that the
  // deep paths of a long chain cost their ends each (the cut points lie far outside what is kept).
  if (text.length > 4 * max) {
    const keep = Math.floor((max - 5) / 2);
    const head = Array.from(escapeUnsafe(text.slice(0, 2 * max))).slice(0, keep);
    const tail = Array.from(escapeUnsafe(text.slice(-2 * max))).slice(-keep);
    return `${head.join("")}[...]${tail.join("")}`;
  }
  let out = escapeUnsafe(text);
  if (out.length > max) {
    const points = Array.from(out);
    if (points.length > max) {
      const keep = Math.floor((max - 5) / 2);
      out = `${points.slice(0, keep).join("")}[...]${points.slice(points.length - keep).join("")}`;
    }
  }
  return out;
}

function escapeUnsafe(text: string): string {
  return text.replace(UNSAFE, (ch) => `\\u{${ch.codePointAt(0)!.toString(16)}}`);
}

/** A label as printed: made safe, and `""` for an empty name so the line still shows something. */
export function shownLabel(label: string): string {
  return label === "" ? '""' : safeText(label);
}
