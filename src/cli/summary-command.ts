import { prepare, summarize } from "../summarize.js";
import { loadInput, pseudonymKey, readFoci } from "./input.js";
import type { CliIO } from "./io.js";
import type { SummaryCliOptions } from "./options.js";
import { outputSettings } from "./output-settings.js";
import { summaryRenderers } from "./renderers.js";

/** Reads, summarises and renders one input; returns the text to print (nothing is printed here). */
export async function summaryCommand(input: string, opts: SummaryCliOptions, io: CliIO): Promise<string> {
  const foci = await readFoci(io, opts, [input]);
  const key = pseudonymKey(opts, io);
  const tree = await loadInput(io, input, opts);
  const settings = outputSettings(opts, io, tree);
  const result = summarize(prepare(tree), {
    foci,
    budget: settings.budget,
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: key,
    chains: opts.chains,
  });
  return summaryRenderers[opts.format](result, settings, tree);
}
