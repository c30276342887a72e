import { safeText } from "../model/safe-text.js";
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
 * explains nothing. `sizeName`: what the sizes measure, as the header and the key call it (`value size`
 * in a diff of documents read as values, a size field's name such as `cost`); default `size`.
 */
export function legendLines(kind: "summary" | "diff", width?: number, sizeName?: string): string[] {
  const lines = legendTexts(kind, sizeName === undefined ? "size" : safeText(sizeName, 40));
  return width === undefined ? lines : lines.flatMap((line) => wrapWords(line, width, LEGEND_INDENT));
}

function legendTexts(kind: "summary" | "diff", size: string): string[] {
  const path = kind === "diff" ? "a change or on the way to a focus or change" : "on the way to a focus";
  // Every mark, number and cut in few words: at 32 columns a summary's legend took 36 lines (now 29),
  // a diff's 50 (now 44).
  const lines = [
    `marks: ${MARK.focus} focus, ${MARK.path} ${path}, ${MARK.other} other, ${MARK.reference} a node with several parents, in full at the path shown (counts no node); a / b: b is a's only child, the line's numbers a's (with all below), its fold b's; a / (3 more) / b: 3 names left out; 8 : x: x is 8 levels down, its level in digits (too deep to indent)`,
    kind === "diff"
      ? `numbers: N nodes = 1 per name on the line (a leading / too: /usr is 2) + the lines below + the hidden, removed nodes included; no count: 1 + hidden; ?: count cut; … cuts a name or value; a ${size}: NEW's own + all below (own = ${size} - the sizes below - the hidden size; on a / b, both own); a narrow fold: (k hidden, S; …): k nodes hidden, S their size; (k hidden, c changed): k nodes hidden, c of them changed; (k hidden): size and net in the line's (none below); (hidden): k = N less the names and the lines below; narrower: size cut (the line above won't add up), then counts only`
      : `numbers: N nodes = 1 per name on the line (a leading / too: /usr is 2) + the lines below + the hidden; no count: 1 + hidden; ?: count cut; … ends a cut name; a ${size}: the node's own + all below (own = ${size} - the sizes below - the hidden size; on a / b, both own); a narrow fold: (k hidden, S): k nodes hidden, S their size; (k hidden): their size in the line's (none below); (hidden): k = N less the names and the lines below; narrower: size cut (the line above won't add up), then counts only`,
  ];
  if (kind === "diff")
    lines.push(
      "changes: [added] [removed] [moved from PARENT] [renamed from NAME] [edited FIELD OLD -> NEW] [resized ±SIZE] [linked] [unlinked] (a parent gained, lost) stand before the name (narrower: [edited 3 fields], [moved]); net ±SIZE: the subtree's size change",
    );
  return lines;
}
