import { formatPlain, formatSize, type Units } from "./format-size.js";

/** How a line's numbers are written. */
export interface NumberOptions {
  units: Units;
  /** Whether sizes are printed (the input had sizes). */
  sizes: boolean;
  /** Add each node's share, in percent, of the whole tree or of the node on the line above. */
  share?: "total" | "parent";
  /** Write counts and plain sizes of 10,000 and more with an SI prefix (`12.1k`), for narrow lines. */
  compact?: boolean;
  /**
   * With `compact`, counts stay exact (`12,121 nodes`): a tree line's count is read in its sums
   * (`nodes = 1 + the lines below + hidden`), which `12.1k` would not let a reader check.
   */
  countsExact?: boolean;
}

// SI prefixes for powers of 1000 (BIPM, The International System of Units, 9th edition, table 7).
const SI = ["", "k", "M", "G", "T", "P", "E"];

/**
 * A count or a plain number in the one style of every count and plain size: `12,121`; with `compact`,
 * from 10,000 up, three significant digits and an SI prefix: `12.1k`, `286M`.
 */
export function formatCount(n: number, compact = false): string {
  if (!compact || !(Math.abs(n) >= 10000)) return formatPlain(n);
  let x = Math.abs(n);
  let k = 0;
  while (x >= 999.5 && k < SI.length - 1) {
    x /= 1000;
    k++;
  }
  const digits = x >= 99.95 ? 0 : x >= 9.995 ? 1 : 2;
  return `${n < 0 ? "-" : ""}${x.toFixed(digits)}${SI[k]}`;
}

/** "12,121 nodes, 3.0 MiB": the count (when above one, or `always`) and the size (when the input has sizes). */
export function amount(nodes: number, size: number, options: NumberOptions & { always?: boolean }): string {
  const parts: string[] = [];
  if (nodes > 1 || options.always)
    parts.push(
      `${formatCount(nodes, options.compact && !options.countsExact)} ${nodes === 1 ? "node" : "nodes"}`,
    );
  if (options.sizes)
    parts.push(
      options.compact && options.units === "plain"
        ? formatCount(size, true)
        : formatSize(size, options.units),
    );
  return parts.join(", ");
}

/** `12.5%` with one decimal; `<0.1%` for a share too small to show, never a misleading `0.0%`. */
export function percent(part: number, whole: number): string {
  if (!(whole > 0)) return "";
  const p = (100 * part) / whole;
  if (p > 0 && p < 0.05) return "<0.1%";
  return `${p.toFixed(1).replace(/\.0$/, "")}%`;
}
