import type { GraphNodes } from "../model/graph-nodes.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { ReadingNote } from "../model/reading-note.js";

/**
 * `nodes` with `notes` after the ones its reading has (a graph's own notes, or a tree's reading's), in
 * place; as it was when there are none, or when a tree has no reading to carry them.
 */
export function withNotes<T extends LinkedNodes | GraphNodes>(nodes: T, notes: readonly ReadingNote[]): T {
  if (notes.length === 0) return nodes;
  if ("edgeFrom" in nodes) {
    nodes.notes = [...(nodes.notes ?? []), ...notes];
    return nodes;
  }
  const reading = nodes.reading;
  if (reading !== undefined) nodes.reading = { ...reading, notes: [...(reading.notes ?? []), ...notes] };
  return nodes;
}
