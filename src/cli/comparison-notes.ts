import { idsRenumberedNote } from "../diff/ids-renumbered.js";
import type { PreparedDiff } from "../diff/prepared-diff.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import { formatCount } from "../render/amount.js";
import { displayName } from "./input.js";
import type { CliIO } from "./io.js";
import { notesText } from "./reading-notes.js";

/**
 * The two versions as `espalier diff` and `espalier explore OLD NEW` show them: what only the
 * comparison tells (ids renumbered) is a note on NEW, written to standard error as the loaders' notes
 * are and carried on NEW's reading notes for the header and JSON.
 */
export function comparisonNotes(
  prepared: PreparedDiff,
  [oldTree, newTree]: readonly [Tree, Tree],
  newInput: string,
  io: CliIO,
  key: string | undefined,
): [Tree, Tree] {
  // Its numbers in the header's style (`998,998`), as the header says the note's count.
  const renumbered = idsRenumberedNote(prepared, (n) => formatCount(n));
  if (!renumbered) return [oldTree, newTree];
  io.stderr.write(notesText(withNotes(newTree, [renumbered]), displayName(newInput), key));
  return [oldTree, withNotes(newTree, [...(newTree.reading?.notes ?? []), renumbered])];
}

/** `tree` with `notes` as its reading notes (a tree read without a reading as a table's). */
function withNotes(tree: Tree, notes: readonly ReadingNote[]): Tree {
  const reading = tree.reading ?? { shape: "table", sizeUnit: "number" };
  return { ...tree, reading: { ...reading, notes } };
}
