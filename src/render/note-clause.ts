import type { NoteFact, ReadingNoteCode } from "../model/reading-note.js";
import { formatCount } from "./amount.js";

/**
 * How the header says each kind of reading note (model/reading-note.ts) in a few words, so that
 * standard output alone, without the note on standard error, tells a reader how to take its numbers:
 * `720 missing counted as nodes`. A counted kind's words follow its count (`one` and `many` for 1 and
 * the rest); a diff says both versions' counts (`0 -> 2 …`). The words name no input text, so
 * `--pseudonymize` has nothing to hide in them.
 */
const clauses: Readonly<Record<ReadingNoteCode, Clause>> = {
  FIRST_LINE_APART: { said: (n) => `line ${formatCount(n.line ?? 1)} read as an edge` },
  COMMAS_READ_AS_PATHS: { said: () => "lines with commas read as paths" },
  READ_AS_OTHER: { said: (n) => `read as ${n.version === "OLD" ? "NEW" : "OLD"} was` },
  ROOT_IS_FOLDER: {
    said: (n) =>
      n.count
        ? `${formatCount(n.count)} ${n.count === 1 ? "folder" : "folders"} above the start left out`
        : "top folder compared as the root",
  },
  SIZES_LEFT_OUT: { said: () => "sizes left out" },
  REPEATED_KEY: { counted: ["repeated key, the last read", "repeated keys, the last read"] },
  UNSIZED_IMPORTANCE: { said: () => "ranked by depth (no sizes)", ofRun: true },
  SBOM_DEPENDENCIES: { said: () => "read as an SBOM's dependency graph" },
  NODES_NOT_READ: {
    counted: ["node object outside the children not read", "node objects outside the children not read"],
  },
  MISSING_ENTRIES: { counted: ["missing counted as a node", "missing counted as nodes"] },
  DEDUPED_ENTRIES: { counted: ["deduped entry counted as a leaf", "deduped entries counted as leaves"] },
  ALIASES_AS_TEXT: { counted: ["YAML alias read as text", "YAML aliases read as text"] },
  SIZES_LIKE_TOTALS: { said: () => "sizes may count children twice" },
  TOTAL_LINE_LEFT_OUT: { said: (n) => `line ${formatCount(n.line ?? 1)} read as a grand total, left out` },
  LAST_LINE_LIKE_TOTAL: { said: (n) => `line ${formatCount(n.line ?? 1)} may be a grand total, counted` },
  IDS_RENUMBERED: {
    said: (n) =>
      `ids look renumbered (${formatCount(n.count ?? 0)} ${n.count === 1 ? "node pairs" : "nodes pair"} by path)`,
    ofRun: true,
  },
  ABSOLUTE_AND_RELATIVE: { said: () => "absolute and relative paths read as two trees" },
  UNIT_NOT_SAID: { said: () => "sizes read as bytes (no unit said)" },
  SAVED_VIEW: {
    said: (n) =>
      n.count
        ? `saved view, ${n.count === 1 ? "1 fold read as one entry" : `${formatCount(n.count)} folds read as one entry each`}`
        : "saved view",
  },
  COMPARED_AT_FOLDS: {
    said: (n) =>
      `compared at ${n.count === 1 ? "1 fold" : `${formatCount(n.count ?? 0)} folds`} of ${n.version === "OLD" ? "NEW" : "OLD"}, the nodes inside counted in ${n.count === 1 ? "it" : "them"}`,
  },
  UNDECODABLE_BYTES: {
    counted: ["entry not UTF-8, read with U+FFFD", "entries not UTF-8, read with U+FFFD"],
  },
};

/**
 * A kind of note as the header says it: `counted`, the words after its count (for 1, for others),
 * where a version without the note counts 0; else `said`, its words for one note. `ofRun`: about the
 * run (the options), said without a version's name in a diff.
 */
type Clause =
  | { counted: readonly [one: string, many: string]; said?: undefined; ofRun?: undefined }
  | { said: (note: NoteFact) => string; ofRun?: boolean; counted?: undefined };

/**
 * The header's clauses for `notes`, in the order of their kinds in `readingNoteCodes`' table above,
 * one per kind: a summary's `2 missing counted as nodes`; a diff's `0 -> 2 missing counted as nodes`
 * for a counted kind, else each version's note behind its name (`NEW: read as OLD was`), or once
 * without one where both versions' say the same words.
 */
export function noteClauses(notes: readonly NoteFact[]): string[] {
  const out: string[] = [];
  const diff = notes.some((n) => n.version !== undefined);
  for (const [code, clause] of Object.entries(clauses) as [ReadingNoteCode, Clause][]) {
    const of = notes.filter((n) => n.code === code);
    if (of.length === 0) continue;
    if (clause.counted) {
      const count = (version?: "OLD" | "NEW") =>
        of.filter((n) => n.version === version).reduce((sum, n) => sum + (n.count ?? 1), 0);
      const counts = diff ? [count("OLD"), count("NEW")] : [count()];
      const last = counts[counts.length - 1];
      out.push(`${counts.map((c) => formatCount(c)).join(" -> ")} ${clause.counted[last === 1 ? 0 : 1]}`);
      continue;
    }
    // Words both versions say are said once, without a version's name: `OLD: read as an SBOM's
    // dependency graph; NEW: read as an SBOM's dependency graph` took four rows of a 32-column header.
    const words = (version: "OLD" | "NEW") =>
      new Set(of.filter((n) => n.version === version).map((n) => clause.said(n)));
    const [old, next] = [words("OLD"), words("NEW")];
    const both = (w: string) => !clause.ofRun && old.has(w) && next.has(w);
    const said = new Set<string>();
    for (const note of of) {
      const w = clause.said(note);
      const version = note.version === undefined || clause.ofRun || both(w) ? "" : `${note.version}: `;
      said.add(`${version}${w}`);
    }
    out.push(...said);
  }
  return out;
}
