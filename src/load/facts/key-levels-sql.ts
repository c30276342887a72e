import { ROLLUP_COLUMNS as C, type FactOptions } from "./fact-options.js";
import { identifier, keyDepthExpression, keyField, literal } from "./rollup-sql.js";

/** Names of the engine's working tables for a key hierarchy. */
export const KEY_TABLES = {
  keys: "espalier_keys",
  level: (j: number): string => `espalier_level_${j}`,
} as const;

/**
 * One part of a grouping split by a hash of its group key, so that no one statement of the engine holds
 * every group: part `index` of `of` (0 <= index < of). Engine-specific (`hash`): run, never printed.
 */
export interface Part {
  readonly of: number;
  readonly index: number;
}

/** The condition that a group key `expression` falls in `part` (none for a whole, one-part grouping). */
export function partSql(expression: string, part: Part | undefined): string | undefined {
  if (part === undefined || part.of <= 1) return undefined;
  return `hash(${expression}) % ${part.of} = ${part.index}`;
}

/** A statement that makes one working table of a key hierarchy (KeyLevels.steps). */
export interface KeyStep {
  readonly table: string;
  /** The depth of the level table's nodes; undefined for the keys table. */
  readonly depth?: number;
  readonly sql: string;
  /** The same statement for one part of its groups, for a step that groups. */
  readonly inPart?: (part: Part) => string;
}

/**
 * The rows of a key hierarchy grouped by their key: one row per distinct key with its depth `d` (NULL
 * for a NULL key), rows `n`, size sum `t` and minimum `m`. With `cutAt`, a deeper key counts at its
 * prefix of `cutAt` names (as in rollupSql with --key-depth); without, the deepest `d` is the depth.
 * With `part`, only the keys of that part (the parts together are the whole result, each key in one).
 */
export function keysSql(
  options: FactOptions,
  hasSize: boolean,
  cutAt?: number,
  part?: Part,
  hashed = false,
): string {
  // Hashed (see KeyLevels.steps): each key's hash kept as h, the part it falls in at its own depth.
  const h = hashed ? ", hash(k) AS h" : "";
  const key = identifier(keyField(options));
  const d = keyDepthExpression(key, options.separator);
  const s = hasSize
    ? `CAST(${identifier(options.sizeField)} AS DOUBLE PRECISION)`
    : "CAST(NULL AS DOUBLE PRECISION)";
  const table = identifier(options.table);
  if (cutAt === undefined) {
    const where = partSql(key, part);
    // The depth is a function of the key: counted once per distinct key, not once per row.
    return (
      `SELECT k, ${keyDepthExpression("k", options.separator)} AS d, n, t, m${h}\n` +
      `FROM (SELECT ${key} AS k, COUNT(*) AS n, SUM(${s}) AS t, MIN(${s}) AS m FROM ${table}` +
      `${where === undefined ? "" : ` WHERE ${where}`} GROUP BY ${key}) AS keyed`
    );
  }
  const cut = `CASE WHEN ${d} > ${cutAt} THEN ${prefixSql(key, cutAt, options.separator)} ELSE ${key} END`;
  const where = partSql("k", part);
  return (
    `SELECT k, d, COUNT(*) AS n, SUM(s) AS t, MIN(s) AS m${h}\n` +
    `FROM (SELECT ${cut} AS k, CASE WHEN ${d} > ${cutAt} THEN ${cutAt} ELSE ${d} END AS d, ${s} AS s\n` +
    `      FROM ${table}) AS keyed\n` +
    `${where === undefined ? "" : `WHERE ${where}\n`}GROUP BY k, d`
  );
}

/**
 * The rollup of a key hierarchy, level by level, as the embedded engine runs it: the same result table
 * as rollupSql's `GROUP BY ROLLUP` (one row per node, own rows of keys that end above the deepest level),
 * at a fraction of the work. The rollup's grouping sets each group every row (one set per key depth),
 * and so does anything joining its level columns; here only the first statement touches the rows:
 *
 * 1. keysSql: the rows grouped by their key (one row per distinct key, its depth, rows, size sum and
 *    minimum);
 * 2. `levelSql(D)` … `levelSql(1)`, `rootSql`: the nodes of one depth from the nodes one level deeper
 *    (grouped by their parent's prefix) and the keys ending at that depth, with each node's subtree node
 *    count and child count summed on the way up;
 * 3. `resultSql`: those as the rollup's result table, optionally only the rows near the focus paths.
 *
 * A node is identified by its prefix: the key cut after its d-th name. Beyond SQL:1999 it uses the
 * functions rollupSql does (SPLIT_PART, REPLACE). `depth` is the deepest level (at least 1); a deeper key
 * counts at its prefix of `depth` names, as in rollupSql.
 */
export class KeyLevels {
  private readonly sep: string;
  private readonly sepLength: number;

  constructor(
    private readonly options: FactOptions,
    /** The deepest level, at least 1. */
    readonly depth: number,
    private readonly hasSize: boolean,
  ) {
    this.sep = literal(options.separator);
    this.sepLength = options.separator.length;
  }

  /**
   * The statements that build the working tables, in the order they run: the keys table (keysSql, cut
   * at `cutAt`), then the level tables from the deepest up to the root. The engine runs each as
   * `CREATE TABLE table AS sql`; --print-sql prints them as the common table expressions of one
   * statement (printedSql), followed by resultSql. A step that groups also gives `inPart`, the same
   * statement for one part of its groups (see Part): the engine may run it part by part into the table.
   * `hashed` (for a plan run in parts; never printed): every table row also keeps `h`, the engine's hash
   * of the prefix it is grouped under one level up (a key's own, a node's parent's), so that a part of
   * the next grouping is a filter on a stored number (`h % P = i`) and each parent prefix is cut once,
   * not once per part.
   */
  steps(cutAt: number | undefined, hashed = false): KeyStep[] {
    const { keys, level } = KEY_TABLES;
    const out: KeyStep[] = [
      {
        table: keys,
        sql: keysSql(this.options, this.hasSize, cutAt, undefined, hashed),
        inPart: (part) => keysSql(this.options, this.hasSize, cutAt, part, hashed),
      },
    ];
    out.push({
      table: level(this.depth),
      depth: this.depth,
      sql: this.levelSql(this.depth, "", keys, undefined, hashed),
    });
    for (let j = this.depth - 1; j >= 1; j--) {
      const below = level(j + 1);
      out.push({
        table: level(j),
        depth: j,
        sql: this.levelSql(j, below, keys, undefined, hashed),
        inPart: (part) => this.levelSql(j, below, keys, part, hashed),
      });
    }
    out.push({ table: level(0), depth: 0, sql: this.rootSql(level(1), keys) });
    return out;
  }

  /**
   * The nodes at depth `j` (p, their prefix; n, t, m; nc, nodes in the subtree; cc, children), from the
   * nodes at depth j + 1 in `nodes` and the keys of depth j in `keys`; with `part`, only the nodes of
   * that part (their prefix's hash: computed, or with `hashed` read from the rows' h).
   */
  levelSql(j: number, nodes: string, keys: string, part?: Part, hashed = false): string {
    // The parent's hash, kept with each node (hashed); the root's children need none.
    const h = (prefix: string) =>
      !hashed ? "" : j > 1 ? `, hash(${this.parentSql(prefix, j)}) AS h` : ", CAST(0 AS UBIGINT) AS h";
    // The deepest nodes are keys, already distinct.
    if (j === this.depth)
      return `SELECT ${j} AS j, k AS p, n, t, m, 1 AS nc, 0 AS cc${h("k")} FROM ${identifier(keys)} WHERE d = ${j}`;
    const parent = this.parentSql("p", j + 1);
    const inPart = (expression: string) => {
      const where = hashed
        ? part === undefined || part.of <= 1
          ? undefined
          : `h % ${part.of} = ${part.index}`
        : partSql(expression, part);
      return where === undefined ? "" : ` AND ${where}`;
    };
    const fromKeys = `SELECT k AS p, n, t, m, 0 AS nc, 0 AS cc FROM ${identifier(keys)} WHERE d = ${j}${inPart("k")}`;
    return (
      `SELECT ${j} AS j, p, SUM(n) AS n, SUM(t) AS t, MIN(m) AS m, 1 + SUM(nc) AS nc, SUM(cc) AS cc${h("p")}\n` +
      `FROM (SELECT ${parent} AS p, n, t, m, nc, 1 AS cc FROM ${identifier(nodes)} WHERE j = ${j + 1}${inPart(parent)}\n` +
      `      UNION ALL ${fromKeys}) AS below\n` +
      "GROUP BY p"
    );
  }

  /** The prefix of the parent of a node at depth `j` (>= 2) whose prefix is `p`: p cut before its j-th name. */
  private parentSql(p: string, j: number): string {
    return `SUBSTRING(${p} FROM 1 FOR CHAR_LENGTH(${p}) - CHAR_LENGTH(SPLIT_PART(${p}, ${this.sep}, ${j})) - ${this.sepLength})`;
  }

  /** The root (depth 0): every row, rows with a NULL key as its own. */
  rootSql(nodes: string, keys: string): string {
    return (
      `SELECT 0 AS j, CAST(NULL AS VARCHAR) AS p, COALESCE(SUM(n), 0) AS n, SUM(t) AS t, MIN(m) AS m,\n` +
      `       1 + COALESCE(SUM(nc), 0) AS nc, COALESCE(SUM(cc), 0) AS cc\n` +
      `FROM (SELECT n, t, m, nc, 1 AS cc FROM ${identifier(nodes)} WHERE j = 1\n` +
      `      UNION ALL SELECT n, t, m, 0, 0 FROM ${identifier(keys)} WHERE k IS NULL) AS below`
    );
  }

  /**
   * The rollup result table (see rollupSql) from the level tables (`level(j)` names depth j's, as
   * levelSql and rootSql make them) and `keys`: node rows, and own rows (a key
   * ending above the deepest level, or NULL: `prefix_depth` d + 1, `level_{d+1}` NULL). With `stats`,
   * also `node_count` and `child_count` (NULL on own rows). With `near`, only the rows within
   * `near.reach` levels of the focus paths, as reachSql chooses them.
   */
  resultSql(
    level: (j: number) => string,
    keys: string,
    stats: boolean,
    near?: { foci: readonly (readonly string[])[]; reach: number },
  ): string {
    const D = this.depth;
    // Nothing deeper than the longest focus plus the reach is near: those levels are not read at all.
    const within = near ? Math.max(0, ...near.foci.map((f) => this.shareable(f))) + near.reach : D;
    const nodeNear = near ? `\nWHERE ${this.nearSql("p", "j", near)}` : "";
    const ownNear = near ? ` AND (d IS NULL OR (d <= ${within} AND ${this.nearSql("k", "d", near)}))` : "";
    const depths = Array.from({ length: Math.min(D, within) + 1 }, (_, j) => j);
    const nodeRows = depths.map((j) => `${this.nodeSelect(stats)}\nFROM ${identifier(level(j))}${nodeNear}`);
    const ownRows = `${this.ownSelect(stats)}\nFROM ${identifier(keys)}\nWHERE (d IS NULL OR d < ${D})${ownNear}`;
    return [...nodeRows, ownRows].join("\nUNION ALL\n");
  }

  /**
   * The children of the nodes at `parents` (paths of names, outermost first; none the root) as rows
   * of the result table with statistics: their node rows and their own rows, nothing else.
   */
  childrenSql(level: (j: number) => string, keys: string, parents: readonly (readonly string[])[]): string {
    const byDepth = new Map<number, (readonly string[])[]>();
    for (const path of parents) {
      if (path.length === 0 || path.length >= this.depth) continue;
      byDepth.set(path.length, [...(byDepth.get(path.length) ?? []), path]);
    }
    const parts: string[] = [];
    for (const [j, paths] of [...byDepth].sort((a, b) => a[0] - b[0])) {
      const under = (column: string) =>
        `(${paths
          .map((path) => {
            const prefix = literal(`${path.join(this.options.separator)}${this.options.separator}`);
            return `SUBSTRING(${column} FROM 1 FOR CHAR_LENGTH(${prefix})) = ${prefix}`;
          })
          .join(" OR ")})`;
      parts.push(`${this.nodeSelect(true)}\nFROM ${identifier(level(j + 1))}\nWHERE ${under("p")}`);
      if (j + 1 < this.depth)
        parts.push(`${this.ownSelect(true)}\nFROM ${identifier(keys)}\nWHERE d = ${j + 1} AND ${under("k")}`);
    }
    return parts.join("\nUNION ALL\n");
  }

  /** The result table's columns over a level table (p, j, n, t, m, nc, cc). */
  private nodeSelect(stats: boolean): string {
    const columns = [
      `j AS ${C.depth}`,
      ...this.levelColumns("p", "j"),
      `n AS ${C.rows}`,
      ...this.sizeColumns(),
      ...(stats ? [`nc AS ${C.nodes}`, `cc AS ${C.children}`] : []),
    ];
    return `SELECT ${columns.join(", ")}`;
  }

  /** The result table's columns over the keys table (k, d, n, t, m), as own rows. */
  private ownSelect(stats: boolean): string {
    const columns = [
      `COALESCE(d, 0) + 1 AS ${C.depth}`,
      ...this.levelColumns("k", "d"),
      `n AS ${C.rows}`,
      ...this.sizeColumns(),
      ...(stats ? [`CAST(NULL AS BIGINT) AS ${C.nodes}`, `CAST(NULL AS BIGINT) AS ${C.children}`] : []),
    ];
    return `SELECT ${columns.join(", ")}`;
  }

  private levelColumns(p: string, d: string): string[] {
    return Array.from(
      { length: this.depth },
      (_, i) =>
        `CASE WHEN ${d} >= ${i + 1} THEN SPLIT_PART(${p}, ${this.sep}, ${i + 1}) END AS ${C.level}${i + 1}`,
    );
  }

  private sizeColumns(): string[] {
    return this.hasSize ? [`t AS ${C.size}`, `m AS ${C.sizeMin}`] : [];
  }

  /**
   * Whether the node with prefix `p` at depth `d` is within `reach` levels of a focus: d minus the
   * names it shares with the focus (as reachSql counts them; the root's prefix is NULL, depth 0).
   */
  private nearSql(
    p: string,
    d: string,
    near: { foci: readonly (readonly string[])[]; reach: number },
  ): string {
    const foci = near.foci.length === 0 ? [[]] : near.foci;
    const conditions = foci.map((focus) => {
      const m = this.shareable(focus);
      if (m === 0) return `${d} <= ${near.reach}`;
      const steps: string[] = [];
      for (let i = m; i >= 1; i--) {
        const prefix = focus.slice(0, i).join(this.options.separator);
        const under = literal(`${prefix}${this.options.separator}`);
        steps.push(
          `WHEN ${p} = ${literal(prefix)} OR SUBSTRING(${p} FROM 1 FOR CHAR_LENGTH(${under})) = ${under} THEN ${i}`,
        );
      }
      return `${d} - (CASE ${steps.join(" ")} ELSE 0 END) <= ${near.reach}`;
    });
    return `(${conditions.join(" OR ")})`;
  }

  /** How many leading names of `focus` a node can share: a name holding the separator is no key's name. */
  private shareable(focus: readonly string[]): number {
    const cut = focus.findIndex((name) => name.includes(this.options.separator));
    return Math.min(focus.length, this.depth, cut >= 0 ? cut : focus.length);
  }
}

/** The first `n` names of `key` (n >= 1): the key cut before its n-th separator. */
function prefixSql(key: string, n: number, separator: string): string {
  const sep = literal(separator);
  const lengths = Array.from({ length: n }, (_, i) => `CHAR_LENGTH(SPLIT_PART(${key}, ${sep}, ${i + 1}))`);
  return `SUBSTRING(${key} FROM 1 FOR ${lengths.join(" + ")} + ${(n - 1) * separator.length})`;
}
