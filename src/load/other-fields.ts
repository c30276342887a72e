import type { LoadOptions } from "./load-options.js";

export type FieldOptions = Pick<
  LoadOptions,
  "nameField" | "sizeField" | "childrenField" | "idField" | "parentField" | "pathField" | "keepFields"
>;

/**
 * Of the field names a load met on its records (a table's columns, a sample of node objects' keys),
 * those it neither read for the tree (name, size, children, id, parent, path) nor kept, in the order
 * met: what a record holds that the tree does not show (TreeReading.otherFields). A diff without
 * `--compare-field` compares them, so a changed value in one of them is a change (an image tag in a
 * list of services, a title in an org chart), not the same versions.
 */
export function otherFields(met: Iterable<string>, options: FieldOptions): string[] | undefined {
  const read = fieldsRead(options);
  const other = [...met].filter((field) => !read.has(field));
  return other.length > 0 ? other : undefined;
}

/** The fields a load reads for the tree (name, size, children, id, parent, path) or keeps: no other fields. */
export function fieldsRead(options: FieldOptions): Set<string> {
  return new Set([
    options.nameField,
    options.sizeField,
    options.childrenField,
    options.idField,
    options.parentField,
    options.pathField,
    ...options.keepFields,
  ]);
}

/** `{ otherFields }` for a reading, or nothing when there are none. */
export function withOtherFields(fields: readonly string[] | undefined): { otherFields?: readonly string[] } {
  return fields === undefined ? {} : { otherFields: fields };
}

/**
 * The options of a load that keeps its records' other fields (LoadOptions.keepOtherFields): those of
 * the fields met that it reads for no other purpose kept too, each where records have it (optional).
 * Unchanged without `keepOtherFields`, or when there are none.
 */
export function keepingOtherFields<
  T extends FieldOptions & Pick<LoadOptions, "keepOtherFields" | "optionalKeepFields">,
>(options: T, met: Iterable<string>): T {
  if (options.keepOtherFields !== true) return options;
  const other = otherFields(met, options);
  if (other === undefined) return options;
  const unique = [...new Set(other)];
  return {
    ...options,
    keepFields: [...options.keepFields, ...unique],
    optionalKeepFields: [...(options.optionalKeepFields ?? []), ...unique],
  };
}
