import { EspalierError } from "../errors.js";
import type { Tree } from "../model/tree.js";
import { prepare, type SummarizeOptions, type SummaryResult, summarize } from "../summarize.js";
import { isFactInput, summarizeFactInput } from "./fact-input.js";
import { displayName, loadInput, pseudonymKey, readFoci, rootNameOf, unmatchedWarning } from "./input.js";
import type { CliIO } from "./io.js";
import type { SharedCliOptions, SummaryCliOptions } from "./options.js";
import {
  defaultBudget,
  headerLinesFor,
  keyRowsFor,
  legendInError,
  outputSettings,
} from "./output-settings.js";
import { summaryHeaderRows, summaryRenderers } from "./renderers.js";

/** Reads, summarises and renders one input; returns the text to print (nothing is printed here). */
export async function summaryCommand(input: string, opts: SummaryCliOptions, io: CliIO): Promise<string> {
  try {
    return await summaryText(input, opts, io);
  } catch (err) {
    throw legendInError(err, opts, "summary", io);
  }
}

async function summaryText(input: string, opts: SummaryCliOptions, io: CliIO): Promise<string> {
  const foci = await readFoci(io, opts, [input]);
  const options: SummarizeOptions = {
    foci,
    budget: opts.budget ?? defaultBudget(io),
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: pseudonymKey(opts, io),
    chains: opts.chains,
    unmatchedFoci: opts.unmatchedFoci,
    headerLines: headerLinesFor(opts, "summary", io),
    spareLines: keyRowsFor(opts, io),
    siblingOrder: opts.siblingOrder,
  };
  const { tree, result: first, again } = await summarizeInput(io, input, opts, options);
  const settings = outputSettings(opts, io, tree);
  // A header wider than the line wraps, and the budget counts its lines: fit again with them counted.
  const extra = summaryHeaderRows(first, settings, tree) - 1;
  const result = extra > 0 ? again({ ...options, headerLines: (options.headerLines ?? 1) + extra }) : first;
  if (result.unmatchedFoci.length > 0) io.stderr.write(unmatchedWarning(result.unmatchedFoci));
  return summaryRenderers[opts.format](result, settings, tree);
}

/**
 * Loads and summarises one input, and says how to fit it again (with other options). A fact table is summarised as it is fetched: only as deep as the
 * summary reaches (see fact-input.ts); any other input is loaded whole, then summarised.
 */
async function summarizeInput(
  io: CliIO,
  input: string,
  opts: SharedCliOptions,
  options: SummarizeOptions,
): Promise<{ tree: Tree; result: SummaryResult; again: (o: SummarizeOptions) => SummaryResult }> {
  if (!isFactInput(opts)) {
    const tree = await loadInput(io, input, opts);
    const prepared = prepare(tree);
    return { tree, result: summarize(prepared, options), again: (o) => summarize(prepared, o) };
  }
  try {
    // A fact table's tree holds every node a fit of `options.budget` lines shows, so every fit of
    // fewer lines too (a fit is a prefix of one best-first order).
    const { tree, result } = await summarizeFactInput(input, opts, options, rootNameOf(input));
    return { tree, result, again: (o) => summarize(prepare(tree), o) };
  } catch (err) {
    throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
  }
}
