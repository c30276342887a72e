import { EspalierError } from "../errors.js";

// What JSON.stringify leaves raw that a terminal or a log viewer may act on or not show: DEL and the C1
// controls (U+009B is a one-character CSI), the line and paragraph separators, every format character
// (General_Category Cf, the bidirectional controls of Unicode UAX #9 among them; the "Trojan Source"
// attack is CVE-2021-42574) and every other Default_Ignorable_Code_Point (Unicode
// DerivedCoreProperties.txt), which print as nothing. JSON text holds them only inside strings, where a
// \u escape (a surrogate pair's two, past U+FFFF) stands for the same character (RFC 8259, section 7).
const RAW = /[\u007f-\u009f\u2028\u2029\p{Cf}\p{Default_Ignorable_Code_Point}]/gu;
// The bracket of a CI runner's command marker ("##[", "##vso["; see model/safe-text.ts) inside a string.
const CI_MARKER = /##(vso)?\[/gi;

/**
 * `value` as JSON text (RFC 8259), two-space indented, ending in a newline: JSON.stringify's text with
 * the characters above written as \u escapes, so it parses to the same value and prints no control or
 * reordering character. A value nested too deeply for the engine's stack, or too long for one string,
 * is LIMIT_EXCEEDED rather than a crash; `what` names it in the message.
 */
export function jsonText(value: unknown, what: string): string {
  try {
    const text = JSON.stringify(value, null, 2);
    return `${text.replace(RAW, unicodeEscape).replace(CI_MARKER, (m) => `${m.slice(0, -1)}\\u005b`)}\n`;
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
  let out = "";
  for (let k = 0; k < ch.length; k++) out += `\\u${ch.charCodeAt(k).toString(16).padStart(4, "0")}`;
  return out;
}
