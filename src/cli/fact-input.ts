import { EspalierError } from "../errors.js";
import { type FactFormat, type FactOptions, factFormatOf } from "../load/facts/fact-options.js";
import type { Tree } from "../model/tree.js";
import { templateFields } from "../view/label.js";
import type { SharedCliOptions } from "./options.js";

/** Whether the options make the input a fact table (rolled up by the SQL engine). */
export function isFactInput(opts: SharedCliOptions): boolean {
  return (
    opts.levels !== undefined ||
    opts.keyField !== undefined ||
    opts.rolledUp ||
    opts.inputFormat === "parquet" ||
    opts.inputFormat === "jsonl"
  );
}

/** How the options say a fact table forms a hierarchy. */
export function factOptionsOf(opts: SharedCliOptions): FactOptions {
  const levels = opts.levels === undefined ? [] : opts.levels.split(",").map((c) => c.trim());
  if (levels.some((c) => c === "")) throw new EspalierError("USAGE", "--levels has an empty column name");
  if (levels.length > 0 && opts.keyField !== undefined)
    throw new EspalierError("USAGE", "give either --levels or --key-field, not both");
  if (levels.length === 0 && opts.keyField === undefined && !opts.rolledUp) {
    throw new EspalierError(
      "USAGE",
      "a fact table needs --levels COL,COL,… (level columns) or --key-field COL (a key split into levels)",
    );
  }
  return {
    levels,
    keyField: opts.keyField,
    separator: opts.keySeparator,
    sizeField: opts.sizeField,
    keyDepth: opts.keyDepth,
    table: opts.sqlTable,
  };
}

/**
 * Loads a fact table through the embedded engine. The loader (and through it the engine) is imported
 * here, when a fact table is read, never at start-up.
 */
export async function loadFactInput(input: string, opts: SharedCliOptions, rootName: string): Promise<Tree> {
  if (input === "-") {
    throw new EspalierError(
      "USAGE",
      "a fact table is read from a file, not standard input: the SQL engine streams the file itself",
    );
  }
  const format = factFormat(input, opts);
  const { loadFactTable } = await import("../load/facts/load-facts.js");
  return loadFactTable({
    file: input,
    format,
    facts: factOptionsOf(opts),
    rolledUp: opts.rolledUp,
    rootName,
    keepFields: opts.label ? templateFields(opts.label) : [],
    maxNodes: opts.maxNodes ?? Number.POSITIVE_INFINITY,
  });
}

/**
 * `--print-sql`: the rollup query in standard SQL over the table `--sql-table`. A key hierarchy's depth
 * comes from --key-depth, else from the input file (the engine reads its deepest key).
 */
export async function printSqlCommand(input: string | undefined, opts: SharedCliOptions): Promise<string> {
  const facts = factOptionsOf(opts);
  if (opts.rolledUp)
    throw new EspalierError("USAGE", "--print-sql prints the query whose result --rolled-up reads");
  const { rollupSql } = await import("../load/facts/rollup-sql.js");
  const hasSize = true;
  if (facts.levels.length > 0) return `${rollupSql(facts, facts.levels.length, hasSize)};\n`;
  if (facts.keyDepth !== undefined) return `${rollupSql(facts, facts.keyDepth, hasSize)};\n`;
  if (input === undefined || input === "-") {
    throw new EspalierError(
      "USAGE",
      "--print-sql with --key-field needs --key-depth N, or the table as input",
    );
  }
  const { deepestKey } = await import("../load/facts/load-facts.js");
  const depth = await deepestKey(input, factFormat(input, opts), facts);
  return `${rollupSql(facts, depth, hasSize)};\n`;
}

function factFormat(input: string, opts: SharedCliOptions): FactFormat {
  const forced = opts.inputFormat;
  if (forced === "csv" || forced === "tsv" || forced === "parquet" || forced === "jsonl") return forced;
  if (forced !== undefined)
    throw new EspalierError("USAGE", `a fact table is CSV, TSV, JSON lines or Parquet, not ${forced}`);
  const format = factFormatOf(input);
  if (format === undefined) {
    throw new EspalierError(
      "FORMAT_UNKNOWN",
      "cannot tell the fact table's format from its name: give --input-format csv, tsv, jsonl or parquet",
      { file: input },
    );
  }
  return format;
}
