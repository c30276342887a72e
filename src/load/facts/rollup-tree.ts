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

interface NodeRow {
  levels: string[];
  rows: number;
  size: number;
  /** Result row (1-based). */
  at: number;
  /** Nodes in the subtree and children, when the result carries them (a pushdown result); else -1. */
  nodes: number;
  children: number;
}

/**
 * The tree of a rollup result (see rollupSql): one node per row whose deepest grouped level is set, in
 * pre-order with children in code-point order of their names; the root is the whole table. A node's own
 * size is its own row's (rows whose key ends there), else, at the deepest level, its subtree's. The
 * result is checked as it is read: every node's row count must equal its own rows plus its children's,
 * so a truncated or edited result table is SHAPE, not a silently different tree.
 */
export function rollupTree(result: Columns, options: RollupTreeOptions): Tree {
  const col = columnsOf(result);
  const depthOf = (r: number) => wholeNumber(result.values[col.depth][r], C.depth, r, options);
  const nodes: NodeRow[] = [];
  const own = new Map<string, { rows: number; size: number; at: number }>();
  let total: NodeRow | undefined;
  const deepest = col.levels.length;
  for (let r = 0; r < result.rowCount; r++) {
    const g = depthOf(r);
    if (g > deepest) throw shape(`${C.depth} ${g} is deeper than the ${deepest} level columns`, r, options);
    const levels: string[] = [];
    for (let k = 0; k < g; k++) {
      const v = result.values[col.levels[k]][r];
      if (v === null || v === undefined) {
        if (k === g - 1) break;
        throw shape(`${C.level}${k + 1} is empty above the deepest grouped level`, r, options);
      }
      levels.push(String(v));
    }
    const rows = wholeNumber(result.values[col.rows][r], C.rows, r, options);
    const counted = (c: number, name: string) => {
      const v = c < 0 ? null : result.values[c][r];
      return v === null || v === undefined ? -1 : wholeNumber(v, name, r, options);
    };
    const nodeCount = counted(col.nodes, C.nodes);
    const childCount = counted(col.children, C.children);
    const size = col.size < 0 ? 0 : sizeValue(result.values[col.size][r]);
    if (col.sizeMin >= 0) {
      const min = result.values[col.sizeMin][r];
      if (min !== null && min !== undefined && Number(min) < 0) {
        throw new EspalierError(
          "BAD_SIZE",
          say`a size under ${describe(levels)} is negative (${Number(min)}); sizes must be from 0 to 2^53 - 1`,
          options.rowsAreInput ? { row: r + 1 } : undefined,
        );
      }
    }
    if (levels.length < g) {
      const key = keyOf(levels);
      if (own.has(key)) throw duplicate(levels, own.get(key)!.at, r, options);
      own.set(key, { rows, size, at: r + 1 });
    } else if (g === 0) {
      if (total) throw duplicate(levels, total.at, r, options);
      total = { levels, rows, size, at: r + 1, nodes: nodeCount, children: childCount };
    } else {
      nodes.push({ levels, rows, size, at: r + 1, nodes: nodeCount, children: childCount });
    }
  }
  if (!total) throw shape("the result has no total row (prefix_depth 0)", -1, options);
  if (total.rows === 0) throw new EspalierError("INPUT_EMPTY", "the table has no rows");
  if (nodes.length + 1 > options.maxNodes) {
    throw new EspalierError(
      "LIMIT_EXCEEDED",
      `the rollup has ${nodes.length + 1} nodes, more than the configured maximum of ${options.maxNodes}`,
    );
  }
  nodes.sort((a, b) => compareLevels(a.levels, b.levels));
  return build(total, nodes, own, deepest, options);
}

function build(
  total: NodeRow,
  nodes: NodeRow[],
  own: Map<string, { rows: number; size: number; at: number }>,
  deepest: number,
  options: RollupTreeOptions,
): Tree {
  const n = nodes.length + 1;
  const parent = new Int32Array(n);
  const depth = new Int32Array(n);
  const ownSize = new Float64Array(n);
  const origin = new Int32Array(n);
  const ownRows = new Float64Array(n);
  const childRows = new Float64Array(n);
  const rowsOf = new Float64Array(n);
  const kids = new Float64Array(n);
  const kidNodes = new Float64Array(n);
  const names: string[] = new Array(n);
  names[0] = options.rootName;
  parent[0] = -1;
  rowsOf[0] = total.rows;
  origin[0] = options.rowsAreInput ? total.at : 0;
  const all = [total, ...nodes];
  const stack = [0];
  for (let i = 1; i < n; i++) {
    const row = nodes[i - 1];
    const d = row.levels.length;
    while (stack.length > d) stack.pop();
    const p = stack[stack.length - 1];
    if (stack.length !== d || !isPrefix(all[p].levels, row.levels)) {
      throw shape(say`${describe(row.levels)} has no row for its parent`, row.at - 1, options);
    }
    if (i > 1 && compareLevels(nodes[i - 2].levels, row.levels) === 0)
      throw duplicate(row.levels, nodes[i - 2].at, row.at - 1, options);
    stack.push(i);
    parent[i] = p;
    depth[i] = d;
    names[i] = row.levels[d - 1];
    rowsOf[i] = row.rows;
    childRows[p] += row.rows;
    kids[p]++;
    kidNodes[p] += row.nodes;
    origin[i] = options.rowsAreInput ? row.at : 0;
  }
  const counts = all.some((row) => row.nodes >= 0);
  const elided = counts ? new Float64Array(n) : undefined;
  // Own size: the own row where the query gave one; at the deepest level the subtree's (no set is finer).
  for (let i = 0; i < n; i++) {
    if (elided && pushedDown(all[i], kids[i], kidNodes[i], elided, i, options)) {
      ownSize[i] = all[i].size;
      continue;
    }
    const mine = own.size === 0 ? undefined : own.get(keyOf(all[i].levels));
    if (mine) {
      ownSize[i] = mine.size;
      ownRows[i] = mine.rows;
    } else if (all[i].levels.length === deepest) {
      ownSize[i] = all[i].size;
      ownRows[i] = all[i].rows;
    }
    if (ownRows[i] + childRows[i] !== rowsOf[i]) {
      throw shape(
        say`${describe(all[i].levels)} counts ${rowsOf[i]} rows but its own rows and its children's add up to ${ownRows[i] + childRows[i]}: the result is not a complete rollup`,
        all[i].at - 1,
        options,
      );
    }
  }
  const known = new Set(own.size === 0 ? [] : all.map((node) => keyOf(node.levels)));
  for (const [key, row] of own) {
    if (!known.has(key)) {
      const levels = JSON.parse(key) as string[];
      throw shape(say`own rows of ${describe(levels)}, which has no row of its own`, row.at - 1, options);
    }
  }
  const fields = new Map<string, string[]>();
  for (const field of options.keepFields) {
    if (field === "rows")
      fields.set(
        field,
        Array.from(rowsOf, (v) => String(v)),
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
  };
}

/**
 * For a pushdown result: whether node `i` is a cut node (its children were not fetched), recording its
 * descendants as elided; checks that a fetched node's counts add up. A node with some but not all of
 * its children is SHAPE: the result was cut across a family, and no tree can be built from it.
 */
function pushedDown(
  row: NodeRow,
  fetched: number,
  fetchedNodes: number,
  elided: Float64Array,
  i: number,
  options: RollupTreeOptions,
): boolean {
  if (row.nodes < 1 || row.children < 0)
    throw shape(`${describe(row.levels)} has no ${C.nodes} or ${C.children}`, row.at - 1, options);
  if (fetched === 0 && row.children > 0) {
    elided[i] = row.nodes - 1;
    return true;
  }
  if (fetched !== row.children || fetchedNodes + 1 !== row.nodes) {
    throw shape(
      `${describe(row.levels)} has ${row.children} children and ${row.nodes} nodes, but the result holds ` +
        `${fetched} children with ${fetchedNodes + 1} nodes: the result is cut across a family`,
      row.at - 1,
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

/** Orders level tuples by code point, name by name, a prefix before its extensions: pre-order. */
export function compareLevels(a: readonly string[], b: readonly string[]): number {
  const n = Math.min(a.length, b.length);
  for (let k = 0; k < n; k++) {
    const c = compareCodePoints(a[k], b[k]);
    if (c !== 0) return c;
  }
  return a.length - b.length;
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

function isPrefix(prefix: readonly string[], levels: readonly string[]): boolean {
  if (prefix.length + 1 !== levels.length) return false;
  for (let k = 0; k < prefix.length; k++) if (prefix[k] !== levels[k]) return false;
  return true;
}

function keyOf(levels: readonly string[]): string {
  return JSON.stringify(levels);
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
