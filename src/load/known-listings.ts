import { EspalierError } from "../errors.js";
import { folderSectionsError, startsSections } from "./folder-sections.js";
import { blockTotalLine } from "./path-list/block-counts.js";

/**
 * The error of {@link knownListingError} for a text detected as YAML whose parse failed: its first two
 * non-blank lines (the second's number is the error's line). As YAML, a first line such as
 * `src/ledger:` or `Archive:  tide.zip` reads as a key, and the parser's own error names neither.
 */
export function knownListingAt(text: string): EspalierError | undefined {
  const lines = text.split("\n", 4).map((line) => line.replace(/\r$/, ""));
  const first = lines.findIndex((line) => line.trim() !== "");
  if (first === -1 || lines[first + 1] === undefined) return undefined;
  return knownListingError(lines[first], lines[first + 1], first + 2, "yaml");
}

/**
 * PARSE_PATHS for an input whose first two non-blank lines (`first`, and `second` on line `line`) start
 * a listing a known command prints, which is no path list, no YAML and no table espalier reads: a
 * folder's section as `ls -R` prints it (see {@link startsSections}), an archive's listing as
 * `unzip -l` and `zipinfo` print it, a commit as `git log` and `git show` print it. `as` is how the
 * input was being read: detected as YAML from its first line, or as a path list. Undefined otherwise.
 */
export function knownListingError(
  first: string,
  second: string,
  line: number,
  as: "yaml" | "paths",
): EspalierError | undefined {
  if (startsSections(first, second) && (as === "yaml" || blockTotalLine(second) || !second.includes("/")))
    return folderSectionsError(line, as);
  const read =
    as === "yaml"
      ? "read as YAML it fails here"
      : "read as a path list, each line would be one path, its other words part of the names";
  const paths = "; to read each line as a path, pass --input-format paths";
  for (const known of KNOWN) {
    if (!known.first.test(first) || !known.second.test(second)) continue;
    return new EspalierError(
      "PARSE_PATHS",
      `${known.listing}; ${read}. ${known.way}${as === "paths" ? paths : ""}`,
      {
        line,
        column: 1,
      },
    );
  }
  return undefined;
}

/**
 * unzip -l, unzip -v and zipinfo (Info-ZIP UnZip 6.00, seen here): `Archive:  NAME`, then a header of
 * columns (`  Length      Date    Time    Name`, ` Length   Method …`) or zipinfo's
 * `Zip file size: 1150 bytes, number of entries: 7`.
 */
const ZIP_FIRST = /^Archive: {2}\S/;
const ZIP_SECOND = /^(?: +Length +|Zip file size: [0-9]+)/;
const ZIP_LISTING =
  "the input starts as unzip -l and zipinfo print an archive (Archive: and its name, then a header)";
const ZIP_WAY =
  "Keep each member's size and name as a path list: unzip -l FILE | awk '$1 ~ /^[0-9]+$/ && $2 ~ /-/ {s = $1; sub(/^ *[0-9]+ +[^ ]+ +[^ ]+ +/, \"\"); print s \"\\t\" $0}' | espalier - (its root's size is the total unzip -l prints last)";

/**
 * git log and git show (git 2.39, seen here): `commit HASH` (SHA-1 or SHA-256, maybe its refs in
 * parentheses), then `Author: …`, or `Merge: …` for a merge.
 */
const COMMIT_FIRST = /^commit [0-9a-f]{7,64}(?: \(.*\))?$/;
const COMMIT_SECOND = /^(?:Author|Merge): /;
const COMMIT =
  "the input starts as git log and git show print a commit (commit and its hash, then Author: or Merge:)";
const COMMIT_WAY =
  'For the files the commits changed, list their paths alone, each with how many commits changed it as its size: git log --name-only --format= | sort | uniq -c | awk \'NF > 1 {n = $1; sub(/^ *[0-9]+ /, ""); print n "\\t" $0}\' | espalier - --units plain';

/**
 * A package's record of fields as pip show (pip 23.2, seen here: `Name: pip`, `Version: 23.2.1`, …,
 * records apart by `---`), dpkg -s, apt-cache show and /var/lib/dpkg/status print it (`Package: bash`,
 * then `Essential:`, `Status:` or `Source:`; deb-control(5)): a field's name, ": " and its value.
 */
const RECORD_FIRST = /^(?:Name|Package): \S/;
const RECORD_SECOND = /^[A-Z][A-Za-z0-9-]*: /;
const RECORD =
  "the input starts as pip show, dpkg -s and apt-cache show print a package's record (Name: or Package:, then a field a line)";
const RECORD_WAY =
  'For what requires what, list one edge a line: pip show PKG... | awk \'/^Name: /{n = $2} /^Requires: ./{sub(/^Requires: /, ""); k = split($0, r, ", "); for (i = 1; i <= k; i++) print n "\\t" r[i]}\' | espalier - --input-format edges; pip list --format json and pip inspect read as they are';

/**
 * espalier's own text and Markdown output (src/render/header.ts): its header, `summary: 5,260 nodes…`
 * or `diff by path: 8 added, 15 removed…`, maybe behind colour escapes, then anything. Read back as a
 * path list each line was a path, so a saved text summary compared with `espalier diff` read as every
 * node removed and its lines added, exit 1 under --fail-on-change; the JSON output reads back.
 */
const OWN_FIRST =
  /^(?:\x1b\[[0-9;]*m)*(?:summary: [0-9][0-9,]* nodes?(?:[,;]|$)|diff by [a-z]+: [0-9][0-9,]* added, [0-9][0-9,]* removed)/;
const OWN_SECOND = /(?:)/;
const OWN = "the input starts as espalier prints a summary or a diff as text (its header line)";
const OWN_WAY =
  "espalier reads back its JSON output only: save the summary with --format json (read as the view it holds), or run espalier on the original input";

/** The listings {@link knownListingError} knows by their first two lines: what they are, and the way to read them. */
const KNOWN: readonly { first: RegExp; second: RegExp; listing: string; way: string }[] = [
  { first: ZIP_FIRST, second: ZIP_SECOND, listing: ZIP_LISTING, way: ZIP_WAY },
  { first: COMMIT_FIRST, second: COMMIT_SECOND, listing: COMMIT, way: COMMIT_WAY },
  { first: RECORD_FIRST, second: RECORD_SECOND, listing: RECORD, way: RECORD_WAY },
  { first: OWN_FIRST, second: OWN_SECOND, listing: OWN, way: OWN_WAY },
];
