import { EspalierError } from "../errors.js";
import type { Tree } from "../model/tree.js";
import { prepare, type SummarizeOptions, type SummaryResult, summarize } from "../summarize.js";
import { isFactInput, summarizeFactInput } from "./fact-input.js";
import { displayName, loadInput, pseudonymKey, readFoci, rootNameOf, unmatchedWarning } from "./input.js";
import type { CliIO } from "./io.js";
import type { SharedCliOptions, SummaryCliOptions } from "./options.js";
import { defaultBudget, headerLinesFor, outputSettings } from "./output-settings.js";
import { summaryRenderers } from "./renderers.js";

/** Reads, summarises and renders one input; returns the text to print (nothing is printed here). */
export async function summaryCommand(input: string, opts: SummaryCliOptions, io: CliIO): Promise<string> {
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
    siblingOrder: opts.siblingOrder,
  };
  const { tree, result } = await summarizeInput(io, input, opts, options);
  if (result.unmatchedFoci.length > 0) io.stderr.write(unmatchedWarning(result.unmatchedFoci));
  return summaryRenderers[opts.format](result, outputSettings(opts, io, tree), tree);
}

/**
 * Loads and summarises one input. A fact table is summarised as it is fetched: only as deep as the
 * summary reaches (see fact-input.ts); any other input is loaded whole, then summarised.
 */
async function summarizeInput(
  io: CliIO,
  input: string,
  opts: SharedCliOptions,
  options: SummarizeOptions,
): Promise<{ tree: Tree; result: SummaryResult }> {
  if (!isFactInput(opts)) {
    const tree = await loadInput(io, input, opts);
    return { tree, result: summarize(prepare(tree), options) };
  }
  try {
    return await summarizeFactInput(input, opts, options, rootNameOf(input));
  } catch (err) {
    throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
  }
}
