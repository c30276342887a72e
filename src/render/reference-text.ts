import { shownLabel } from "../model/safe-text.js";
import { formatCount } from "./amount.js";

/** What a reference line of a graph says after its label: where the node's full entry is. */
export function referenceText(to: { path: string; cycle: boolean }): string {
  const where = to.path === "" ? "the root" : shownLabel(to.path);
  return to.cycle ? `cycle, full entry above at ${where}` : `full entry at ${where}`;
}

/**
 * ", 2 references" after a fold's numbers, when references of a graph are folded there; the count in
 * the style of every other count (`1,449`, compact `12.1k`).
 */
export function referencesText(references: number | undefined, compact = false): string {
  return references
    ? `, ${formatCount(references, compact)} ${references === 1 ? "reference" : "references"}`
    : "";
}

/** "3 parents, 1 not shown" on the line of a focus with several parents (graphs); "" otherwise. */
export function parentsText(parents: { count: number; hidden: number } | undefined): string {
  if (!parents || parents.count < 2) return "";
  const hidden = parents.hidden > 0 ? `, ${formatCount(parents.hidden)} not shown` : "";
  return `${formatCount(parents.count)} parents${hidden}`;
}
