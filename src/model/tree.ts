import type { Names } from "./names.js";
import type { ReadingNote } from "./reading-note.js";

/**
 * The whole input as flat arrays, nodes numbered in pre-order (a parent precedes its descendants and a
 * subtree occupies a contiguous index range), children in input order. Node 0 is the root.
 */
export interface Tree {
  /** Number of nodes. */
  readonly length: number;
  /** Parent index; -1 for the root. Always parent[i] < i. */
  readonly parent: Int32Array;
  /** Edges from the root; the root has depth 0. */
  readonly depth: Int32Array;
  /** The node's own name (not escaped): `name.get(i)`. */
  readonly name: Names;
  /** The node's own size (not including descendants); 0 where the input gives none. */
  readonly ownSize: Float64Array;
  /** Whether the input carried sizes at all. */
  readonly hasSizes: boolean;
  /** The row id of each node, when the input links rows by id; "" for a synthetic root. */
  readonly ids: Names | null;
  /** 1-based line (text formats) or data row (tables) each node came from; 0 for a synthetic root. */
  readonly origin: Int32Array;
  /** Whether `origin` counts table rows (true) or text lines (false). */
  readonly originIsRow: boolean;
  /** Extra record fields kept for labels, by field name; one string per node ("" when absent). */
  readonly fields: ReadonlyMap<string, readonly string[]>;
  /** Whether node 0 was added by espalier to join several top-level nodes. */
  readonly syntheticRoot: boolean;
  /**
   * Graphs only (absent on a tree): for each slot, -1 when it is a node's full entry, else the slot of
   * the full entry of the node this one-line reference stands for (see model/build-graph.ts). A
   * reference is a leaf with no size; it counts in no node count.
   */
  readonly referenceTo?: Int32Array;
  /**
   * Descendants of each node that exist in the input but are not in these arrays (a fact table's
   * rollup fetched only as deep as the summary can reach; see docs/scale.md). Absent: none.
   * A node with elided descendants has no children here, and its own size is its whole subtree's.
   */
  readonly elided?: Float64Array;
  /** How the loader read the input, when a loader says (trees built otherwise may leave it out). */
  readonly reading?: TreeReading;
  /**
   * Nested input: 1 where the node's object had no field at all (`{}`: `npm ls --json` lists a
   * dependency it did not install so). Such a node counts like any other; the output says so. Absent:
   * none.
   */
  readonly empty?: Uint8Array;
}

/** How an input was read: what a reader of the output needs to know to trust the numbers. */
export interface TreeReading {
  /**
   * `nodes`: node objects (nested JSON/YAML); `values`: every value of a JSON/YAML document a node;
   * `path-map`: an object keyed by path; `rows`: JSON rows; `table`: CSV/TSV; `paths`: a path list;
   * `graph`: nodes and edges (an edge list or table, an adjacency map, a table read with `graph`).
   */
  readonly shape: "nodes" | "values" | "path-map" | "rows" | "table" | "paths" | "graph";
  /** What sizes count: bytes (file sizes, a document's bytes, a field marked as bytes) or plain numbers. */
  readonly sizeUnit: "bytes" | "number";
  /** Nested JSON/YAML: the field children were read from. */
  readonly childrenField?: string;
  /** Whether espalier chose `childrenField` because the configured one was absent. */
  readonly childrenFieldFound?: boolean;
  /** A map keyed by path: the field of the top-level object that holds it ("" for the top level). */
  readonly pathMapField?: string;
  /**
   * A path list whose folder lines gave each folder with its contents (as `du -ab` prints them): own sizes
   * are those totals minus the contents', so nothing counts twice.
   */
  readonly folderTotals?: boolean;
  /** JSON/YAML read from one part of the document (`--start-at`): the JSON Pointer (RFC 6901) of that part. */
  readonly startAt?: string;
  /**
   * A path list whose root stands for the folder it lists, whatever the root is named: a line with an
   * empty path named it (`find DIR -printf '%P'`), or every path starts with `.` (`find .`). A diff
   * compares such a root with the other version's root or synthetic root (src/diff/align-roots.ts).
   */
  readonly rootIsStart?: boolean;
  /**
   * The root's name is espalier's, not the input's: `added`, a root espalier put above the input's
   * top-level nodes (`Tree.syntheticRoot`); `nameless`, the input's one top node had no name and was
   * named after the input (load/node-sink.ts `nameNamelessTop`). Written in a saved summary
   * (`input.rootNamed`), so that a diff of two saves, each root named after its own file, compares the
   * roots as one root, as a diff of the inputs (which names both after NEW) does (diff/align-roots.ts).
   * The loaders set `nameless`; `added` is what the summary JSON writes for a synthetic root.
   */
  readonly rootNamed?: "added" | "nameless";
  /**
   * A diff's path lists of one folder that one of them names (`find /srv/harbour-ops`): the folder's path
   * as that list writes it, set on both versions; a focus may start with it (see cli/listing-start.ts).
   */
  readonly folderPath?: string;
  /**
   * A diff's document read as values, sized by its scalars' text as JSON writes it (objects and arrays
   * by nothing of their own), as the other version is, not by its bytes: see cli/version-readings.ts
   * `valueSized`.
   */
  readonly valueSizes?: boolean;
  /** Nested input: how many nodes are empty objects (`{}`), when any are (see `Tree.empty`). */
  readonly emptyEntries?: number;
  /** A CSV/TSV table: how many short rows were read with their missing last fields empty (`--short-rows fill`). */
  readonly filledRows?: number;
  /** A YAML stream of several documents read as values: how many (each a child of the root named by its index). */
  readonly documents?: number;
  /**
   * Node objects, rows and tables: the record fields the records hold beside those read for the tree
   * (name, size, children, id, parent, path) and those kept for a purpose (a label's, a compared one),
   * in the order first seen; a nested document's from a sample (the first 1,000 node objects' keys, up
   * to 40 names). A load asked to keep them (LoadOptions.keepOtherFields) keeps them in `Tree.fields`
   * too, and lists those it kept that some record holds, met anywhere. A diff without `--compare-field`
   * compares them (cli/compared-fields.ts). Absent: none.
   */
  readonly otherFields?: readonly string[];
  /**
   * Node objects read keeping their other fields: fields met after the most a load keeps
   * (load/other-fields-kept.ts), not kept, so not compared; the first 20 named, `more` when there were
   * others. Absent: none left out.
   */
  readonly otherFieldsLeft?: { readonly names: readonly string[]; readonly more: boolean };
  /**
   * A table or rows linked by id without the name column: the id column, whose values name the nodes.
   * The header says so, so a reader whose names sit in another column sees where to point --name-field.
   */
  readonly namesFrom?: string;
  /**
   * A table or rows: the columns that link the rows, the id and parent columns or the path column. JSON
   * rows are one reading of an array among others (nested roots), so the header names these.
   */
  readonly linkedBy?: string[];
  /**
   * Nested nodes of which none has the name field (this field, `name` by default) and none is keyed by
   * name below the top: every node is named "". The header says so, so a reader sees to point
   * --name-field at the field that holds names (a mount table's `target`).
   */
  readonly unnamed?: string;
  /**
   * A fact table rolled up by its level columns or keys: how many of its rows the tree's nodes stand
   * for (the root's row count). Several rows may fall on one leaf (a row per day), so the header says
   * it beside the node count.
   */
  readonly rolledUpRows?: number;
  /**
   * What the reader should know about this reading that the tree cannot show: the input was read one
   * way although it may have meant another, and how to say so (see model/reading-note.ts). The command
   * line prints each on standard error; absent when there is none.
   */
  readonly notes?: readonly ReadingNote[];
}
