import { EspalierError } from "../../errors.js";
import { defaultLoadOptions, type LoadOptions } from "../load-options.js";
import type { Sample } from "./sample.js";

/** How to read a JSON or YAML document. */
export type Reading =
  /** Node objects, children under `childrenField`; `found` when espalier chose the field. */
  | { readonly kind: "nodes"; readonly childrenField: string; readonly found: boolean }
  /** Records keyed by path in the object at `field` of the top-level object ("" for the top level). */
  | { readonly kind: "path-map"; readonly field: string }
  /** Every value a node. */
  | { readonly kind: "values" }
  /** A top-level array of records linked by id and parent, or by path (JSON rows). */
  | { readonly kind: "rows" };

type Fields = Pick<
  LoadOptions,
  | "nameField"
  | "sizeField"
  | "childrenField"
  | "idField"
  | "parentField"
  | "pathField"
  | "keepFields"
  | "optionalKeepFields"
  | "readAs"
  | "childrenFieldNamed"
  | "sameReading"
>;

/**
 * Chooses how to read a document from a sample of its start, deterministically (the same bytes, the
 * same choice), looking at the first node object: the top-level object, or the first element of a
 * top-level array.
 * 0. `sameReading` (a diff's NEW read as its OLD was) is that reading, when the document fits it (see
 *    {@link fitReading}).
 * 1. `readAs: "values"` reads values. Otherwise, when the first node object has the configured children
 *    field, nodes as configured; a top-level array whose first record has the id, parent or path field
 *    (and no children field) is rows.
 * 2. With the children field left at its default: an object keyed by path (the top level, or a field of
 *    the first node object) whose values are records is a path map; see {@link isPathMap}.
 * 3. Then a field found to hold children (see {@link findChildrenField}).
 * 4. Otherwise nodes as configured when asked for nodes (`readAs: "nodes"`, or a children field other
 *    than the default), or when the first node object is a leaf node: it has the name or the size field
 *    and holds nothing nested; else values: a document with no node shape at all (a configuration's
 *    flat `{"timeout": 30}` too) reads as the tree of its values, so no key goes unseen.
 */
export function chooseReading(sample: Sample | undefined, fields: Fields): Reading {
  if (fields.sameReading !== undefined) return fitReading(sample, fields.sameReading, fields);
  const configured: Reading = { kind: "nodes", childrenField: fields.childrenField, found: false };
  if (fields.readAs === "values") return { kind: "values" };
  const first = sample === undefined ? undefined : firstNodeObject(sample);
  if (first !== undefined && has(first, fields.childrenField)) return configured;
  // Rows by the keys of the first record (as isRowsValue decides on the whole record).
  if (
    sample?.kind === "array" &&
    first !== undefined &&
    (has(first, fields.idField) || has(first, fields.parentField) || has(first, fields.pathField))
  )
    return { kind: "rows" };
  const discover =
    fields.childrenField === defaultLoadOptions.childrenField && fields.childrenFieldNamed !== true;
  if (discover && sample !== undefined) {
    if (sample.kind === "object" && isPathMap(sample)) return { kind: "path-map", field: "" };
    if (first !== undefined) {
      for (const [key, value] of first.entries)
        if (value.kind === "object" && isPathMap(value) && !isSubpathMap(value))
          return { kind: "path-map", field: key };
      const found = findChildrenField(first, fields);
      if (found !== undefined) return { kind: "nodes", childrenField: found, found: true };
    }
  }
  // Asked for nodes (or for a children field by name): read them so; the loader fails rather than give
  // a lone root for a document with more in it.
  if (fields.readAs === "nodes" || !discover) return configured;
  // A node object with nothing nested but the fields it is read for (a leaf, or leaves in a top-level
  // array) is nodes all the same, when it has a field a node is read for: without one, every key of
  // the document would be dropped for one nameless node.
  if (
    first !== undefined &&
    (has(first, fields.nameField) || has(first, fields.sizeField)) &&
    hasNoContainers(first, fieldsOf(fields))
  )
    return configured;
  return { kind: "values" };
}

/**
 * `wanted` for a document it fits, else SHAPE saying why: values fit every document; nodes fit where
 * the first node object has the children field (the loader then refuses a document that would be one
 * node while other fields hold objects or arrays, as for a field named by option); a map keyed by path
 * where that object is one; rows where a top-level array's first record has the id, parent or path field.
 */
export function fitReading(
  sample: Sample | undefined,
  wanted: Reading,
  fields: Pick<Fields, "idField" | "parentField" | "pathField">,
): Reading {
  const first = sample === undefined ? undefined : firstNodeObject(sample);
  switch (wanted.kind) {
    case "values":
      return wanted;
    case "nodes":
      if (first !== undefined) return wanted;
      throw new EspalierError("SHAPE", "the document holds no object to read as a node");
    case "path-map": {
      const map =
        wanted.field === "" ? sample : sample?.kind === "object" ? fieldOf(sample, wanted.field) : undefined;
      if (map?.kind === "object" && isPathMap(map)) return wanted;
      throw new EspalierError(
        "SHAPE",
        wanted.field === ""
          ? "the top-level object is not keyed by path"
          : `the top-level object has no field ${JSON.stringify(wanted.field)} keyed by path`,
      );
    }
    case "rows":
      if (
        sample?.kind === "array" &&
        first !== undefined &&
        (has(first, fields.idField) || has(first, fields.parentField) || has(first, fields.pathField))
      )
        return wanted;
      throw new EspalierError(
        "SHAPE",
        `the document is not a top-level array whose first record has the field ${JSON.stringify(fields.idField)}, ${JSON.stringify(fields.parentField)} or ${JSON.stringify(fields.pathField)}`,
      );
  }
}

type ObjectSample = Extract<Sample, { kind: "object" }>;

function fieldOf(object: ObjectSample, key: string): Sample | undefined {
  return object.entries.find(([k]) => k === key)?.[1];
}

function firstNodeObject(sample: Sample): ObjectSample | undefined {
  if (sample.kind === "object") return sample;
  if (sample.kind === "array" && sample.items[0]?.kind === "object") return sample.items[0];
  return undefined;
}

function has(object: ObjectSample, key: string): boolean {
  return object.entries.some(([k]) => k === key);
}

/** Whether an object holds no object or array but in the fields named in `except`. */
function hasNoContainers(object: ObjectSample, except: ReadonlySet<string> = new Set()): boolean {
  return object.entries.every(([k, v]) => v.kind === "scalar" || except.has(k));
}

/**
 * The fields a node object is read for besides its children: never children themselves. Not those kept
 * only where records have them (what a diff compares by default, cli/compared-fields.ts): a diff reads
 * a document as a summary does, whatever it keeps, and its second read keeping the records' other
 * fields reads it as its first did.
 */
function fieldsOf(
  fields: Pick<Fields, "nameField" | "sizeField" | "keepFields" | "optionalKeepFields">,
): Set<string> {
  const optional = new Set(fields.optionalKeepFields ?? []);
  return new Set([fields.nameField, fields.sizeField, ...fields.keepFields.filter((f) => !optional.has(f))]);
}

/** The objects a container holds: an array's elements or an object's values, when all (sampled) are objects. */
function childObjects(value: Sample): ObjectSample[] | undefined {
  const members =
    value.kind === "array" ? value.items : value.kind === "object" ? value.entries.map(([, v]) => v) : [];
  if (members.length === 0) return undefined;
  const objects: ObjectSample[] = [];
  for (const member of members) {
    if (member.kind !== "object") return undefined;
    objects.push(member);
  }
  return objects;
}

/**
 * The field of `first` that holds its children: its value is an array of objects or an object whose
 * values are objects (children keyed by name), and the same field holds the children's children, as
 * `dependencies` in a package manager's listing: the first such field in document order; a list of
 * records none of which has the name or size field only when it is the one field of `first` holding an
 * object or array (a JSON Schema's `allOf` of `allOf` is no children field). A field whose
 * children (as far as sampled) are all leaves counts when it is the one field of `first` holding
 * an object or array (a listing one level deep); otherwise a configuration's `defaults: {run: {…}}`
 * would pass for children and hide the rest. It counts too beside other objects and arrays when it is
 * the one field of `first` holding records, and they are records of the kind `first` is: each (not
 * empty) shares a field with `first`, holding the same kind of value there (a scalar, a list, an
 * object), and holds no record of its own, only scalars and lists of them, and they are keyed by name
 * (a listing of packages none of which is installed: `{"name": …, "problems": […], "dependencies":
 * {"a": {"missing": true, "problems": […]}}}`). A list of records sharing a scalar by chance is no
 * such field (a package.json's `contributors: [{"name": …}]` or `funding: [{"type": …}]` beside its
 * own `name` and `type`), nor records whose shared field holds another kind of value (a command's
 * `arguments: {"resource": {"help_text": "…"}}` beside its own `help_text: {…}`). The name, size and
 * kept fields are never children.
 */
export function findChildrenField(
  first: ObjectSample,
  fields: Pick<Fields, "nameField" | "sizeField" | "keepFields" | "optionalKeepFields">,
): string | undefined {
  const own = fieldsOf(fields);
  let leafy: string | undefined;
  let nameless: string | undefined;
  let kindred: string | undefined;
  let containers = 0;
  let holdingRecords = 0;
  for (const [key, value] of first.entries) {
    if (own.has(key)) continue;
    if (value.kind !== "scalar") containers++;
    const children = childObjects(value);
    if (children === undefined) continue;
    holdingRecords++;
    const recurs = children.some((child) =>
      child.entries.some(([k, v]) => k === key && childObjects(v) !== undefined),
    );
    if (recurs) {
      // A list of records none of which has the name or size field, beside other objects and arrays
      // (a JSON Schema's `allOf: [{allOf: [...]}]` beside its `properties` and `definitions`): read
      // so, the document would be a few nodes printed as "" and the rest unseen.
      if (
        value.kind === "object" ||
        children.some((c) => has(c, fields.nameField) || has(c, fields.sizeField))
      )
        return key;
      nameless ??= key;
      continue;
    }
    if (leafy === undefined && children.every((child) => hasNoContainers(child))) leafy = key;
    if (kindred === undefined && value.kind === "object" && recordsOfKind(children, first, key))
      kindred = key;
  }
  if (containers === 1 && (nameless ?? leafy) !== undefined) return nameless ?? leafy;
  return holdingRecords === 1 && containers <= KINDRED_CONTAINERS ? kindred : undefined;
}

/**
 * The most fields of `first` holding an object or array, its children's field among them, beside which
 * records of its kind are read as its children: npm ls --all --json with nothing installed has three
 * (`problems`, `dependencies`, `error`); a package.json has a dozen (`scripts`, `keywords`, `exports`,
 * `devEngines: {"packageManager": {"name": …, "version": …}}` sharing its `name` and `version`), and
 * read as the records of one of them it would lose the rest.
 */
const KINDRED_CONTAINERS = 3;

/**
 * Whether `children` (found under `key` of `parent`) are records of the parent's kind with nothing of
 * their own below: at least one is not empty, each that is not empty shares a field other than `key`
 * with the parent, every shared field holding the same kind of value in both (a scalar, an array, an
 * object), and none holds an object or array of anything but scalars.
 */
function recordsOfKind(children: readonly ObjectSample[], parent: ObjectSample, key: string): boolean {
  const parentKinds = new Map(parent.entries.map(([k, v]) => [k, v.kind]));
  parentKinds.delete(key);
  let filled = 0;
  for (const child of children) {
    if (child.entries.length === 0) continue;
    filled++;
    if (!child.entries.some(([k]) => parentKinds.has(k))) return false;
    if (child.entries.some(([k, v]) => parentKinds.has(k) && parentKinds.get(k) !== v.kind)) return false;
    if (!child.entries.every(([, v]) => holdsScalarsOnly(v))) return false;
  }
  return filled > 0;
}

/** A scalar, or an object or array whose (sampled) members are all scalars. */
function holdsScalarsOnly(value: Sample): boolean {
  if (value.kind === "scalar") return true;
  const members = value.kind === "array" ? value.items : value.entries.map(([, v]) => v);
  return members.every((member) => member.kind === "scalar");
}

/**
 * Whether an object is keyed by path with records as values, as a lock file's `packages` map: every
 * (sampled) value is an object, and some key is "" (the root) or the path of another key's parent
 * (`a` beside `a/b`). Names that merely hold a "/" (`@scope/name`) are not paths.
 */
export function isPathMap(object: ObjectSample): boolean {
  if (object.entries.length === 0 || childObjects(object) === undefined) return false;
  const keys = new Set(object.entries.map(([k]) => k));
  if (keys.has("")) return true;
  for (const key of keys) {
    for (let k = key.lastIndexOf("/"); k > 0; k = key.lastIndexOf("/", k - 1))
      if (keys.has(key.slice(0, k))) return true;
  }
  return false;
}

/**
 * Whether an object's keys are the subpaths a package.json's `exports` lists (`.`, `./sync`,
 * `./browser/esm`: Node.js package entry points, from memory), each `.` or starting with `./`: a map
 * beside a package's other fields, not a listing of its paths (a lock file's `packages` keys are
 * `""` and `node_modules/…`), so it is not read as the document's tree.
 */
function isSubpathMap(object: ObjectSample): boolean {
  return object.entries.every(([k]) => k === "." || k.startsWith("./"));
}
