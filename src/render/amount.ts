import { formatSize, type Units } from "./format-size.js";

/** How a line's numbers are written. */
export interface NumberOptions {
  units: Units;
  /** Whether sizes are printed (the input had sizes). */
  sizes: boolean;
}

/** "12 nodes, 3.0 MiB": the count (when above one, or `always`) and the size (when the input has sizes). */
export function amount(nodes: number, size: number, options: NumberOptions & { always?: boolean }): string {
  const parts: string[] = [];
  if (nodes > 1 || options.always) parts.push(`${nodes} ${nodes === 1 ? "node" : "nodes"}`);
  if (options.sizes) parts.push(formatSize(size, options.units));
  return parts.join(", ");
}
