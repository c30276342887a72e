import type { Tree } from "../model/tree.js";
import type { ReadLimits } from "./read-limits.js";
import type { Reading } from "./shape/choose-reading.js";
import type { Table } from "./table/table.js";

/**
 * Input formats espalier reads. `rows` is a JSON array of flat records (id + parent, or a path column);
 * `edges` is a graph as one `parent child` pair per line, or a CSV/TSV with a parent and a child column.
 */
export const inputFormats = ["json", "yaml", "csv", "tsv", "rows", "paths", "edges"] as const;
export type InputFormat = (typeof inputFormats)[number];

/** The options that name a column or field some reading links its nodes by. */
export type LinkOption =
  | "--id-field"
  | "--parent-field"
  | "--path-field"
  | "--child-field"
  | "--children-field";

/** Field names and choices for loading; every field has the documented default. */
export interface LoadOptions {
  /** Forced format; detected from the file name and content when undefined. */
  format?: InputFormat;
  /** Name shown in error positions and used to detect the format by extension ("-" or undefined for stdin). */
  file?: string;
  /** Field holding a node's name (nested formats and tables). Default "name". */
  nameField: string;
  /** Field holding a node's children, an array or an object keyed by child name. Default "children". */
  childrenField: string;
  /** Field holding a node's own size. Default "size". */
  sizeField: string;
  /** Column holding a row's id (tables). Default "id". */
  idField: string;
  /** Column holding the parent's id (tables). Default "parent". */
  parentField: string;
  /** Column holding a row's full path (tables linked by path). Default "path". */
  pathField: string;
  /**
   * Parent cells that mean "no parent" as the empty cell does (a process table's 0, an export's `\N`);
   * a row whose id is one of them is SHAPE (see table/null-parent.ts). Default none.
   */
  nullParents?: readonly string[];
  /** Column holding an edge's child id (edge tables). Default "child". */
  childField: string;
  /**
   * Read the input as a graph: a table (or JSON rows) linked by id and parent whose ids may repeat with
   * other parents, or a JSON/YAML object as an adjacency map of ids. Default false.
   */
  graph: boolean;
  /** Node records for a graph (names, sizes, kept fields) by id, from a second table. */
  nodeRecords?: Table;
  /** Extra record fields to keep per node, e.g. for a label template. */
  keepFields: readonly string[];
  /**
   * Fields of `keepFields` kept only where records have them: when no record has one, it is left out
   * of the tree's fields rather than FIELD_MISSING (`diff` compares `version` this way by default).
   */
  optionalKeepFields?: readonly string[];
  /**
   * Keep, in the same read, every record field not read for the tree (nor in `keepFields`) as text
   * (an object or array as its JSON or YAML text), "" where a record has none, and list them, and only
   * them, as `reading.otherFields`: a diff of two versions without `--compare-field` compares them
   * (cli/compared-fields.ts). Tables and rows keep every other column; node objects at most
   * MOST_OTHER_FIELDS, naming those met past it (`reading.otherFieldsLeft`; other-fields-kept.ts).
   * Default false: a summary keeps none.
   */
  keepOtherFields?: boolean;
  /** Name of the root espalier adds when the input has several top-level nodes. */
  rootName: string;
  /** Refuse inputs with more nodes than this (LIMIT_EXCEEDED). */
  maxNodes: number;
  /** Lower limits of reading than `readLimits` (see read-limits.ts); tests and the fuzzer use tiny ones. */
  limits?: Partial<ReadLimits>;
  /**
   * The input's length in bytes, when known before reading (a named regular file): a reader may size
   * its arrays from it (an edge list, see edge-list.ts). A hint only: nothing is refused by it.
   */
  inputBytes?: number;
  /**
   * A version of this input loaded before it (a diff's OLD, when NEW loads after it on one thread): a
   * CSV/TSV table places a name or id cell whose bytes that version's node of the same row has too
   * where that version keeps them, rather than copying them (load/table/earlier-rows.ts). The tree read
   * is the same without it.
   */
  earlierVersion?: Pick<Tree, "name" | "ids">;
  /**
   * A later version of this input will be loaded against the tree this load returns (`earlierVersion`,
   * a diff's NEW after its OLD on one thread): a CSV/TSV table read from a stream of known length
   * (`inputBytes`, at most 256 MiB) keeps its bytes, where its rows start and its cells until that
   * load, which then takes the rows whose bytes are the same from it instead of scanning them
   * (load/table/kept-table.ts). Held until a load with this tree as its `earlierVersion` ends; the
   * tree read is the same without it.
   */
  keepForLaterVersion?: boolean;
  /**
   * With `keepForLaterVersion`: this input's bytes can be read again by the later version's load
   * (`earlierInput`), so a JSON document's load keeps where its node objects lie, not its bytes
   * (load/json/kept-json.ts).
   */
  inputReadAgain?: boolean;
  /**
   * With `earlierVersion`: its input's bytes read again where a JSON document's load compares its node
   * objects with the earlier version's (load/json/kept-json.ts), when that load kept no bytes of its own
   * (`inputReadAgain`). Its bytes must be those that load read.
   */
  earlierInput?: BytesAt;
  /**
   * JSON and YAML: `nodes` reads node objects (children under the children field, or a field found to
   * hold them), `values` makes every value of the document a node; undefined chooses by the document
   * (src/load/shape/choose-reading.ts).
   */
  readAs?: "nodes" | "values";
  /**
   * JSON and YAML: a JSON Pointer (RFC 6901, e.g. `/data/items`) to the value read as the whole
   * document (a list of rows or nodes inside a wrapper object); undefined or empty: the whole document.
   */
  startAt?: string;
  /**
   * JSON and YAML: read the document this way, or fail with SHAPE when it does not fit (a diff reads its
   * NEW version as its OLD one was read when the two would be read differently: src/cli/version-readings.ts).
   * Overrides `readAs` and the search for a children field.
   */
  sameReading?: Reading;
  /**
   * The children field was named on purpose: never look for another one (nor for a map keyed by path)
   * when it is absent. A children field other than the default counts as named.
   */
  childrenFieldNamed?: boolean;
  /**
   * The size field was named on purpose (a size field other than the default counts as named): an input
   * where no record carries a number in it, or whose sizes come from elsewhere (a path list, values),
   * is FIELD_MISSING rather than a tree without sizes.
   */
  sizeFieldNamed?: boolean;
  /**
   * The name field was named on purpose (a name field other than the default counts as named): an input
   * where no record carries a name in it, or whose names come from elsewhere (a path list, values, an
   * edge list without node records), is FIELD_MISSING rather than a tree named by keys or ids.
   */
  nameFieldNamed?: boolean;
  /**
   * CSV and TSV tables: a row with fewer fields than the header reads its missing last fields as empty
   * (`fill`); absent: such a row is PARSE_CSV (RFC 4180, section 2.4).
   */
  shortRows?: "fill";
  /**
   * Link options given on purpose (a flag or the config file, even at the default name): a reading
   * that does not read one is USAGE rather than a tree read another way (reading-options.ts).
   */
  linkOptionsNamed?: readonly LinkOption[];
  /** Path lists: entries end with a NUL byte, not a line break (`find -print0`, `git ls-files -z`). */
  nulSeparated?: boolean;
  /**
   * Path lists with sizes: a folder's line gives its own size (`own`, as `find -printf '%s'`) or the folder
   * with its contents (`total`, as `du -ab`); absent: decided by the listing (src/load/path-list/folder-totals.ts).
   */
  folderSizes?: "own" | "total";
  /**
   * JSON and YAML read as values: keep each scalar's source text (`"ec2"`, `1.0`, `true`) as the record
   * field {@link SCALAR_VALUE_FIELD}, {@link EMPTY_OBJECT} for an object and {@link EMPTY_ARRAY} for an
   * array, so that a diff compares values and not only names and byte lengths (a value changed to one
   * of the same length changes neither, nor does `[]` changed to `{}`).
   */
  keepScalars?: boolean;
}

/**
 * The record field under which a document read as values keeps, for each list item that is an object
 * with a string member `name`, that string (`steps: [{name: Checkout, …}]`): a node named by its index
 * alone (`0`) says nothing of what it is. "" for every other node; absent when no item has one. The
 * label shows it beside the index (view/label.ts); names and paths keep the index (RFC 6901 pointers).
 */
export const ITEM_NAME_FIELD = "item name";

/**
 * The most list items whose `name` a document read as values keeps (see {@link ITEM_NAME_FIELD}): past
 * it, none, as the names cost memory for every node (a field holds one string per node) and only the
 * few lines shown use them. A million named items (bench/out/data/tree-1000000.json read as values)
 * took 150 MiB more and 1.38 times the CPU; 100,000 of them take about a tenth of that.
 */
export const MOST_ITEM_NAMES = 100_000;

/** The record field under which a document read as values keeps its scalars' text (`keepScalars`). */
export const SCALAR_VALUE_FIELD = "value";
/**
 * The {@link SCALAR_VALUE_FIELD} of an object and of an array, whatever they hold: their members are
 * nodes of their own, so only the kind is compared. `[]` and `{}` are not one value (RFC 8259 §4, §5:
 * an object and an array are two kinds of value; YAML 1.2 §3.2.1.1: a mapping and a sequence), and no
 * scalar is kept so (strings are kept as JSON writes them, quoted).
 */
export const EMPTY_OBJECT = "{}";
export const EMPTY_ARRAY = "[]";

export const defaultLoadOptions: LoadOptions = {
  nameField: "name",
  childrenField: "children",
  sizeField: "size",
  idField: "id",
  parentField: "parent",
  pathField: "path",
  childField: "child",
  graph: false,
  keepFields: [],
  rootName: "(root)",
  maxNodes: Number.POSITIVE_INFINITY,
};

/** An input's bytes read again at a position, synchronously (a regular file's, by its descriptor). */
export interface BytesAt {
  /** Reads up to `length` bytes at `position` into `into` from `offset`; returns how many it read. */
  read(into: Uint8Array, offset: number, length: number, position: number): number;
}
