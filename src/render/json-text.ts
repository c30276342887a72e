import { EspalierError } from "../errors.js";

// What JSON.stringify leaves raw that a terminal or a log viewer may act on: DEL and the C1 controls
// (U+009B is a one-character CSI), the line and paragraph separators, and the bidirectional controls
// (Unicode UAX #9; the "Trojan Source" attack is CVE-2021-42574). JSON text holds them only inside
// strings, where a \u escape stands for the same character (RFC 8259, section 7).
const RAW = /[\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

/**
 * `value` as JSON text (RFC 8259), two-space indented, ending in a newline: JSON.stringify's text with
 * the characters above written as \u escapes, so it parses to the same value and prints no control or
 * reordering character. A value nested too deeply for the engine's stack, or too long for one string,
 * is LIMIT_EXCEEDED rather than a crash; `what` names it in the message.
 */
export function jsonText(value: unknown, what: string): string {
  try {
    return `${JSON.stringify(value, null, 2).replace(RAW, unicodeEscape)}\n`;
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    throw new EspalierError(
      "LIMIT_EXCEEDED",
      `the ${what} is too deeply nested or too long to write as JSON (${error.message}); ` +
        "lower --budget, choose a shallower focus, or use the text format",
    );
  }
}

function unicodeEscape(ch: string): string {
  return `\\u${ch.charCodeAt(0).toString(16).padStart(4, "0")}`;
}
