import { EspalierError, quoted, quotedList, type SourcePos, say } from "../errors.js";
import { escapeSegment } from "../model/segment.js";

/** Names of fields seen on node objects, kept while a loader reads: the first few, of the first nodes. */
export class FieldsSeen {
  private readonly names = new Set<string>();

  /** Whether node `node`'s keys are still sampled (the first 1,000 nodes, up to 40 names). */
  wants(node: number): boolean {
    return node < 1000 && this.names.size < 40;
  }

  add(name: string): void {
    this.names.add(name);
  }

  /** The names seen, in the order first seen. */
  list(): string[] {
    return [...this.names];
  }
}

/** A field the user names for every record: its role, the option that names it. */
export type NamedField = "size" | "name" | "kept";

const asked: Record<NamedField, string> = {
  size: "has a number in the size field",
  name: "has the name field",
  kept: "has the field",
};
const option: Record<NamedField, string> = {
  size: "--size-field",
  name: "--name-field",
  kept: "--label, --compare-field",
};

/**
 * FIELD_MISSING for a field the user named that no record has: `--size-field` (a named size field
 * that no node carries a number in), `--name-field` (named, and no node carries a name in it) or a
 * kept field (`--label`, `--compare-field`). The message names the fields the input does have, so the
 * user can pick the right one; `seen` may be a sample.
 */
export function missingField(
  role: NamedField,
  field: string,
  seen: readonly string[],
  sampled = false,
): EspalierError {
  const what = say`no record ${asked[role]} ${quoted.name(field)}${role === "kept" ? " asked to be kept" : ""} (${option[role]})`;
  const have =
    seen.length === 0
      ? ["; the records have no fields"]
      : say`; the ${sampled ? "fields seen on the first records" : "fields"} are ${quotedList("name", seen, 40)}`;
  return new EspalierError("FIELD_MISSING", [...what, ...have], undefined, {
    ...(role === "kept" ? {} : { option: option[role] }),
    field,
    fieldsSeen: [...seen],
  });
}

/**
 * FIELD_MISSING for a named `--size-field` or `--name-field` on an input whose sizes or names come from
 * elsewhere: a path list (the numbers before a tab, the path's last name), a document read as values
 * (each value's bytes, its key or index), or an edge list without node records (the ids), where the
 * message names --nodes (`details.remedies`).
 */
export function fieldNotApplicable(
  role: "size" | "name",
  field: string,
  shape: "paths" | "values" | "edges",
): EspalierError {
  const why = {
    paths:
      role === "size"
        ? "a path list has no record fields: its sizes are the numbers before a tab"
        : "a path list has no record fields: a node's name is the last name of its path",
    values:
      role === "size"
        ? "a document read as values is sized by each value's bytes"
        : "a document read as values names each value by its key or index",
    edges: "the input holds edges and ids only: names and sizes come from node records (--nodes)",
  }[shape];
  return new EspalierError(
    "FIELD_MISSING",
    say`${option[role]} ${quoted.name(field)} does not apply: ${why}`,
    undefined,
    { option: option[role], field, fieldsSeen: [], ...(shape === "edges" ? { remedies: ["--nodes"] } : {}) },
  );
}

/**
 * FIELD_MISSING for a document that would load as one node although its top-level object (a mapping,
 * in YAML's words), or the one object of a top-level array (`inList`), holds objects or arrays under
 * other fields: `fields` are those fields, and the message names the two options that read such a
 * document (`details.remedies`).
 */
export function loneRoot(
  childrenField: string,
  fields: readonly string[],
  words: "json" | "yaml",
  inList = false,
): EspalierError {
  const holding =
    words === "json" ? "fields holding objects or arrays" : "fields holding mappings or sequences";
  const object = words === "json" ? "object" : "mapping";
  const top = inList
    ? `${words === "json" ? "array" : "sequence"}'s one ${object}'s ${holding}`
    : `${object}'s ${holding}`;
  return new EspalierError(
    "FIELD_MISSING",
    say`no node has the children field "${childrenField}", so the input would be one node; the top-level ${top} are ${quotedList("name", fields)}: name the one holding the children with --children-field, or read every value with --read-as values`,
    undefined,
    {
      option: "--children-field",
      field: childrenField,
      fieldsSeen: [...fields],
      remedies: ["--children-field", "--read-as values"],
    },
  );
}

/**
 * FIELD_MISSING for a top-level object (mapping) that is no node but a map of nodes by name: it has no
 * children field, while objects under it do (`below`: the first, by its key, and its field's line), as the
 * value of a children field does (`--start-at /dependencies` of a package listing). A children-by-name
 * object is read below the node that holds it, so the message names the pointer one level up
 * (`startAt` without its last segment) or, with no `--start-at`, the document that holds this one.
 */
export function mapOfNodes(
  childrenField: string,
  below: { holder: string; line: number },
  startAt: string | undefined,
  words: "json" | "yaml",
): EspalierError {
  const object = words === "json" ? "object" : "mapping";
  const up = startAt ? startAt.slice(0, startAt.lastIndexOf("/")) : undefined;
  const remedy =
    up === undefined
      ? [
          "such a map is read as the children field of the node that holds it, or every value with --read-as values",
        ]
      : up === ""
        ? [
            "such a map is read as the children field of the node that holds it: leave out --start-at to read the whole document, or read every value with --read-as values",
          ]
        : say`such a map is read as the children field of the node that holds it: --start-at ${quoted.path(up)}, or read every value with --read-as values`;
  return new EspalierError(
    "FIELD_MISSING",
    say`the top-level ${object} has no children field "${childrenField}", but the ${object}s under it do (that of ${quoted.name(below.holder)} on line ${below.line}): it is a map of nodes by name, not a node, so it would be one node; ${remedy}`,
    { line: below.line },
    {
      option: "--children-field",
      field: childrenField,
      remedies: up === undefined ? ["--read-as values"] : ["--start-at", "--read-as values"],
    },
  );
}

/** Whether an input must carry the size field: it was named, or differs from the default `size`. */
export function sizeFieldNamed(options: { sizeField: string; sizeFieldNamed?: boolean }): boolean {
  return options.sizeFieldNamed === true || options.sizeField !== "size";
}

/** Whether an input must carry the name field: it was named, or differs from the default `name`. */
export function nameFieldNamed(options: { nameField: string; nameFieldNamed?: boolean }): boolean {
  return options.nameFieldNamed === true || options.nameField !== "name";
}

/**
 * Checks the named size and name fields against the fields (columns) a table has: FIELD_MISSING naming
 * them when a named one is absent.
 */
export function checkNamedColumns(
  columns: readonly string[],
  options: { sizeField: string; sizeFieldNamed?: boolean; nameField: string; nameFieldNamed?: boolean },
): void {
  if (sizeFieldNamed(options) && !columns.includes(options.sizeField))
    throw missingField("size", options.sizeField, columns);
  if (nameFieldNamed(options) && !columns.includes(options.nameField))
    throw missingField("name", options.nameField, columns);
}

/** FIELD_MISSING for a named size or name field on an input that has no record fields to read it from. */
export function checkNoNamedFields(
  options: { sizeField: string; sizeFieldNamed?: boolean; nameField: string; nameFieldNamed?: boolean },
  shape: "paths" | "values" | "edges",
): void {
  if (sizeFieldNamed(options)) throw fieldNotApplicable("size", options.sizeField, shape);
  if (nameFieldNamed(options)) throw fieldNotApplicable("name", options.nameField, shape);
}

/**
 * Checks a graph's named size and name fields against its records (its own and `--nodes`): a named
 * field no record has is FIELD_MISSING naming the fields the records have; on a graph of edges and ids
 * only, the error says that names and sizes come from node records.
 */
export function checkGraphFields(
  graph: { hasSizes: boolean; recordFields?: readonly string[] },
  options: { sizeField: string; sizeFieldNamed?: boolean; nameField: string; nameFieldNamed?: boolean },
): void {
  const fields = graph.recordFields;
  if (fields === undefined) return;
  const size = sizeFieldNamed(options) && !graph.hasSizes;
  const name = nameFieldNamed(options) && !fields.includes(options.nameField);
  if (!size && !name) return;
  const role = size ? "size" : "name";
  const field = size ? options.sizeField : options.nameField;
  throw fields.length === 0 ? fieldNotApplicable(role, field, "edges") : missingField(role, field, fields);
}

/**
 * FIELD_MISSING at `pos` when the children field named holds the top level only (no node has
 * children but the top ones) while a node holds an object or array under `children`: a wrapper's
 * field named as the children field (a mount table's `{"filesystems": [...]}`, each mount's own under
 * `children`) read the top level and dropped the rest with exit 0.
 */
export function wrapperChildren(
  field: string,
  pos: SourcePos | undefined,
  words: "json" | "yaml",
): EspalierError {
  const out = `--start-at /${escapeSegment(field)}`;
  const held = words === "json" ? "an object or array" : "a mapping or sequence";
  return new EspalierError(
    "FIELD_MISSING",
    say`the children field "${field}" holds only the top level, while nodes below hold ${held} under "children" (one field holds the children at every level): if "${field}" wraps the top nodes, read them alone (${out}) and leave out --children-field`,
    pos,
    { option: "--children-field", field },
  );
}

/** Whether no node of `parentOf[0, length)` has a grandparent: the tree is at most one level deep. */
export function atMostOneLevel(parentOf: Int32Array, length: number): boolean {
  for (let i = 0; i < length; i++) {
    const p = parentOf[i];
    if (p !== -1 && parentOf[p] !== -1) return false;
  }
  return true;
}
