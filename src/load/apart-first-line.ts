import { quoted, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { NamePool } from "../model/names.js";
import type { ReadingNote } from "../model/reading-note.js";

/**
 * An edge list (pairs of ids, `--input-format edges`) whose first line is an edge that shares no node
 * with any other edge: a header naming the columns in words the options do not (`from<TAB>to`,
 * `source target`) reads so, as a lone edge beside the real graph, with exit 0. It may be a real edge
 * of a graph in several parts, so it stays read as an edge, with a FIRST_LINE_APART note saying so and
 * how to read the line as a header instead (see model/reading-note.ts). Other graphs come back as
 * they are. `start` is the input's first text (the first line at least), to tell a tab from spaces.
 */
export function noteApartFirstLine(graph: GraphNodes, start: string): GraphNodes {
  if (graph.linkedBy !== "pairs" || graph.edgeCount < 2) return graph;
  const { edgeFrom, edgeTo, edgeCount, origin, edgeOrigin } = graph;
  const a = edgeFrom[0];
  const b = edgeTo[0];
  // Nodes are numbered by first appearance: edge 0 is on the input's first line with an id when its
  // parent is node 0 and first appears on that edge's line.
  if (a !== 0 || a === b || origin[a] !== edgeOrigin[0]) return graph;
  for (let k = 1; k < edgeCount; k++) {
    const from = edgeFrom[k];
    const to = edgeTo[k];
    if (from === a || from === b || to === a || to === b) return graph;
  }
  const line = edgeOrigin[0];
  const parent = idOf(graph.ids, a);
  const child = idOf(graph.ids, b);
  const firstLine = /^[ \t]*\S[^\n]*/m.exec(start)?.[0] ?? "";
  // Cells split on a tab make an edge table's header with the columns named (graph-input.ts
  // edgeTableDelimiter); pairs split on spaces have no header form.
  const instead = firstLine.includes("\t")
    ? say`if the line names the columns, pass --parent-field ${quoted.id(parent)} --child-field ${quoted.id(child)} to read it as a header`
    : say`if the line names the columns, leave it out (tail -n +${line + 1} prints the lines after it) or separate them with a tab and pass --parent-field ${quoted.id(parent)} --child-field ${quoted.id(child)}`;
  const note: ReadingNote = {
    code: "FIRST_LINE_APART",
    line,
    parts: say`line ${line} was read as an edge from ${quoted.id(parent)} to ${quoted.id(child)}, which shares no node with any other line; ${instead}`,
  };
  return { ...graph, notes: [...(graph.notes ?? []), note] };
}

function idOf(ids: GraphNodes["ids"], i: number): string {
  return Array.isArray(ids) ? (ids as readonly string[])[i] : (ids as NamePool).get(i);
}
