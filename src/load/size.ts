// A plain decimal number: digits with an optional fraction and exponent, no sign, no hex, no "Infinity".
const decimal = /^\+?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The size written in a text cell or column: "" is 0, a decimal number is its value, anything else
 * (negative, hex, "12 KB", "NaN") is NaN so the caller can report BAD_SIZE where it knows the position.
 */
export function parseSize(text: string): number {
  const s = text.trim();
  if (s === "") return 0;
  if (!decimal.test(s)) return Number.NaN;
  const value = Number(s);
  return value < Number.POSITIVE_INFINITY ? value : Number.NaN;
}
