import type { LoadOptions } from "./load-options.js";

type FieldNames = Pick<LoadOptions, "childrenField" | "idField" | "parentField" | "pathField">;

/**
 * Whether a parsed JSON value is a table of rows rather than an array of nested root nodes: a top-level
 * array whose first element is a flat object (no object or array values) with no children field and with
 * the id, parent or path field.
 */
export function isRowsValue(value: unknown, fields: FieldNames): boolean {
  if (!Array.isArray(value) || value.length === 0) return false;
  const first: unknown = value[0];
  if (typeof first !== "object" || first === null || Array.isArray(first)) return false;
  if (Object.hasOwn(first, fields.childrenField)) return false;
  for (const cell of Object.values(first)) if (typeof cell === "object" && cell !== null) return false;
  return (
    Object.hasOwn(first, fields.idField) ||
    Object.hasOwn(first, fields.parentField) ||
    Object.hasOwn(first, fields.pathField)
  );
}
