import type { ViewNode } from "../view/view-node.js";
import { amount, type NumberOptions } from "./amount.js";
import type { LineGroup } from "./line-groups.js";
import type { LineParts } from "./line-layout.js";
import { parentsText, referencesText, referenceText } from "./reference-text.js";
import { shownLabel } from "./safe-text.js";

/** Line marks; they carry the meaning without colour. `&`: a reference line of a graph. */
export const MARK = { focus: "*", path: ">", other: "-", reference: "&" } as const;

/**
 * The node converter of every line-based format: what the line of `group` says. The chain's labels,
 * the numbers of its top node, and the fold of its last. A diff adds its fields on top (see
 * `diffLineParts`).
 */
export function lineParts<T extends ViewNode>(group: LineGroup<T>, options: NumberOptions): LineParts {
  const { level, nodes } = group;
  const top = nodes[0];
  const last = nodes[nodes.length - 1];
  const role = last.focus ? "focus" : last.onPath ? "path" : "other";
  // A reference (graphs) is a line of its own that says where its node's full entry is.
  if (top.reference) {
    return {
      level,
      mark: MARK.reference,
      role: role === "focus" ? "path" : role,
      tag: "",
      shortTag: "",
      labels: [shownLabel(top.label)],
      numbers: referenceText(top.reference),
      fold: "",
      foldShort: "",
    };
  }
  const parents = parentsText(last.parents);
  return {
    level,
    mark: MARK[role],
    role,
    tag: "",
    shortTag: "",
    labels: nodes.map((n) => shownLabel(n.label)),
    numbers: amount(top.nodes, top.size, options),
    fold: joined(last.hidden ? `+${last.hidden.children} more: ${foldAmount(last, options)}` : "", parents),
    foldShort: joined(last.hidden ? `+${last.hidden.children} more` : "", parents),
  };
}

/** Two parts of a line's end, two spaces apart, either may be empty. */
function joined(a: string, b: string): string {
  return a && b ? `${a}  ${b}` : a || b;
}

/** The numbers of what is folded under `node`: always with its count. */
export function foldAmount(node: ViewNode, options: NumberOptions): string {
  const { nodes, size, references } = node.hidden!;
  return amount(nodes, size, { ...options, always: true }) + referencesText(references);
}
