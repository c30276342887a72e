import { DEFAULT_COMPARED_FIELDS } from "../diff/field-edits.js";
import { EspalierError } from "../errors.js";
import type { FocusSpec } from "../focus/focus-spec.js";
import { defaultLoadOptions, type LinkOption, type LoadOptions } from "../load/load-options.js";
import { unitNotShown } from "../load/path-list/unit-not-shown.js";
import type { Reading } from "../load/shape/choose-reading.js";
import { loadTreeFromStream } from "../load/stream/index.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import { templateFields } from "../view/label.js";
import { isFactInput, loadFactInput } from "./fact-input.js";
import type { ReadAgain } from "./file-read-again.js";
import type { CliIO } from "./io.js";
import { alignListings } from "./listing-start.js";
import { LOAD_THREADS_ENV, loadThreads } from "./load-threads.js";
import { readNodeRecords } from "./node-records.js";
import { PSEUDONYM_KEY_ENV, type SharedCliOptions } from "./options.js";
import { withProgress } from "./progress.js";
import { FOCI_BOUND, readInput } from "./read-input.js";
import { readInputStream } from "./read-input-stream.js";
import { notesText } from "./reading-notes.js";
import {
  nestedReading,
  readAsOtherNote,
  readingsDiffer,
  sameWay,
  sizedAlike,
  valueSized,
} from "./version-readings.js";

// What every command reads: its input trees, its foci and the pseudonym key. Summary, diff and explore
// all go through here, so they read the same inputs the same way.

/**
 * One input as a tree: a fact table rolled up by the engine, else any tree format streamed in chunks
 * (no string ever holds the whole input, so inputs past the engine's longest string load too), with
 * progress on a terminal. Errors name the file.
 */
export async function loadInput(
  io: CliIO,
  input: string,
  opts: SharedCliOptions,
  rootName: string = rootNameOf(input),
  nodes: string | undefined = singleNodes(opts),
): Promise<Tree> {
  const tree = withUnsizedImportance(
    withUnitNotSaid(await loadQuietly(io, input, opts, rootName, nodes), opts),
    opts,
  );
  sayNotes(io, input, tree, opts);
  return tree;
}

/**
 * The tree with an UNSIZED_IMPORTANCE note when `--importance size` was asked for and it has no sizes:
 * API(x) = -depth(x) + log2((size(x) + 1) / (size(root) + 1)) is then -depth(x) for every node
 * (interest/importance.ts), the ranking of `--importance depth`, which the run must not leave unsaid.
 */
function withUnsizedImportance(tree: Tree, opts: SharedCliOptions): Tree {
  if (opts.importance !== "size" || tree.hasSizes) return tree;
  return withNote(tree, {
    code: "UNSIZED_IMPORTANCE",
    parts: [
      "--importance size ranks a node by its subtree's size, and this input has no sizes: every node ranks as with --importance depth",
    ],
  });
}

/**
 * The tree with a UNIT_NOT_SAID note when it is a path list whose sizes, read as bytes under `--units
 * auto`, show their unit nowhere ({@link unitNotShown}): a list of one folder's entries and nothing
 * else, where `du -s --apparent-size DIR/*` of folders of folders (the KiB listings folder-totals.ts
 * cannot tell) and `dpkg-query -W` (KiB) look as `du -sb DIR/*` does, or a list too short for the
 * tests that tell KiB and blocks from bytes. `--units bytes` (they are bytes) or `plain` (numbers as
 * given) says it instead.
 */
function withUnitNotSaid(tree: Tree, opts: SharedCliOptions): Tree {
  const reading = tree.reading;
  if (opts.units !== "auto" || reading?.shape !== "paths" || reading.sizeUnit !== "bytes") return tree;
  if (!tree.hasSizes) return tree;
  const unsaid = unitNotShown(tree);
  if (unsaid === undefined) return tree;
  const n = unsaid.count.toLocaleString("en-US");
  const ways = `list bytes instead (du -sb, du -ab, find -printf '%s\\t%p\\n'; awk -F'\\t' -v OFS='\\t' '{$1 = $1 * 1024} 1' makes KiB bytes), or pass --units plain to print the numbers as given; --units bytes reads them as bytes without this note`;
  return withNote(tree, {
    code: "UNIT_NOT_SAID",
    count: unsaid.count,
    parts: [
      unsaid.why === "entries"
        ? `the list is ${n} ${unsaid.count === 1 ? "entry" : "entries side by side"} (a folder's, or an inventory's), none inside another, and its sizes show no unit: they were read as bytes, as du -sb DIR/* lists them. du -s --apparent-size DIR/* and du -sk DIR/* list KiB, and so does dpkg-query -W -f='\${Installed-Size}\\t\${Package}\\n': ${ways}`
        : `the list has ${n} ${unsaid.count === 1 ? "size" : "sizes"} above 0, too few to tell by them whether they count bytes, KiB or blocks, and no folder's own size shows a directory's bytes: they were read as bytes, as du -ab and find -printf '%s' list them. du -a and find -printf '%k' list 1 KiB blocks, du --apparent-size without -b lists KiB, du -m MiB: ${ways}`,
    ],
  });
}

/** The loader's notes on `tree` (read from `input`) on standard error, one line each (reading-notes.ts). */
function sayNotes(io: CliIO, input: string, tree: Tree, opts: SharedCliOptions): void {
  if (tree.reading?.notes?.length)
    io.stderr.write(notesText(tree, displayName(input), pseudonymKey(opts, io)));
}

/** {@link loadInput} without printing the loader's notes. */
async function loadQuietly(
  io: CliIO,
  input: string,
  opts: SharedCliOptions,
  rootName: string,
  nodes: string | undefined,
  sameReading?: Reading,
  earlier?: Tree,
  keepForLaterVersion = false,
  again?: { inputReadAgain: boolean } | { earlierInput: ReadAgain },
): Promise<Tree> {
  try {
    if (isFactInput(opts)) return await loadFactInput(input, opts, rootName);
    const options: LoadOptions = {
      ...toLoadOptions(input, opts),
      rootName,
      ...(sameReading === undefined ? {} : { sameReading }),
      ...(earlier ? { earlierVersion: earlier } : {}),
      ...(keepForLaterVersion ? { keepForLaterVersion } : {}),
      ...again,
    };
    // A graph's node records (--nodes) come from a file of their own; its errors name that file.
    if (nodes !== undefined) options.nodeRecords = await readNodeRecords(io, nodes, options);
    return await streamTree(io, input, options);
  } catch (err) {
    throw err instanceof EspalierError ? err.inFile(displayName(input)) : err;
  }
}

/**
 * OLD's file changed while NEW was read against it (its node objects compared with OLD's bytes read
 * again): what NEW's load took from OLD may not be OLD's, so nothing is shown.
 */
function oldChanged(oldInput: string): EspalierError {
  return new EspalierError(
    "IO",
    `${displayName(oldInput)} changed while the new version was read against it; run the comparison again once it stays as it is`,
  );
}

/** The one `--nodes` table of a run with one input; two are a USAGE error there. */
function singleNodes(opts: SharedCliOptions): string | undefined {
  const nodes = opts.nodes ?? [];
  if (nodes.length > 1)
    throw new EspalierError(
      "USAGE",
      "--nodes is given twice, but there is one input: give it twice only when comparing two versions (OLD's, then NEW's)",
      undefined,
      { option: "--nodes" },
    );
  return nodes[0];
}

/**
 * Two versions of one hierarchy, under one root name (NEW's) so that a root espalier adds never shows
 * as renamed. OLD loads on another thread while NEW loads here when the IO can (a named file of a tree
 * format, without node records) and a second processor is idle (load-threads.ts); else one after the
 * other. An error in OLD is reported before one in
 * NEW either way. `--nodes` given once gives both versions its node records; given twice, the first
 * is OLD's and the second NEW's.
 */
export async function loadVersions(
  io: CliIO,
  oldInput: string,
  newInput: string,
  opts: SharedCliOptions & ComparedFieldOptions,
): Promise<[Tree, Tree]> {
  if (readsStandardInput(oldInput) && readsStandardInput(newInput))
    throw new EspalierError("USAGE", "only one of the two versions can come from standard input");
  // --nodes once: one table of node records for both versions; twice: OLD's, then NEW's.
  const nodes = opts.nodes ?? [];
  const [oldNodes, newNodes] = nodes.length === 2 ? nodes : [nodes[0], nodes[0]];
  const rootName = rootNameOf(newInput);
  const threads = loadThreads(io.env[LOAD_THREADS_ENV], io.machineLoad?.());
  if (!io.loadInWorker || threads === 1 || oldInput === "-" || isFactInput(opts) || oldNodes !== undefined) {
    // No idle processor for a second thread (see load-threads.ts); a fact table's engine uses every core
    // itself, and node records are read here: one after the other.
    // OLD's table keeps its bytes and cells until NEW's load, which takes its rows whose bytes are the
    // same from them (load/table/kept-table.ts), and reads OLD's bytes for the cells they share
    // (load/table/earlier-rows.ts).
    // A JSON document's load keeps where its node objects lie, and NEW's reads OLD's file again to
    // compare with them (file-read-again.ts, load/json/kept-json.ts), when OLD is a regular file that
    // stays as it was; else OLD's load keeps the bytes too.
    const again = io.readAgainAt?.(oldInput);
    let oldTree: Tree;
    let newTree: Tree;
    try {
      oldTree = await loadQuietly(io, oldInput, opts, rootName, oldNodes, undefined, undefined, true, {
        inputReadAgain: again !== undefined,
      });
      const readable = again?.unchanged() === true;
      newTree = await loadQuietly(
        io,
        newInput,
        opts,
        rootName,
        newNodes,
        undefined,
        oldTree,
        false,
        readable ? { earlierInput: again! } : undefined,
      );
      // A change matters only where NEW's load read OLD again (a JSON document or a table it compared).
      if (readable && again!.readFrom() && !again!.unchanged()) throw oldChanged(oldInput);
    } finally {
      again?.close();
    }
    return sayVersionNotes(
      io,
      [oldInput, newInput],
      await readOneWay(io, [oldInput, newInput], [oldTree, newTree], opts, rootName, [oldNodes, newNodes]),
      opts,
    );
  }
  // Notes are printed once both loads are over, OLD's first, as the loads one after the other print them.
  const named = (err: unknown) => (err instanceof EspalierError ? err.inFile(displayName(oldInput)) : err);
  const [oldTree, newTree] = await Promise.allSettled([
    io
      .loadInWorker(oldInput, { ...toLoadOptions(oldInput, opts), rootName })
      .catch((err) => Promise.reject(named(err))),
    loadQuietly(io, newInput, opts, rootName, undefined),
  ]);
  if (oldTree.status === "rejected") throw oldTree.reason;
  if (newTree.status === "rejected") throw newTree.reason;
  return sayVersionNotes(
    io,
    [oldInput, newInput],
    await readOneWay(io, [oldInput, newInput], [oldTree.value, newTree.value], opts, rootName, [
      undefined,
      undefined,
    ]),
    opts,
  );
}

/**
 * The versions with path lists of one folder rooted alike (listing-start.ts), then both versions' notes
 * on standard error, OLD's first.
 */
function sayVersionNotes(
  io: CliIO,
  [oldInput, newInput]: readonly [string, string],
  read: [Tree, Tree],
  opts: SharedCliOptions,
): [Tree, Tree] {
  const files = [displayName(oldInput), displayName(newInput)] as const;
  const aligned = valueSized(sizedAlike(alignListings(read, files), files));
  // A diff's sizes are NEW's (none when either version has none): one note, on NEW.
  const trees: [Tree, Tree] = [
    withUnitNotSaid(aligned[0], opts),
    withUnsizedImportance(withUnitNotSaid(aligned[1], opts), opts),
  ];
  sayNotes(io, oldInput, trees[0], opts);
  sayNotes(io, newInput, trees[1], opts);
  return trees;
}

/**
 * The two versions read one way (see version-readings.ts): as loaded when they were (or either is no
 * JSON or YAML document). Else OLD read again as NEW was, when OLD fell to every value a node on its own
 * (nothing in it was shaped like nodes, and something in NEW was) and fits NEW's reading; else NEW read
 * again as OLD was; a version read again carries a READ_AS_OTHER note. NEW that does not fit OLD's
 * reading (or comes from standard input, which cannot be read twice) is SHAPE naming both readings.
 */
async function readOneWay(
  io: CliIO,
  [oldInput, newInput]: readonly [string, string],
  [oldTree, newTree]: readonly [Tree, Tree],
  opts: SharedCliOptions,
  rootName: string,
  [oldNodes, newNodes]: readonly [string | undefined, string | undefined],
): Promise<[Tree, Tree]> {
  const oldReading = nestedReading(oldTree);
  const newReading = nestedReading(newTree);
  if (oldReading === undefined || newReading === undefined || sameWay(oldReading, newReading))
    return [oldTree, newTree];
  const [oldFile, newFile] = [displayName(oldInput), displayName(newInput)];
  if (oldReading.kind === "values" && opts.readAs === "auto" && oldInput !== "-") {
    try {
      const again = await loadQuietly(io, oldInput, opts, rootName, oldNodes, newReading);
      return [withNote(again, readAsOtherNote("NEW", newFile, newReading, oldReading)), newTree];
    } catch (err) {
      if (!(err instanceof EspalierError)) throw err;
      // OLD does not read as NEW: NEW is read as OLD was, as values, which fit every document.
    }
  }
  if (newInput === "-") throw readingsDiffer(oldFile, oldReading, newReading, undefined).inFile(newFile);
  try {
    const again = await loadQuietly(io, newInput, opts, rootName, newNodes, oldReading);
    return [oldTree, withNote(again, readAsOtherNote("OLD", oldFile, oldReading, newReading))];
  } catch (err) {
    if (!(err instanceof EspalierError)) throw err;
    throw readingsDiffer(oldFile, oldReading, newReading, err).inFile(newFile);
  }
}

function withNote(tree: Tree, note: ReadingNote): Tree {
  const reading = tree.reading;
  if (reading === undefined) return tree;
  return { ...tree, reading: { ...reading, notes: [...(reading.notes ?? []), note] } };
}

/**
 * The foci: every `--focus`, then each line of the `--focus-from` file, a literal path as other tools
 * print them (see focus/listed-node.ts) taken verbatim: a name may begin or end with spaces; blank
 * lines are skipped. A list holding a NUL byte is NUL-separated (`git diff --name-only -z`), so a
 * name may hold a line break. `inputs` are the command's inputs: standard input cannot hold both one
 * of them and the foci.
 */
export async function readFoci(
  io: CliIO,
  opts: SharedCliOptions,
  inputs: readonly string[],
): Promise<FocusSpec[]> {
  const foci: FocusSpec[] = [...opts.focus];
  if (opts.focusFrom === undefined) return foci;
  if (readsStandardInput(opts.focusFrom) && inputs.some(readsStandardInput))
    throw new EspalierError(
      "USAGE",
      `standard input cannot hold both an input and the foci (--focus-from ${opts.focusFrom})`,
    );
  // A file or a pipe, never a device, at most maxFociBytes (read-limits.ts).
  const focusFrom = opts.focusFrom;
  const text = await readInput(io, focusFrom, FOCI_BOUND);
  if (text.includes("\0") && looksLikeUtf16(text))
    throw new EspalierError(
      "USAGE",
      "the focus list looks like UTF-16 text without a byte order mark (every other byte is NUL), which would read as a NUL-separated list of single letters: write it as UTF-8, or as UTF-16 with its byte order mark (PowerShell: Out-File -Encoding utf8)",
      { file: displayName(focusFrom) },
    );
  const lines = text.includes("\0") ? text.split("\0") : text.split(/\r?\n/);
  lines.forEach((listed, k) => {
    if (listed !== "") foci.push({ listed, line: k + 1, file: displayName(focusFrom) });
  });
  // An empty list is no error (a change list with no change), but a failed command before a pipe
  // writes one too: the run goes on without foci from it, and says so.
  if (foci.length === opts.focus.length)
    io.stderr.write(
      `espalier: warning: ${displayName(focusFrom)}: the focus list holds no path, so it adds no focus` +
        `${focusFrom === "-" ? " (did the command before the pipe fail?)" : ""}\n`,
    );
  return foci;
}

/**
 * Whether a name reads standard input: `-`, or a name of the system's for it (Linux, and /dev/fd on
 * the BSDs and macOS; from memory). Two readers of it would take its bytes in turn: the second found
 * it empty, and said a command before the pipe had failed.
 */
function readsStandardInput(name: string): boolean {
  return name === "-" || name === "/dev/stdin" || name === "/dev/fd/0" || name === "/proc/self/fd/0";
}

/**
 * Whether a focus list read as UTF-8 is UTF-16 without its byte order mark: within its first 256 code
 * units every NUL stands at one parity (odd for little-endian, even for big-endian), at least three in
 * four units of that parity are NULs (text in the Latin scripts), and a line break stands beside a
 * NUL, or more than 16 "entries" between NULs are one character each (one line with no line end). A
 * list made NUL-separated on purpose (`git diff --name-only -z`) has names of any length between its
 * NULs.
 */
function looksLikeUtf16(text: string): boolean {
  const head = text.slice(0, 256);
  if (head.length < 4) return false;
  const nulAt = (k: number) => head.charCodeAt(k) === 0;
  for (const parity of [1, 0]) {
    let nuls = 0;
    let other = false;
    for (let k = 0; k < head.length && !other; k++) {
      if (k % 2 === parity) nuls += nulAt(k) ? 1 : 0;
      else other = nulAt(k);
    }
    if (other || nuls * 8 < head.length * 3) continue;
    const breakBeside = parity === 1 ? /\n\0/.test(head) : /\0\n/.test(head);
    const entries = head.split("\0");
    const letters =
      entries.length > 16 && entries.every((entry, k) => entry.length <= 1 || k === entries.length - 1);
    if (breakBeside || letters) return true;
  }
  return false;
}

/**
 * The lines a run writes to standard error for foci left out by `--unmatched-foci skip` (already
 * pseudonymous under `--pseudonymize`); "" when there are none. At most 20 are named.
 */
export function unmatchedWarning(unmatched: readonly string[]): string {
  if (unmatched.length === 0) return "";
  const shown = unmatched.slice(0, 20).map((f) => JSON.stringify(f));
  const more = unmatched.length > shown.length ? ` and ${unmatched.length - shown.length} more` : "";
  const count = unmatched.length === 1 ? "1 focus matches" : `${unmatched.length} foci match`;
  return `espalier: warning: ${count} no node and ${unmatched.length === 1 ? "is" : "are"} left out (--unmatched-foci skip): ${shown.join(", ")}${more}\n`;
}

/** The secret of `--pseudonymize`, from the environment (never from an option, which a log would keep). */
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

/**
 * The loader's options for one input of a tree format. Kept record fields: the label's, and a diff's
 * compared fields (`--compare-field`).
 */
export function toLoadOptions(input: string, opts: SharedCliOptions & ComparedFieldOptions): LoadOptions {
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
    ...(opts.nullParent && opts.nullParent.length > 0 ? { nullParents: opts.nullParent } : {}),
    pathField: opts.pathField,
    childField: opts.childField,
    graph: opts.graph,
    keepFields: [
      ...new Set([
        ...(opts.label ? templateFields(opts.label) : []),
        ...(opts.compareField ?? []),
        ...defaultCompared(opts),
      ]),
    ],
    // A diff without --compare-field compares a document's values where it is read as values.
    ...(defaultCompared(opts).length > 0
      ? { optionalKeepFields: [...defaultCompared(opts)], keepScalars: true }
      : {}),
    ...(opts.keepOtherFields ? { keepOtherFields: true } : {}),
    rootName: rootNameOf(input),
    maxNodes: opts.maxNodes ?? Number.POSITIVE_INFINITY,
    ...(opts.readAs === "auto" ? {} : { readAs: opts.readAs }),
    ...(opts.startAt ? { startAt: opts.startAt } : {}),
    ...(opts.shortRows === "fill" ? { shortRows: "fill" as const } : {}),
    ...(opts.nulSeparated ? { nulSeparated: true } : {}),
    ...(opts.folderSizes === "auto" ? {} : { folderSizes: opts.folderSizes }),
    // Named on purpose (a flag or the config), even as the default name: then the input must have it.
    ...(opts.named?.has("sizeField") ? { sizeFieldNamed: true } : {}),
    ...(opts.named?.has("nameField") ? { nameFieldNamed: true } : {}),
    ...linkOptionsNamed(opts.named),
  };
}

const linkOptionKeys: Readonly<Record<string, LinkOption>> = {
  idField: "--id-field",
  parentField: "--parent-field",
  pathField: "--path-field",
  childField: "--child-field",
  childrenField: "--children-field",
};

/** The link options the run named (a flag or the config), for the loader to check they are read. */
function linkOptionsNamed(named: ReadonlySet<string> | undefined): { linkOptionsNamed?: LinkOption[] } {
  const flags = Object.entries(linkOptionKeys)
    .filter(([key]) => named?.has(key))
    .map(([, flag]) => flag);
  return flags.length > 0 ? { linkOptionsNamed: flags } : {};
}

/**
 * The fields a diff keeps to compare: `compareField` (`--compare-field`; empty: a diff without it, which
 * keeps `version` where records have it), and `keepOtherFields`: keep the records' other fields as
 * they are read, which a diff without it compares (cli/compared-fields.ts).
 */
export interface ComparedFieldOptions {
  compareField?: readonly string[];
  /** Keep every other field the records hold, in the same read (LoadOptions.keepOtherFields). */
  keepOtherFields?: boolean;
}

/**
 * A diff without `--compare-field` keeps the fields it compares by default (`version`), where records
 * have them; a summary keeps none of them.
 */
function defaultCompared(opts: { compareField?: readonly string[] }): readonly string[] {
  return opts.compareField !== undefined && opts.compareField.length === 0 ? DEFAULT_COMPARED_FIELDS : [];
}

/** The name of a root espalier adds: the input file's base name, `(stdin)` for standard input. */
export function rootNameOf(input: string): string {
  if (input === "-") return "(stdin)";
  const parts = input.split(/[\\/]/);
  return parts[parts.length - 1] || input;
}

/** How an input is named in messages. */
export function displayName(input: string): string {
  return input === "-" ? "<stdin>" : input;
}

async function streamTree(io: CliIO, input: string, options: LoadOptions): Promise<Tree> {
  const source = await readInputStream(io, input);
  const chunks = withProgress(source.chunks, io, displayName(input), source.size);
  const sized = source.size === undefined ? options : { ...options, inputBytes: source.size };
  return loadTreeFromStream(chunks, sized, readAgain(io, input, source.size));
}

/**
 * How to read a named regular file again, to place a table row's error at its cell (a pipe, standard
 * input or a re-encoded file cannot be: the error then has the row's line only).
 */
export function readAgain(
  io: CliIO,
  input: string,
  size: number | undefined,
): (() => Promise<AsyncIterable<Uint8Array>>) | undefined {
  if (input === "-" || size === undefined) return undefined;
  return async () => (await readInputStream(io, input)).chunks;
}
