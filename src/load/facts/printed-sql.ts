import type { FactOptions } from "./fact-options.js";
import { KEY_TABLES, KeyLevels } from "./key-levels-sql.js";
import { reachSql, statsSql } from "./pushdown-sql.js";
import { identifier, rollupSql } from "./rollup-sql.js";

/** Names of the rollup and of its node statistics, as tables in the engine and as CTEs in print. */
export const ROLLUP_TABLE = "espalier_rollup";
export const STATS_TABLE = "espalier_stats";

/**
 * The query `--print-sql` prints: the plan the embedded engine runs, as one statement. Level columns:
 * the rollup; with `near`, the pushdown query over it, which returns only the nodes within
 * `near.reach` levels of the focus paths, with subtree node and child counts, so the result stays
 * small however many rows the table has. A key hierarchy (`depth` its deepest level): the rows grouped
 * by key, then the nodes level by level from the deepest up (KeyLevels.steps, the tables the engine
 * makes, here common table expressions), then the result table (KeyLevels.resultSql, with `near` only
 * the rows near the focus paths). One statement, ending in a semicolon.
 */
export function printedSql(
  facts: FactOptions,
  depth: number,
  near?: { foci: readonly (readonly string[])[]; reach: number },
): string {
  const indent = (text: string) => text.replace(/^/gm, "  ");
  const cte = (name: string, sql: string) => `${identifier(name)} AS (\n${indent(sql)}\n)`;
  if (facts.levels.length === 0 && depth > 0) {
    const plan = new KeyLevels(facts, depth, true);
    const steps = plan.steps(facts.keyDepth).map((step) => cte(step.table, step.sql));
    const result = plan.resultSql(KEY_TABLES.level, KEY_TABLES.keys, near !== undefined, near);
    return `WITH ${steps.join(",\n")}\n${result};\n`;
  }
  const rollup = rollupSql(facts, depth, true);
  if (near === undefined) return `${rollup};\n`;
  return (
    `WITH ${cte(ROLLUP_TABLE, rollup)},\n${cte(STATS_TABLE, statsSql(ROLLUP_TABLE, depth))}\n` +
    `${reachSql(STATS_TABLE, depth, near.foci, near.reach)};\n`
  );
}
