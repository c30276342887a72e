import type { GraphNodes } from "../model/graph-nodes.js";
import { loadEdgeList } from "./edge-list.js";
import { linkGraphTable, withRecords } from "./graph-table.js";
import type { LoadOptions } from "./load-options.js";
import { csvTable } from "./table.js";

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

/** An edge list or edge table held as text, with its node records laid over it. */
export function loadEdges(text: string, options: LoadOptions): GraphNodes {
  const delimiter = edgeTableDelimiter(text, options);
  const graph =
    delimiter === null
      ? loadEdgeList(text, options)
      : linkGraphTable(csvTable(text, delimiter, Number.POSITIVE_INFINITY), options, true);
  return withNodeRecords(graph, options);
}

/** The graph with `options.nodeRecords` laid over its nodes, when there are records. */
export function withNodeRecords(graph: GraphNodes, options: LoadOptions): GraphNodes {
  return options.nodeRecords ? withRecords(graph, options.nodeRecords, options) : graph;
}

/** Whether loaders gave a graph (edges) rather than linked tree nodes. */
export function isGraph(nodes: object): nodes is GraphNodes {
  return "edgeFrom" in nodes;
}
