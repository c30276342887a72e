import { EspalierError } from "../errors.js";
import type { Tree } from "../model/tree.js";
import { keyMostRows } from "../render/key-line.js";
import { summaryKeyInPart, summaryKeyRows } from "../render/summary-text.js";
import { prepare, type SummarizeOptions, type SummaryResult, summarize } from "../summarize.js";
import { isFactInput, summarizeFactInput } from "./fact-input.js";
import { fitToBudget } from "./fit-to-budget.js";
import { displayName, loadInput, pseudonymKey, readFoci, rootNameOf, unmatchedWarning } from "./input.js";
import type { CliIO } from "./io.js";
import type { SharedCliOptions, SummaryCliOptions } from "./options.js";
import {
  budgetLines,
  defaultBudget,
  headerLinesFor,
  keyRowsFor,
  legendInError,
  outputSettings,
} from "./output-settings.js";
import { summaryHeaderRows, summaryRenderers, summaryTextOptions } from "./renderers.js";

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
  const { tree, fit: fitWith, canGrow } = await summarizeInput(io, input, opts, options);
  const settings = outputSettings(opts, io, tree);
  // A header wider than the line wraps, and the budget counts its lines: fitted with them counted.
  const { result, keyLeftOut, keyRows, keyInPart } = fitToBudget(
    {
      fit: (budget, before, spare) => fitWith({ ...options, budget, headerLines: before, spareLines: spare }),
      headerRows: (r, budget, left) => summaryHeaderRows(r, { ...settings, budget, keyLeftOut: left }, tree),
      keyRowsOf: (r, budget) =>
        summaryKeyRows(
          r.view,
          summaryTextOptions(r, { ...settings, budget }, tree),
          keyMostRows(budget, settings.width),
        ),
      keyInPartSays: (r, budget, rows) =>
        summaryKeyInPart(r.view, summaryTextOptions(r, { ...settings, budget }, tree), rows),
      ...budgetLines(opts, "summary", io),
      canGrow,
    },
    options.budget,
  );
  if (result.unmatchedFoci.length > 0) io.stderr.write(unmatchedWarning(result.unmatchedFoci));
  return summaryRenderers[opts.format](result, { ...settings, keyLeftOut, keyRows, keyInPart }, tree);
}

/**
 * Loads one input and says how to fit it (with any options): a fact table is summarised as it is
 * fetched, only as deep as the summary reaches (see fact-input.ts), so its fits may not grow past
 * the budget asked (`canGrow`); any other input is loaded whole, and fits at any budget.
 */
async function summarizeInput(
  io: CliIO,
  input: string,
  opts: SharedCliOptions,
  options: SummarizeOptions,
): Promise<{ tree: Tree; fit: (o: SummarizeOptions) => SummaryResult; canGrow: boolean }> {
  if (!isFactInput(opts)) {
    const tree = await loadInput(io, input, opts);
    const prepared = prepare(tree);
    return { tree, fit: (o) => summarize(prepared, o), canGrow: true };
  }
  try {
    // A fact table's tree holds every node a fit of `options.budget` lines shows, so every fit of
    // fewer lines too (a fit is a prefix of one best-first order).
    const { tree } = await summarizeFactInput(input, opts, options, rootNameOf(input));
    const prepared = prepare(tree);
    return { tree, fit: (o) => summarize(prepared, o), canGrow: false };
  } catch (err) {
    throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
  }
}
