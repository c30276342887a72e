import { type InputText, type MessagePart, showInput } from "../errors.js";

/**
 * What a loader tells the reader beside the tree: the input was read one way although it may have meant
 * another, and how to say so. The load succeeds (exit 0); the command line prints each note on
 * standard error and the summary JSON carries them under `input.notes`, so a run whose numbers rest on
 * a guess never says nothing about it. Plain data: a note crosses a thread with its tree.
 */
export interface ReadingNote {
  /** What was noticed (one code per kind of note, as errors have). */
  readonly code: ReadingNoteCode;
  /** 1-based line of the input the note is about, when it is about one. */
  readonly line?: number;
  /** The note as wording and marked input text (see `quoted` in errors.ts), so `--pseudonymize` can hide it. */
  readonly parts: readonly MessagePart[];
  /**
   * How many things the note is about, where it counts them: node objects marked missing, keys
   * repeated, aliases, folders left out above a listing's start. The header line says it (see
   * render/note-clause.ts), so standard output alone tells a reader how to take the numbers.
   */
  readonly count?: number;
}

/**
 * The kinds of note. `FIRST_LINE_APART`: an edge list's first line was read as an edge that joins no
 * other line, as a header naming the columns (`from<TAB>to`) reads (load/apart-first-line.ts).
 * `COMMAS_READ_AS_PATHS`: a detected path list of two lines holding as many commas, as a CSV table's
 * header and one row do, was read as two paths (load/path-list/path-list-reader.ts; from three such
 * lines on it is PARSE_PATHS). `READ_AS_OTHER`: a diff's version was read as the other one was (node objects
 * with one children field, every value a node, …) although on its own it reads another way
 * (cli/input.ts readOneWay). `ROOT_IS_FOLDER`: a diff's path list that names its folder (`find proj`,
 * `find /srv/proj`) was compared from that folder down with the other version, which lists the folder's
 * contents without its name, or names it at another path (cli/listing-start.ts). `SIZES_LEFT_OUT`: a diff's version with sizes was
 * compared without them, as the other version has none (cli/version-readings.ts). `REPEATED_KEY`: JSON
 * node objects in which a key repeats where the repeat drops nodes (a children-by-name object, a
 * node's children field), or an id repeats in a JSON adjacency map: the last value was read, as
 * JSON.parse reads it (load/json/json-loader.ts, load/graph-input.ts). `UNSIZED_IMPORTANCE`:
 * `--importance size` on an input without sizes, which ranks as `--importance depth` (cli/input.ts).
 * `MISSING_ENTRIES`: node objects holding `"missing": true`, as `npm ls --all --json` lists a dependency
 * it did not find, counted as nodes (load/missing-entries.ts). `DEDUPED_ENTRIES`: JSON node objects
 * holding a `version` and no `overridden` beside others that hold one, as `npm ls --all --json` lists
 * a package again under each package that requires it, counted as leaves (load/deduped-entries.ts).
 * `ALIASES_AS_TEXT`: YAML read as values
 * holds aliases, each a leaf of its own text (`*base`), not the value it names (load/yaml-values.ts).
 * `SIZES_LIKE_TOTALS`: node objects or rows whose every node with children is at least as big as its
 * children add up to, as sizes that include the children's are, read as own sizes
 * (load/size-totals.ts); or a path list so, in an order and with sizes that do not settle it
 * (path-list/folder-totals.ts). `TOTAL_LINE_LEFT_OUT`: a path list's last line `SIZE<TAB>total` that gives
 * what the other lines add up to, as `du -c` ends its listing, left out (path-list/grand-total.ts).
 * `LAST_LINE_LIKE_TOTAL`: such a last line in a word that is no translation of du's "total" espalier
 * knows, read as an entry (path-list/grand-total.ts). `IDS_RENUMBERED`: a diff's NEW version, matched
 * by id, in which most removed nodes pair by name and place with added ones, or most nodes moved or
 * renamed pair so with other nodes than by id, as renumbered ids do (diff/ids-renumbered.ts).
 * `NODES_NOT_READ`: node objects (objects holding the name, size or children field) in a field of a
 * node object that is not read, as a second list beside the children field's, left out of the tree and
 * of every total (load/nodes-not-read.ts). `UNDECODABLE_BYTES`: lines of a path list or a YAML document, rows
 * of a table, ids of an edge list or strings of a JSON document hold bytes that are not UTF-8, read as U+FFFD; count: how many (load/not-utf8-note.ts).
 * `ABSOLUTE_AND_RELATIVE`: a path list names paths from "/" and paths that start elsewhere, read as two
 * trees side by side (load/path-list/mixed-starts.ts).
 * `SBOM_DEPENDENCIES`: a CycloneDX document read as its dependency graph, not as its values
 * (load/cyclonedx.ts). `UNIT_NOT_SAID`: a path list whose sizes, which show no unit (one folder's
 * entries, or fewer than 8 sizes), were read as bytes; count: the entries, or the sizes
 * (load/path-list/unit-not-shown.ts, cli/input.ts). `SAVED_VIEW`: espalier's own summary JSON
 * read as the view it holds, each fold one entry standing for what it hides; count: the folds
 * (load/saved-output.ts). `COMPARED_AT_FOLDS` (a diff's version): it shows nodes inside folds of the
 * other version, a saved view that folds more, and was compared at those folds, each a whole; count:
 * the folds (diff/at-coarser-folds.ts).
 */
export const readingNoteCodes = [
  "FIRST_LINE_APART",
  "COMMAS_READ_AS_PATHS",
  "READ_AS_OTHER",
  "ROOT_IS_FOLDER",
  "SIZES_LEFT_OUT",
  "REPEATED_KEY",
  "UNSIZED_IMPORTANCE",
  "MISSING_ENTRIES",
  "DEDUPED_ENTRIES",
  "ALIASES_AS_TEXT",
  "SIZES_LIKE_TOTALS",
  "TOTAL_LINE_LEFT_OUT",
  "LAST_LINE_LIKE_TOTAL",
  "IDS_RENUMBERED",
  "NODES_NOT_READ",
  "UNDECODABLE_BYTES",
  "ABSOLUTE_AND_RELATIVE",
  "SBOM_DEPENDENCIES",
  "UNIT_NOT_SAID",
  "SAVED_VIEW",
  "COMPARED_AT_FOLDS",
] as const;

export type ReadingNoteCode = (typeof readingNoteCodes)[number];

/**
 * A note as it is printed: its code, its line, its count and its message (input shown by `show`). The
 * count is what the header says in its words (`3 missing counted as nodes`), so a script reads from
 * the JSON every number the screen shows.
 */
export interface ShownNote {
  code: ReadingNoteCode;
  line?: number;
  count?: number;
  message: string;
}

/** A note as the header line says it: its code, its count and line, and the diff version it is on. */
export interface NoteFact {
  code: ReadingNoteCode;
  count?: number;
  line?: number;
  /** A diff: the version the note is on; undefined for a summary. */
  version?: "OLD" | "NEW";
}

/** `note` as the header says it: no input text, so nothing `--pseudonymize` hides. */
export function noteFact(note: ReadingNote, version?: "OLD" | "NEW"): NoteFact {
  return {
    code: note.code,
    ...(note.count === undefined ? {} : { count: note.count }),
    ...(note.line === undefined ? {} : { line: note.line }),
    ...(version === undefined ? {} : { version }),
  };
}

/** `note` with its input text shown by `show` (as it is, or pseudonyms under `--pseudonymize`). */
export function showNote(note: ReadingNote, show: (t: InputText) => string = showInput): ShownNote {
  let message = "";
  for (const part of note.parts) message += typeof part === "string" ? part : show(part);
  return {
    code: note.code,
    ...(note.line === undefined ? {} : { line: note.line }),
    ...(note.count === undefined ? {} : { count: note.count }),
    message,
  };
}
