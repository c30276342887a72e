import { type MessagePart, say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";

/**
 * The field by which a node object says it stands for something that is not there: `npm ls --all
 * --json` lists each dependency it did not find as `{"required": "...", "missing": true, "problems":
 * [...]}` beside the installed ones (npm 11, as observed on such a listing).
 */
export const MISSING_FIELD = "missing";

/**
 * MISSING_ENTRIES: `count` node objects hold `"missing": true`, the first being `first` (on `line`,
 * when known). They are nodes like the others and count in every total; the note says so, so a reader
 * counting what is installed can take them off, and names the label that marks them.
 */
export function missingEntriesNote(count: number, first: readonly MessagePart[], line?: number): ReadingNote {
  const objects = count === 1 ? "1 node object holds" : `${count} node objects hold`;
  return {
    code: "MISSING_ENTRIES",
    count,
    ...(line === undefined ? {} : { line }),
    parts: say`${objects} "${MISSING_FIELD}": true, as npm ls --all --json lists a dependency it did not find (the first: ${first}): each is counted as a node, in every total; --label '{name} {${MISSING_FIELD}}' marks them on their lines`,
  };
}
