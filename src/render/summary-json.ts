import type { HierarchyNode } from "d3-hierarchy";
import { type ShownNote, showNote } from "../model/reading-note.js";
import type { TreeReading } from "../model/tree.js";
import type { ViewNode } from "../view/view-node.js";
import { jsonNodeFields } from "./json-node.js";
import { jsonText } from "./json-text.js";
import { mapTree } from "./map-tree.js";
import { SUMMARY_FORMAT, type Summary, type SummaryNode } from "./summary-schema.js";

export interface JsonOptions {
  budget: number;
  lines: number;
  foci: string[];
  /** Foci left out because they matched no node; listed when there are any. */
  unmatchedFoci?: readonly string[];
  /** Include each node's label (when a label template is in use). */
  labels: boolean;
  /** How the input was read, when known (the tree's `reading`). */
  input?: TreeReading;
  /**
   * The input's notes as printed (model/reading-note.ts), input text shown or hidden as the run shows
   * it (`--pseudonymize`); without them, `input.notes` shows the input as it is.
   */
  notes?: readonly ShownNote[];
}

/** The summary JSON object (see docs/summary.schema.json). Iterative: any depth of view is fine. */
export function toSummary(view: HierarchyNode<ViewNode>, options: JsonOptions): Summary {
  const convert = (node: ViewNode): SummaryNode => ({
    ...jsonNodeFields(node, options.labels),
    children: [],
    hidden: node.hidden ? { ...node.hidden } : null,
  });
  const root = mapTree(view.data, convert);
  return {
    format: SUMMARY_FORMAT,
    budget: options.budget,
    lines: options.lines,
    totals: { nodes: view.data.nodes, size: view.data.size },
    foci: options.foci,
    ...(options.unmatchedFoci?.length ? { unmatchedFoci: [...options.unmatchedFoci] } : {}),
    ...(options.input ? { input: jsonReading(options.input, options.notes) } : {}),
    root,
  };
}

/**
 * `input` as the JSON has it: the reading, with its notes as messages (none: no `notes`). The records'
 * other fields are what a diff compares by default (cli/compared-fields.ts), not a fact of the summary.
 */
function jsonReading(reading: TreeReading, shown: readonly ShownNote[] | undefined): Summary["input"] {
  const { notes, otherFields: _, otherFieldsLeft: __, ...rest } = reading;
  const out = shown ?? (notes ?? []).map((note) => showNote(note));
  return out.length > 0 ? { ...rest, notes: out.map((note) => ({ ...note })) } : { ...rest };
}

/** The summary as JSON text (RFC 8259), two-space indented, ending in a newline (see {@link jsonText}). */
export function renderJson(view: HierarchyNode<ViewNode>, options: JsonOptions): string {
  return jsonText(toSummary(view, options), "summary");
}
