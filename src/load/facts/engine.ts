import { createRequire } from "node:module";
import { EspalierError, quoted, say } from "../../errors.js";
import { type ChunkedResult, resultColumns } from "./result-columns.js";

/** A query's result, column by column: values as the engine hands them to JavaScript. */
export interface Columns {
  readonly names: readonly string[];
  /**
   * `values[c][r]`: column c, row r; null for SQL NULL; numbers as numbers, 64- and 128-bit integers
   * beyond 2^53 - 1 as bigint (resultColumns).
   */
  readonly values: readonly (readonly unknown[])[];
  readonly rowCount: number;
}

/** The embedded SQL engine, as espalier uses it: run statements, read results, close. */
export interface Engine {
  run(sql: string): Promise<Columns>;
  close(): void;
}

/** Engine settings; memory is capped so the engine spills to disk rather than growing without bound. */
export interface EngineSettings {
  /** The engine's own memory cap, e.g. "1GB". */
  memoryLimit?: string;
  /** Worker threads; the engine's default (every core) when undefined. */
  threads?: number;
  /** Where the engine spills what does not fit its memory cap. */
  tempDirectory?: string;
  /**
   * A database file for the working tables (created; the caller removes it): their data is written to
   * the file and leaves memory when memory is short. Measured with 10M grouped keys under a 200 MB cap,
   * made in five parts: temporary tables of an in-memory instance ran out of memory, tables in a
   * database file did not.
   */
  databaseFile?: string;
  /** Told of each statement that ran: its text, milliseconds and result rows (tests, benchmarks). */
  onQuery?: (sql: string, ms: number, rows: number) => void;
}

/** The package that ships the engine; imported here and nowhere else, and only when a fact table is read. */
const PACKAGE = "@duckdb/node-api";

/**
 * Opens an in-memory instance of the embedded engine (DuckDB through `@duckdb/node-api`). The package
 * is an optional dependency with a native binary per platform: where it did not install, or its binary
 * does not load, this is ENGINE_MISSING with what to do, and nothing else in espalier is affected.
 * `from` names the package (tests name one that is not there).
 */
export async function openEngine(settings: EngineSettings = {}, from: string = PACKAGE): Promise<Engine> {
  let api: typeof import("@duckdb/node-api");
  try {
    api = engineApi(from);
  } catch (err) {
    throw new EspalierError(
      "ENGINE_MISSING",
      `fact tables need the SQL engine package ${from}, which is not installed or has no binary for ` +
        `this platform (${process.platform}-${process.arch}): ${firstLine(err)}. ` +
        `Install it with 'npm install ${from}', or run the query printed by --print-sql elsewhere ` +
        "and read its result here",
    );
  }
  const options: Record<string, string> = {};
  if (settings.memoryLimit !== undefined) options.memory_limit = settings.memoryLimit;
  if (settings.threads !== undefined) options.threads = String(settings.threads);
  if (settings.tempDirectory !== undefined) options.temp_directory = settings.tempDirectory;
  const instance = await api.DuckDBInstance.create(settings.databaseFile ?? ":memory:", options);
  const connection = await instance.connect();
  // The working tables are thrown away with the file: closing need not write them into it first.
  if (settings.databaseFile !== undefined) await connection.run("PRAGMA disable_checkpoint_on_shutdown");
  return {
    async run(sql: string): Promise<Columns> {
      let result: Awaited<ReturnType<typeof connection.run>>;
      const started = performance.now();
      try {
        result = await connection.run(sql);
      } catch (err) {
        throw engineFailed(err);
      }
      const columns = resultColumns(result as unknown as ChunkedResult);
      settings.onQuery?.(sql, performance.now() - started, columns.rowCount);
      return columns;
    },
    close(): void {
      connection.closeSync();
      instance.closeSync();
    },
  };
}

/**
 * The package's JavaScript layer. From the command line's bundle, the one-file copy scripts/bundle.js
 * writes beside it (engine-api-VERSION.cjs) when the installed native part (@duckdb/node-bindings, which
 * that copy loads) is the VERSION it was built against: one file to compile instead of some 120
 * modules. Anywhere else, or with another version installed, the package itself.
 */
function engineApi(from: string): typeof import("@duckdb/node-api") {
  // require, not import(): the package is CommonJS, and the command line's bundle runs as a script
  // whose import() would need an experimental engine hook (bin/load-bundle.js). Not named `require`,
  // so that the bundler leaves these calls to run time.
  const load = createRequire(import.meta.url);
  if (from === PACKAGE) {
    let copy: string | undefined;
    try {
      const { version } = load("@duckdb/node-bindings/package.json") as { version: string };
      copy = load.resolve(`./engine-api-${version}.cjs`);
    } catch {
      copy = undefined;
    }
    if (copy !== undefined) return load(copy) as typeof import("@duckdb/node-api");
  }
  return load(from) as typeof import("@duckdb/node-api");
}

/** An error the engine raised (a file it cannot read, a value it cannot convert), as ENGINE_FAILED. */
export function engineFailed(err: unknown): EspalierError {
  // The engine's words may quote the data (a value it cannot convert): an excerpt, hidden by --pseudonymize.
  return new EspalierError("ENGINE_FAILED", say`the SQL engine reported: ${quoted.excerpt(firstLine(err))}`);
}

function firstLine(err: unknown): string {
  const text = err instanceof Error ? err.message : String(err);
  return text.split("\n")[0];
}
