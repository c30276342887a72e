import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { EspalierError, quoted as input, quotedList, say } from "../../errors.js";
import type { Tree } from "../../model/tree.js";
import { missingField, sizeFieldNamed } from "../missing-field.js";
import { type Columns, type Engine, type EngineSettings, openEngine } from "./engine.js";
import type { FactFormat, FactOptions } from "./fact-options.js";
import { KEY_TABLES, KeyLevels, keysSql, type Part } from "./key-levels-sql.js";
import { locateBadSize, locateMalformedJson } from "./locate-fact-error.js";
import { ROLLUP_TABLE, STATS_TABLE } from "./printed-sql.js";
import { reachSql, statsSql } from "./pushdown-sql.js";
import { readHeader } from "./read-header.js";
import { identifier, keyDepthSql, preOrderSql, rollupSql } from "./rollup-sql.js";
import { rollupTree } from "./rollup-tree.js";
import { textRowEstimate } from "./row-estimate.js";
import { sourceViewSql } from "./source-sql.js";

/** A fact table to read: where, in what format, how it forms a hierarchy, and how to name the tree. */
export interface FactLoad {
  file: string;
  format: FactFormat;
  facts: FactOptions;
  /** The file is the result table of the rollup query (see --print-sql), not the facts themselves. */
  rolledUp: boolean;
  rootName: string;
  keepFields: readonly string[];
  maxNodes: number;
  engine?: EngineSettings;
  /**
   * At most how many groups (keys, or nodes of one level) one statement of the engine groups; a larger
   * grouping runs in parts (see Part). Default: by the engine's memory cap (MEMORY_LIMIT / GROUP_BYTES).
   */
  partRows?: number;
}

/** The engine's memory cap: it spills to disk past it. */
const MEMORY_LIMIT = "1GB";

/**
 * Memory cap per group a grouping may hold in one statement. Measured: the rows of a generated
 * inventory grouped by key in one statement ran out of memory for 10M keys under a 400 MB cap
 * (once in two tries) and 100M keys under 1 GB; 2M keys a part under 200 MB did not. 128 bytes a group
 * is 8M keys a part under 1 GB.
 */
const GROUP_BYTES = 128;

/**
 * Reads a fact table into a {@link Tree}: the embedded engine streams the file, runs the rollup query
 * (rollupSql, exactly as --print-sql prints it) and hands back one row per node, from which the tree is
 * built (rollupTree). With `rolledUp`, the file already is such a result, made by another engine.
 */
export async function loadFactTable(load: FactLoad): Promise<Tree> {
  const session = await openFactTable(load);
  try {
    return await session.whole();
  } finally {
    session.close();
  }
}

/** A fact table opened in the engine and rolled up there, from which trees are fetched. */
export interface FactSession {
  /** Rows of the rollup result (nodes, and own rows of a key hierarchy): what a whole tree costs. */
  readonly size: number;
  /** The whole rollup as a tree. */
  whole(): Promise<Tree>;
  /**
   * The nodes within `reach` levels of the focus paths (names, outermost first), each other node
   * counted in its nearest fetched ancestor's `elided` descendants. The rolled-up input of a
   * pushdown query gives what it holds.
   */
  near(foci: readonly (readonly string[])[], reach: number): Promise<Tree>;
  /**
   * Where the engine can fetch a family at a time (a key hierarchy): the tree of the last `near` or
   * `widen` with the children of the nodes at `parents` (paths of names, each a node of that tree
   * whose children were not fetched) added.
   */
  widen?(parents: readonly (readonly string[])[]): Promise<Tree>;
  close(): void;
}

/**
 * Opens a fact table: the engine reads the file as a view and rolls it up into a temporary table
 * (kept by the engine, spilled to disk past its memory cap), so that a tree of any part of it costs
 * one more query over the rollup, never another pass over the facts.
 */
export async function openFactTable(load: FactLoad): Promise<FactSession> {
  const header = await headerOf(load);
  // The engine's spill files go to a folder of their own, removed on close; so does the database file
  // that holds a key hierarchy's working tables (as many rows as the table has keys and more: there
  // they leave memory when it is short). A rollup of level columns has a row per combination of level
  // values, and its table is kept in memory (spilled past the cap).
  const work = mkdtempSync(join(load.engine?.tempDirectory ?? tmpdir(), "espalier-engine-"));
  const keyed = load.facts.levels.length === 0 && !load.rolledUp;
  let engine: Engine;
  try {
    const opened = await openEngine({
      memoryLimit: MEMORY_LIMIT,
      ...load.engine,
      tempDirectory: work,
      ...(keyed ? { databaseFile: join(work, "work.db") } : {}),
    });
    engine = {
      run: (sql) => opened.run(sql),
      close: () => {
        try {
          opened.close();
        } finally {
          rmSync(work, { recursive: true, force: true });
        }
      },
    };
  } catch (err) {
    rmSync(work, { recursive: true, force: true });
    throw err;
  }
  try {
    return placingErrors(await openSession(load, header, engine), engine, load);
  } catch (err) {
    const placed = await placeError(err, engine, load);
    engine.close();
    throw placed;
  }
}

/**
 * `session` with the errors of its fetches placed (placeError): a negative size is found when the
 * rollup's rows become a tree.
 */
function placingErrors(session: FactSession, engine: Engine, load: FactLoad): FactSession {
  const placing = async <T>(fetched: Promise<T>): Promise<T> => {
    try {
      return await fetched;
    } catch (err) {
      throw await placeError(err, engine, load);
    }
  };
  const { widen } = session;
  return {
    size: session.size,
    whole: () => placing(session.whole()),
    near: (foci, reach) => placing(session.near(foci, reach)),
    ...(widen === undefined ? {} : { widen: (parents) => placing(widen(parents)) }),
    close: () => session.close(),
  };
}

/**
 * An error about the facts at its place in the file where it can be found: a size that is not a number
 * or is negative at its row (and line and column, where the file has them); a malformed JSON lines
 * record at its line and column. Any other error as it is.
 */
async function placeError(err: unknown, engine: Engine, load: FactLoad): Promise<unknown> {
  if (!(err instanceof EspalierError) || load.rolledUp) return err;
  const source = {
    file: load.file,
    format: load.format,
    table: load.facts.table,
    sizeField: load.facts.sizeField,
  };
  if (err.code === "BAD_SIZE" && err.pos?.row === undefined) return locateBadSize(err, engine, source);
  if (err.code === "ENGINE_FAILED" && load.format === "jsonl" && /Malformed JSON/i.test(err.message))
    return (await locateMalformedJson(load.file).catch(() => undefined)) ?? err;
  return err;
}

/** The session of openFactTable, over an open engine. */
async function openSession(load: FactLoad, header: readonly string[], engine: Engine): Promise<FactSession> {
  await run(engine, sourceViewSql(load.facts.table, load.file, load.format, header), load);
  const columns = (await run(engine, `SELECT * FROM ${identifier(load.facts.table)} LIMIT 0`, load)).names;
  const treeOptions = {
    rootName: load.rootName,
    keepFields: load.keepFields,
    levelNames: load.facts.levels,
    maxNodes: load.maxNodes,
    rowsAreInput: load.rolledUp,
  };
  if (load.rolledUp) {
    const all = async () =>
      rollupTree(await run(engine, `SELECT * FROM ${identifier(load.facts.table)}`, load), treeOptions);
    return { size: 0, whole: all, near: all, close: () => engine.close() };
  }
  requireColumns(columns, load.facts);
  const hasSize = columns.includes(load.facts.sizeField);
  if (!hasSize && sizeFieldNamed(load.facts)) throw missingField("size", load.facts.sizeField, columns);
  const sized = (tree: Tree): Tree => (hasSize ? tree : { ...tree, hasSizes: false });
  const fetch = async (sql: string) => sized(rollupTree(await run(engine, sql, load), treeOptions));
  if (load.facts.levels.length === 0) {
    const levels = await keyLevels(engine, load, hasSize);
    if (levels !== undefined) {
      const { level, keys } = KEY_TABLES;
      let fetched: Columns | undefined;
      const keep = (rows: Columns) => {
        fetched = rows;
        return sized(rollupTree(rows, treeOptions));
      };
      return {
        size: levels.size,
        whole: () => fetch(levels.plan.resultSql(level, keys, false)),
        near: async (foci, reach) =>
          keep(await run(engine, levels.plan.resultSql(level, keys, true, { foci, reach }), load)),
        widen: async (parents) => {
          if (fetched === undefined) throw new Error("widen() before near()");
          const more = await run(engine, levels.plan.childrenSql(level, keys, parents), load);
          return keep(appendRows(fetched, more));
        },
        close: () => engine.close(),
      };
    }
  }
  // Level columns; or a key hierarchy with no key below the root: its total alone.
  const depth = load.facts.levels.length;
  await run(
    engine,
    `CREATE TABLE ${ROLLUP_TABLE} AS ${rollupSql(load.facts, depth, hasSize)}`,
    load,
    hasSize,
  );
  const size = Number((await run(engine, `SELECT COUNT(*) FROM ${ROLLUP_TABLE}`, load)).values[0][0]);
  let stats = false;
  return {
    size,
    whole: () => fetch(`SELECT * FROM ${ROLLUP_TABLE}\n${preOrderSql(depth)}`),
    near: async (foci, reach) => {
      if (!stats) {
        await run(engine, `CREATE TABLE ${STATS_TABLE} AS ${statsSql(ROLLUP_TABLE, depth)}`, load);
        stats = true;
      }
      return fetch(reachSql(STATS_TABLE, depth, foci, reach));
    },
    close: () => engine.close(),
  };
}

/**
 * A key hierarchy rolled up level by level in the engine (KeyLevels): the rows grouped by key once,
 * then each depth's nodes from the one below, into the tables KEY_TABLES names. Undefined when the
 * table has no key deeper than the root (no key, or only NULL keys): rollupSql's total is then the tree.
 */
async function keyLevels(
  engine: Engine,
  load: FactLoad,
  hasSize: boolean,
): Promise<{ plan: KeyLevels; size: number } | undefined> {
  const { keys, level } = KEY_TABLES;
  if (load.facts.keyDepth === 0) return undefined;
  const partRows =
    load.partRows ?? Math.floor(bytesOf(load.engine?.memoryLimit ?? MEMORY_LIMIT) / GROUP_BYTES);
  // The keys grouped in parts when the table may have more rows than a part holds (every row may be a
  // key of its own); then every table keeps its rows' hashes for the groupings in parts that follow.
  const keyParts = partsFor(await rowEstimate(engine, load), partRows);
  const hashed = keyParts > 1;
  const keysStep = keysSql(load.facts, hasSize, load.facts.keyDepth, undefined, hashed);
  await runInParts(
    engine,
    load,
    keys,
    keysStep,
    (part) => keysSql(load.facts, hasSize, load.facts.keyDepth, part, hashed),
    keyParts,
    hasSize,
  );
  const deepest = (await run(engine, `SELECT MAX(d) FROM ${keys}`, load)).values[0][0];
  if (deepest === null || deepest === undefined || Number(deepest) === 0) return undefined;
  const plan = new KeyLevels(load.facts, Number(deepest), hasSize);
  // The steps --print-sql prints (printedSql; with hashes, those with h), the keys table's already run.
  const [first, ...rest] = plan.steps(load.facts.keyDepth, hashed);
  if (first.table !== keys || first.sql !== keysStep)
    throw new Error("keyLevels: the plan's first step differs");
  // Keys by depth, and each level's nodes once made: a level has at most as many groups as the nodes
  // one level deeper plus its keys, and no more than there are keys (each node has a key under it).
  const byDepth = new Map<number, number>();
  const depths = await run(engine, `SELECT d, COUNT(*) FROM ${keys} GROUP BY d`, load);
  let keyCount = 0;
  for (let r = 0; r < depths.rowCount; r++) {
    byDepth.set(Number(depths.values[0][r]), Number(depths.values[1][r]));
    keyCount += Number(depths.values[1][r]);
  }
  let below = 0;
  for (const step of rest) {
    const groups = Math.min(keyCount, below + (byDepth.get(step.depth ?? 0) ?? 0));
    const parts = step.inPart === undefined ? 1 : partsFor(groups, partRows);
    await runInParts(engine, load, step.table, step.sql, step.inPart, parts);
    below = Number((await run(engine, `SELECT COUNT(*) FROM ${step.table}`, load)).values[0][0]);
  }
  const counts = Array.from({ length: plan.depth + 1 }, (_, j) => `(SELECT COUNT(*) FROM ${level(j)})`);
  const counted = await run(
    engine,
    `SELECT ${counts.join(" + ")} + (SELECT COUNT(*) FROM ${keys} WHERE d IS NULL OR d < ${plan.depth})`,
    load,
  );
  return { plan, size: Number(counted.values[0][0]) };
}

/**
 * Makes the working table `table` from `sql`; in `parts` parts (each a statement of `inPart`, the
 * first making the table, the others appending to it) when there are more than one.
 */
async function runInParts(
  engine: Engine,
  load: FactLoad,
  table: string,
  sql: string,
  inPart: ((part: Part) => string) | undefined,
  parts: number,
  hasSize = false,
): Promise<void> {
  if (parts <= 1 || inPart === undefined) {
    await run(engine, `CREATE TABLE ${table} AS ${sql}`, load, hasSize);
    return;
  }
  for (let index = 0; index < parts; index++) {
    const part = inPart({ of: parts, index });
    await run(
      engine,
      index === 0 ? `CREATE TABLE ${table} AS ${part}` : `INSERT INTO ${table} ${part}`,
      load,
      hasSize,
    );
  }
}

/** How many parts a grouping of up to `groups` groups takes, at most `partRows` a part. */
function partsFor(groups: number, partRows: number): number {
  return Math.max(1, Math.ceil(groups / Math.max(1, partRows)));
}

/**
 * How many rows the table has, without reading it all: a Parquet file says (the engine reads the count
 * from its metadata); a text file's is estimated from its first lines (textRowEstimate).
 */
async function rowEstimate(engine: Engine, load: FactLoad): Promise<number> {
  if (load.format !== "parquet") return textRowEstimate(load.file);
  const counted = await run(engine, `SELECT COUNT(*) FROM ${identifier(load.facts.table)}`, load);
  return Number(counted.values[0][0]);
}

/** Bytes of an engine memory setting such as "1GB" or "512MB" (decimal or binary units). */
function bytesOf(setting: string): number {
  const m = /^\s*([\d.]+)\s*([KMGT]?i?B)?\s*$/i.exec(setting);
  if (!m) return 1e9;
  const unit = (m[2] ?? "B").toUpperCase();
  const power = { B: 0, KB: 1, MB: 2, GB: 3, TB: 4, KIB: 1, MIB: 2, GIB: 3, TIB: 4 }[unit] ?? 0;
  return Number(m[1]) * (unit.includes("I") ? 1024 : 1000) ** power;
}

/** The rows of `b` after those of `a`, two results of the same columns. */
function appendRows(a: Columns, b: Columns): Columns {
  if (a.names.join("\u0000") !== b.names.join("\u0000"))
    throw new Error(`appendRows: columns differ (${a.names.join(", ")} / ${b.names.join(", ")})`);
  return {
    names: a.names,
    values: a.values.map((column, c) => [...column, ...b.values[c]]),
    rowCount: a.rowCount + b.rowCount,
  };
}

/** The deepest key of a key hierarchy in `file`, as the engine finds it (for the printed query). */
export async function deepestKey(file: string, format: FactFormat, facts: FactOptions): Promise<number> {
  const load: FactLoad = { file, format, facts, rolledUp: false, rootName: "", keepFields: [], maxNodes: 0 };
  const header = await headerOf(load);
  const engine = await openEngine();
  try {
    await run(engine, sourceViewSql(facts.table, file, format, header), load);
    requireColumns(
      (await run(engine, `SELECT * FROM ${identifier(facts.table)} LIMIT 0`, load)).names,
      facts,
    );
    return await keyDepth(engine, { ...load, facts: { ...facts, keyDepth: undefined } });
  } finally {
    engine.close();
  }
}

/** The deepest key level: given, or asked of the engine (0 for a table without keys). */
async function keyDepth(engine: Engine, load: FactLoad): Promise<number> {
  if (load.facts.keyDepth !== undefined) return load.facts.keyDepth;
  const result = await run(engine, keyDepthSql(load.facts), load);
  const value = result.values[0]?.[0];
  return value === null || value === undefined ? 0 : Number(value);
}

function requireColumns(columns: readonly string[], facts: FactOptions): void {
  const wanted =
    facts.levels.length > 0 ? facts.levels : facts.keyField === undefined ? [] : [facts.keyField];
  const missing = wanted.filter((name) => !columns.includes(name));
  if (missing.length > 0) {
    throw new EspalierError(
      "FIELD_MISSING",
      say`the table has no column ${quotedList("name", missing)}; columns: ${quotedList("name", columns, 40)}`,
    );
  }
}

/**
 * Runs one statement; the engine's complaints become typed errors: a malformed CSV row is PARSE_CSV at
 * its line, a size that is not a number is BAD_SIZE, anything else ENGINE_FAILED.
 */
async function run(engine: Engine, sql: string, load: FactLoad, hasSize = false): Promise<Columns> {
  try {
    return await engine.run(sql);
  } catch (err) {
    if (!(err instanceof EspalierError)) throw err;
    const csvLine = /CSV Error on Line: (\d+)/.exec(err.message);
    if (csvLine) {
      throw new EspalierError(
        "PARSE_CSV",
        say`${input.excerpt(err.message.replace(/^the SQL engine reported: /, ""))}`,
        {
          line: Number(csvLine[1]),
        },
      );
    }
    if (hasSize && /Conversion Error/i.test(err.message)) {
      throw new EspalierError(
        "BAD_SIZE",
        say`a value of the size column ${JSON.stringify(load.facts.sizeField)} is not a number (${input.excerpt(err.message)})`,
      );
    }
    throw err;
  }
}

/** The header row's names of a CSV or TSV input; none for the formats that name their own columns. */
function headerOf(load: FactLoad): Promise<string[]> | string[] {
  if (load.format === "csv") return readHeader(load.file, ",");
  if (load.format === "tsv") return readHeader(load.file, "\t");
  return [];
}
