import {
  type Alias,
  isAlias,
  isMap,
  isPair,
  isScalar,
  isSeq,
  LineCounter,
  type Node,
  parseAllDocuments,
  parseDocument,
  type Scalar,
  visit,
  type YAMLMap,
} from "yaml";
import { EspalierError, quoted, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import { adjacencyNodes, rowsListChildren } from "./adjacency.js";
import { linkGraphTable } from "./graph-table.js";
import { knownListingAt } from "./known-listings.js";
import type { LoadOptions } from "./load-options.js";
import { chooseReading } from "./shape/choose-reading.js";
import { sampleNested } from "./shape/sample-nested.js";
import { linkPathMap, linkTable } from "./table/link-table.js";
import { rowsTable } from "./table/rows-table.js";
import { Kind, type NestedAccess, walkNested } from "./walk-nested.js";
import { isMergeKey, keyText, scalarAsWritten } from "./yaml-keys.js";
import { yamlAtPointer } from "./yaml-pointer.js";
import { yamlValues } from "./yaml-values.js";

type YamlValue = Node | null;

/**
 * Loads a YAML document of nested nodes (the shapes JSON allows), walking the parsed nodes themselves so
 * origins are line numbers. Aliases are followed, never expanded: a node object or children list reached
 * again through an alias is a one-line reference to where it was first placed (see walkNested), so an
 * alias bomb cannot blow up and nothing is counted twice.
 */
export function loadYaml(text: string, options: LoadOptions): LinkedNodes | GraphNodes {
  const lineCounter = new LineCounter();
  let doc: ReturnType<typeof parseDocument>;
  try {
    doc = parseDocument(text, { lineCounter, uniqueKeys: true, merge: true });
  } catch (error) {
    if (error instanceof RangeError) {
      throw new EspalierError("LIMIT_EXCEEDED", "the YAML is nested too deeply to parse; convert it to JSON");
    }
    throw error;
  }
  if (doc.errors.length > 0) {
    const error = doc.errors[0];
    const at = error.linePos?.[0] ?? lineCounter.linePos(error.pos[0]);
    const pos = { line: at.line, column: at.col };
    if (error.code === "RESOURCE_EXHAUSTION") {
      // The YAML parser recurses per nesting level and gives up a few hundred levels down.
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        "the YAML is nested too deeply to parse; convert it to JSON",
        pos,
      );
    }
    if (error.code === "MULTIPLE_DOCS") {
      // Several documents (a stream of manifests): each one's values under the root, when values are
      // what is read; nodes, rows and graphs come in one document.
      if (options.startAt)
        throw new EspalierError(
          "USAGE",
          "a second YAML document starts here (after ---); --start-at reads into one document: split the file",
          pos,
          { option: "--start-at" },
        );
      if (
        options.readAs !== "nodes" &&
        !options.graph &&
        options.childrenFieldNamed !== true &&
        (options.sameReading === undefined || options.sameReading.kind === "values")
      )
        return documentValues(text, options);
      throw new EspalierError(
        "PARSE_YAML",
        "a second YAML document starts here (after ---); nodes, rows and graphs are read from one document per input: split the file, or read every document's values with --read-as values",
        pos,
      );
    }
    // Detected as YAML by its first line (no --input-format, no .yaml name): `ls -R` output starts so,
    // and `unzip -l`'s and `zipinfo`'s (`Archive:  NAME`).
    const known = detectedYaml(options) ? knownListingAt(text) : undefined;
    if (known !== undefined) throw known;
    const reason = error.message.replace(/ at line \d+, column \d+:.*$/s, "");
    throw new EspalierError("PARSE_YAML", say`invalid YAML (${error.code}): ${quoted.excerpt(reason)}`, pos);
  }
  if (doc.contents === null || (isScalar(doc.contents) && doc.contents.value === null)) {
    throw new EspalierError("INPUT_EMPTY", "the YAML document holds no value");
  }
  // `--start-at`: the part read as the whole document (aliases in it still reach anchors before it).
  const root = (
    options.startAt ? yamlAtPointer(doc, options.startAt, lineCounter) : doc.contents
  ) as YamlValue;

  // With `options.graph` the document is an adjacency map, records naming their children or rows
  // linked by parent, as JSON's (graph-input.ts); aliases expand in its plain value, up to the yaml
  // package's alias count limit.
  if (options.graph) {
    idsAsWritten(doc, options.sizeField);
    const value = plainValue(doc, lineCounter, root);
    if (Array.isArray(value) && !rowsListChildren(value, options))
      return linkGraphTable(rowsTable(value), options);
    return adjacencyNodes(value, options);
  }

  // An alias stands for the last node with its anchor before it, in document order.
  const target = new Map<Alias, Node>();
  if (text.includes("*")) {
    const anchored = new Map<string, Node>();
    visit(doc, {
      Node(_, node) {
        if (isAlias(node)) {
          const found = anchored.get(node.source);
          if (found) target.set(node, found);
        } else if (node.anchor) {
          anchored.set(node.anchor, node);
        }
      },
    });
  }
  // Values stay as written (an alias is kept, so positions point at it); each use looks through it.
  const deref = (v: YamlValue | undefined): YamlValue => (isAlias(v) ? (target.get(v) ?? null) : (v ?? null));
  // Where each anchored node object or children list was first placed (the node that holds it).
  const placedNodes = new Map<Node, number>();
  const placedLists = new Map<Node, number>();

  // Merge keys (`<<: *base`, the YAML 1.1 merge type, yaml.org/type/merge.html): a mapping's own keys
  // come first; then each merged mapping's keys it does not have, earlier mappings in a sequence of
  // them before later ones, merged mappings' own merges included.
  const mergedOf = (map: YAMLMap): YamlValue[] => {
    const sources: YamlValue[] = [];
    for (const pair of map.items) {
      if (!isMergeKey(pair.key)) continue;
      const value = deref(pair.value as YamlValue);
      if (isSeq(value)) for (const item of value.items) sources.push(deref(item as YamlValue));
      else sources.push(value);
    }
    return sources;
  };
  const fieldOf = (map: YamlValue, key: string, depth: number): YamlValue | undefined => {
    if (!isMap(map) || depth > MAX_MERGE_DEPTH) return undefined;
    for (const pair of map.items)
      if (!isMergeKey(pair.key) && keyText(pair.key) === key) return pair.value as YamlValue;
    for (const source of mergedOf(map)) {
      const found = fieldOf(source, key, depth + 1);
      if (found !== undefined) return found;
    }
    return undefined;
  };
  const entriesOf = (
    map: YamlValue,
    keys: string[],
    values: YamlValue[],
    seen: Set<string>,
    depth: number,
  ) => {
    if (!isMap(map) || depth > MAX_MERGE_DEPTH) return;
    for (const pair of map.items) {
      if (isMergeKey(pair.key)) continue;
      const key = keyText(pair.key);
      // Within one mapping a repeated key is a parse error (uniqueKeys), so `seen` only skips merged ones.
      if (depth > 0 && seen.has(key)) continue;
      seen.add(key);
      keys.push(key);
      values.push(pair.value as YamlValue);
    }
    for (const source of mergedOf(map)) entriesOf(source, keys, values, seen, depth + 1);
  };

  const access: NestedAccess<YamlValue> = {
    kind(value) {
      const v = deref(value);
      if (v === null) return Kind.Null;
      if (isMap(v)) return Kind.Map;
      if (isSeq(v)) return Kind.Seq;
      if (!isScalar(v)) return Kind.Other;
      if (isTaggedFloat(v)) return Kind.Number;
      // A `%YAML 1.1` timestamp (`2024-01-05`, yaml.org/type/timestamp.html) is text as written here.
      if (v.value instanceof Date) return Kind.String;
      switch (typeof v.value) {
        case "number":
        case "bigint":
          return Kind.Number;
        case "string":
          return Kind.String;
        case "boolean":
          return Kind.Boolean;
        default:
          return v.value === null || v.value === undefined ? Kind.Null : Kind.Other;
      }
    },
    field(value, key) {
      return fieldOf(deref(value), key, 0);
    },
    items(value) {
      const seq = deref(value);
      return isSeq(seq) ? (seq.items as YamlValue[]) : [];
    },
    entries(value, keys, values) {
      const seen = new Set<string>();
      entriesOf(deref(value), keys, values, seen, 0);
    },
    number(value) {
      const v = deref(value);
      return isScalar(v) ? Number(v.value) : Number.NaN;
    },
    text(value) {
      const v = deref(value);
      if (!isScalar(v)) return "";
      // A whole number past 2^53 - 1 keeps its digits as written, as JSON's loader keeps them
      // (json-loader.ts numberText): read as a double, 12345678901234567891 is 12345678901234567000.
      const n = v.value;
      if (typeof n === "number" && Number.isInteger(n) && !Number.isSafeInteger(n) && v.range)
        return text.slice(v.range[0], v.range[1]);
      // A name, an id or a field written as a number reads as written (`3.10`, not 3.1): yaml-keys.ts.
      return typeof n === "number" || typeof n === "bigint" || n instanceof Date
        ? scalarAsWritten(v)
        : String(n);
    },
    source(value) {
      const range = deref(value)?.range;
      return range ? text.slice(range[0], range[1]) : "";
    },
    line: (v) => (v?.range ? lineCounter.linePos(v.range[0]).line : 0),
    pos(v) {
      if (!v?.range) return undefined;
      const at = lineCounter.linePos(v.range[0]);
      return { line: at.line, column: at.col };
    },
    target: (value) => deref(value),
    claim(value, owner, role) {
      // Only an anchored node can be reached twice (its alias); a node inside an anchored one is reached
      // again only through it, and a node reached again is not walked into.
      const v = deref(value);
      if (v === null || !("anchor" in v) || !v.anchor) return -1;
      const placed = role === "node" ? placedNodes : placedLists;
      const first = placed.get(v);
      if (first !== undefined) return first;
      placed.set(v, owner);
      return -1;
    },
  };
  const reading = chooseReading(sampleNested<YamlValue>(root, access), options);
  switch (reading.kind) {
    case "values":
      return yamlValues([root as Node], text, lineCounter, options);
    case "rows": {
      const items = access.items(root);
      // A row's fault at its cell's value (or the row itself), as the parser places them.
      const place = (row: number, field?: string) => {
        const item = items[row - 1];
        if (item === undefined) return undefined;
        const cell = field === undefined ? undefined : access.field(item, field);
        return (cell === undefined ? undefined : access.pos(cell)) ?? access.pos(item);
      };
      const table = rowsTable(
        items.map((item) => recordOf(item, access, options.sizeField)),
        place,
      );
      // The first row with its lists' first records, for the hint of a FIELD_MISSING (rows-inside.ts).
      const first = items.length > 0 ? listsOf(items[0], access, options.sizeField) : undefined;
      return linkTable(first ? { ...table, firstRecord: first } : table, options, "rows");
    }
    case "path-map": {
      const map = reading.field === "" ? root : (access.field(root, reading.field) ?? null);
      const keys: string[] = [];
      const values: YamlValue[] = [];
      access.entries(map, keys, values);
      return linkPathMap(
        keys,
        values.map((value) => recordOf(value, access, options.sizeField)),
        options,
        reading.field,
      );
    }
    case "nodes":
      return walkNested<YamlValue>(
        root,
        access,
        { ...options, childrenField: reading.childrenField },
        reading.found,
      );
  }
}

/**
 * A YAML stream of several documents read as values: each document a child of the root named by its
 * index (`0`, `1`, …), holding its values; a document's size is its text's, the markers between them
 * the root's own. The first error of any document is reported as one document's would be.
 */
function documentValues(text: string, options: LoadOptions): LinkedNodes {
  const lineCounter = new LineCounter();
  const docs = parseAllDocuments(text, { lineCounter, uniqueKeys: true });
  if (!Array.isArray(docs)) throw new EspalierError("INPUT_EMPTY", "the YAML document holds no value");
  for (const doc of docs) {
    const error = doc.errors[0];
    if (error === undefined) continue;
    const at = error.linePos?.[0] ?? lineCounter.linePos(error.pos[0]);
    const reason = error.message.replace(/ at line \d+, column \d+:.*$/s, "");
    throw new EspalierError("PARSE_YAML", say`invalid YAML (${error.code}): ${quoted.excerpt(reason)}`, {
      line: at.line,
      column: at.col,
    });
  }
  return yamlValues(
    docs.map((doc) => doc.contents as Node | null),
    text,
    lineCounter,
    options,
  );
}

/** A row's fields as {@link recordOf} reads them, a list of maps read as the list of its first record. */
function listsOf(
  value: YamlValue,
  access: NestedAccess<YamlValue>,
  sizeField: string,
): Record<string, unknown> {
  const record = recordOf(value, access, sizeField);
  if (access.kind(value) !== Kind.Map) return record;
  const keys: string[] = [];
  const values: YamlValue[] = [];
  access.entries(value, keys, values);
  keys.forEach((key, k) => {
    if (access.kind(values[k]) === Kind.Seq)
      record[key] = access
        .items(values[k])
        .slice(0, 1)
        .map((item) => recordOf(item, access, sizeField));
  });
  return record;
}

/**
 * A mapping as a plain record for a table: scalars as their values, nested values as empty objects
 * (a table reads only plain values; reading such a field is an error there, not a silent blank). A
 * number other than the size whose text is not the number's own (`001`, `3.10`, `0x1F`) is its text as
 * written: an id, a parent or a name (UN M.49's `001`), as a CSV cell would give it (yaml-keys.ts).
 */
function recordOf(
  value: YamlValue,
  access: NestedAccess<YamlValue>,
  sizeField: string,
): Record<string, unknown> {
  const record: Record<string, unknown> = {};
  if (access.kind(value) !== Kind.Map) return record;
  const keys: string[] = [];
  const values: YamlValue[] = [];
  access.entries(value, keys, values);
  keys.forEach((key, k) => {
    const v = values[k];
    const kind = access.kind(v);
    record[key] =
      kind === Kind.Number
        ? key === sizeField || access.text(v) === String(access.number(v))
          ? access.number(v)
          : access.text(v)
        : kind === Kind.String || kind === Kind.Boolean
          ? access.text(v)
          : kind === Kind.Null
            ? null
            : {};
  });
  return record;
}

/** How deep merges may nest (a merge of a mapping that merges one, …); deeper ones are not followed. */
const MAX_MERGE_DEPTH = 64;

/** YAML 1.2.2, 10.3.2 (core schema): the plain text a !!float may have; "3" is one, the float 3.0. */
const CORE_FLOAT = /^[-+]?(?:\.[0-9]+|[0-9]+(?:\.[0-9]*)?)(?:[eE][-+]?[0-9]+)?$/;

/**
 * A scalar tagged !!float whose text is a float by the core schema though the YAML library left it as
 * text (it reads `!!float 3` as the string "3"): read as the number it is.
 */
function isTaggedFloat(v: Scalar): boolean {
  return typeof v.value === "string" && v.tag === "tag:yaml.org,2002:float" && CORE_FLOAT.test(v.value);
}

/**
 * Before a graph's plain values are taken: every map key, list item and field other than the size
 * written as a number whose text is not the number's own (`001`, `3.10`), or as a `%YAML 1.1` date, is
 * set to its text as written, as the tree readings read ids and names (yaml-keys.ts), so an adjacency
 * map's `001: [019]` links and prints `001` and `019`, not 1 and 19. The size stays the number.
 */
function idsAsWritten(doc: ReturnType<typeof parseDocument>, sizeField: string): void {
  visit(doc, {
    Scalar(key, node, path) {
      const v = node.value;
      if (typeof v !== "number" && typeof v !== "bigint" && !(v instanceof Date)) return;
      const written = scalarAsWritten(node);
      if (written === String(v)) return;
      const parent = path[path.length - 1];
      if (key === "value" && isPair(parent) && keyText(parent.key) === sizeField) return;
      node.value = written;
    },
  });
}

/**
 * The document as plain values (an adjacency map's ids). An alias must name an anchor set before it
 * (YAML 1.2.2 §7.1: an alias node refers to the most recent preceding node with that anchor): one that
 * does not is PARSE_YAML at the alias. Aliases that expand past the yaml package's alias count limit
 * (an alias bomb) are LIMIT_EXCEEDED.
 */
function plainValue(
  doc: ReturnType<typeof parseDocument>,
  lineCounter: LineCounter,
  root: YamlValue,
): unknown {
  const anchors = new Set<string>();
  let unresolved: Alias | undefined;
  visit(doc, {
    Node(_, node) {
      if (isAlias(node)) {
        if (anchors.has(node.source)) return undefined;
        unresolved = node;
        return visit.BREAK;
      }
      if (node.anchor) anchors.add(node.anchor);
      return undefined;
    },
  });
  if (unresolved) {
    const at = lineCounter.linePos(unresolved.range?.[0] ?? 0);
    throw new EspalierError(
      "PARSE_YAML",
      say`the alias ${quoted.excerpt(`*${unresolved.source}`)} names no anchor set before it`,
      { line: at.line, column: at.col },
    );
  }
  try {
    return root === doc.contents ? doc.toJS() : (root?.toJS(doc) ?? null);
  } catch (error) {
    if (error instanceof ReferenceError && /alias count/i.test(error.message))
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        "the YAML's aliases expand into too many values to read as a graph (an alias of an alias of …); write the lists out, or read the document without --graph",
      );
    // The merge type (yaml.org/type/merge.html) merges mappings, or a sequence of them, only.
    if (error instanceof Error && /^Merge sources/.test(error.message)) throw badMerge(doc, lineCounter);
    throw error;
  }
}

/** SHAPE at the first merge key (`<<`) whose value is no mapping, alias of one, or sequence of them. */
function badMerge(doc: ReturnType<typeof parseDocument>, lineCounter: LineCounter): EspalierError {
  const anchored = new Map<string, Node>();
  const mapping = (v: unknown): boolean => isMap(isAlias(v) ? anchored.get(v.source) : v);
  let at: { line: number; col: number } | undefined;
  visit(doc, {
    Node(_, node) {
      if (!isAlias(node) && node.anchor) anchored.set(node.anchor, node);
    },
    Pair(_, pair) {
      if (!isMergeKey(pair.key)) return undefined;
      const v = pair.value;
      if (mapping(v) || (isSeq(v) && v.items.every(mapping))) return undefined;
      at = lineCounter.linePos((pair.key as Node).range?.[0] ?? 0);
      return visit.BREAK;
    },
  });
  return new EspalierError(
    "SHAPE",
    "a merge key (<<) must name a mapping, an alias of one or a list of them (the YAML 1.1 merge type)",
    at ? { line: at.line, column: at.col } : undefined,
  );
}

/** Whether the input was taken for YAML by its content: no `--input-format`, no `.yaml`/`.yml` name. */
function detectedYaml(options: LoadOptions): boolean {
  return options.format === undefined && !/\.ya?ml$/i.test(options.file ?? "");
}
