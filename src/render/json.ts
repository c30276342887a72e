import type { HierarchyNode } from "d3-hierarchy";
import type { ViewNode } from "../view/view-node.js";
import { SUMMARY_FORMAT, type Summary, type SummaryNode } from "./summary-schema.js";

export interface JsonOptions {
  budget: number;
  lines: number;
  foci: string[];
  /** Include each node's label (when a label template is in use). */
  labels: boolean;
}

/** The summary JSON object (see docs/summary.schema.json). */
export function toSummary(view: HierarchyNode<ViewNode>, options: JsonOptions): Summary {
  const convert = (node: ViewNode): SummaryNode => ({
    name: node.name,
    path: node.path,
    ...(node.id !== null ? { id: node.id } : {}),
    ...(options.labels ? { label: node.label } : {}),
    interest: node.interest,
    nodes: node.nodes,
    size: node.size,
    focus: node.focus,
    children: node.children.map(convert),
    hidden: node.hidden ? { ...node.hidden } : null,
  });
  return {
    format: SUMMARY_FORMAT,
    budget: options.budget,
    lines: options.lines,
    totals: { nodes: view.data.nodes, size: view.data.size },
    foci: options.foci,
    root: convert(view.data),
  };
}

/** The summary as JSON text (RFC 8259), two-space indented, ending in a newline. */
export function renderJson(view: HierarchyNode<ViewNode>, options: JsonOptions): string {
  return `${JSON.stringify(toSummary(view, options), null, 2)}\n`;
}
