import { defaultComparedFields } from "../diff/field-edits.js";
import { safeText } from "../model/safe-text.js";
import type { Tree } from "../model/tree.js";
import { loadVersions } from "./input.js";
import type { CliIO } from "./io.js";
import type { SharedCliOptions } from "./options.js";

/** Two versions loaded for a diff, and the record fields it compares between matched nodes. */
export interface ComparedVersions {
  readonly trees: [Tree, Tree];
  /** The compared fields: `--compare-field`'s, else those compared by default (see {@link loadCompared}). */
  readonly fields: readonly string[];
  /** Whether a compared field may be missing from a version (holding nothing there): the default's other fields. */
  readonly optional: boolean;
}

/**
 * Loads both versions with the fields the diff compares. `--compare-field` names them. Without it, a
 * diff compares `version` where both versions' records have it (a dependency listing's), a document read
 * as values its scalars' text, and else every other field the records hold (TreeReading.otherFields:
 * an image tag in a list of services, a title in an org chart): the versions are read again keeping
 * them, since a field no one compared would make a changed value no change, and `--fail-on-change`
 * pass it. Standard input is read once: its diff says on standard error what it could not compare.
 */
export async function loadCompared(
  io: CliIO,
  oldInput: string,
  newInput: string,
  opts: SharedCliOptions & { readonly compareField: readonly string[] },
): Promise<ComparedVersions> {
  const trees = await loadVersions(io, oldInput, newInput, opts);
  if (opts.compareField.length > 0) return { trees, fields: opts.compareField, optional: false };
  const fields = defaultComparedFields(trees[0], trees[1]);
  const other = fields.length > 0 ? [] : otherFieldsOf(trees);
  if (other.length === 0) return { trees, fields, optional: false };
  if (oldInput === "-" || newInput === "-") {
    io.stderr.write(notComparedNote(other));
    return { trees, fields, optional: false };
  }
  // The first load's notes were said; the second's are the same.
  const quiet: CliIO = { ...io, stderr: { write: () => true, isTTY: false } };
  const again = await loadVersions(quiet, oldInput, newInput, { ...opts, otherCompared: other });
  return { trees: again, fields: other, optional: true };
}

/** The record fields either version holds beside those read for the tree, OLD's first. */
function otherFieldsOf(trees: readonly Tree[]): string[] {
  return [...new Set(trees.flatMap((tree) => tree.reading?.otherFields ?? []))];
}

function notComparedNote(fields: readonly string[]): string {
  const named = fields.map((f) => JSON.stringify(safeText(f, 80))).join(", ");
  return (
    `espalier: note: the records hold fields this diff did not compare (${named}), since a version ` +
    `read from standard input is read once: a changed value in them is no change here; give each with ` +
    `--compare-field to compare it [FIELDS_NOT_COMPARED]\n`
  );
}
