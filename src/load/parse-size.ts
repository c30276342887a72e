import { isSize } from "../model/size-rule.js";

// A plain decimal number: digits with an optional fraction and exponent and a sign; no hex or "Infinity".
const decimal = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The size written in a text cell or column: "" is 0, a decimal number is its value ("-0" is 0, as a
 * JSON or YAML -0 is), anything else (negative, hex, "12 KB", "NaN", past 2^53 - 1) is NaN so the caller can report BAD_SIZE where it knows the position.
 */
export function parseSize(text: string): number {
  // Fast path: up to 15 plain digits, exact in a double.
  const n = text.length;
  if (n > 0 && n <= 15) {
    let value = 0;
    let k = 0;
    for (; k < n; k++) {
      const d = text.charCodeAt(k) - 48;
      if (d < 0 || d > 9) break;
      value = value * 10 + d;
    }
    if (k === n) return value;
  }
  const s = text.trim();
  if (s === "") return 0;
  if (!decimal.test(s)) return Number.NaN;
  const value = Number(s);
  if (s.charCodeAt(0) === 45 /* - */) return value === 0 ? 0 : Number.NaN;
  return isSize(value) ? value : Number.NaN;
}
