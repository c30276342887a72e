import { type MessagePart, say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";

/**
 * The fields by which `npm ls --all --json` tells a package's full entry from a deduped one (npm 11,
 * lib/commands/ls.js, read here): every entry but the project's own gets `overridden` (true or false),
 * except one standing for a package already listed, which is written from a copy of the package that
 * lacks it: `{"version": "1.0.4"}` (with `--long`, the manifest too), its dependencies under the full
 * entry only. So, in a listing whose entries hold `overridden`, a node object below the top with a
 * `version`, no `overridden` and no dependencies is deduped.
 */
export const VERSION_FIELD = "version";
export const OVERRIDDEN_FIELD = "overridden";

/** The children field of `npm ls --all --json`, under which deduped entries are looked for. */
export const NPM_CHILDREN_FIELD = "dependencies";

/**
 * DEDUPED_ENTRIES: `count` node objects are deduped entries, the first being `first` (on `line`, when
 * known). They are leaves counted in every total, as a package listed again is a node of the listing;
 * the note says so, so a reader counting installed packages knows the count holds them twice.
 */
export function dedupedEntriesNote(count: number, first: readonly MessagePart[], line?: number): ReadingNote {
  const objects = count === 1 ? "1 node object holds" : `${count} node objects hold`;
  return {
    code: "DEDUPED_ENTRIES",
    count,
    ...(line === undefined ? {} : { line }),
    parts: say`${objects} a "${VERSION_FIELD}" and no "${OVERRIDDEN_FIELD}", as npm ls --all --json lists a package again (deduped) under each other package that requires it, its dependencies under its full entry only (the first: ${first}): each is counted as a node, a leaf, in every total; npm ls --all --parseable lists each installed package once`,
  };
}
