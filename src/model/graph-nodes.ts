import type { SourcePos } from "../errors.js";
import type { NamePool } from "./names.js";
import type { ReadingNote } from "./reading-note.js";
import type { TreeReading } from "./tree.js";

/**
 * A graph as a loader found it: nodes (records) and edges parent -> child in input order. A node may be
 * the child of several parents, and edges may form cycles; {@link buildGraphTree} turns it into a
 * spanning tree with one-line references. It takes the edge arrays over: once they are read, it makes
 * some of the tree's arrays in their memory, so one GraphNodes builds one tree.
 */
export interface GraphNodes {
  /** Linked by an id and a parent column (`--graph` on a table or rows), where `--null-parent` applies. */
  parentColumnRead?: boolean;
  /**
   * How the input links its nodes: `pairs` (an edge list of ids separated by spaces or a tab),
   * `parent-child` (an edge table's parent and child columns), `id-parent` (a table or rows with
   * `--graph`), `map` (an adjacency map), `id-children` (records naming their children, each with its
   * id), `sbom` (a CycloneDX SBOM's dependency graph, load/cyclonedx.ts); the link options each reads
   * are checked against it (load/reading-options.ts).
   */
  linkedBy: "pairs" | "parent-child" | "id-parent" | "map" | "id-children" | "sbom";
  /** Names, one per node (the id where the input gives no name). */
  name: NamePool | readonly string[];
  /** Ids, one per node: what edges name. */
  ids: NamePool | readonly string[];
  ownSize: Float64Array;
  hasSizes: boolean;
  /** What the sizes count (plain numbers when there are none). */
  sizeUnit: TreeReading["sizeUnit"];
  /** 1-based line or row where each node first appears. */
  origin: Int32Array;
  originIsRow: boolean;
  /**
   * The fields the nodes' records have (a table's columns, the keys of an adjacency map's records), for
   * the message of a named field no record has; empty when the input holds edges only.
   */
  recordFields?: readonly string[];
  /** Extra record fields kept for labels, one string per node. */
  fields: Map<string, string[]>;
  /**
   * Of `fields`, those kept as the records' other fields (LoadOptions.keepOtherFields), and those met
   * past the most kept: the tree's `reading.otherFields` and `reading.otherFieldsLeft`.
   */
  otherFields?: readonly string[];
  otherFieldsLeft?: TreeReading["otherFieldsLeft"];
  /** Name of the root espalier adds when there are several top-level nodes. */
  rootName: string;
  /** Edge k goes from node `edgeFrom[k]` (the parent) to node `edgeTo[k]` (the child). */
  edgeFrom: Int32Array;
  edgeTo: Int32Array;
  /** 1-based line or row of each edge (in the same unit as `origin`). */
  edgeOrigin: Int32Array;
  /** Number of edges (the arrays may be longer). */
  edgeCount: number;
  /** Where a row (an origin when `originIsRow`) is in the input, when the loader can say. */
  placeRow?: (row: number, field?: string) => SourcePos | undefined;
  /** A repeated edge (same parent, same child): read once ("skip"), or DUPLICATE_ID at its row ("error"). */
  repeatedEdges: "skip" | "error";
  /**
   * Memory the loader reads no more (the edge-list reader's hash table), whatever it holds, given once
   * (later calls give undefined, so that nothing else holds it): the build makes the graph interest's
   * table of parents in it when it is long enough, and lets it go at once when the graph has no
   * reference (a tree needs no such table).
   */
  takeSpare?: () => Int32Array | undefined;
  /** Notes on the reading for the tree's `reading.notes` (see model/reading-note.ts); absent when none. */
  notes?: readonly ReadingNote[];
  /** A JSON/YAML adjacency map read from one part of the document (`--start-at`): that part's JSON Pointer. */
  startAt?: string;
}
