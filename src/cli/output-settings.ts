import { EspalierError } from "../errors.js";
import { type NoteFact, noteFact, type ShownNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import type { Units } from "../render/format-size.js";
import {
  type HeaderReading,
  type KeyLeftOut,
  type ListedReading,
  VALUE_SIZE,
  type VersionReading,
} from "../render/header.js";
import { KEY_MIN_BUDGET, keyRows } from "../render/key-line.js";
import { MIN_WIDTH } from "../render/line-layout.js";
import { legendLines } from "../render/marks.js";
import { type Palette, palette } from "../render/palette.js";
import { pseudonymKey } from "./input.js";
import type { CliIO } from "./io.js";
import { DEFAULT_BUDGET, type SharedCliOptions } from "./options.js";
import { shownNotes } from "./reading-notes.js";

/** How a command's result is printed: what the options and the terminal say. */
export interface OutputSettings {
  budget: number;
  /**
   * The budget is the default for output that is no terminal (no `--budget`, none in a config file):
   * the header says so, so a CI log's reader sees why the view has 40 lines.
   */
  budgetOffTerminal: boolean;
  /** Widest line in columns; undefined for no limit. */
  width: number | undefined;
  units: Units;
  palette: Palette;
  chains: boolean;
  /** Whether a label template was given (JSON then carries each node's label). */
  labels: boolean;
  /** `--width` as given (an SVG is sized from it, never from the terminal); undefined without it. */
  widthOption: number | undefined;
  /** Whether text, Markdown and SVG start with the header line (not with --bare). */
  header: boolean;
  /** Whether the legend follows the header (--legend). */
  legend: boolean;
  /** Whether the key line follows the header instead (see `showsKey`). */
  key: boolean;
  /** Each node's share in percent, of the whole tree or of its parent; none when undefined. */
  share: "total" | "parent" | undefined;
  /** What the size measures, as the input calls it, for the header; undefined for the default `size`. */
  sizeName: string | undefined;
  /** How the input was read when espalier chose it (the header names it); undefined when the options did. */
  reading: HeaderReading | undefined;
  /** Short rows read with empty last fields (`--short-rows fill`), per input; undefined when none was. */
  filledRows: readonly number[] | undefined;
  /** The part of a JSON/YAML document read (`--start-at`, a JSON Pointer); undefined for the whole. */
  startAt: string | undefined;
  /** YAML documents of a stream read as values, per input; undefined when no input had several. */
  documents: readonly number[] | undefined;
  /** The id column that names the nodes of an input without a name column (the first such input's). */
  namesFrom: string | undefined;
  /** The name field no node of an input has (nested nodes all named ""), the first such input's. */
  unnamed: string | undefined;
  /** A diff: the one version `namesFrom` is of, when the other has a name column; undefined otherwise. */
  namesFromOnly?: "OLD" | "NEW";
  /** A diff: the one version `unnamed` is of, when the other's nodes have names; undefined otherwise. */
  unnamedOnly?: "OLD" | "NEW";
  /** The loader's notes on the input (reading-notes.ts), input text hidden under --pseudonymize; JSON carries them. */
  notes: readonly ShownNote[];
  /** A diff: each version's notes as {@link notes} shows them, OLD's first; the diff JSON carries them. */
  versionNotes?: readonly (ShownNote & { version: "OLD" | "NEW" })[];
  /** The notes as the header says them (`2 missing counted as nodes`), a diff's with their version. */
  noteFacts: readonly NoteFact[];
  /** A fact table's rows the nodes stand for, per input (see `TreeReading.rolledUpRows`); undefined for other inputs. */
  rolledUpRows: readonly number[] | undefined;
  /** A diff's compared record fields (see `HeaderOptions.compared`); undefined for a summary. */
  compared?: readonly string[];
  /** The key was asked for but left out of the fit (see `HeaderOptions.keyLeftOut`); set after the fit. */
  keyLeftOut?: KeyLeftOut;
  /** Lines the fit counted for the key (see `keyRowsNeeded`); set after the fit, `keyRows(width)` before. */
  keyRows?: number;
  /** The fit printed the key in part (see `KeyFacts.inPart`); set after the fit. */
  keyInPart?: boolean;
}

/**
 * The settings of one run: options first, then the terminal (when printing to one), then defaults; the
 * unit of size also from the loaded tree.
 */
export function outputSettings(
  opts: SharedCliOptions,
  io: CliIO,
  tree: Tree,
  inputs: readonly Tree[] = [tree],
): OutputSettings {
  const filled = inputs.map((t) => t.reading?.filledRows ?? 0);
  const documents = inputs.map((t) => t.reading?.documents ?? 1);
  return {
    budget: opts.budget ?? defaultBudget(io),
    budgetOffTerminal: opts.budget === undefined && io.stdout.isTTY !== true,
    width: opts.width ?? defaultWidth(io),
    units: unitsFor(opts, tree),
    palette: palette(useColour(opts, io)),
    chains: opts.chains,
    labels: opts.label !== undefined,
    widthOption: opts.width,
    header: !opts.bare,
    legend: opts.legend,
    key: showsKey(opts, io),
    share: opts.share === "none" ? undefined : opts.share,
    sizeName: sizeNameOf(opts, inputs),
    reading: inputs.length === 2 ? versionsReading(opts, inputs[0], inputs[1]) : chosenReading(opts, tree),
    filledRows: filled.some((n) => n > 0) ? filled : undefined,
    documents: documents.some((n) => n > 1) ? documents : undefined,
    startAt: inputs.find((t) => t.reading?.startAt !== undefined)?.reading?.startAt,
    // A --label template says what each line shows, so the ids' naming is moot then.
    namesFrom:
      opts.label === undefined
        ? inputs.find((t) => t.reading?.namesFrom !== undefined)?.reading?.namesFrom
        : undefined,
    unnamed:
      opts.label === undefined
        ? inputs.find((t) => t.reading?.unnamed !== undefined)?.reading?.unnamed
        : undefined,
    namesFromOnly: onlyIn(inputs, (t) => t.reading?.namesFrom !== undefined),
    unnamedOnly: onlyIn(inputs, (t) => t.reading?.unnamed !== undefined),
    notes: shownNotes(tree, pseudonymKey(opts, io)),
    ...(inputs.length === 2 ? { versionNotes: versionNotes(inputs, pseudonymKey(opts, io)) } : {}),
    noteFacts:
      inputs.length === 2
        ? inputs.flatMap((t, v) => (t.reading?.notes ?? []).map((n) => noteFact(n, v === 0 ? "OLD" : "NEW")))
        : (tree.reading?.notes ?? []).map((n) => noteFact(n)),
    rolledUpRows: inputs.every((t) => t.reading?.rolledUpRows !== undefined)
      ? inputs.map((t) => t.reading!.rolledUpRows!)
      : undefined,
  };
}

/** A diff's notes, OLD's then NEW's, each with its version (input text hidden under a pseudonym key). */
function versionNotes(
  inputs: readonly Tree[],
  key: string | undefined,
): (ShownNote & { version: "OLD" | "NEW" })[] {
  return inputs.flatMap((t, v) =>
    shownNotes(t, key).map((note) => ({ version: v === 0 ? ("OLD" as const) : ("NEW" as const), ...note })),
  );
}

/**
 * The reading of an input that espalier chose itself, for the header: children found under a field
 * other than the one asked for (`--read-as nodes` says nodes, not which field holds them), an object
 * keyed by path, every value a node when nothing looked like nodes, an array of records read as rows
 * (linked by id and parent, or by path), or a path list's folder sizes read as totals (`du -ab`). None
 * when `--read-as`, `--input-format rows`, `--children-field` or `--folder-sizes` decided it.
 */
export function chosenReading(opts: SharedCliOptions, tree: Tree): HeaderReading | undefined {
  const r = tree.reading;
  if (r === undefined) return undefined;
  if (
    r.shape === "nodes" &&
    r.childrenFieldFound &&
    r.childrenField !== undefined &&
    opts.readAs !== "values"
  )
    return { kind: "children", field: r.childrenField };
  if (opts.readAs !== "auto") return undefined;
  if (r.shape === "path-map" && r.pathMapField !== undefined)
    return { kind: "path-map", field: r.pathMapField };
  if (r.shape === "values") return { kind: "values" };
  // An array of records read as rows rather than as nested roots, unless --input-format rows said so.
  if (r.shape === "rows" && r.linkedBy !== undefined && opts.inputFormat !== "rows")
    return { kind: "rows", by: r.linkedBy };
  if (r.folderTotals && opts.folderSizes === "auto") return { kind: "folder-totals" };
  return undefined;
}

/** A diff's version of which alone `holds` is true; undefined for a summary, or for both or neither. */
function onlyIn(inputs: readonly Tree[], holds: (tree: Tree) => boolean): "OLD" | "NEW" | undefined {
  if (inputs.length !== 2) return undefined;
  const [old, now] = [holds(inputs[0]), holds(inputs[1])];
  return old === now ? undefined : old ? "OLD" : "NEW";
}

/**
 * A diff's reading for the header: as {@link chosenReading} says when both versions were read one way;
 * else each version's (what espalier chose, or what its format reads as), so a diff of a table against
 * a path list, or of folder sizes read as totals against ones read as listed, never says one of them.
 */
export function versionsReading(
  opts: SharedCliOptions,
  oldTree: Tree,
  newTree: Tree,
): HeaderReading | undefined {
  const [old, now] = [readingOfVersion(opts, oldTree), readingOfVersion(opts, newTree)];
  if (JSON.stringify(old) === JSON.stringify(now)) return chosenReading(opts, newTree);
  if (old === undefined || now === undefined) return chosenReading(opts, newTree);
  return { kind: "versions", old, new: now };
}

function readingOfVersion(opts: SharedCliOptions, tree: Tree): VersionReading | ListedReading | undefined {
  const chosen = chosenReading(opts, tree);
  if (chosen !== undefined && chosen.kind !== "versions") return chosen;
  const r = tree.reading;
  if (r === undefined) return undefined;
  switch (r.shape) {
    case "nodes":
      return r.childrenField === undefined ? undefined : { kind: "children", field: r.childrenField };
    case "values":
      return { kind: "values" };
    case "path-map":
      return r.pathMapField === undefined ? undefined : { kind: "path-map", field: r.pathMapField };
    default:
      return { kind: "listed", shape: r.shape };
  }
}

/**
 * What the sizes measure, as the header, the key and the legend call it: {@link VALUE_SIZE} in a diff of
 * documents read as values, which sizes them by their values (cli/version-readings.ts valueSized), the
 * size field's name when it is not `size` (`cost`), else undefined (`size`).
 */
export function sizeNameOf(opts: SharedCliOptions, inputs: readonly Tree[] = []): string | undefined {
  if (inputs.length === 2 && inputs.every((t) => t.reading?.valueSizes)) return VALUE_SIZE;
  return opts.sizeField === "size" ? undefined : opts.sizeField;
}

/**
 * Lines before the tree, which the budget counts: the header unless --bare, the legend with --legend
 * (wrapped to the width of the run, as text prints it; every format counts the same lines, so every
 * format shows the same nodes). `sizeName`: as {@link sizeNameOf} gives it, which the legend says.
 */
export function headerLinesFor(
  opts: SharedCliOptions,
  kind: "summary" | "diff",
  io: CliIO,
  sizeName = sizeNameOf(opts),
): number {
  const legend = opts.legend ? legendLines(kind, opts.width ?? defaultWidth(io), sizeName).length : 0;
  return (opts.bare ? 0 : 1) + legend + keyRowsFor(opts, io);
}

/**
 * How a run's lines before the tree are counted at any budget (see `BudgetFit`): the legend's lines,
 * whether a header is printed, the key's rows at a budget, and whether a key is asked for at all.
 */
export function budgetLines(
  opts: SharedCliOptions,
  kind: "summary" | "diff",
  io: CliIO,
  sizeName = sizeNameOf(opts),
): { fixed: number; header: boolean; keyRows: (budget: number) => number; keyWanted: boolean } {
  return {
    fixed: opts.legend ? legendLines(kind, opts.width ?? defaultWidth(io), sizeName).length : 0,
    header: !opts.bare,
    keyRows: (budget) => keyRowsFor({ ...opts, budget }, io),
    keyWanted: opts.key && !opts.bare && !opts.legend,
  };
}

/**
 * A BUDGET_TOO_SMALL error from a run with `--legend` says how many of the lines before the tree the
 * legend takes, so the reader sees what to drop; any other error is returned as it is.
 */
export function legendInError(
  err: unknown,
  opts: SharedCliOptions,
  kind: "summary" | "diff",
  io: CliIO,
  sizeName = sizeNameOf(opts),
): unknown {
  if (!opts.legend || !(err instanceof EspalierError) || err.code !== "BUDGET_TOO_SMALL") return err;
  const width = opts.width ?? defaultWidth(io);
  const legend = legendLines(kind, width, sizeName).length;
  const at = width === undefined ? "" : ` at ${width} columns`;
  const before = Number(err.details.before ?? 0);
  return new EspalierError(
    err.code,
    [...err.parts, ` (--legend takes ${legend} of those ${before} lines${at})`],
    err.pos,
    err.details,
  );
}

/** Lines the key takes (see `keyRows`): one, two on a screen under 60 columns, none when not shown. */
export function keyRowsFor(opts: SharedCliOptions, io: CliIO): number {
  return showsKey(opts, io) ? keyRows(opts.width ?? defaultWidth(io)) : 0;
}

/**
 * Whether the key line (see `keyLine`) follows the header: by default, unless --bare, --legend (which
 * says more) or --no-key, or a budget under `KEY_MIN_BUDGET` lines. Its lines depend on the width
 * alone (see `keyRowsFor`), so they are counted before the fit as the header is.
 */
export function showsKey(opts: SharedCliOptions, io: CliIO): boolean {
  return opts.key && !opts.bare && !opts.legend && (opts.budget ?? defaultBudget(io)) >= KEY_MIN_BUDGET;
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

/**
 * Colour only on a terminal, never with NO_COLOR set (no-color.org) or TERM=dumb; `--color` decides
 * over all of these. FORCE_COLOR, which CI runners set so a log shows colours (common practice, no
 * source), turns it on off a terminal and under TERM=dumb, `0` or `false` off; NO_COLOR wins over it.
 * A file written by `--output` is no log: no colour there unless `--color always`.
 */
export function useColour(opts: SharedCliOptions, io: CliIO): boolean {
  if (opts.color !== "auto") return opts.color === "always";
  if (io.stdout.toFile === true) return false;
  if (io.env.NO_COLOR !== undefined && io.env.NO_COLOR !== "") return false;
  const forced = io.env.FORCE_COLOR;
  if (forced !== undefined && forced !== "") return forced !== "0" && forced.toLowerCase() !== "false";
  if (io.env.TERM === "dumb") return false;
  return io.stdout.isTTY === true;
}

/**
 * The width without `--width`: `COLUMNS` when it holds a decimal integer above 0, on a terminal or
 * not (POSIX.1-2017, XBD 8.3: the user's preferred width, used in place of the terminal's), else the
 * terminal's width when printing to one; at least MIN_WIDTH either way. No limit otherwise, and for
 * any other `COLUMNS` (empty, `80x`, `0`), which the standard leaves unspecified.
 */
export function defaultWidth(io: CliIO): number | undefined {
  const asked = columnsOf(io.env.COLUMNS);
  if (asked !== undefined) return Math.max(MIN_WIDTH, asked);
  return io.stdout.isTTY && io.stdout.columns && io.stdout.columns > 0
    ? Math.max(MIN_WIDTH, io.stdout.columns)
    : undefined;
}

/** `COLUMNS` as a width: digits only, above 0 (POSIX.1-2017, XBD 8.3); undefined otherwise. */
export function columnsOf(value: string | undefined): number | undefined {
  if (value === undefined || !/^[0-9]+$/.test(value)) return undefined;
  const n = Number(value);
  return n > 0 && Number.isSafeInteger(n) ? n : undefined;
}

/** The terminal's height less one line for the prompt; 40 when not printing to a terminal. */
export function defaultBudget(io: CliIO): number {
  if (io.stdout.isTTY && io.stdout.rows && io.stdout.rows > 2) return io.stdout.rows - 1;
  return DEFAULT_BUDGET;
}

/**
 * The compared fields as the header says them: the list, or none compared for inputs of records (a
 * table, rows, node objects, a graph), whose other fields a reader could think compared; nothing to say
 * for path lists and documents read as values, which hold no record fields.
 */
export function comparedSaid(
  fields: readonly string[],
  trees: readonly Tree[],
): readonly string[] | undefined {
  if (fields.length > 0) return [...new Set(fields)];
  const records = trees.some((t) => t.reading?.shape !== "paths" && t.reading?.shape !== "values");
  return records ? [] : undefined;
}
