import type { LoadOptions } from "./load-options.js";

type FieldNames = Pick<LoadOptions, "childrenField" | "idField" | "parentField" | "pathField">;

/**
 * Whether a parsed JSON value is a table of rows rather than an array of nested root nodes, by the keys
 * of its first element: a top-level array whose first element is an object with the id, parent or path
 * field and no children field. Other values of a row may be anything (only the fields read must be
 * plain values).
 */
export function isRowsValue(value: unknown, fields: FieldNames): boolean {
  if (!Array.isArray(value) || value.length === 0) return false;
  const first: unknown = value[0];
  if (typeof first !== "object" || first === null || Array.isArray(first)) return false;
  if (Object.hasOwn(first, fields.childrenField)) return false;
  return (
    Object.hasOwn(first, fields.idField) ||
    Object.hasOwn(first, fields.parentField) ||
    Object.hasOwn(first, fields.pathField)
  );
}
