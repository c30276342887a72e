import { totalChanges } from "../diff/changes.js";
import { diffTrees } from "../diff/diff-trees.js";
import { EspalierError } from "../errors.js";
import type { LoadOptions } from "../load/load-options.js";
import { loadTreeFromStream } from "../load/stream/index.js";
import type { Tree } from "../model/tree.js";
import { renderDiffJson } from "../render/diff-json.js";
import { renderDiffMarkdown } from "../render/diff-markdown.js";
import { renderDiffText } from "../render/diff-text.js";
import { renderSvg } from "../render/icicle-svg.js";
import { palette } from "../render/palette.js";
import type { CommandOutput } from "./commands.js";
import { EXIT } from "./exit-codes.js";
import { isFactInput, loadFactInput } from "./fact-input.js";
import type { CliIO } from "./io.js";
import { type DiffCliOptions, PSEUDONYM_KEY_ENV } from "./options.js";
import { withProgress } from "./progress.js";
import { FOCI_BOUND, readInput } from "./read-input.js";
import { readInputStream } from "./read-input-stream.js";
import {
  defaultBudget,
  defaultWidth,
  displayName,
  rootNameOf,
  toLoadOptions,
  unitsFor,
  useColour,
} from "./summary-command.js";

/** Reads, compares and renders two versions; returns the text to print and the exit code. */
export async function diffCommand(
  oldInput: string,
  newInput: string,
  opts: DiffCliOptions,
  io: CliIO,
): Promise<CommandOutput> {
  if (oldInput === "-" && newInput === "-")
    throw new EspalierError("USAGE", "only one of the two versions can come from standard input");
  // Errors leave through hidingInput in commands.ts (defineCommand), as every command's do.
  return diffOf(oldInput, newInput, opts, io, pseudonymKey(opts, io));
}

async function diffOf(
  oldInput: string,
  newInput: string,
  opts: DiffCliOptions,
  io: CliIO,
  key: string | undefined,
): Promise<CommandOutput> {
  const foci = [...opts.focus];
  if (opts.focusFrom !== undefined) {
    if (opts.focusFrom === "-" && (oldInput === "-" || newInput === "-"))
      throw new EspalierError("USAGE", "standard input cannot hold both a version and the foci");
    const text = await readInput(io, opts.focusFrom, FOCI_BOUND);
    foci.push(...text.split(/\r?\n/).filter((line) => line !== ""));
  }
  const [oldTree, newTree] = isFactInput(opts)
    ? await loadFacts(oldInput, newInput, opts)
    : await loadTables(io, oldInput, newInput, opts);
  const budget = opts.budget ?? defaultBudget(io);
  const result = diffTrees(oldTree, newTree, {
    foci,
    budget,
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: key,
    chains: opts.chains,
  });
  const by = result.combined.by;
  const textOptions = {
    units: unitsFor(opts, result.combined.tree),
    sizes: result.combined.tree.hasSizes,
    by,
    palette: palette(useColour(opts, io)),
    chains: opts.chains,
    width: opts.width ?? defaultWidth(io),
  };
  const text =
    opts.format === "svg"
      ? renderSvg(result.view, {
          units: textOptions.units,
          sizes: textOptions.sizes,
          changeOf: (n) => n.change,
        })
      : opts.format === "markdown"
        ? renderDiffMarkdown(result.view, result.totals, textOptions)
        : opts.format === "json"
          ? renderDiffJson(result.view, result.totals, {
              budget,
              lines: result.selection.lines,
              foci: result.fociPaths,
              by,
              labels: opts.label !== undefined,
            })
          : renderDiffText(result.view, result.totals, textOptions);
  const differ = totalChanges(result.totals.changes) > 0;
  return { text, exitCode: opts.exitCode && differ ? EXIT.differences : EXIT.ok };
}

function loadTables(
  io: CliIO,
  oldInput: string,
  newInput: string,
  opts: DiffCliOptions,
): Promise<[Tree, Tree]> {
  const newOptions = toLoadOptions(newInput, opts);
  // Both versions get the same synthetic root name, so that it never shows as a change.
  const oldOptions = { ...toLoadOptions(oldInput, opts), rootName: newOptions.rootName };
  return loadBoth(io, oldInput, oldOptions, newInput, newOptions);
}

/** Two fact tables, one after the other (the engine uses every core for each); one root name for both. */
async function loadFacts(oldInput: string, newInput: string, opts: DiffCliOptions): Promise<[Tree, Tree]> {
  const rootName = rootNameOf(newInput);
  const one = async (input: string) => {
    try {
      return await loadFactInput(input, opts, rootName);
    } catch (err) {
      throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
    }
  };
  const oldTree = await one(oldInput);
  return [oldTree, await one(newInput)];
}

/**
 * Both versions: OLD on another thread while NEW loads here, when the IO can (a file, not standard
 * input); else one after the other. An error in OLD is reported before one in NEW either way.
 */
export async function loadBoth(
  io: CliIO,
  oldInput: string,
  oldOptions: LoadOptions,
  newInput: string,
  newOptions: LoadOptions,
): Promise<[Tree, Tree]> {
  if (!io.loadInWorker || oldInput === "-")
    return [await load(io, oldInput, oldOptions), await load(io, newInput, newOptions)];
  const named = (err: unknown) => (err instanceof EspalierError ? err.inFile(displayName(oldInput)) : err);
  const [oldTree, newTree] = await Promise.allSettled([
    io.loadInWorker(oldInput, oldOptions).catch((err) => Promise.reject(named(err))),
    load(io, newInput, newOptions),
  ]);
  if (oldTree.status === "rejected") throw oldTree.reason;
  if (newTree.status === "rejected") throw newTree.reason;
  return [oldTree.value, newTree.value];
}

/** Loads one version as the summary loads its input: streamed, with progress, errors naming the file. */
export async function load(io: CliIO, input: string, options: LoadOptions): Promise<Tree> {
  const source = await readInputStream(io, input);
  try {
    const chunks = withProgress(source.chunks, io, displayName(input), source.size);
    return await loadTreeFromStream(chunks, options);
  } catch (err) {
    throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
  }
}

function pseudonymKey(opts: DiffCliOptions, io: CliIO): string | undefined {
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
