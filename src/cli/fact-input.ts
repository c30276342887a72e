import { EspalierError } from "../errors.js";
import { type FactFormat, type FactOptions, factFormatOf } from "../load/facts/fact-options.js";
import type { FactLoad, FactSession } from "../load/facts/load-facts.js";
import { checkPathListOptions } from "../load/path-list/path-list-options.js";
import { checkShortRowsFormat } from "../load/table/short-rows-format.js";
import { parseSegment, splitPath } from "../model/segment.js";
import type { Tree } from "../model/tree.js";
import { prepare, type SummarizeOptions, type SummaryResult, summarize } from "../summarize.js";
import { templateFields } from "../view/label.js";
import type { SharedCliOptions, SummaryCliOptions } from "./options.js";

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

/** Fact-table options that read something only in some runs: each with its flag and what it needs. */
const FACT_OPTION_NEEDS = {
  keySeparator: { flag: "--key-separator", needs: "key" },
  keyDepth: { flag: "--key-depth", needs: "key" },
  sqlTable: { flag: "--sql-table", needs: "print" },
  sqlReach: { flag: "--sql-reach", needs: "print" },
  pushdown: { flag: "--pushdown", needs: "summary" },
} as const;

/**
 * USAGE for a fact-table option given as a flag where it reads nothing, rather than a run that
 * silently ignores it: any of them on an input that is no fact table; `--key-separator` and
 * `--key-depth` without `--key-field`; `--sql-table` and `--sql-reach` without `--print-sql`;
 * `--pushdown` outside a summary (`command`). A config file's values are not checked: a file serves
 * many runs.
 */
export function checkFactOptionsRead(
  opts: SharedCliOptions & { printSql?: boolean },
  fromConfig: ReadonlySet<string>,
  command: string,
): void {
  const fact = isFactInput(opts);
  for (const [key, { flag, needs }] of Object.entries(FACT_OPTION_NEEDS)) {
    if (!opts.named?.has(key) || fromConfig.has(key)) continue;
    const why = !fact
      ? "applies to fact tables (read with --levels, --key-field or --rolled-up), and this input is none"
      : needs === "key" && opts.keyField === undefined
        ? "applies to a key split into levels (--key-field) only"
        : needs === "print" && opts.printSql !== true
          ? "shapes the --print-sql query only"
          : needs === "summary" && command !== "summary"
            ? `applies to a summary only, not to espalier ${command}`
            : undefined;
    if (why !== undefined)
      throw new EspalierError("USAGE", `${flag} ${why}: it would change nothing here`, undefined, {
        option: flag,
      });
  }
}

/** How the options say a fact table forms a hierarchy. */
export function factOptionsOf(opts: SharedCliOptions): FactOptions {
  const levels = opts.levels === undefined ? [] : opts.levels.split(",").map((c) => c.trim());
  if (levels.some((c) => c === "")) throw new EspalierError("USAGE", "--levels has an empty column name");
  checkPathListOptions("fact table", {
    nulSeparated: opts.nulSeparated,
    folderSizes: opts.folderSizes === "auto" ? undefined : opts.folderSizes,
  });
  checkShortRowsFormat("fact table", opts.shortRows === "fill" ? { shortRows: "fill" } : {});
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
    ...(opts.named?.has("sizeField") ? { sizeFieldNamed: true } : {}),
    keyDepth: opts.keyDepth,
    table: opts.sqlTable,
  };
}

/**
 * Loads a fact table through the embedded engine. The loader (and through it the engine) is imported
 * here, when a fact table is read, never at start-up.
 */
export async function loadFactInput(input: string, opts: SharedCliOptions, rootName: string): Promise<Tree> {
  const { loadFactTable } = await import("../load/facts/load-facts.js");
  return loadFactTable(factLoadOf(input, opts, rootName));
}

function factLoadOf(input: string, opts: SharedCliOptions, rootName: string): FactLoad {
  if (input === "-") {
    throw new EspalierError(
      "USAGE",
      "a fact table is read from a file, not standard input: the SQL engine streams the file itself",
    );
  }
  return {
    file: input,
    format: factFormat(input, opts),
    facts: factOptionsOf(opts),
    rolledUp: opts.rolledUp,
    rootName,
    keepFields: opts.label ? templateFields(opts.label) : [],
    maxNodes: opts.maxNodes ?? Number.POSITIVE_INFINITY,
  };
}

/** With `--pushdown auto`, a rollup with more rows than this is fetched only as deep as the summary reaches. */
export const PUSHDOWN_FROM = 1_000_000;

/**
 * Loads and summarises a fact table. A small rollup is fetched whole. A big one (or any, with
 * `--pushdown always`) is fetched only near the focus paths: the nodes within `reach` levels of them,
 * each other node counted in its nearest fetched ancestor. The summary is exact when no shown node has
 * unfetched children, since then the fit meets exactly the nodes it meets on the whole tree, with the
 * same counts, sizes and order; otherwise the children of the shown nodes that lack them are fetched
 * (a key hierarchy) or the reach grows by one (level columns), and the summary is made again. A
 * rolled-up input that is too shallow for the summary is SHAPE, with the reach to ask for.
 */
export async function summarizeFactInput(
  input: string,
  opts: SharedCliOptions,
  options: SummarizeOptions,
  rootName: string,
): Promise<{ tree: Tree; result: SummaryResult }> {
  const { openFactTable } = await import("../load/facts/load-facts.js");
  const session = await openFactTable(factLoadOf(input, opts, rootName));
  try {
    const pushdown =
      opts.pushdown === "always" ||
      (opts.pushdown === "auto" && session.size > PUSHDOWN_FROM) ||
      opts.rolledUp;
    return await summarizeFactSession(session, options, pushdown, opts.rolledUp);
  } finally {
    session.close();
  }
}

/** The loop of {@link summarizeFactInput} on an open fact table (see there). */
export async function summarizeFactSession(
  session: FactSession,
  options: SummarizeOptions,
  pushdown: boolean,
  rolledUp: boolean,
): Promise<{ tree: Tree; result: SummaryResult }> {
  const foci = literalFoci(options);
  if (!pushdown || foci === undefined || options.importance !== "depth") {
    const tree = await session.whole();
    const result = summarize(prepare(tree), options);
    if (rolledUp) exactOrShallow(tree, result);
    return { tree, result };
  }
  let tree = await session.near(foci, 2);
  for (let reach = 2; ; ) {
    const result = summarize(prepare(tree), options);
    if (rolledUp) {
      exactOrShallow(tree, result);
      return { tree, result };
    }
    const cut = cutShown(tree, result);
    if (cut.length === 0) return { tree, result };
    // Fetch the missing families themselves where the engine can; else everything one level further.
    const before = tree.length;
    tree = session.widen
      ? await session.widen(cut.map((i) => pathOf(tree, i)))
      : await session.near(foci, ++reach);
    if (tree.length <= before) throw new Error("fact table pushdown: a fetch added no nodes");
  }
}

/** Shown nodes with descendants that were not fetched. */
function cutShown(tree: Tree, result: SummaryResult): number[] {
  const { elided } = tree;
  if (!elided) return [];
  return [...result.selection.admitted].filter((i) => elided[i] > 0);
}

/** Names from the root's child down to node `i`. */
function pathOf(tree: Tree, i: number): string[] {
  const names: string[] = [];
  for (let x = i; x > 0; x = tree.parent[x]) names.push(tree.name.get(x));
  return names.reverse();
}

/** Whether no shown node has descendants that were not fetched. */
function reachesFar(tree: Tree, result: SummaryResult): boolean {
  const { elided } = tree;
  if (!elided) return true;
  for (const i of result.selection.admitted) if (elided[i] > 0) return false;
  return true;
}

function exactOrShallow(tree: Tree, result: SummaryResult): void {
  if (reachesFar(tree, result)) return;
  throw new EspalierError(
    "SHAPE",
    "the rollup result stops above nodes this summary shows: print the query again with a larger " +
      "--sql-reach (or a smaller --budget), run it, and read its result",
  );
}

/**
 * The foci as lists of names when every one is an exact path (no glob, no pseudonym); else undefined.
 * Lines of a focus list (which may start at the root's own name) take the whole tree too.
 */
function literalFoci(options: SummarizeOptions): string[][] | undefined {
  const out: string[][] = [];
  for (const spec of options.foci) {
    if (typeof spec !== "string") return undefined;
    if (spec.includes("*")) return undefined;
    if (options.pseudonymKey !== undefined && spec.includes("anon-")) return undefined;
    out.push(splitPath(spec).map((raw) => parseSegment(raw).name));
  }
  return out;
}

/**
 * `--print-sql`: the rollup query in standard SQL over the table `--sql-table`. A key hierarchy's depth
 * comes from --key-depth, else from the input file (the engine reads its deepest key).
 */
export async function printSqlCommand(input: string | undefined, opts: SummaryCliOptions): Promise<string> {
  const facts = factOptionsOf(opts);
  if (opts.rolledUp)
    throw new EspalierError("USAGE", "--print-sql prints the query whose result --rolled-up reads");
  const { printedSql } = await import("../load/facts/printed-sql.js");
  const foci =
    opts.sqlReach === undefined ? undefined : literalFoci({ ...opts, foci: opts.focus, budget: 1 });
  if (opts.sqlReach !== undefined && foci === undefined)
    throw new EspalierError("USAGE", "--sql-reach needs foci given as exact paths (no globs)");
  const reach = opts.sqlReach === undefined ? undefined : { foci: foci ?? [], reach: opts.sqlReach };
  if (facts.levels.length > 0) return printedSql(facts, facts.levels.length, reach);
  if (facts.keyDepth !== undefined) return printedSql(facts, facts.keyDepth, reach);
  if (input === undefined || input === "-") {
    throw new EspalierError(
      "USAGE",
      "--print-sql with --key-field needs --key-depth N, or the table as input",
    );
  }
  const { deepestKey } = await import("../load/facts/load-facts.js");
  return printedSql(facts, await deepestKey(input, factFormat(input, opts), facts), reach);
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
