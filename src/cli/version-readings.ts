import { EspalierError, type MessagePart, quoted, say } from "../errors.js";
import { EMPTY_ARRAY, EMPTY_OBJECT, SCALAR_VALUE_FIELD } from "../load/load-options.js";
import type { Reading } from "../load/shape/choose-reading.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";

// A diff compares two versions read one way. A JSON or YAML document is read as node objects, every
// value a node, a map keyed by path or rows, as each document's own start suggests; two versions of one
// listing can suggest two readings (a dependency listing with nothing installed has no nested
// dependencies to find its children field by), and a diff of two readings counts every node of each as
// removed or added. So both are read one way (cli/input.ts readOneWay), or the diff is refused.

/** How a tree of a JSON or YAML document was read, as its loader would be told to read it again; else undefined. */
export function nestedReading(tree: Tree): Reading | undefined {
  const r = tree.reading;
  switch (r?.shape) {
    case "nodes":
      return r.childrenField === undefined
        ? undefined
        : { kind: "nodes", childrenField: r.childrenField, found: r.childrenFieldFound === true };
    case "values":
      return { kind: "values" };
    case "path-map":
      return r.pathMapField === undefined ? undefined : { kind: "path-map", field: r.pathMapField };
    case "rows":
      return { kind: "rows" };
    default:
      return undefined;
  }
}

/** Whether two readings read a document the same way (who chose a children field does not matter). */
export function sameWay(a: Reading, b: Reading): boolean {
  if (a.kind !== b.kind) return false;
  if (a.kind === "nodes" && b.kind === "nodes") return a.childrenField === b.childrenField;
  if (a.kind === "path-map" && b.kind === "path-map") return a.field === b.field;
  return true;
}

/** A reading in a message's words: `children under "dependencies"`, `every value a node`, … */
export function readingWords(r: Reading): MessagePart[] {
  switch (r.kind) {
    case "nodes":
      return say`node objects with children under ${quoted.name(r.childrenField)}`;
    case "values":
      return ["every value a node"];
    case "path-map":
      return r.field === ""
        ? ["records keyed by path"]
        : say`records keyed by path under ${quoted.name(r.field)}`;
    case "rows":
      return ["rows linked by id, parent or path"];
  }
}

/**
 * SHAPE for a diff whose NEW version (`newFile`) does not read as OLD (`oldFile`) was: both readings
 * named, why NEW does not fit OLD's (`why`, the loader's error, whose position in NEW it keeps; absent
 * when NEW comes from standard input, which cannot be read twice), and the options that read both one way.
 */
export function readingsDiffer(
  oldFile: string,
  wanted: Reading,
  own: Reading,
  why: EspalierError | undefined,
): EspalierError {
  const remedies = ["--read-as values", "--children-field"];
  const reason: MessagePart[] =
    why === undefined ? ["standard input cannot be read a second time"] : [...why.parts, ` [${why.code}]`];
  return new EspalierError(
    "SHAPE",
    say`the two versions read differently: OLD (${oldFile}) as ${readingWords(wanted)}, NEW on its own as ${readingWords(own)}; NEW does not read as OLD did: ${reason}; give --read-as values to read both as every value a node, or --children-field naming the field both hold their children under`,
    why?.pos,
    { oldReading: wanted.kind, newReading: own.kind, remedies },
  );
}

/** The note on a version read as the `other` one (`otherFile`) was although on its own it reads as `own`. */
export function readAsOtherNote(
  other: "OLD" | "NEW",
  otherFile: string,
  wanted: Reading,
  own: Reading,
): ReadingNote {
  return {
    code: "READ_AS_OTHER",
    parts: say`read as ${other} (${otherFile}) was, as ${readingWords(wanted)}; on its own it reads as ${readingWords(own)} (give --read-as or --children-field to choose)`,
  };
}

/**
 * Two versions of which only one has sizes (a path list with sizes against one without, node objects
 * with a size field against ones without): every node of the sized one would count as resized from 0.
 * The sized one's sizes are left out, with a SIZES_LEFT_OUT note saying so; versions alike are kept.
 */
export function sizedAlike(
  [oldTree, newTree]: readonly [Tree, Tree],
  [oldFile, newFile]: readonly [string, string],
): [Tree, Tree] {
  if (oldTree.hasSizes === newTree.hasSizes) return [oldTree, newTree];
  return oldTree.hasSizes
    ? [withoutSizes(oldTree, "NEW", newFile), newTree]
    : [oldTree, withoutSizes(newTree, "OLD", oldFile)];
}

function withoutSizes(tree: Tree, other: "OLD" | "NEW", otherFile: string): Tree {
  const note: ReadingNote = {
    code: "SIZES_LEFT_OUT",
    parts: say`its sizes are left out: ${other} (${otherFile}) has none, so no node is compared by size (give both versions sizes, or neither)`,
  };
  const reading = tree.reading;
  return {
    ...tree,
    hasSizes: false,
    ownSize: new Float64Array(tree.length),
    ...(reading ? { reading: { ...reading, notes: [...(reading.notes ?? []), note] } } : {}),
  };
}

/**
 * Two documents read as values, compared by their scalars' text (`value`): both sized by those values,
 * each scalar by its text as JSON writes it (a string quoted, a number as written: the compared text,
 * in UTF-8 bytes) and an object or array by nothing of its own; `reading.valueSizes` says so (the
 * header and key name the sizes `value size`). Sized by the documents' bytes, a new layout (compact
 * against indented JSON, JSON against YAML, a comment, quotes) resized nodes whose every value stayed,
 * and `--fail-on-change` failed on it. Other versions are kept.
 */
export function valueSized([oldTree, newTree]: readonly [Tree, Tree]): [Tree, Tree] {
  const [oldValues, newValues] = [oldTree, newTree].map((t) =>
    t.reading?.shape === "values" && t.hasSizes ? t.fields.get(SCALAR_VALUE_FIELD) : undefined,
  );
  if (oldValues === undefined || newValues === undefined) return [oldTree, newTree];
  return [sizedByValues(oldTree, oldValues), sizedByValues(newTree, newValues)];
}

function sizedByValues(tree: Tree, values: readonly string[]): Tree {
  const ownSize = new Float64Array(tree.length);
  for (let i = 0; i < tree.length; i++) {
    const v = values[i];
    ownSize[i] = v === EMPTY_OBJECT || v === EMPTY_ARRAY ? 0 : Buffer.byteLength(v, "utf8");
  }
  const reading = tree.reading;
  return { ...tree, ownSize, ...(reading ? { reading: { ...reading, valueSizes: true } } : {}) };
}
