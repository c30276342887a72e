import type { HierarchyNode } from "d3-hierarchy";
import type { DiffResult } from "../diff/diff-trees.js";
import type { Tree, TreeReading } from "../model/tree.js";
import type { DiffTextOptions } from "../render/diff-text.js";
import {
  diffHeader,
  diffHeaderLines,
  fociOf,
  type HeaderOptions,
  type InputFacts,
  summaryHeader,
  summaryHeaderLines,
} from "../render/header.js";
import { MIN_WIDTH } from "../render/line-layout.js";
import { renderText, type TextOptions } from "../render/summary-text.js";
import type { SummaryResult } from "../summarize.js";
import type { ViewNode } from "../view/view-node.js";
import type { OutputFormat } from "./options.js";
import type { OutputSettings } from "./output-settings.js";

/** Turns a command's result into the text to print, in one format; `tree` is the tree it shows. */
export type Renderer<R> = (result: R, settings: OutputSettings, tree: Tree) => Promise<string>;

/**
 * A summary in each output format. The text renderer is loaded with the command; every other one when
 * a run asks for it, so a start loads only what the run needs.
 */
export const summaryRenderers: Record<OutputFormat, Renderer<SummaryResult>> = {
  text: async (result, s, tree) => renderText(result.view, summaryTextOptions(result, s, tree)),
  json: async (result, s, tree) =>
    (await import("../render/summary-json.js")).renderJson(result.view, {
      budget: s.budget,
      lines: result.selection.lines,
      foci: result.fociPaths,
      unmatchedFoci: result.unmatchedFoci,
      labels: s.labels,
      ...(tree.reading ? { input: savedReading(tree, tree.reading), notes: s.notes } : {}),
    }),
  markdown: async (result, s, tree) =>
    (await import("../render/summary-markdown.js")).renderMarkdown(result.view, {
      units: s.units,
      sizes: tree.hasSizes,
      share: s.share,
      chains: s.chains,
      header: headerOf(result, s),
      legend: s.legend,
      key: s.key && !result.selection.spared && s.keyLeftOut === undefined,
    }),
  svg: async (result, s, tree) => {
    const { renderSvg, svgWidth } = await import("../render/icicle-svg.js");
    // A picture has no key line to leave out (its legend is its own).
    const header = headerOf(result, { ...s, keyLeftOut: undefined });
    const numbers = { units: s.units, sizes: tree.hasSizes, share: s.share };
    return renderSvg(result.view, {
      units: s.units,
      sizes: tree.hasSizes,
      width: svgWidth(s.widthOption),
      heading: header && summaryHeader(result.view.data, header, numbers),
    });
  },
};

/** The options of a summary's text rendering. */
export function summaryTextOptions(result: SummaryResult, s: OutputSettings, tree: Tree): TextOptions {
  return lineSettings(result, s, tree.hasSizes);
}

/** A diff in each output format (loaded when asked for, like the summary's). */
export const diffRenderers: Record<OutputFormat, Renderer<DiffResult>> = {
  text: async (result, s, tree) =>
    (await import("../render/diff-text.js")).renderDiffText(
      result.view,
      result.totals,
      diffLines(result, s, tree.hasSizes),
    ),
  json: async (result, s) =>
    (await import("../render/diff-json.js")).renderDiffJson(result.view, result.totals, {
      budget: s.budget,
      lines: result.selection.lines,
      foci: result.fociPaths,
      unmatchedFoci: result.unmatchedFoci,
      by: result.combined.by,
      labels: s.labels,
      compared: s.compared ?? [],
      notes: s.versionNotes ?? [],
      ...(s.sizeName === undefined ? {} : { sizeName: s.sizeName }),
    }),
  markdown: async (result, s, tree) =>
    (await import("../render/diff-markdown.js")).renderDiffMarkdown(
      result.view,
      result.totals,
      diffLines(result, s, tree.hasSizes),
    ),
  svg: async (result, s, tree) => {
    const [{ renderSvg, svgWidth }, { changeTag }] = await Promise.all([
      import("../render/icicle-svg.js"),
      import("../render/diff-line-parts.js"),
    ]);
    const lines = diffLines(result, { ...s, keyLeftOut: undefined }, tree.hasSizes);
    return renderSvg(result.view, {
      units: s.units,
      sizes: tree.hasSizes,
      changeOf: (n) => n.change,
      width: svgWidth(s.widthOption),
      heading: lines.header && diffHeader(result.totals, result.combined.by, lines.header, lines),
      changeNote: (n) =>
        changeTag(n, { units: s.units, sizes: tree.hasSizes }, undefined, result.view.data.name),
      changesIn: (n, folded) => (folded ? n.hidden!.changes : n.changes),
    });
  },
};

/**
 * Lines the text header of a summary takes at the run's width, had the fit used the whole budget (the
 * most it can take; see `wrapHeader`); 0 with --bare. Every format's fit counts them, as it counts the
 * legend, so every format shows the same nodes.
 */
export function summaryHeaderRows(result: SummaryResult, s: OutputSettings, tree: Tree): number {
  const header = headerOf(result, s);
  if (!header) return 0;
  if (tooNarrow(s)) return 1;
  const numbers = { units: s.units, sizes: tree.hasSizes, share: s.share };
  return summaryHeaderLines(result.view.data, { ...header, lines: s.budget }, numbers, s.width).length;
}

/** The same for a diff's header (see {@link summaryHeaderRows}). */
export function diffHeaderRows(result: DiffResult, s: OutputSettings, tree: Tree): number {
  const header = headerOf(result, s);
  if (!header) return 0;
  if (tooNarrow(s)) return 1;
  const numbers = { units: s.units, sizes: tree.hasSizes, share: s.share };
  return diffHeaderLines(result.totals, result.combined.by, { ...header, lines: s.budget }, numbers, s.width)
    .length;
}

/** A width the text renderer refuses (USAGE, see `checkWidth`): no wrapping is counted for it. */
function tooNarrow(s: OutputSettings): boolean {
  return s.width !== undefined && !(s.width >= MIN_WIDTH);
}

/** The line options of a diff's text and Markdown (Markdown takes no colour and no width). */
export function diffLines(result: DiffResult, s: OutputSettings, sizes: boolean): DiffTextOptions {
  return { ...lineSettings(result, s, sizes), by: result.combined.by };
}

/** What a summary's and a diff's lines take alike from the output settings (a key only where the fit spared its line). */
function lineSettings<T extends ViewNode>(
  result: Parameters<typeof headerOf<T>>[0] & { selection: { spared: boolean } },
  s: OutputSettings,
  sizes: boolean,
): TextOptions {
  return {
    units: s.units,
    sizes,
    share: s.share,
    palette: s.palette,
    chains: s.chains,
    width: s.width,
    header: headerOf(result, s),
    legend: s.legend,
    key: s.key && !result.selection.spared && s.keyLeftOut === undefined,
    ...(s.keyRows === undefined ? {} : { keyRows: s.keyRows }),
    ...(s.keyInPart ? { keyInPart: true } : {}),
  };
}

/**
 * The header's facts (budget, lines used, foci as printed, how many were skipped for matching nothing,
 * what the size measures); none with --bare.
 */
function headerOf<T extends ViewNode>(
  result: { view: HierarchyNode<T>; selection: { lines: number }; unmatchedFoci: readonly string[] },
  s: OutputSettings,
): HeaderOptions | undefined {
  if (!s.header) return undefined;
  return {
    budget: s.budget,
    ...(s.budgetOffTerminal ? { budgetOffTerminal: true } : {}),
    lines: result.selection.lines,
    foci: fociOf(result.view),
    ...(result.unmatchedFoci.length > 0 ? { skippedFoci: result.unmatchedFoci.length } : {}),
    ...(s.keyLeftOut === undefined ? {} : { keyLeftOut: s.keyLeftOut }),
    ...inputFacts(s),
  };
}

/**
 * What the header says of the inputs, the same for every view of them (the interactive view's too):
 * what the size measures, how the input was read, rows filled, YAML documents, fields compared, a fact
 * table's rows, the loader's notes.
 */
export function inputFacts(s: OutputSettings): InputFacts {
  return {
    ...(s.sizeName === undefined ? {} : { sizeName: s.sizeName }),
    ...(s.reading === undefined ? {} : { reading: s.reading }),
    ...(s.filledRows === undefined ? {} : { filledRows: s.filledRows }),
    ...(s.documents === undefined ? {} : { documents: s.documents }),
    ...(s.startAt === undefined ? {} : { startAt: s.startAt }),
    ...(s.namesFrom === undefined ? {} : { namesFrom: s.namesFrom }),
    ...(s.unnamed === undefined ? {} : { unnamed: s.unnamed }),
    ...(s.namesFromOnly === undefined ? {} : { namesFromOnly: s.namesFromOnly }),
    ...(s.unnamedOnly === undefined ? {} : { unnamedOnly: s.unnamedOnly }),
    ...(s.compared === undefined ? {} : { compared: s.compared }),
    ...(s.rolledUpRows === undefined ? {} : { rolledUpRows: s.rolledUpRows }),
    ...(s.noteFacts.length === 0 ? {} : { notes: s.noteFacts }),
  };
}

/**
 * The reading a summary's JSON writes: a root espalier added says so (`rootNamed: "added"`), so a
 * diff of two saved summaries compares two such roots, each named after its own file, as one root.
 */
function savedReading(tree: Tree, reading: TreeReading): TreeReading {
  return tree.syntheticRoot && reading.rootNamed === undefined ? { ...reading, rootNamed: "added" } : reading;
}
