import { Buffer } from "node:buffer";
import { EspalierError, quoted, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { ReadingNote } from "../model/reading-note.js";
import { adjacencyNodes, rowsListChildren } from "./adjacency.js";
import { sbomGraph } from "./cyclonedx.js";
import { loadEdgeList } from "./edge-list.js";
import { linkGraphTable, withRecords } from "./graph-table.js";
import { findJsonEntry } from "./json/json-entry-finder.js";
import { type RepeatedKeys, repeatedTopKeys } from "./json/repeated-top-keys.js";
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

/**
 * A plain edge list (pairs separated by spaces or a tab, no header naming its columns) reads no column,
 * so column options named for it would be ignored: an edge table whose header names its columns
 * otherwise (`from,to` with `--parent-field src`) would read as a list of one-id lines, with exit 0.
 * FIELD_MISSING instead when --parent-field or --child-field was named (the header lacks them), USAGE
 * for the other link options (--id-field only without node records, whose id column it names).
 */
export function checkPlainEdgeList(text: string, options: LoadOptions): void {
  // --id-field names the id column of node records (--nodes), which a plain edge list may have.
  const named = (options.linkOptionsNamed ?? []).filter(
    (flag) => flag !== "--id-field" || options.nodeRecords === undefined,
  );
  if (named.length === 0) return;
  const first = (/^[ \t]*\S[^\n]*/m.exec(text)?.[0] ?? "").replace(/\r$/, "").trim();
  const columns = named.filter((flag) => flag === "--parent-field" || flag === "--child-field");
  if (columns.length > 0)
    throw new EspalierError(
      "FIELD_MISSING",
      say`an edge table's first line names its columns, and this one names no ${options.parentField} and ${options.childField} columns (${columns.join(", ")}): it reads ${quoted.value(first.slice(0, 120))}; name the columns the header has, or, for pairs separated by spaces or a tab without a header, leave the options out`,
      { line: 1, column: 1 },
      { fieldsNeeded: [options.parentField, options.childField] },
    );
  throw new EspalierError(
    "USAGE",
    `${named.join(", ")} ${named.length === 1 ? "does" : "do"} not apply: an edge list is read by its ${options.parentField} and ${options.childField} columns (--parent-field, --child-field) or as pairs separated by spaces or a tab`,
    undefined,
    { options: [...named] },
  );
}

/** An edge list or edge table held as text. */
export function loadEdges(text: string, options: LoadOptions): GraphNodes {
  const delimiter = edgeTableDelimiter(text, options);
  if (delimiter === null) {
    checkPlainEdgeList(text, options);
    return loadEdgeList(text, options);
  }
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
    if (Array.isArray(value))
      return rowsListChildren(value, options)
        ? adjacencyNodes(value, options)
        : linkGraphTable(rowsTable(value), options);
    const graph = adjacencyNodes(value, options);
    const repeated = repeatedTopKeys(bytes ?? Buffer.from(text, "utf8"));
    if (repeated !== undefined) graph.notes = [...(graph.notes ?? []), repeatedIdNote(repeated)];
    return graph;
  } catch (err) {
    throw placedInJson(err, bytes ?? Buffer.from(text, "utf8"));
  }
}

/**
 * A CycloneDX SBOM's dependency graph (cyclonedx.ts) from its bytes; undefined when they are no JSON or
 * no such document, to be read as any other.
 */
export function jsonSbom(bytes: Uint8Array, options: LoadOptions): GraphNodes | undefined {
  let value: unknown;
  try {
    value = JSON.parse(new TextDecoder("utf-8", { ignoreBOM: false }).decode(bytes));
  } catch {
    return undefined;
  }
  return sbomGraph(value, options);
}

/**
 * REPEATED_KEY: an adjacency map's id given twice; JSON.parse keeps the last entry, so the earlier
 * ones' links are not read (RFC 8259 section 4 leaves a repeated name to each reader).
 */
function repeatedIdNote({ key, line, repeats }: RepeatedKeys): ReadingNote {
  const more = repeats > 1 ? `, and ${repeats - 1} more id${repeats > 2 ? "s" : ""} so` : "";
  return {
    code: "REPEATED_KEY",
    line,
    count: repeats,
    parts: say`line ${line} repeats the id ${quoted.id(key)} of the adjacency map${more}: as JSON.parse does, the last entry is read and the links of the earlier ones are not; give each id once, with all its children`,
  };
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
