import { shownLabel } from "../model/safe-text.js";

/** What a reference line of a graph says after its label: where the node's full entry is. */
export function referenceText(to: { path: string; cycle: boolean }): string {
  const where = to.path === "" ? "the root" : shownLabel(to.path);
  return to.cycle ? `cycle, full entry above at ${where}` : `full entry at ${where}`;
}

/** ", 2 references" after a fold's numbers, when references of a graph are folded there. */
export function referencesText(references: number | undefined): string {
  return references ? `, ${references} ${references === 1 ? "reference" : "references"}` : "";
}

/** "3 parents, 1 not shown" on the line of a focus with several parents (graphs); "" otherwise. */
export function parentsText(parents: { count: number; hidden: number } | undefined): string {
  if (!parents || parents.count < 2) return "";
  return `${parents.count} parents${parents.hidden > 0 ? `, ${parents.hidden} not shown` : ""}`;
}
