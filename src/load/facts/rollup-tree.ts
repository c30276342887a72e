import { EspalierError, type MessagePart, quoted, quotedList, say } from "../../errors.js";
import { checkSizes } from "../../model/check-sizes.js";
import { NamePool } from "../../model/names.js";
import type { Tree } from "../../model/tree.js";
import type { Columns } from "./engine.js";
import { ROLLUP_COLUMNS as C } from "./fact-options.js";

/** How to name and label the tree built from a rollup result. */
export interface RollupTreeOptions {
  /** Name of the root (the whole table). */
  rootName: string;
  /** Record fields a label asks for: `rows` (rows in the subtree) and `level` (the level column). */
  keepFields: readonly string[];
  /** Level column names, outermost first, for the `level` field; empty for a key hierarchy. */
  levelNames: readonly string[];
  /** Refuse results with more nodes than this (LIMIT_EXCEEDED). */
  maxNodes: number;
  /** Whether the result's row numbers are worth naming in errors (a result table read from a file). */
  rowsAreInput: boolean;
}

/**
 * The tree of a rollup result (see rollupSql): one node per row whose deepest grouped level is set, in
 * pre-order with children in code-point order of their names; the root is the whole table. A node's own
 * size is its own row's (rows whose key ends there), else, at the deepest level, its subtree's. The
 * result is checked as it is read: every node's row count must equal its own rows plus its children's,
 * so a truncated or edited result table is SHAPE, not a silently different tree.
 *
 * Read column by column, without an object per row: rows already in that order (as the engine is asked
 * to return its own rollup: ROLLUP_ORDER) are taken as they come, after a check of each row against the
 * one before; any other order (a result table made elsewhere) is sorted first.
 */
export function rollupTree(result: Columns, options: RollupTreeOptions): Tree {
  const col = columnsOf(result);
  const m = result.rowCount;
  const deepest = col.levels.length;
  const levelValues = col.levels.map((c) => result.values[c]);
  // Per row, in row order: grouped levels, levels named (one less for an own row), counts and size.
  const grouped = new Int32Array(m);
  const named = new Int32Array(m);
  const rows = new Float64Array(m);
  const sizes = new Float64Array(m);
  const nodeCounts = new Float64Array(m);
  const childCounts = new Float64Array(m);
  let totalRow = -1;
  let nodeRows = 0;
  for (let r = 0; r < m; r++) {
    const g = wholeNumber(result.values[col.depth][r], C.depth, r, options);
    if (g > deepest) throw shape(`${C.depth} ${g} is deeper than the ${deepest} level columns`, r, options);
    let k = 0;
    for (; k < g; k++) {
      const v = levelValues[k][r];
      if (v === null || v === undefined) {
        if (k === g - 1) break;
        throw shape(`${C.level}${k + 1} is empty above the deepest grouped level`, r, options);
      }
    }
    grouped[r] = g;
    named[r] = k;
    rows[r] = wholeNumber(result.values[col.rows][r], C.rows, r, options);
    nodeCounts[r] = counted(result, col.nodes, C.nodes, r, options);
    childCounts[r] = counted(result, col.children, C.children, r, options);
    sizes[r] = col.size < 0 ? 0 : sizeValue(result.values[col.size][r]);
    if (col.sizeMin >= 0) {
      const min = result.values[col.sizeMin][r];
      if (min !== null && min !== undefined && Number(min) < 0) {
        throw new EspalierError(
          "BAD_SIZE",
          say`a size under ${describe(levelsOf(levelValues, r, k))} is negative (${Number(min)}); sizes must be from 0 to 2^53 - 1`,
          options.rowsAreInput ? { row: r + 1 } : undefined,
        );
      }
    }
    if (g === 0) {
      if (totalRow >= 0) throw duplicate([], totalRow + 1, r, options);
      totalRow = r;
    } else if (k === g) nodeRows++;
  }
  if (totalRow < 0) throw shape("the result has no total row (prefix_depth 0)", -1, options);
  if (rows[totalRow] === 0) throw new EspalierError("INPUT_EMPTY", "the table has no rows");
  if (nodeRows + 1 > options.maxNodes) {
    throw new EspalierError(
      "LIMIT_EXCEEDED",
      `the rollup has ${nodeRows + 1} nodes, more than the limit given (--max-nodes ${options.maxNodes}); raise it, or roll up fewer levels (--key-depth, fewer --levels)`,
    );
  }
  // Rows in pre-order: a row before another when its named levels come first, name by name in
  // code-point order (an unnamed level first: a prefix before its extensions), then by fewer levels
  // grouped (a node's row before its own rows).
  const compare = (a: number, b: number): number => {
    for (let k = 0; k < deepest; k++) {
      const x = k < named[a] ? (levelValues[k][a] as unknown) : null;
      const y = k < named[b] ? (levelValues[k][b] as unknown) : null;
      if (x === null || y === null) {
        if (x !== y) return x === null ? -1 : 1;
        break;
      }
      const c = compareCodePoints(String(x), String(y));
      if (c !== 0) return c;
    }
    return grouped[a] - grouped[b];
  };
  let order: Int32Array | undefined;
  for (let r = 1; r < m && order === undefined; r++) {
    const c = compare(r - 1, r);
    if (c === 0) throw duplicate(levelsOf(levelValues, r, named[r]), r, r, options);
    if (c > 0) order = Int32Array.from({ length: m }, (_, i) => i).sort(compare);
  }
  if (order !== undefined) {
    for (let i = 1; i < m; i++) {
      if (compare(order[i - 1], order[i]) === 0) {
        const [a, b] = [order[i - 1], order[i]].sort((x, y) => x - y);
        throw duplicate(levelsOf(levelValues, b, named[b]), a + 1, b, options);
      }
    }
  }
  const rowAt = order === undefined ? (i: number) => i : (i: number) => order[i];
  return build(
    result,
    col,
    { grouped, named, rows, sizes, nodeCounts, childCounts },
    rowAt,
    nodeRows + 1,
    options,
  );
}

/** The per-row values rollupTree read, in row order. */
interface RowValues {
  grouped: Int32Array;
  named: Int32Array;
  rows: Float64Array;
  sizes: Float64Array;
  nodeCounts: Float64Array;
  childCounts: Float64Array;
}

/**
 * The tree of the rows taken in pre-order (`rowAt(i)`: the i-th row in that order; the total row is
 * the first): each node's parent is the node on the path above it, whose levels must be its own but
 * the deepest; an own row must follow its node's row.
 */
function build(
  result: Columns,
  col: ColumnIndex,
  v: RowValues,
  rowAt: (i: number) => number,
  n: number,
  options: RollupTreeOptions,
): Tree {
  const deepest = col.levels.length;
  const levelValues = col.levels.map((c) => result.values[c]);
  const parent = new Int32Array(n);
  const depth = new Int32Array(n);
  const ownSize = new Float64Array(n);
  const origin = new Int32Array(n);
  const ownRows = new Float64Array(n);
  const childRows = new Float64Array(n);
  const rowsOf = new Float64Array(n);
  const kids = new Float64Array(n);
  const kidNodes = new Float64Array(n);
  const rowOf = new Int32Array(n);
  const hasOwn = new Uint8Array(n);
  const ownRowOf = new Int32Array(n);
  const names: string[] = new Array(n);
  names[0] = options.rootName;
  parent[0] = -1;
  const m = result.rowCount;
  // The path from the root to the last node placed: stack[d] is its node at depth d.
  const stack = new Int32Array(deepest + 1);
  let top = 0;
  let i = 0;
  for (let at = 0; at < m; at++) {
    const r = rowAt(at);
    const g = v.grouped[r];
    const k = v.named[r];
    if (g === 0) {
      // The total sorts first; any row before it would have failed its parent check.
      rowsOf[0] = v.rows[r];
      rowOf[0] = r;
      origin[0] = options.rowsAreInput ? r + 1 : 0;
      continue;
    }
    if (k < g) {
      // Own rows: they follow their node's row, before its children.
      const node = stack[top];
      if (top !== k || !onPath(levelValues, r, k, stack, names) || kids[node] > 0) {
        throw shape(
          say`own rows of ${describe(levelsOf(levelValues, r, k))}, which has no row of its own`,
          r,
          options,
        );
      }
      if (hasOwn[node]) throw duplicate(levelsOf(levelValues, r, k), ownRowOf[node] + 1, r, options);
      hasOwn[node] = 1;
      ownRowOf[node] = r;
      ownSize[node] = v.sizes[r];
      ownRows[node] = v.rows[r];
      continue;
    }
    if (top > g - 1) top = g - 1;
    if (top !== g - 1 || !onPath(levelValues, r, g - 1, stack, names)) {
      throw shape(say`${describe(levelsOf(levelValues, r, g))} has no row for its parent`, r, options);
    }
    i++;
    const p = stack[top];
    stack[++top] = i;
    parent[i] = p;
    depth[i] = g;
    names[i] = String(levelValues[g - 1][r]);
    rowsOf[i] = v.rows[r];
    rowOf[i] = r;
    childRows[p] += v.rows[r];
    kids[p]++;
    kidNodes[p] += v.nodeCounts[r];
    origin[i] = options.rowsAreInput ? r + 1 : 0;
  }
  const counts = Array.prototype.some.call(v.nodeCounts, (c: number) => c >= 0);
  const elided = counts ? new Float64Array(n) : undefined;
  // Own size: the own row where the query gave one; at the deepest level the subtree's (no set is finer).
  for (let x = 0; x < n; x++) {
    const r = rowOf[x];
    if (elided && pushedDown(levelValues, r, v, kids[x], kidNodes[x], elided, x, options)) {
      ownSize[x] = v.sizes[r];
      continue;
    }
    if (!hasOwn[x] && depth[x] === deepest) {
      ownSize[x] = v.sizes[r];
      ownRows[x] = v.rows[r];
    }
    if (ownRows[x] + childRows[x] !== rowsOf[x]) {
      throw shape(
        say`${describe(levelsOf(levelValues, r, depth[x]))} counts ${rowsOf[x]} rows but its own rows and its children's add up to ${ownRows[x] + childRows[x]}: the result is not a complete rollup`,
        r,
        options,
      );
    }
  }
  const fields = new Map<string, string[]>();
  for (const field of options.keepFields) {
    if (field === "rows")
      fields.set(
        field,
        Array.from(rowsOf, (value) => String(value)),
      );
    if (field === "level" && options.levelNames.length > 0)
      fields.set(
        field,
        Array.from(depth, (d) => (d === 0 ? "" : (options.levelNames[d - 1] ?? ""))),
      );
  }
  const pool = NamePool.from(names);
  const linked = {
    parentOf: parent,
    name: pool,
    ownSize,
    hasSizes: true,
    ids: null,
    origin,
    originIsRow: true,
    fields,
    rootName: options.rootName,
  };
  checkSizes(linked);
  return {
    length: n,
    parent,
    depth,
    name: pool,
    ownSize,
    hasSizes: true,
    ids: null,
    origin,
    originIsRow: true,
    fields,
    syntheticRoot: true,
    ...(elided ? { elided } : {}),
    // The root's row count is every row of the table (of the original table, for a rollup result read
    // with --rolled-up): the header says how many rows the nodes stand for.
    reading: { shape: "table", sizeUnit: "number", rolledUpRows: rowsOf[0] },
  };
}

/** Whether row r's first `k` levels are the names of the path stack[1..k]. */
function onPath(
  levelValues: readonly (readonly unknown[])[],
  r: number,
  k: number,
  stack: Int32Array,
  names: readonly string[],
): boolean {
  for (let j = 0; j < k; j++) if (String(levelValues[j][r]) !== names[stack[j + 1]]) return false;
  return true;
}

/** Row r's first `k` level values, as names. */
function levelsOf(levelValues: readonly (readonly unknown[])[], r: number, k: number): string[] {
  const out: string[] = [];
  for (let j = 0; j < k; j++) out.push(String(levelValues[j][r]));
  return out;
}

/** A node or child count of row r, or -1 where the result has no such column or value. */
function counted(result: Columns, c: number, name: string, r: number, options: RollupTreeOptions): number {
  const value = c < 0 ? null : result.values[c][r];
  return value === null || value === undefined ? -1 : wholeNumber(value, name, r, options);
}

/**
 * For a pushdown result: whether node `i` (of row r) is a cut node (its children were not fetched),
 * recording its descendants as elided; checks that a fetched node's counts add up. A node with some but
 * not all of its children is SHAPE: the result was cut across a family, and no tree can be built from it.
 */
function pushedDown(
  levelValues: readonly (readonly unknown[])[],
  r: number,
  v: RowValues,
  fetched: number,
  fetchedNodes: number,
  elided: Float64Array,
  i: number,
  options: RollupTreeOptions,
): boolean {
  const nodes = v.nodeCounts[r];
  const children = v.childCounts[r];
  const levels = () => describe(levelsOf(levelValues, r, v.named[r]));
  if (nodes < 1 || children < 0) throw shape(say`${levels()} has no ${C.nodes} or ${C.children}`, r, options);
  if (fetched === 0 && children > 0) {
    elided[i] = nodes - 1;
    return true;
  }
  if (fetched !== children || fetchedNodes + 1 !== nodes) {
    throw shape(
      say`${levels()} has ${children} children and ${nodes} nodes, but the result holds ${fetched} children with ${fetchedNodes + 1} nodes: the result is cut across a family`,
      r,
      options,
    );
  }
  return false;
}

interface ColumnIndex {
  depth: number;
  levels: number[];
  rows: number;
  size: number;
  sizeMin: number;
  nodes: number;
  children: number;
}

function columnsOf(result: Columns): ColumnIndex {
  const at = (name: string) => result.names.findIndex((n) => n.toLowerCase() === name);
  const levels: number[] = [];
  for (let k = 1; at(`${C.level}${k}`) >= 0; k++) levels.push(at(`${C.level}${k}`));
  const index = {
    depth: at(C.depth),
    levels,
    rows: at(C.rows),
    size: at(C.size),
    sizeMin: at(C.sizeMin),
    nodes: at(C.nodes),
    children: at(C.children),
  };
  const missing = [C.depth, C.rows].filter((name) => at(name) < 0);
  if (missing.length > 0) {
    throw new EspalierError(
      "FIELD_MISSING",
      say`a rollup result needs the columns ${C.depth}, ${C.level}1…, ${C.rows} (and ${C.size} for sizes); missing ${missing.join(", ")}; columns: ${quotedList("name", result.names, 40)}`,
    );
  }
  return index;
}

/**
 * Code-point order (UTF-16 order differs above U+FFFF: a surrogate sorts below U+E000). Compared by
 * UTF-16 unit up to the first difference, which decides as the code points do when neither unit there
 * is a surrogate; otherwise code point by code point.
 */
export function compareCodePoints(a: string, b: string): number {
  if (a === b) return 0;
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) {
    const x = a.charCodeAt(i);
    const y = b.charCodeAt(i);
    if (x === y) continue;
    if ((x < 0xd800 || x > 0xdfff) && (y < 0xd800 || y > 0xdfff)) return x - y;
    return byCodePoint(a, b);
  }
  return a.length - b.length;
}

function byCodePoint(a: string, b: string): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) {
    const x = a.codePointAt(i)!;
    const y = b.codePointAt(i)!;
    if (x !== y) return x - y;
    if (x > 0xffff) i++;
  }
  return a.length - b.length;
}

/** A rollup node for a message: its levels as a path, marked as input text (hidden by --pseudonymize). */
function describe(levels: readonly string[]): MessagePart {
  return levels.length === 0 ? "the total" : quoted.path(levels.join("/"));
}

function wholeNumber(value: unknown, column: string, r: number, options: RollupTreeOptions): number {
  const v = typeof value === "bigint" ? Number(value) : typeof value === "string" ? Number(value) : value;
  if (typeof v !== "number" || !Number.isInteger(v) || v < 0)
    throw shape(say`${column} must be a whole number, got ${quoted.value(String(value))}`, r, options);
  return v;
}

function sizeValue(value: unknown): number {
  if (value === null || value === undefined || value === "") return 0;
  const v = typeof value === "bigint" ? Number(value) : Number(value);
  // NaN and negative totals are refused by checkSizes with the node named.
  return Object.is(v, -0) ? 0 : v;
}

function shape(message: string | MessagePart[], r: number, options: RollupTreeOptions): EspalierError {
  return new EspalierError("SHAPE", message, options.rowsAreInput && r >= 0 ? { row: r + 1 } : undefined);
}

function duplicate(levels: readonly string[], first: number, r: number, options: RollupTreeOptions) {
  return new EspalierError(
    "DUPLICATE_PATH",
    say`${describe(levels)} has two rows (${first} and ${r + 1}) in the rollup result`,
    options.rowsAreInput ? { row: r + 1 } : undefined,
  );
}
