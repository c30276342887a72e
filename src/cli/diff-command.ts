import { totalChanges } from "../diff/changes.js";
import { type DiffOptions, prepareDiff, summarizeDiff } from "../diff/diff-trees.js";
import { keyMostRows } from "../render/key-line.js";
import type { CommandOutput } from "./command-output.js";
import { loadCompared } from "./compared-fields.js";
import { comparisonNotes } from "./comparison-notes.js";
import { EXIT } from "./exit-codes.js";
import { fitToBudget } from "./fit-to-budget.js";
import { generalDiff } from "./general-diff.js";
import { pseudonymKey, readFoci, unmatchedWarning } from "./input.js";
import type { CliIO } from "./io.js";
import type { DiffCliOptions } from "./options.js";
import {
  budgetLines,
  comparedSaid,
  defaultBudget,
  headerLinesFor,
  keyRowsFor,
  legendInError,
  outputSettings,
  sizeNameOf,
} from "./output-settings.js";
import { diffHeaderRows, diffLines, diffRenderers } from "./renderers.js";

/** Reads, compares and renders two versions; returns the text to print and the exit code. */
export async function diffCommand(
  oldInput: string,
  newInput: string,
  opts: DiffCliOptions,
  io: CliIO,
): Promise<CommandOutput> {
  // What the sizes measure, known once both versions are read: the legend says it.
  const read: { sizeName?: string } = {};
  try {
    return await diffOutput(oldInput, newInput, opts, io, read);
  } catch (err) {
    throw legendInError(err, opts, "diff", io, read.sizeName);
  }
}

async function diffOutput(
  oldInput: string,
  newInput: string,
  opts: DiffCliOptions,
  io: CliIO,
  read: { sizeName?: string },
): Promise<CommandOutput> {
  const foci = await readFoci(io, opts, [oldInput, newInput]);
  const key = pseudonymKey(opts, io);
  const compared = await loadCompared(io, oldInput, newInput, opts);
  const [oldTree, newTree] = compared.trees;
  const sizeName = sizeNameOf(opts, [oldTree, newTree]);
  read.sizeName = sizeName;
  const compareFields = compared.fields;
  const prepared = prepareDiff(oldTree, newTree, {
    compareFields,
    fieldsOptional: compared.optional,
    generalPath: generalDiff(io.env),
  });
  const versions = comparisonNotes(prepared, [oldTree, newTree], [oldInput, newInput], io, key);
  const options: DiffOptions = {
    foci,
    budget: opts.budget ?? defaultBudget(io),
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: key,
    chains: opts.chains,
    headerLines: headerLinesFor(opts, "diff", io, sizeName),
    spareLines: keyRowsFor(opts, io),
    siblingOrder: opts.siblingOrder,
    unmatchedFoci: opts.unmatchedFoci,
  };
  const { tree } = prepared.combined;
  const settings = {
    ...outputSettings(opts, io, tree, versions),
    compared: comparedSaid(compareFields, [oldTree, newTree]),
  };
  // The text's key rows are counted in every format, so every format shows the same nodes.
  const { diffKeyInPart, diffKeyRows } = await import("../render/diff-text.js");
  // A header wider than the line wraps, and the budget counts its lines: fitted with them counted.
  const { result, keyLeftOut, keyRows, keyInPart } = fitToBudget(
    {
      fit: (budget, before, spare) =>
        summarizeDiff(prepared, { ...options, budget, headerLines: before, spareLines: spare }),
      headerRows: (r, budget, left) => diffHeaderRows(r, { ...settings, budget, keyLeftOut: left }, tree),
      keyRowsOf: (r, budget) =>
        diffKeyRows(
          r.view,
          diffLines(r, { ...settings, budget }, tree.hasSizes),
          keyMostRows(budget, settings.width),
        ),
      keyInPartSays: (r, budget, rows) =>
        diffKeyInPart(r.view, diffLines(r, { ...settings, budget }, tree.hasSizes), rows),
      ...budgetLines(opts, "diff", io, sizeName),
      canGrow: true,
    },
    options.budget,
  );
  if (result.unmatchedFoci.length > 0) io.stderr.write(unmatchedWarning(result.unmatchedFoci));
  const text = await diffRenderers[opts.format](
    result,
    { ...settings, keyLeftOut, keyRows, keyInPart },
    tree,
  );
  const differ = totalChanges(result.totals.changes) > 0;
  return { text, exitCode: opts.failOnChange && differ ? EXIT.differences : EXIT.ok };
}
