import { EspalierError } from "../errors.js";
import { defaultLoadOptions, type LoadOptions } from "../load/load-options.js";
import { loadTreeFromStream } from "../load/stream/index.js";
import type { Tree } from "../model/tree.js";
import type { Units } from "../render/format-size.js";
import { palette } from "../render/palette.js";
import { renderText } from "../render/summary-text.js";
import { prepare, type SummaryResult, summarize } from "../summarize.js";
import { templateFields } from "../view/label.js";
import { isFactInput, loadFactInput, summarizeFactInput } from "./fact-input.js";
import type { CliIO } from "./io.js";
import {
  DEFAULT_BUDGET,
  PSEUDONYM_KEY_ENV,
  type SharedCliOptions,
  type SummaryCliOptions,
} from "./options.js";
import { withProgress } from "./progress.js";
import { FOCI_BOUND, readInput } from "./read-input.js";
import { readInputStream } from "./read-input-stream.js";

/** Reads, summarises and renders one input; returns the text to print (nothing is printed here). */
export async function summaryCommand(input: string, opts: SummaryCliOptions, io: CliIO): Promise<string> {
  // Errors leave through hidingInput in commands.ts (defineCommand), as every command's do.
  const foci = [...opts.focus];
  if (opts.focusFrom !== undefined) foci.push(...(await readFociFile(io, opts.focusFrom, input)));
  const key = pseudonymKey(opts, io);
  const budget = opts.budget ?? defaultBudget(io);
  const options = {
    foci,
    budget,
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: key,
    chains: opts.chains,
  };
  let tree: Tree;
  let result: SummaryResult;
  if (isFactInput(opts)) {
    // A fact table is summarised as it is fetched: only as deep as the summary reaches (see fact-input).
    try {
      ({ tree, result } = await summarizeFactInput(input, opts, options, rootNameOf(input)));
    } catch (err) {
      throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
    }
  } else {
    tree = await loadInput(io, input, opts);
    result = summarize(prepare(tree), options);
  }
  if (opts.format === "json") {
    // Each other output format is loaded when asked for: a start loads only what the run needs.
    const { renderJson } = await import("../render/summary-json.js");
    return renderJson(result.view, {
      budget,
      lines: result.selection.lines,
      foci: result.fociPaths,
      labels: opts.label !== undefined,
      ...(tree.reading ? { input: tree.reading } : {}),
    });
  }
  if (opts.format === "svg") {
    const { renderSvg } = await import("../render/icicle-svg.js");
    return renderSvg(result.view, { units: unitsFor(opts, tree), sizes: tree.hasSizes });
  }
  if (opts.format === "markdown") {
    const { renderMarkdown } = await import("../render/summary-markdown.js");
    return renderMarkdown(result.view, {
      units: unitsFor(opts, tree),
      sizes: tree.hasSizes,
      chains: opts.chains,
    });
  }
  return renderText(result.view, {
    units: unitsFor(opts, tree),
    sizes: tree.hasSizes,
    palette: palette(useColour(opts, io)),
    chains: opts.chains,
    width: opts.width ?? defaultWidth(io),
  });
}

/** Loads one input as every command does: a fact table rolled up, else any tree format, streamed. */
export async function loadInput(io: CliIO, input: string, opts: SharedCliOptions): Promise<Tree> {
  try {
    if (isFactInput(opts)) return await loadFactInput(input, opts, rootNameOf(input));
    const source = await readInputStream(io, input);
    // Streamed: no string ever holds the whole input, so inputs past the engine's longest string load too.
    const chunks = withProgress(source.chunks, io, displayName(input), source.size);
    return await loadTreeFromStream(chunks, toLoadOptions(input, opts));
  } catch (err) {
    throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
  }
}

export function toLoadOptions(input: string, opts: SharedCliOptions): LoadOptions {
  const format = opts.inputFormat;
  if (format === "parquet" || format === "jsonl")
    throw new EspalierError(
      "USAGE",
      `--input-format ${format} is read as a fact table: give --levels or --key-field`,
    );
  return {
    ...defaultLoadOptions,
    format,
    file: input === "-" ? undefined : input,
    nameField: opts.nameField,
    childrenField: opts.childrenField,
    sizeField: opts.sizeField,
    idField: opts.idField,
    parentField: opts.parentField,
    pathField: opts.pathField,
    keepFields: opts.label ? templateFields(opts.label) : [],
    rootName: rootNameOf(input),
    maxNodes: opts.maxNodes ?? Number.POSITIVE_INFINITY,
    ...(opts.readAs === "auto" ? {} : { readAs: opts.readAs }),
    ...(opts.nulSeparated ? { nulSeparated: true } : {}),
  };
}

/** The name of a root espalier adds: the input file's base name, `(stdin)` for standard input. */
export function rootNameOf(input: string): string {
  return input === "-" ? "(stdin)" : baseName(input);
}

export function displayName(input: string): string {
  return input === "-" ? "<stdin>" : input;
}

function baseName(path: string): string {
  const parts = path.split(/[\\/]/);
  return parts[parts.length - 1] || path;
}

/**
 * Sizes print as bytes when the loader says they count bytes (see src/load/size-unit.ts), else plain.
 * Without a loaded tree (a caller that decides before loading) the size field's name decides.
 */
export function unitsFor(opts: SharedCliOptions, tree?: Tree): Units {
  if (opts.units !== "auto") return opts.units;
  if (tree === undefined) return ["size", "bytes"].includes(opts.sizeField.toLowerCase()) ? "bytes" : "plain";
  return tree.reading?.sizeUnit === "bytes" ? "bytes" : "plain";
}

/** Colour only on a terminal, never with NO_COLOR set (no-color.org) or TERM=dumb, unless forced. */
export function useColour(opts: SharedCliOptions, io: CliIO): boolean {
  if (opts.color !== "auto") return opts.color === "always";
  if (io.env.NO_COLOR !== undefined && io.env.NO_COLOR !== "") return false;
  if (io.env.TERM === "dumb") return false;
  return io.stdout.isTTY === true;
}

/** The terminal's width when printing to one; no limit otherwise. */
export function defaultWidth(io: CliIO): number | undefined {
  return io.stdout.isTTY && io.stdout.columns && io.stdout.columns > 0 ? io.stdout.columns : undefined;
}

/** The terminal's height less one line for the prompt; 40 when not printing to a terminal. */
export function defaultBudget(io: CliIO): number {
  if (io.stdout.isTTY && io.stdout.rows && io.stdout.rows > 2) return io.stdout.rows - 1;
  return DEFAULT_BUDGET;
}

/** The secret of --pseudonymize (USAGE when it is on without one); undefined when it is off. */
export function pseudonymKey(opts: { pseudonymize?: boolean }, io: CliIO): string | undefined {
  if (!opts.pseudonymize) return undefined;
  const key = io.env[PSEUDONYM_KEY_ENV];
  if (!key) {
    throw new EspalierError(
      "USAGE",
      `--pseudonymize needs a secret in the environment variable ${PSEUDONYM_KEY_ENV} (keep it out of the log)`,
    );
  }
  return key;
}

async function readFociFile(io: CliIO, name: string, input: string): Promise<string[]> {
  if (name === "-" && input === "-")
    throw new EspalierError("USAGE", "standard input cannot hold both the tree and the foci");
  const text = await readInput(io, name, FOCI_BOUND);
  // One spec per line, taken verbatim (a name may begin or end with spaces); blank lines are skipped.
  return text.split(/\r?\n/).filter((line) => line !== "");
}
