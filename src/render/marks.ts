import { wrapWords } from "./wrap-words.js";

/**
 * Line marks, the same in summaries and diffs; each carries its meaning without colour. None of them
 * is a sign a line diff uses (`+`, `-`, `<`, `>`), so a saved summary read through a line diff, or a
 * diff of espalier's, never reads as an addition or removal by its mark alone.
 */
export const MARK = {
  /** A focus the user asked for. */
  focus: "*",
  /** On the way to a focus; in a diff also a change or on the way to one. */
  path: ":",
  /** Any other shown node. */
  other: ".",
  /** A reference line of a graph: the node's full entry is elsewhere (its path follows). */
  reference: "&",
} as const;

/** How many lines {@link legendLines} gives for a summary and for a diff, unwrapped. */
export const LEGEND_LINES = { summary: 2, diff: 3 } as const;

/** How a legend line that is wider than the width goes on: on lines of its own, indented so. */
const LEGEND_INDENT = "  ";

/**
 * What the marks, numbers and folds mean, a few lines a reader can have without the docs: printed
 * under the header with `--legend` (the budget counts them) and in `--help`. Given a width, each is
 * wrapped at spaces to it (its further lines indented two columns), never cut: a legend cut short
 * explains nothing.
 */
export function legendLines(kind: "summary" | "diff", width?: number): string[] {
  const lines = legendTexts(kind);
  return width === undefined ? lines : lines.flatMap((line) => wrapWords(line, width, LEGEND_INDENT));
}

function legendTexts(kind: "summary" | "diff"): string[] {
  const path = kind === "diff" ? "a change or on the way to a focus or change" : "on the way to a focus";
  const lines = [
    `marks: ${MARK.focus} focus, ${MARK.path} ${path}, ${MARK.other} other, ${MARK.reference} a reference (a node with several parents: its full entry is at the path shown; counts no node); a / b: b is a's only child, the line's numbers are a's (a with all below it), its fold b's; a / (3 more) / b: 3 names left out between; a line too deep to indent starts with its level in digits (8 : x is 8 levels down)`,
    kind === "diff"
      ? "numbers: N nodes = 1 for each name on the line (a leading / is a name too: /usr is 2) + the nodes on the lines below + the hidden ones, removed nodes included; no count: 1 node (a lone ?: no count fitted; … ends a cut name); a size is the node's own plus all below it, NEW's (own = size - the sizes on the lines below - the hidden size; on a line a / b, a's and b's own together); a line too narrow for its fold says (k hidden, S; …) with S their size, or (k hidden, c changed): k nodes hidden, c of them changed, or (k hidden) alone (on a line with none below it, their size and net are in the line's), or (hidden) alone (k is N less the names and the lines below); narrower: size cut (the line above won't add up), then counts only"
      : "numbers: N nodes = 1 for each name on the line (a leading / is a name too: /usr is 2) + the nodes on the lines below + the hidden ones; no count: 1 node (a lone ?: no count fitted; … ends a cut name); a size is the node's own plus all below it (own = size - the sizes on the lines below - the hidden size; on a line a / b, a's and b's own together); a line too narrow for its fold says (k hidden, S): k nodes hidden, S their size, or (k hidden) (on a line with none below it, their size is in the line's), or (hidden) alone (k is N less the names and the lines below); narrower: size cut (the line above won't add up), then counts only",
  ];
  if (kind === "diff")
    lines.push(
      "changes: [added] [removed] [moved from PARENT] [renamed from NAME] [edited FIELD OLD -> NEW] [resized ±SIZE] [linked] [unlinked] (a parent gained, lost) stand before the name (a narrow line keeps only the kind: [moved]); net ±SIZE: the subtree's size change",
    );
  return lines;
}
