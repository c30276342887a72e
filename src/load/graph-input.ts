import { Buffer } from "node:buffer";
import { EspalierError } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import { adjacencyNodes } from "./adjacency.js";
import { loadEdgeList } from "./edge-list.js";
import { linkGraphTable, withRecords } from "./graph-table.js";
import { findJsonEntry } from "./json/json-entry-finder.js";
import type { LoadOptions } from "./load-options.js";
import { checkGraphFields } from "./missing-field.js";
import { csvTableFromBytes } from "./table/csv-table.js";
import { rowsTable } from "./table/rows-table.js";

/**
 * The delimiter of an edge table's header ("," or a tab), or null for a plain edge list: the first
 * non-blank line is a header when its comma- (or tab-) separated cells name both the parent and the
 * child field.
 */
export function edgeTableDelimiter(
  text: string,
  options: Pick<LoadOptions, "parentField" | "childField">,
): "," | "\t" | null {
  const match = /^[ \t]*\S[^\n]*/m.exec(text);
  if (!match) return null;
  const line = match[0].replace(/\r$/, "");
  for (const delimiter of ["\t", ","] as const) {
    const cells = line.split(delimiter).map((cell) => cell.trim().replace(/^"(.*)"$/, "$1"));
    if (cells.includes(options.parentField) && cells.includes(options.childField)) return delimiter;
  }
  return null;
}

/**
 * Load options for reading a graph table (`--graph`, or an edge table): its child column is read too
 * when there is one, and nothing limits rows here (a row is an edge; the graph counts its nodes).
 */
export function edgeTableFields(options: LoadOptions): LoadOptions {
  return {
    ...options,
    keepFields: [...options.keepFields, options.childField],
    maxNodes: Number.POSITIVE_INFINITY,
  };
}

/** An edge list or edge table held as text. */
export function loadEdges(text: string, options: LoadOptions): GraphNodes {
  const delimiter = edgeTableDelimiter(text, options);
  if (delimiter === null) return loadEdgeList(text, options);
  const table = csvTableFromBytes(Buffer.from(text, "utf8"), delimiter, edgeTableFields(options));
  try {
    return linkGraphTable(table, options, true);
  } finally {
    table.release?.();
  }
}

/**
 * A JSON text read as a graph (`options.graph`): an array is rows whose ids may repeat with other
 * parents, an object an adjacency map (see {@link adjacencyNodes}). Null when the text is no JSON, so
 * that the JSON loader reads it and places the error.
 */
export function jsonGraph(text: string, options: LoadOptions, bytes?: Uint8Array): GraphNodes | null {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return null;
  }
  try {
    return Array.isArray(value) ? linkGraphTable(rowsTable(value), options) : adjacencyNodes(value, options);
  } catch (err) {
    throw placedInJson(err, bytes ?? Buffer.from(text, "utf8"));
  }
}

/**
 * A fault of a JSON graph, found after parsing, placed by reading the text again: a row's at the row,
 * an adjacency map entry's (its key in `pos.field`) at the key.
 */
function placedInJson(err: unknown, bytes: Uint8Array): unknown {
  if (!(err instanceof EspalierError) || err.pos?.column !== undefined) return err;
  const { row, field } = err.pos ?? {};
  if (row !== undefined) return err.placed(findJsonEntry(bytes, { index: row - 1 }));
  if (field !== undefined) return err.placed(findJsonEntry(bytes, { key: field }));
  return err;
}

/**
 * The graph with `options.nodeRecords` laid over its nodes, when there are records; a named size or
 * name field that neither the graph's records nor the node records have is FIELD_MISSING.
 */
export function withNodeRecords(graph: GraphNodes, options: LoadOptions): GraphNodes {
  const full = options.nodeRecords ? withRecords(graph, options.nodeRecords, options) : graph;
  checkGraphFields(full, options);
  return full;
}

/** Whether loaders gave a graph (edges) rather than linked tree nodes. */
export function isGraph(nodes: object): nodes is GraphNodes {
  return "edgeFrom" in nodes;
}
