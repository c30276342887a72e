import { defaultComparedFields } from "../diff/field-edits.js";
import { NPM_CHILDREN_FIELD, OVERRIDDEN_FIELD } from "../load/deduped-entries.js";
import { MOST_OTHER_FIELDS } from "../load/other-fields-kept.js";
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
 * as values its scalars' text, and besides every other field the records hold (TreeReading.otherFields:
 * an image tag in a list of services that also name a version, a title in an org chart), since a field
 * no one compared would make a changed value no change, and `--fail-on-change` pass it. Each version's
 * load keeps them as it reads (LoadOptions.keepOtherFields), a version from standard input too, so each
 * is read once. Fields a load met past the most it keeps (load/other-fields-kept.ts) are said on
 * standard error as not compared.
 */
export async function loadCompared(
  io: CliIO,
  oldInput: string,
  newInput: string,
  opts: SharedCliOptions & { readonly compareField: readonly string[] },
): Promise<ComparedVersions> {
  if (opts.compareField.length > 0)
    return {
      trees: await loadVersions(io, oldInput, newInput, opts),
      fields: opts.compareField,
      optional: false,
    };
  const trees = await loadVersions(io, oldInput, newInput, { ...opts, keepOtherFields: true });
  const fields = defaultComparedFields(trees[0], trees[1]);
  const left = leftOut(trees).filter((f) => !fields.includes(f));
  if (left.length > 0)
    io.stderr.write(
      notComparedNote(
        left,
        trees.some((t) => t.reading?.otherFieldsLeft?.more),
      ),
    );
  let other = otherCompared(trees).filter((f) => !fields.includes(f) && !left.includes(f));
  // A saved view keeps no record fields (load/saved-output.ts): the other version's would each be an
  // edit from nothing on every node, a change no one made. Compared: those every saved view holds.
  const unknown = other.filter((f) => trees.some((t) => isSavedView(t) && !t.fields.has(f)));
  if (unknown.length > 0) {
    io.stderr.write(savedNotComparedNote(unknown));
    other = other.filter((f) => !unknown.includes(f));
  }
  if (other.length === 0) return { trees: onlyCompared(trees, fields), fields, optional: false };
  return withOther(trees, fields, other);
}

/** The default fields and the other fields after them; a version may lack the others (optional). */
function withOther(
  trees: [Tree, Tree],
  fields: readonly string[],
  other: readonly string[],
): ComparedVersions {
  const all = [...fields, ...other.filter((f) => !fields.includes(f))];
  return { trees: onlyCompared(trees, all), fields: all, optional: all.length > fields.length };
}

/**
 * The versions without the other fields their loads kept and the diff does not compare (npm ls's
 * `overridden`): the combined tree carries only what was kept for a purpose.
 */
function onlyCompared(trees: [Tree, Tree], compared: readonly string[]): [Tree, Tree] {
  return trees.map((tree) => {
    const drop = (tree.reading?.otherFields ?? []).filter((f) => tree.fields.has(f) && !compared.includes(f));
    if (drop.length === 0) return tree;
    const fields = new Map(tree.fields);
    for (const f of drop) fields.delete(f);
    return { ...tree, fields };
  }) as [Tree, Tree];
}

/**
 * The record fields the versions hold beside those read for the tree (OLD's first) that a diff without
 * `--compare-field` compares after the default ones (`version`, where both versions have it): all but
 * npm ls's `overridden` (deduped-entries.ts), which marks an entry full rather than deduped: a package's
 * deduped entry paired with its full entry would be an edit of nothing.
 */
function otherCompared(trees: readonly Tree[]): string[] {
  const npm = trees.some(
    (t) => t.reading?.shape === "nodes" && t.reading.childrenField === NPM_CHILDREN_FIELD,
  );
  return otherFieldsOf(trees).filter((f) => !(npm && f === OVERRIDDEN_FIELD));
}

/** The record fields either version holds beside those read for the tree, OLD's first. */
function otherFieldsOf(trees: readonly Tree[]): string[] {
  return [...new Set(trees.flatMap((tree) => tree.reading?.otherFields ?? []))];
}

/**
 * The fields the versions' loads met past the most they keep, not kept (OLD's first), and any a
 * reading lists that its load did not keep: compared, each would hold nothing, a change no change.
 */
function leftOut(trees: readonly Tree[]): string[] {
  return [
    ...new Set(
      trees.flatMap((tree) => [
        ...(tree.reading?.otherFieldsLeft?.names ?? []),
        ...(tree.reading?.otherFields ?? []).filter((f) => !tree.fields.has(f)),
      ]),
    ),
  ];
}

/** The fields not kept (met past the most a load keeps), so not compared. */
function notComparedNote(fields: readonly string[], more: boolean | undefined): string {
  const named = fields.map((f) => JSON.stringify(safeText(f, 80))).join(", ");
  return (
    `espalier: note: the records hold fields this diff did not keep, so did not compare (${named}` +
    `${more ? " and more" : ""}): a load keeps at most ${MOST_OTHER_FIELDS} fields beside those the tree is ` +
    `read from, the first met; a value changed in the others is no change here; give each with ` +
    `--compare-field to compare it [FIELDS_NOT_COMPARED]\n`
  );
}

function isSavedView(tree: Tree): boolean {
  return tree.reading?.notes?.some((n) => n.code === "SAVED_VIEW") === true;
}

/** The fields a version holds that a saved view does not keep, so not compared. */
function savedNotComparedNote(fields: readonly string[]): string {
  const named = fields.map((f) => JSON.stringify(safeText(f, 80))).join(", ");
  return (
    `espalier: note: a saved view (SAVED_VIEW) keeps no record fields, so the other version's were not ` +
    `compared (${named}): a value changed in them is no change here; diff the original inputs to ` +
    `compare them [FIELDS_NOT_COMPARED]\n`
  );
}
