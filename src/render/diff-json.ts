import type { HierarchyNode } from "d3-hierarchy";
import { type ChangeCounts, treeChangeKinds } from "../diff/changes.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import type { DiffTotals } from "../diff/prepared-diff.js";
import type { ShownNote } from "../model/reading-note.js";
import { DIFF_FORMAT, type DiffSummary, type DiffSummaryNode, type TreeChangeCounts } from "./diff-schema.js";
import { VALUE_SIZE } from "./header.js";
import { jsonNodeFields } from "./json-node.js";
import { jsonText } from "./json-text.js";
import { mapTree } from "./map-tree.js";

export interface DiffJsonOptions {
  budget: number;
  lines: number;
  foci: string[];
  /** Foci left out because they matched no node; listed when there are any. */
  unmatchedFoci?: readonly string[];
  by: "id" | "path";
  /** Record fields compared between matched nodes (a different value is `edited`); none by default. */
  compared?: readonly string[];
  /** Include each node's label (when a label template is in use). */
  labels: boolean;
  /** Each version's reading notes as printed, with the version they are on; listed when there are any. */
  notes?: readonly (ShownNote & { version: "OLD" | "NEW" })[];
  /** What the sizes measure, as the header says it: {@link VALUE_SIZE} makes `sizes` "values". */
  sizeName?: string;
}

/** The diff JSON object (see docs/diff.md and `diffSchema`). Iterative: any depth of view is fine. */
export function toDiffSummary(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffJsonOptions,
): DiffSummary {
  const convert = (node: DiffViewNode): DiffSummaryNode => ({
    ...jsonNodeFields(node, options.labels),
    change: node.change,
    delta: node.delta,
    net: node.net,
    ...(node.movedFrom !== null ? { movedFrom: node.movedFrom } : {}),
    ...(node.renamedFrom !== null ? { renamedFrom: node.renamedFrom } : {}),
    ...(node.edits.length > 0 ? { edits: node.edits.map((e) => ({ ...e })) } : {}),
    children: [],
    hidden: node.hidden ? { ...node.hidden, changes: counts(node.hidden.changes) } : null,
  });
  // A diff of trees has no edge kinds: its counts keep the six kinds of change a tree has.
  const counts = (c: ChangeCounts): ChangeCounts | TreeChangeCounts =>
    totals.graph ? { ...c } : (Object.fromEntries(treeChangeKinds.map((k) => [k, c[k]])) as TreeChangeCounts);
  const root = mapTree(view.data, convert);
  return {
    format: DIFF_FORMAT,
    match: options.by,
    compared: [...(options.compared ?? [])],
    ...(options.sizeName === VALUE_SIZE ? { sizes: "values" as const } : {}),
    budget: options.budget,
    lines: options.lines,
    changes: counts(totals.changes),
    totals: {
      nodes: view.data.nodes,
      size: view.data.size,
      delta: totals.delta,
      old: { ...totals.old },
      new: { ...totals.new },
    },
    foci: options.foci,
    ...(options.unmatchedFoci?.length ? { unmatchedFoci: [...options.unmatchedFoci] } : {}),
    ...(options.notes?.length ? { notes: options.notes.map((note) => ({ ...note })) } : {}),
    root,
  };
}

/** The diff as JSON text (RFC 8259), two-space indented, ending in a newline (see {@link jsonText}). */
export function renderDiffJson(
  view: HierarchyNode<DiffViewNode>,
  totals: DiffTotals,
  options: DiffJsonOptions,
): string {
  return jsonText(toDiffSummary(view, totals, options), "diff");
}
