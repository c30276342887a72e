import { pseudonymousInput } from "../model/pseudonym.js";
import { type ShownNote, showNote } from "../model/reading-note.js";
import { safeText } from "../model/safe-text.js";
import type { Tree } from "../model/tree.js";

/**
 * The loader's notes on how it read `tree` (model/reading-note.ts), input text shown as it is or, under
 * `--pseudonymize` (a key), as pseudonyms: what standard error prints and the summary JSON carries.
 */
export function shownNotes(tree: Tree, key: string | undefined): ShownNote[] {
  const show = key === undefined ? undefined : pseudonymousInput(key);
  return (tree.reading?.notes ?? []).map((note) => showNote(note, show));
}

/** The lines standard error gets for the notes on `tree`, read from `file` (as messages name it). */
export function notesText(tree: Tree, file: string, key: string | undefined): string {
  return shownNotes(tree, key)
    .map((note) => {
      const where = note.line === undefined ? file : `${file}:${note.line}`;
      return `espalier: note: ${safeText(where, 400)}: ${safeText(note.message, 2000)} [${note.code}]\n`;
    })
    .join("");
}
