/** How sizes are printed: binary multiples of bytes, or the plain number. */
export const unitChoices = ["bytes", "plain"] as const;
export type Units = (typeof unitChoices)[number];

// IEC 80000-13 binary prefixes: Ki = 2^10, Mi = 2^20, Gi = 2^30, Ti = 2^40, Pi = 2^50, Ei = 2^60.
const PREFIXES = ["", "Ki", "Mi", "Gi", "Ti", "Pi", "Ei"];

/**
 * "512 B", "4.0 KiB", "18.1 MiB" (one decimal past 1 KiB, or `decimals`: 0 gives "18 MiB" for a
 * narrow place), or "1,234,567" for plain numbers.
 */
export function formatSize(value: number, units: Units, decimals = 1): string {
  if (units === "plain") return formatPlain(value);
  const sign = value < 0 ? "-" : "";
  let x = Math.abs(value);
  if (x < 1024) return `${sign}${Number.isInteger(x) ? x : x.toFixed(1)} B`;
  let k = 0;
  while (k < PREFIXES.length - 1 && x >= 1024) {
    x /= 1024;
    k++;
  }
  let shown = x.toFixed(decimals);
  if (Number(shown) >= 1024 && k < PREFIXES.length - 1) {
    shown = (1).toFixed(decimals);
    k++;
  }
  return `${sign}${shown} ${PREFIXES[k]}B`;
}

/** Thousands grouped with "," and at most two decimals (common practice, no source). */
export function formatPlain(value: number): string {
  const sign = value < 0 ? "-" : "";
  const x = Math.abs(value);
  const fixed = Number.isInteger(x) ? String(x) : x.toFixed(2).replace(/\.?0+$/, "");
  if (/e/i.test(fixed)) return sign + fixed;
  const [whole, frac] = fixed.split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return sign + grouped + (frac ? `.${frac}` : "");
}
