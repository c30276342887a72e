import { type ErrorDetails, EspalierError } from "../errors.js";
import { SCALAR_VALUE_FIELD } from "../load/load-options.js";
import type { Tree } from "../model/tree.js";

/** One compared field whose value differs between the two versions of a matched node. */
export interface FieldEdit {
  field: string;
  /** The value in OLD, as the loader kept it ("" when the node has none). */
  old: string;
  /** The value in NEW. */
  new: string;
}

/** The fields `--compare-field` names, with each version's values (one string per node, "" when absent). */
export interface ComparedFields {
  readonly fields: readonly string[];
  readonly oldValues: readonly (readonly string[])[];
  readonly newValues: readonly (readonly string[])[];
}

/**
 * What `diff` compares without `--compare-field`: a package's `version`, as dependency listings and
 * lock files carry it (npm's `npm ls --json` and package-lock.json name it so; common practice, no
 * source for other ecosystems). Without it a version bump that moves no node and changes no size would
 * be no change at all, and `--fail-on-change` would pass it.
 */
export const DEFAULT_COMPARED_FIELDS: readonly string[] = ["version"];

/**
 * The default compared fields that both versions kept (an input without them compares none); two
 * documents read as values compare their scalars' text (kept as `value`, see LoadOptions.keepScalars),
 * which is what such a document holds beyond names and byte lengths.
 */
export function defaultComparedFields(oldTree: Tree, newTree: Tree): string[] {
  const values = [oldTree, newTree].every(
    (t) => t.reading?.shape === "values" && t.fields.has(SCALAR_VALUE_FIELD),
  );
  if (values) return [SCALAR_VALUE_FIELD];
  return DEFAULT_COMPARED_FIELDS.filter((f) => oldTree.fields.has(f) && newTree.fields.has(f));
}

/**
 * The compared fields of two versions. `optional` (the fields compared by default): a field a version
 * does not have holds nothing there (every value ""). Else a field that some version does not have is
 * FIELD_MISSING naming
 * the fields it does have: a comparison with nothing would report no change, or every node changed,
 * silently. (The loaders already refuse a kept field that no node of their input has; this also covers
 * inputs that keep no fields, such as path lists.)
 */
export function comparedFields(
  oldTree: Tree,
  newTree: Tree,
  fields: readonly string[],
  optional = false,
): ComparedFields {
  const unique = [...new Set(fields)];
  const none: readonly string[] = [];
  if (optional)
    return {
      fields: unique,
      oldValues: unique.map((field) => oldTree.fields.get(field) ?? none),
      newValues: unique.map((field) => newTree.fields.get(field) ?? none),
    };
  for (const field of unique) {
    for (const [tree, version] of [
      [oldTree, "OLD"],
      [newTree, "NEW"],
    ] as const) {
      if (tree.fields.has(field)) continue;
      const seen = [...tree.fields.keys()].filter((name) => !unique.includes(name));
      const details: ErrorDetails = { option: "--compare-field", field, version, fieldsSeen: seen };
      throw new EspalierError(
        "FIELD_MISSING",
        `--compare-field ${JSON.stringify(field)}: no node of ${version} has this field` +
          (seen.length > 0
            ? `; the other kept fields are ${seen.map((s) => JSON.stringify(s)).join(", ")}`
            : "; this input keeps no record fields"),
        undefined,
        details,
      );
    }
  }
  return {
    fields: unique,
    oldValues: unique.map((field) => oldTree.fields.get(field)!),
    newValues: unique.map((field) => newTree.fields.get(field)!),
  };
}

/** Whether matched nodes o (in OLD) and n (in NEW) differ in a compared field: code units equal or not. */
export function isEdited(compared: ComparedFields, o: number, n: number): boolean {
  const { oldValues, newValues } = compared;
  for (let f = 0; f < oldValues.length; f++) {
    if ((oldValues[f][o] ?? "") !== (newValues[f][n] ?? "")) return true;
  }
  return false;
}

/** The compared fields in which matched nodes o and n differ, in the order they were asked for. */
export function fieldEdits(compared: ComparedFields, o: number, n: number): FieldEdit[] {
  const edits: FieldEdit[] = [];
  compared.fields.forEach((field, f) => {
    const before = compared.oldValues[f][o] ?? "";
    const after = compared.newValues[f][n] ?? "";
    if (before !== after) edits.push({ field, old: before, new: after });
  });
  return edits;
}
