/** File formats a fact table is read from (by the embedded engine). */
export const factFormats = ["csv", "tsv", "jsonl", "parquet"] as const;
export type FactFormat = (typeof factFormats)[number];

/**
 * How a table of facts becomes a hierarchy. Either `levels` names the level columns, outermost first,
 * or `keyField` names one column whose values are split on `separator` (an object key, a path).
 */
export interface FactOptions {
  /** Level columns, outermost first; empty when the hierarchy comes from a key column. */
  levels: readonly string[];
  /** Column split on `separator`; used when `levels` is empty. */
  keyField: string | undefined;
  /** What a key is split on; default "/". */
  separator: string;
  /** Numeric column summed into each node's size; a table without it has no sizes. */
  sizeField: string;
  /** The size field was named on purpose (even as the default "size"): a table without it is FIELD_MISSING. */
  sizeFieldNamed?: boolean;
  /** Deepest key level to roll up to; found by a query over the table when undefined. */
  keyDepth?: number;
  /** Name of the table in the printed SQL; default "facts". */
  table: string;
}

/** Result-table columns of the rollup query (see docs/scale.md); a level column is `level_1`, `level_2`, … */
export const ROLLUP_COLUMNS = {
  depth: "prefix_depth",
  level: "level_",
  rows: "row_count",
  size: "size_sum",
  sizeMin: "size_min",
  nodes: "node_count",
  children: "child_count",
} as const;

/** The fact format a file name implies, or undefined. */
export function factFormatOf(file: string | undefined): FactFormat | undefined {
  const name = (file ?? "").toLowerCase();
  if (name.endsWith(".parquet") || name.endsWith(".pq")) return "parquet";
  if (name.endsWith(".jsonl") || name.endsWith(".ndjson")) return "jsonl";
  if (name.endsWith(".tsv") || name.endsWith(".tab")) return "tsv";
  if (name.endsWith(".csv")) return "csv";
  return undefined;
}
