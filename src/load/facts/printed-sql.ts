import type { FactOptions } from "./fact-options.js";
import { reachSql, statsSql } from "./pushdown-sql.js";
import { identifier, rollupSql } from "./rollup-sql.js";

/** Names of the rollup and of its node statistics, as tables in the engine and as CTEs in print. */
export const ROLLUP_TABLE = "espalier_rollup";
export const STATS_TABLE = "espalier_stats";

/**
 * The query `--print-sql` prints: the rollup; with `near`, the pushdown query, which returns only the
 * nodes within `near.reach` levels of the focus paths, with subtree node and child counts, so the result
 * stays small however many rows the table has. One statement, ending in a semicolon.
 */
export function printedSql(
  facts: FactOptions,
  depth: number,
  near?: { foci: readonly (readonly string[])[]; reach: number },
): string {
  const rollup = rollupSql(facts, depth, true);
  if (near === undefined) return `${rollup};\n`;
  const indent = (text: string) => text.replace(/^/gm, "  ");
  return (
    `WITH ${identifier(ROLLUP_TABLE)} AS (\n${indent(rollup)}\n),\n` +
    `${identifier(STATS_TABLE)} AS (\n${indent(statsSql(ROLLUP_TABLE, depth))}\n)\n` +
    `${reachSql(STATS_TABLE, depth, near.foci, near.reach)};\n`
  );
}
