import type { SourcePos } from "../errors.js";
import type { NamePool } from "./names.js";
import type { TreeReading } from "./tree.js";

/** Nodes as a loader found them: any order, each linked to its parent by index. */
export interface LinkedNodes {
  /** Linked by an id and a parent column (a table or JSON rows), where `--null-parent` applies. */
  parentColumnRead?: boolean;
  /** Parent index among these nodes, or -1 for a top-level node. */
  parentOf: Int32Array;
  /** Names, one per node: a pool (as loaders fill it) or plain strings. */
  name: NamePool | readonly string[];
  ownSize: Float64Array;
  hasSizes: boolean;
  /** Row ids, one per node, pooled or plain; null when rows are not linked by id. */
  ids: NamePool | readonly string[] | null;
  /** 1-based line or row of each node. */
  origin: Int32Array;
  originIsRow: boolean;
  fields: Map<string, string[]>;
  /** Name of the root espalier adds when there are several top-level nodes (or none). */
  rootName: string;
  /** How the loader read the input. */
  reading?: TreeReading;
  /** Where a row (an origin when `originIsRow`) is in the input, when the loader can say. */
  placeRow?: (row: number, field?: string) => SourcePos | undefined;
  /**
   * One-line references (a YAML alias reaching a node placed elsewhere): for each node, -1 for a full
   * entry, else the node whose full entry it stands for (a full entry itself). A reference has no
   * children and no size; the tree gets it as `referenceTo` (see model/tree.ts).
   */
  referenceOf?: Int32Array;
  /** Nested input: 1 where the node's object had no field at all (`{}`); absent when none had. */
  empty?: Uint8Array;
}
