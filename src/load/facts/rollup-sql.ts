import { EspalierError } from "../../errors.js";
import { ROLLUP_COLUMNS as C, type FactOptions } from "./fact-options.js";

/**
 * The rollup query in standard SQL (ISO/IEC 9075:1999, GROUP BY ROLLUP with GROUPING, feature T431),
 * over a table named `options.table`. Beyond SQL:1999 it uses only the functions listed in
 * docs/scale.md (SPLIT_PART and REPLACE for key hierarchies, the type name VARCHAR).
 *
 * One result row per node: `prefix_depth` levels grouped, the node's level values, its row count and
 * size summed over its subtree. For a key hierarchy the query also returns the rows whose key ends at a
 * node ("own" rows: `prefix_depth` k with `level_k` NULL), so each node's own size is read, not
 * subtracted. `depth` is how many levels to roll up (the level columns, or the deepest key).
 */
export function rollupSql(options: FactOptions, depth: number, hasSize: boolean): string {
  const l = (k: number) => `l${k}`;
  const ks = range(depth);
  const leveled = levelSelect(options, depth, hasSize);
  const grouped = ks.map((k) => `(1 - GROUPING(${l(k)}))`).join(" + ") || "0";
  const select = [
    `  ${grouped} AS ${C.depth}`,
    ...ks.map((k) => `  ${l(k)} AS ${C.level}${k}`),
    `  COUNT(*) AS ${C.rows}`,
    ...(hasSize ? [`  SUM(s) AS ${C.size}`, `  MIN(s) AS ${C.sizeMin}`] : []),
  ];
  // A key that ends above a grouping set's depth shows there as NULL levels: keep the set just below
  // its end (its own row) and drop the deeper repeats.
  const having =
    options.levels.length === 0 && depth > 1
      ? `\nHAVING ${ks
          .slice(1)
          .map((k) => `(GROUPING(${l(k)}) = 1 OR ${l(k - 1)} IS NOT NULL)`)
          .join("\n   AND ")}`
      : "";
  const groupBy = depth === 0 ? "" : `\nGROUP BY ROLLUP (${ks.map(l).join(", ")})`;
  if (options.levels.length === 0 || depth === 0)
    return `SELECT\n${select.join(",\n")}\nFROM (\n${leveled}\n) AS leveled${groupBy}${having}`;
  // Level columns repeat (a cost export has a row per day): the finest grouping first, then the
  // rollup of that, which is small, instead of every grouping set over every row.
  const combined = [...ks.map(l), "COUNT(*) AS n", ...(hasSize ? ["SUM(s) AS t", "MIN(s) AS m"] : [])];
  const outer = [
    `  ${grouped} AS ${C.depth}`,
    ...ks.map((k) => `  ${l(k)} AS ${C.level}${k}`),
    `  COALESCE(SUM(n), 0) AS ${C.rows}`,
    ...(hasSize ? [`  SUM(t) AS ${C.size}`, `  MIN(m) AS ${C.sizeMin}`] : []),
  ];
  return (
    `SELECT\n${outer.join(",\n")}\nFROM (\n  SELECT ${combined.join(", ")}\n  FROM (\n${indent(leveled)}\n  ) AS leveled\n` +
    `  GROUP BY ${ks.map(l).join(", ")}\n) AS combined${groupBy}`
  );
}

/**
 * `ORDER BY` for a rollup result in pre-order, the order rollupTree builds the tree in: by each level
 * value (NULL first: a node before its descendants), then by fewer levels grouped (a node's row before
 * its own rows). The engine compares text by its UTF-8 bytes, which is code-point order; rollupTree
 * checks each row against the one before and sorts itself if they are not in that order.
 */
export function preOrderSql(depth: number): string {
  const keys = [...range(depth).map((k) => `${C.level}${k} NULLS FIRST`), C.depth];
  return `ORDER BY ${keys.join(", ")}`;
}

/** The deepest key, as a query: the number of separators plus one, at most. */
export function keyDepthSql(options: FactOptions): string {
  return `SELECT MAX(${keyDepthExpression(identifier(keyField(options)), options.separator)}) AS key_depth FROM ${identifier(options.table)}`;
}

/** `SELECT l1, …, lD, s FROM table`: the level values of every row (and its size as s). */
function levelSelect(options: FactOptions, depth: number, hasSize: boolean): string {
  const sizeValue = `CAST(${identifier(options.sizeField)} AS DOUBLE PRECISION)`;
  const size = hasSize ? [`${sizeValue} AS s`] : [];
  const table = identifier(options.table);
  if (options.levels.length > 0) {
    // A missing level value is a node named "": nothing in the row is dropped.
    const cols = options.levels.map((c, i) => `COALESCE(CAST(${identifier(c)} AS VARCHAR), '') AS l${i + 1}`);
    return `  SELECT ${[...cols, ...size].join(",\n         ")}\n  FROM ${table}`;
  }
  const sep = literal(options.separator);
  const cols = range(depth).map((k) => `CASE WHEN d >= ${k} THEN SPLIT_PART(k, ${sep}, ${k}) END AS l${k}`);
  const inner = [
    `${identifier(keyField(options))} AS k`,
    `${keyDepthExpression(identifier(keyField(options)), options.separator)} AS d`,
    ...size,
  ];
  return (
    `  SELECT ${[...cols, ...(hasSize ? ["s"] : [])].join(",\n         ")}\n` +
    `  FROM (SELECT ${inner.join(", ")} FROM ${table}) AS keyed`
  );
}

/** Number of key levels of `column`: separators counted by the length lost when they are removed. */
export function keyDepthExpression(column: string, separator: string): string {
  const sep = literal(separator);
  const removed = `CHAR_LENGTH(${column}) - CHAR_LENGTH(REPLACE(${column}, ${sep}, ''))`;
  return separator.length === 1 ? `${removed} + 1` : `(${removed}) / ${separator.length} + 1`;
}

export function keyField(options: FactOptions): string {
  if (options.keyField === undefined)
    throw new EspalierError("USAGE", "a fact table needs --levels COL,COL,… or --key-field COL");
  return options.keyField;
}

/** A delimited identifier (SQL:1999 5.2): in double quotes, a quote doubled. */
export function identifier(name: string): string {
  return `"${name.replaceAll('"', '""')}"`;
}

/** A character string literal (SQL:1999 5.3): in single quotes, a quote doubled. */
export function literal(text: string): string {
  return `'${text.replaceAll("'", "''")}'`;
}

function indent(text: string): string {
  return text.replace(/^/gm, "  ");
}

function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i + 1);
}
