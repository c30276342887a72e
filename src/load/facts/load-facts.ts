import { tmpdir } from "node:os";
import { EspalierError, quoted as input, quotedList, say } from "../../errors.js";
import type { Tree } from "../../model/tree.js";
import { missingField, sizeFieldNamed } from "../missing-field.js";
import { type Columns, type Engine, type EngineSettings, openEngine } from "./engine.js";
import type { FactFormat, FactOptions } from "./fact-options.js";
import { KEY_TABLES, KeyLevels, keysSql } from "./key-levels-sql.js";
import { ROLLUP_TABLE, STATS_TABLE } from "./printed-sql.js";
import { reachSql, statsSql } from "./pushdown-sql.js";
import { readHeader } from "./read-header.js";
import { identifier, keyDepthSql, rollupSql } from "./rollup-sql.js";
import { rollupTree } from "./rollup-tree.js";
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
}

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
  const engine = await openEngine({ memoryLimit: "1GB", tempDirectory: tmpdir(), ...load.engine });
  try {
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
      `CREATE TEMPORARY TABLE ${ROLLUP_TABLE} AS ${rollupSql(load.facts, depth, hasSize)}`,
      load,
      hasSize,
    );
    const size = Number((await run(engine, `SELECT COUNT(*) FROM ${ROLLUP_TABLE}`, load)).values[0][0]);
    let stats = false;
    return {
      size,
      whole: () => fetch(`SELECT * FROM ${ROLLUP_TABLE}`),
      near: async (foci, reach) => {
        if (!stats) {
          await run(
            engine,
            `CREATE TEMPORARY TABLE ${STATS_TABLE} AS ${statsSql(ROLLUP_TABLE, depth)}`,
            load,
          );
          stats = true;
        }
        return fetch(reachSql(STATS_TABLE, depth, foci, reach));
      },
      close: () => engine.close(),
    };
  } catch (err) {
    engine.close();
    throw err;
  }
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
  const keysStep = keysSql(load.facts, hasSize, load.facts.keyDepth);
  await run(engine, `CREATE TEMPORARY TABLE ${keys} AS ${keysStep}`, load, hasSize);
  const deepest = (await run(engine, `SELECT MAX(d) FROM ${keys}`, load)).values[0][0];
  if (deepest === null || deepest === undefined || Number(deepest) === 0) return undefined;
  const plan = new KeyLevels(load.facts, Number(deepest), hasSize);
  // The steps --print-sql prints (printedSql), the keys table's already run.
  const [first, ...rest] = plan.steps(load.facts.keyDepth);
  if (first.table !== keys || first.sql !== keysStep)
    throw new Error("keyLevels: the plan's first step differs");
  for (const step of rest) await run(engine, `CREATE TEMPORARY TABLE ${step.table} AS ${step.sql}`, load);
  const counts = Array.from({ length: plan.depth + 1 }, (_, j) => `(SELECT COUNT(*) FROM ${level(j)})`);
  const counted = await run(
    engine,
    `SELECT ${counts.join(" + ")} + (SELECT COUNT(*) FROM ${keys} WHERE d IS NULL OR d < ${plan.depth})`,
    load,
  );
  return { plan, size: Number(counted.values[0][0]) };
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
