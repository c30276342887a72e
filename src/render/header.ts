import type { HierarchyNode } from "d3-hierarchy";
import { type ChangeKind, changeKinds, treeChangeKinds } from "../diff/changes.js";
import type { DiffTotals } from "../diff/prepared-diff.js";
import type { NoteFact } from "../model/reading-note.js";
import { safeText } from "../model/safe-text.js";
import type { ViewNode } from "../view/view-node.js";
import { formatCount, type NumberOptions } from "./amount.js";
import { displayWidth, shortenEnd } from "./display-width.js";
import { formatSize } from "./format-size.js";
import { markdownText } from "./markdown-escape.js";
import { codeSpan } from "./markdown-line.js";
import { noteClauses } from "./note-clause.js";
import { wrapWords } from "./wrap-words.js";

/** How the header's own words and the input's names are written: plain text, or Markdown. */
export interface HeaderStyle {
  words: (s: string) => string;
  name: (s: string) => string;
}

const plainStyle: HeaderStyle = { words: (s) => s, name: (s) => s };

/**
 * The size's name in a diff of two documents read as values, sized by their values' text rather than
 * their bytes (cli/version-readings.ts `valueSized`): said in words, not as a field's name.
 */
export const VALUE_SIZE = "value size";

/** What the first line of a text or Markdown rendering states. */
export interface HeaderOptions {
  /** The line budget asked for. */
  budget: number;
  /**
   * The budget is the default taken because the output is no terminal (a pipe, a file, a CI log):
   * said after the lines used, `40 of 40 lines (default budget: not a terminal)`.
   */
  budgetOffTerminal?: boolean;
  /** Lines the rendering takes, this header (and any legend) included. */
  lines: number;
  /** Printed paths (or row ids) of the foci; each is accepted back as a focus. */
  foci: readonly string[];
  /** What the size measures, as the input calls it (`cost`), or {@link VALUE_SIZE}; default `size`. */
  sizeName?: string;
  /**
   * How many foci matched no node and were left out (`--unmatched-foci skip`): the header counts them,
   * never names them (a typed path is no path of the input, and may be what `--pseudonymize` hides).
   */
  skippedFoci?: number;
  /**
   * How the input was read, when espalier chose it rather than the options: children found under
   * another field, a map keyed by path, or every value a node. The header says so, so a reader who
   * expected another reading sees it without the docs.
   */
  reading?: HeaderReading;
  /**
   * Short CSV/TSV rows read with their missing last fields empty (`--short-rows fill`): one count per
   * input (a diff's OLD and NEW), said when any is above 0.
   */
  filledRows?: readonly number[];
  /**
   * YAML documents of a stream read as values (each a child of the root named by its index), one count
   * per input; said when any is above 1, as a reader would take the `0`, `1` for a list's items.
   */
  documents?: readonly number[];
  /** The part of a JSON/YAML document read (`--start-at`): `read at /data/teams`. */
  startAt?: string;
  /**
   * A table linked by id without the name column: the id column, which names the nodes
   * (`named by employee_id (no name column)`), so a reader whose names sit in another column sees it.
   */
  namesFrom?: string;
  /**
   * Nested nodes none of which has the name field (`TreeReading.unnamed`): that field, said as
   * `no "name" field: nodes print as "" (see --name-field)`, so a screen of `""` lines explains itself.
   */
  unnamed?: string;
  /**
   * A diff of which one version alone is named by ids (`namesFrom`) or has no names (`unnamed`): that
   * version, said in front (`NEW: no "name" field: …`), so the clause is not read as both versions'.
   */
  namesFromOnly?: "OLD" | "NEW";
  unnamedOnly?: "OLD" | "NEW";
  /**
   * A diff: the record fields compared between matched nodes (`--compare-field`, else `version` where
   * both versions have it and the records' other fields), said beside the `edited` count (`1 edited
   * (compared: version)`, four named at most); empty
   * for records of which no field was compared (`0 edited (no field compared)`), so a reader does not
   * take a changed title for no change; undefined where inputs hold no record fields (path lists).
   */
  compared?: readonly string[];
  /**
   * A fact table: how many of its rows the nodes stand for, one count per input (a diff's OLD and NEW),
   * said as `rolled up from 41,352 rows`, since several rows may fall on one node (a row per day) and
   * the node count alone says nothing of them.
   */
  rolledUpRows?: readonly number[];
  /**
   * The loader's notes on the inputs (model/reading-note.ts), said in a few words each right after the
   * totals (`2 missing counted as nodes`; see render/note-clause.ts), so the screen says how its numbers
   * were read even where standard error, which has the whole note, is not kept.
   */
  notes?: readonly NoteFact[];
  /**
   * The key was asked for but the budget has no room for it beside the root and the focus paths (or
   * is under `KEY_MIN_BUDGET`): the header says so, and names the smallest budget that prints it
   * (`key left out: --budget 19 has room`), so a screen whose marks go unexplained says where to look.
   */
  keyLeftOut?: KeyLeftOut;
  /**
   * The interactive view's header where its key needs the rows (see `explore/session.ts`): `lines`
   * leaves out the lines used (the screen is the budget), `foci` the foci too (the status row names
   * the cursor's path and counts the foci, and `'*'` marks each focus's line).
   */
  brief?: "lines" | "foci";
}

/**
 * See `HeaderOptions.keyLeftOut`: the smallest budget that prints the key, when one was found, and
 * whether to say it in fewest words (`no key: --budget 19`), where the longer ones would take a line.
 */
export interface KeyLeftOut {
  readonly budget: number | undefined;
  readonly short?: boolean;
}

/** What a header says of its inputs beside the budget, the lines and the foci (see `HeaderOptions`). */
export type InputFacts = Pick<
  HeaderOptions,
  | "sizeName"
  | "reading"
  | "filledRows"
  | "documents"
  | "namesFrom"
  | "unnamed"
  | "namesFromOnly"
  | "unnamedOnly"
  | "compared"
  | "rolledUpRows"
  | "notes"
>;

/**
 * A reading of the input the header names (see `HeaderOptions.reading`); a diff whose two versions were
 * read differently names each one's (`OLD: a table, NEW: a path list`).
 */
export type HeaderReading =
  | VersionReading
  | { kind: "versions"; old: VersionReading | ListedReading; new: VersionReading | ListedReading };

/** A reading espalier chose for one input. */
export type VersionReading =
  | { kind: "children"; field: string }
  | { kind: "path-map"; field: string }
  | { kind: "values" }
  | { kind: "rows"; by: readonly string[] }
  | { kind: "folder-totals" };

/** An input read as its format reads (named only beside another version's other reading). */
export type ListedReading = { kind: "listed"; shape: "rows" | "table" | "paths" | "graph" };

const listedWords: Readonly<Record<ListedReading["shape"], string>> = {
  rows: "rows",
  table: "a table",
  paths: "a path list",
  graph: "a graph",
};

/** Foci named on the header before the rest are counted (`and 4 more`). */
const FOCI_SHOWN = 3;

/**
 * `summary: 5,260 nodes, size 587.9 MiB; focus services/ledger/src; 14 of 14 lines`: the totals with
 * what the size measures, the foci, and the budget used. Starts with a fixed word, so a name can never
 * begin the line. Within `width`, the list of foci shortens first, then the end is cut.
 */
export function summaryHeader(
  root: { nodes: number; size: number; emptyBelow?: number },
  header: HeaderOptions,
  options: NumberOptions,
  width?: number,
  style: HeaderStyle = plainStyle,
): string {
  return fitHeader(summaryParts(root, header, options, style), header, width, style);
}

/**
 * The summary's header as text prints it within `width`: one line when it fits (the list of foci
 * shortened first), else wrapped at its `; ` clauses (see {@link wrapHeader}); never cut short of a number.
 */
export function summaryHeaderLines(
  root: { nodes: number; size: number; emptyBelow?: number },
  header: HeaderOptions,
  options: NumberOptions,
  width?: number,
): string[] {
  return wrapHeader(summaryParts(root, header, options, plainStyle), header, width);
}

/** The summary header's clauses (joined by `; `), naming at most `fociShown` foci. */
function summaryParts(
  root: { nodes: number; size: number; emptyBelow?: number },
  header: HeaderOptions,
  options: NumberOptions,
  style: HeaderStyle,
): HeaderParts {
  const w = style.words;
  let totals = w(`summary: ${formatCount(root.nodes)} ${root.nodes === 1 ? "node" : "nodes"}`);
  // Entries that are empty objects (`{}`) count as nodes: the header says how many of them there are.
  if (root.emptyBelow) totals += w(` (${formatCount(root.emptyBelow)} of them empty {})`);
  if (options.sizes)
    totals += `${w(", ")}${sizeWord(header, style)}${w(` ${formatSize(root.size, options.units)}`)}`;
  const read = readingParts(header, style);
  return (k, h) => [totals, ...read, ...endParts(h, k, style)];
}

/** A header's clauses after its totals and reading: the foci, the key left out, the lines used (see `brief`). */
function endParts(header: HeaderOptions, fociShown: number, style: HeaderStyle): string[] {
  if (header.brief === "foci") return [];
  const foci = fociText(header, fociShown, style);
  return header.brief === "lines" ? [foci] : [foci, ...keyText(header, style), style.words(used(header))];
}

/**
 * `diff by id: 1 added, 0 removed, 1 moved, 0 renamed, 0 edited, 0 resized; 6 -> 7 nodes, size 3 KiB -> 4 KiB
 * (net +1 KiB); no focus; 9 of 40 lines`: how nodes were matched, the count of each kind, both
 * versions' totals, the foci and the budget used.
 */
export function diffHeader(
  totals: DiffTotals,
  by: "id" | "path",
  header: HeaderOptions,
  options: NumberOptions,
  width?: number,
  style: HeaderStyle = plainStyle,
): string {
  return fitHeader(diffParts(totals, by, header, options, style), header, width, style);
}

/** The diff's header as text prints it within `width` (see {@link summaryHeaderLines}). */
export function diffHeaderLines(
  totals: DiffTotals,
  by: "id" | "path",
  header: HeaderOptions,
  options: NumberOptions,
  width?: number,
): string[] {
  const listed = diffParts(totals, by, header, options, plainStyle);
  if (width === undefined) return wrapHeader(listed, header, width);
  // The kinds none of the nodes has said once (`0 moved, renamed or edited`) where that takes fewer
  // lines: decided as if the whole budget were used, as `wrapHeader` decides its breaks.
  const grouped = diffParts(totals, by, header, options, plainStyle, true);
  const most = { ...header, lines: header.budget };
  const fewer = wrapHeader(grouped, most, width).length < wrapHeader(listed, most, width).length;
  return wrapHeader(fewer ? grouped : listed, header, width);
}

/**
 * The diff header's clauses (joined by `; `), naming at most `fociShown` foci; `grouped`: the kinds
 * with no node said together after the others (`3 added, 340 removed, 0 moved, renamed or edited`),
 * where two or more have none.
 */
function diffParts(
  totals: DiffTotals,
  by: "id" | "path",
  header: HeaderOptions,
  options: NumberOptions,
  style: HeaderStyle,
  grouped = false,
): HeaderParts {
  const w = style.words;
  // A diff of graphs counts edges linked and unlinked too; a diff of trees has none to count.
  const all = totals.graph ? changeKinds : treeChangeKinds;
  const said = (k: ChangeKind) => `${k}${k === "edited" ? comparedText(header) : ""}`;
  const none = all.filter((k) => totals.changes[k] === 0);
  const kinds =
    grouped && none.length >= 2
      ? [
          ...all
            .filter((k) => totals.changes[k] > 0)
            .map((k) => `${formatCount(totals.changes[k])} ${said(k)}`),
          `0 ${none.slice(0, -1).map(said).join(", ")} or ${said(none[none.length - 1])}`,
        ].join(", ")
      : all.map((k) => `${formatCount(totals.changes[k])} ${said(k)}`).join(", ");
  let counts = w(`${formatCount(totals.old.nodes)} -> ${formatCount(totals.new.nodes)} nodes`);
  // Entries that are empty objects (`{}`) count as nodes: how many of each version's are such.
  if (totals.old.empty || totals.new.empty)
    counts += w(
      ` (${formatCount(totals.old.empty ?? 0)} -> ${formatCount(totals.new.empty ?? 0)} of them empty {})`,
    );
  // The lines count NEW's nodes and the removed ones (each at its old place): the root's count is then
  // not NEW's, and the header says what it is, so it can be checked against the root's line.
  const removed = totals.changes.removed;
  if (removed > 0)
    counts += w(`, ${formatCount(totals.new.nodes + removed)} with the ${formatCount(removed)} removed`);
  if (options.sizes) {
    const { units } = options;
    const net = totals.delta < 0 ? formatSize(totals.delta, units) : `+${formatSize(totals.delta, units)}`;
    counts += `${w(", ")}${sizeWord(header, style)}${w(` ${formatSize(totals.old.size, units)} -> ${formatSize(totals.new.size, units)} (net ${net})`)}`;
  }
  const read = readingParts(header, style);
  return (k, h) => [w(`diff by ${by}: ${kinds}`), counts, ...read, ...endParts(h, k, style)];
}

/** The compared fields a header names; more are counted (a lock file's records hold some twenty). */
const COMPARED_NAMED = 4;

/**
 * ` (compared: version, team)`, ` (compared: version, license, engines and 16 other fields)`, ` (no
 * field compared)`, or nothing (see `HeaderOptions.compared`). The JSON output lists every field.
 */
function comparedText({ compared }: HeaderOptions): string {
  if (compared === undefined) return "";
  if (compared.length === 0) return " (no field compared)";
  const named = compared.length > COMPARED_NAMED ? compared.slice(0, COMPARED_NAMED - 1) : compared;
  const more = compared.length - named.length;
  return ` (compared: ${named.map((f) => safeText(f, 40)).join(", ")}${more > 0 ? ` and ${more} other fields` : ""})`;
}

/** The header's text for Markdown: its own words escaped, the input's names as code spans. */
export const markdownHeaderStyle: HeaderStyle = {
  words: (s) => markdownText(s, true, true),
  name: (s) => codeSpan(s),
};

function sizeWord(header: HeaderOptions, style: HeaderStyle): string {
  if (header.sizeName === undefined || header.sizeName === VALUE_SIZE)
    return style.words(header.sizeName ?? "size");
  return style.name(safeText(header.sizeName, 40));
}

/**
 * `2 missing counted as nodes` (the loader's notes), `read at /data/teams`, `children under dependencies`, `paths from packages` (`paths from keys` for the top level),
 * `every value a node`, `rows linked by path`, `folder sizes read as totals with contents`, `3 short rows filled`: the
 * header's clauses on how the input was read; none when the options chose the reading.
 */
function readingParts(header: HeaderOptions, style: HeaderStyle): string[] {
  return [
    ...noteClauses(header.notes ?? []).map((clause) => style.words(clause)),
    rolledUpText(header, style),
    startAtText(header, style),
    choiceText(header, style),
    documentsText(header, style),
    namesText(header, style),
    unnamedText(header, style),
    filledText(header, style),
  ].filter((part) => part !== "");
}

/** `rolled up from 41,352 rows` (a diff: `rolled up from 41,352 -> 41,400 rows`); empty for other inputs. */
function rolledUpText({ rolledUpRows }: HeaderOptions, style: HeaderStyle): string {
  if (!rolledUpRows || rolledUpRows.length === 0) return "";
  const last = rolledUpRows[rolledUpRows.length - 1];
  const counts = rolledUpRows.map((n) => formatCount(n)).join(" -> ");
  return style.words(`rolled up from ${counts} ${rolledUpRows.length === 1 && last === 1 ? "row" : "rows"}`);
}

/** `read at /data/teams`: the part of the document read (`--start-at`); empty for the whole. */
function startAtText({ startAt }: HeaderOptions, style: HeaderStyle): string {
  return startAt ? `${style.words("read at ")}${style.name(safeText(startAt, 80))}` : "";
}

/** `2 YAML documents, named 0 and 1`, `5 YAML documents, named 0 to 4` (a diff: `1 -> 3 YAML documents`). */
function documentsText({ documents }: HeaderOptions, style: HeaderStyle): string {
  if (!documents?.some((n) => n > 1)) return "";
  const last = documents[documents.length - 1];
  if (documents.length > 1)
    return style.words(`${documents.map((n) => formatCount(n)).join(" -> ")} YAML documents`);
  return style.words(
    `${formatCount(last)} YAML documents, named 0 ${last === 2 ? "and" : "to"} ${formatCount(last - 1)}`,
  );
}

/** `named by employee_id (no name column)`: the ids name the nodes; empty when a name column does. */
function namesText({ namesFrom, namesFromOnly }: HeaderOptions, style: HeaderStyle): string {
  if (namesFrom === undefined) return "";
  return `${style.words(namesFromOnly === undefined ? "" : `${namesFromOnly}: `)}${style.words("named by ")}${style.name(safeText(namesFrom, 40))}${style.words(" (no name column)")}`;
}

/** `no "name" field: nodes print as "" (see --name-field)`: no node has the name field; empty when some node has it. */
function unnamedText({ unnamed, unnamedOnly }: HeaderOptions, style: HeaderStyle): string {
  if (unnamed === undefined) return "";
  return `${style.words(unnamedOnly === undefined ? "no " : `${unnamedOnly}: no `)}${style.name(JSON.stringify(safeText(unnamed, 40)))}${style.words(' field: nodes print as "" (see --name-field)')}`;
}

/** `3 short rows filled` (a diff: `3 -> 0 short rows filled`); empty when none was. */
function filledText({ filledRows }: HeaderOptions, style: HeaderStyle): string {
  if (!filledRows?.some((n) => n > 0)) return "";
  const last = filledRows[filledRows.length - 1];
  const counts = filledRows.map((n) => formatCount(n)).join(" -> ");
  return style.words(`${counts} short ${filledRows.length === 1 && last === 1 ? "row" : "rows"} filled`);
}

function choiceText({ reading }: HeaderOptions, style: HeaderStyle): string {
  const w = style.words;
  if (reading === undefined) return "";
  if (reading.kind === "versions")
    return `${w("OLD: ")}${readingText(reading.old, style)}${w(", NEW: ")}${readingText(reading.new, style)}`;
  return readingText(reading, style);
}

function readingText(reading: VersionReading | ListedReading, style: HeaderStyle): string {
  const w = style.words;
  if (reading.kind === "listed") return w(listedWords[reading.shape]);
  if (reading.kind === "values") return w("every value a node");
  if (reading.kind === "folder-totals") return w("folder sizes read as totals with contents");
  if (reading.kind === "rows")
    return `${w("rows linked by ")}${reading.by.map((f) => style.name(safeText(f, 40))).join(w(" and "))}`;
  const field = style.name(safeText(reading.field, 40));
  if (reading.kind === "children") return `${w("children under ")}${field}`;
  return reading.field === "" ? w("paths from keys") : `${w("paths from ")}${field}`;
}

/** `key left out: --budget 19 has room` (see `HeaderOptions.keyLeftOut`); nothing when the key is printed. */
function keyText({ keyLeftOut }: HeaderOptions, style: HeaderStyle): string[] {
  if (keyLeftOut === undefined) return [];
  const { budget, short } = keyLeftOut;
  if (short) return [style.words(budget === undefined ? "no key" : `no key: --budget ${budget}`)];
  const room = budget === undefined ? "too few lines" : `--budget ${budget} has room`;
  return [style.words(`key left out: ${room}`)];
}

function used(header: HeaderOptions): string {
  const why = header.budgetOffTerminal ? " (default budget: not a terminal)" : "";
  return `${formatCount(header.lines)} of ${formatCount(header.budget)} lines${why}`;
}

/**
 * `no focus`, `focus a`, `foci a, b, c and 4 more`, naming at most `shown` of them; then the foci left
 * out for matching nothing, counted: `focus a; 2 foci skipped (no match)`.
 */
function fociText(header: HeaderOptions, shown: number, style: HeaderStyle): string {
  const { foci, skippedFoci = 0 } = header;
  const w = style.words;
  const skipped =
    skippedFoci > 0
      ? w(`; ${formatCount(skippedFoci)} ${skippedFoci === 1 ? "focus" : "foci"} skipped (no match)`)
      : "";
  if (foci.length === 0) return `${w("no focus")}${skipped}`;
  const named = foci.slice(0, Math.max(shown, 1)).map((f) => style.name(f === "" ? '""' : safeText(f)));
  const rest = foci.length - named.length;
  return `${w(foci.length === 1 ? "focus " : "foci ")}${named.join(w(", "))}${rest > 0 ? w(` and ${formatCount(rest)} more`) : ""}${skipped}`;
}

/**
 * A header's clauses, naming at most `fociShown` foci and saying `header.lines` of the budget used
 * (the lines asked for are passed apart, so the wrapping can be decided for the most lines there can be).
 */
type HeaderParts = (fociShown: number, header: HeaderOptions) => string[];

/** One line within `width`: the list of foci shortens first, then the end is cut (the interactive view's). */
function fitHeader(
  parts: HeaderParts,
  header: HeaderOptions,
  width: number | undefined,
  style: HeaderStyle,
): string {
  const text = (k: number) => parts(k, header).join(style.words("; "));
  if (width === undefined) return text(FOCI_SHOWN);
  for (let k = FOCI_SHOWN; k >= 1; k--) if (displayWidth(text(k)) <= width) return text(k);
  return shortenEnd(text(1), width);
}

/** How a wrapped header's lines after the first start. */
const HEADER_INDENT = "  ";

/**
 * The header within `width` as printed lines: one line when it fits with some foci named (three, two,
 * then one); else the one-focus text wrapped, whole `; ` clauses to a line where they fit, a clause
 * longer than a line broken at its spaces (a word longer than a line cut at its end). Where the lines
 * break is decided as if the whole budget were used, so a header counted before the fit (see
 * `headerLinesFor`) takes no more lines once the fit says how many it used.
 */
export function wrapHeader(parts: HeaderParts, header: HeaderOptions, width: number | undefined): string[] {
  const text = (k: number) => parts(k, header).join("; ");
  if (width === undefined) return [text(FOCI_SHOWN)];
  // One line only when it would be one with the whole budget used (`40 of 40 lines`): the fit counted
  // the rows so, and a header one row shorter would make its own count of lines wrong.
  const most = (k: number) => parts(k, { ...header, lines: header.budget }).join("; ");
  for (let k = FOCI_SHOWN; k >= 1; k--) if (displayWidth(most(k)) <= width) return [text(k)];
  const widest = parts(1, { ...header, lines: header.budget });
  const lines = packClauses(widest, width);
  const last = widest[widest.length - 1];
  const actual = parts(1, header);
  return lastClauseReplaced(lines, last, actual[actual.length - 1]) ?? packClauses(actual, width);
}

/**
 * `lines` with their last clause `was` (`40 of 40 lines`) written as `now` (`12 of 40 lines`), word for
 * word where it stands, so the header takes the rows the fit counted even where `was` broke over two
 * lines and `now` would not; null when the two do not have the same words in number, or `was` is not
 * at the end whole (a word cut).
 */
function lastClauseReplaced(lines: readonly string[], was: string, now: string): string[] | null {
  const before = was.split(" ");
  const after = now.split(" ");
  if (before.length !== after.length) return null;
  const out = [...lines];
  let left = before.length;
  for (let i = out.length - 1; i >= 0 && left > 0; i--) {
    const body = out[i].trimStart();
    const indent = out[i].slice(0, out[i].length - body.length);
    const words = body.split(" ");
    const n = Math.min(left, words.length);
    const tail = words.slice(words.length - n);
    if (tail.join(" ") !== before.slice(left - n, left).join(" ")) return null;
    out[i] = indent + [...words.slice(0, words.length - n), ...after.slice(left - n, left)].join(" ");
    left -= n;
  }
  return left === 0 ? out : null;
}

/** Clauses `; `-joined into lines of at most `width` columns (see {@link wrapHeader}). */
function packClauses(clauses: readonly string[], width: number): string[] {
  const lines: string[] = [];
  let line = "";
  const fits = (s: string) => displayWidth(s) <= width;
  clauses.forEach((clause, i) => {
    const piece = i < clauses.length - 1 ? `${clause};` : clause;
    if (line !== "" && fits(`${line} ${piece}`)) line = `${line} ${piece}`;
    else {
      if (line !== "") lines.push(line);
      const start = lines.length === 0 ? "" : HEADER_INDENT;
      if (fits(start + piece)) line = start + piece;
      else {
        const room = width - displayWidth(HEADER_INDENT);
        const broken = wrapWords(longWordsCut(piece, room), room).map((l, j) =>
          j === 0 ? start + l : HEADER_INDENT + l,
        );
        line = broken.pop()!;
        lines.push(...broken);
      }
    }
  });
  lines.push(line);
  return lines;
}

/** Fewest columns a word longer than a line keeps beside the word before it (see {@link longWordsCut}). */
const LONG_WORD_KEPT = 12;

/**
 * `text` with each word longer than a line of `room` columns (a focus's long path) cut to the room
 * its line has after the word before it (`focus doc/liberror-prone-java/exa…`), where that keeps
 * {@link LONG_WORD_KEPT} columns of it: such a word is cut anyway, and on a line of its own it would
 * leave the word before it alone on another.
 */
function longWordsCut(text: string, room: number): string {
  const words = text.split(" ");
  return words
    .map((word, k) => {
      if (k === 0 || displayWidth(word) <= room) return word;
      const left = room - displayWidth(words[k - 1]) - 1;
      return left >= LONG_WORD_KEPT ? shortenEnd(word, left) : word;
    })
    .join(" ");
}

/** The foci of a view as the header prints them: a row id where rows have ids, else the path. */
export function fociOf<T extends ViewNode>(view: HierarchyNode<T>): string[] {
  const out: string[] = [];
  view.eachBefore(({ data }) => {
    if (data.focus) out.push(data.id ?? data.path);
  });
  return out;
}
