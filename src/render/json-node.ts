import type { ViewNode } from "../view/view-node.js";
import type { NodeFields } from "./summary-schema.js";

/**
 * The node converter of the JSON formats: the fields a summary node and a diff node share, in their
 * order (`id` only where rows have ids, `label` only with a label template). A format adds its own
 * fields, then `children` and `hidden`.
 */
export function jsonNodeFields(node: ViewNode, labels: boolean): NodeFields {
  return {
    name: node.name,
    path: node.path,
    ...(node.id !== null ? { id: node.id } : {}),
    ...(labels ? { label: node.label } : {}),
    interest: node.interest,
    nodes: node.nodes,
    size: node.size,
    focus: node.focus,
    ...(node.reference ? { reference: { ...node.reference } } : {}),
    ...(node.parents ? { parents: { ...node.parents } } : {}),
    ...(node.empty ? { empty: true as const } : {}),
  };
}
