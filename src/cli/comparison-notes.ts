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
 * comparison tells is a note on its version, written to standard error as the loaders' notes are and
 * carried on that version's reading notes for the header and JSON: ids renumbered (on NEW), and a
 * version compared at the other's saved folds (COMPARED_AT_FOLDS, diff/at-coarser-folds.ts).
 */
export function comparisonNotes(
  prepared: PreparedDiff,
  versions: readonly [Tree, Tree],
  inputs: readonly [string, string],
  io: CliIO,
  key: string | undefined,
): [Tree, Tree] {
  const { combined } = prepared;
  const added: [ReadingNote[], ReadingNote[]] = [[], []];
  for (const [v, tree] of [combined.oldTree, combined.newTree].entries()) {
    const atFolds = tree.reading?.notes?.find((n) => n.code === "COMPARED_AT_FOLDS");
    if (atFolds) added[v].push(atFolds);
  }
  // Its numbers in the header's style (`998,998`), as the header says the note's count.
  const renumbered = idsRenumberedNote(prepared, (n) => formatCount(n));
  if (renumbered) added[1].push(renumbered);
  const out: [Tree, Tree] = [versions[0], versions[1]];
  for (const v of [0, 1] as const) {
    if (added[v].length === 0) continue;
    io.stderr.write(notesText(withNotes(out[v], added[v]), displayName(inputs[v]), key));
    out[v] = withNotes(out[v], [...(out[v].reading?.notes ?? []), ...added[v]]);
  }
  return out;
}

/** `tree` with `notes` as its reading notes (a tree read without a reading as a table's). */
function withNotes(tree: Tree, notes: readonly ReadingNote[]): Tree {
  const reading = tree.reading ?? { shape: "table", sizeUnit: "number" };
  return { ...tree, reading: { ...reading, notes } };
}
