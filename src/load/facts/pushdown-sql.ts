import { ROLLUP_COLUMNS as C } from "./fact-options.js";
import { identifier, literal } from "./rollup-sql.js";

/**
 * Node statistics over a rollup result (the table or CTE `rollup`, as rollupSql returns it): every
 * row of it, and on each node's row `node_count` (nodes in its subtree, itself included) and
 * `child_count`; own rows keep NULL there. Standard SQL:1999: ROLLUP with GROUPING (T431) and
 * IS NOT DISTINCT FROM (T151), column references only in GROUP BY.
 */
export function statsSql(rollup: string, depth: number): string {
  const ks = range(depth);
  const lv = (k: number) => `${C.level}${k}`;
  const from = identifier(rollup);
  const deepest =
    depth === 0 ? "NULL" : `CASE ${C.depth} ${ks.map((k) => `WHEN ${k} THEN ${lv(k)}`).join(" ")} END`;
  const grouped = ks.map((k) => `(1 - GROUPING(${lv(k)}))`).join(" + ") || "0";
  const levels = ks.map(lv).join(", ");
  const same = (a: string, b: string) =>
    ks.map((k) => `${a}.${lv(k)} IS NOT DISTINCT FROM ${b}.${lv(k)}`).join(" AND ");
  const subtree = [
    `node_rows AS (SELECT * FROM ${from} WHERE ${C.depth} = 0 OR ${deepest} IS NOT NULL)`,
    `subtree_counts AS (\n  SELECT ${grouped} AS ${C.depth}${ks.map((k) => `, ${lv(k)}`).join("")}, COUNT(*) AS ${C.nodes}\n` +
      `  FROM node_rows${depth === 0 ? "" : `\n  GROUP BY ROLLUP (${levels})`}` +
      (depth === 0
        ? ""
        : `\n  HAVING ${ks.map((k) => `(GROUPING(${lv(k)}) = 1 OR ${lv(k)} IS NOT NULL)`).join(" AND ")}`) +
      ")",
    // A node's parent: its levels but the deepest, at one level less.
    `parents AS (\n  SELECT ${C.depth} - 1 AS parent_depth` +
      ks.map((k) => `, CASE WHEN ${C.depth} > ${k} THEN ${lv(k)} END AS ${lv(k)}`).join("") +
      `\n  FROM node_rows WHERE ${C.depth} > 0)`,
    `child_counts AS (\n  SELECT parent_depth${ks.map((k) => `, ${lv(k)}`).join("")}, COUNT(*) AS ${C.children}\n` +
      `  FROM parents GROUP BY parent_depth${ks.map((k) => `, ${lv(k)}`).join("")})`,
  ];
  return (
    `WITH ${subtree.join(",\n")}\n` +
    `SELECT r.*, s.${C.nodes},\n` +
    `  CASE WHEN s.${C.nodes} IS NULL THEN NULL ELSE COALESCE(c.${C.children}, 0) END AS ${C.children}\n` +
    `FROM ${from} AS r\n` +
    `LEFT JOIN subtree_counts AS s ON s.${C.depth} = r.${C.depth}${depth > 0 ? ` AND ${same("s", "r")}` : ""}\n` +
    `LEFT JOIN child_counts AS c ON c.parent_depth = r.${C.depth}${depth > 0 ? ` AND ${same("c", "r")}` : ""}`
  );
}

/**
 * The rows of node statistics (the table `stats`, as statsSql returns it) within `reach` levels of the
 * focus paths: a node at depth d whose path shares j leading names with a focus is d - j levels from
 * it (with no focus, from the root); an own row counts at its node's depth.
 */
export function reachSql(
  stats: string,
  depth: number,
  foci: readonly (readonly string[])[],
  reach: number,
): string {
  const lv = (k: number) => `${C.level}${k}`;
  const nodeDepth = `${C.depth} - CASE WHEN ${C.nodes} IS NULL THEN 1 ELSE 0 END`;
  const shared = (focus: readonly string[]) => {
    const m = Math.min(focus.length, depth);
    if (m === 0) return "0";
    const steps = range(m).map(
      (k) => `WHEN ${lv(k)} IS DISTINCT FROM ${literal(focus[k - 1])} THEN ${k - 1}`,
    );
    return `CASE ${steps.join(" ")} ELSE ${m} END`;
  };
  const near = (foci.length === 0 ? [[]] : foci).map((f) => `${nodeDepth} - (${shared(f)}) <= ${reach}`);
  return `SELECT * FROM ${identifier(stats)}\nWHERE ${near.map((c) => `(${c})`).join("\n   OR ")}`;
}

function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i + 1);
}
