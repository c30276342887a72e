import type { NumberOptions } from "./amount.js";
import type { WidthCuts } from "./key-line.js";
import {
  type LaidOutLine,
  type LayoutOptions,
  type LineParts,
  laidOutLine,
  laidOutWhole,
  SIZE_CUT,
} from "./line-layout.js";

/** A screen's lines as laid out, the parts they came from, and what the width took from their sizes. */
export interface ScreenLines extends WidthCuts {
  parts: LineParts[];
  lines: string[];
  /**
   * The input has sizes but the lines print none: some line could say neither its sizes nor that
   * they were cut ({@link SIZE_CUT}) without leaving out a count. The key says so (see `keyLine`).
   */
  sizesLeftOut: boolean;
}

/**
 * The lines of one screen, each of `groups` made into parts by `parts` and laid out within the width.
 * A line that would have to leave a number out to fit first keeps them all if its indentation and
 * names give way further (see `laidOutWhole`); failing that it leaves its sizes out, all of them, and
 * says so in their place (`14 nodes, size cut  (hidden: 13 nodes)`), so every size left on screen
 * adds up (a line's size less its lines' sizes and its fold's is its own size) except on the line
 * just above such a line, which the key points out. When a line cannot say even that, or more than a
 * third of the lines would, or the key cannot say what `size cut` means (`explained`, given the
 * screen, says whether it can), the whole screen leaves sizes out (`sizesLeftOut`), so every count
 * and size on it adds up.
 */
export function screenLines<G>(
  groups: readonly G[],
  parts: (group: G, options: NumberOptions) => LineParts,
  options: NumberOptions & LayoutOptions,
  explained?: (screen: ScreenLines) => boolean,
): ScreenLines {
  const made = groups.map((g) => parts(g, options));
  const laid = made.map((p) => laidOutLine(p, options));
  let sizesCut = 0;
  if (options.sizes)
    for (let k = 0; k < laid.length; k++) {
      if (!laid[k].numbersCut) continue;
      const whole = laidOutWhole(made[k], options);
      if (whole !== null) {
        laid[k] = whole;
        continue;
      }
      // A share is of sizes on this screen: the line's, by count, would read as one of them.
      const bare = sizeCut(parts(groups[k], { ...options, sizes: false, share: undefined }));
      const line = laidOutWhole(bare, options) ?? laidOutLine(bare, options);
      // Not even `N nodes, size cut` and the fold's count: counts only, every line. A fold that says
      // its changes in one count (`278 changed`) keeps every number the sums need.
      if (line.ownNumbersCut || line.countCut || line.foldCut) return everyLineBare(groups, parts, options);
      made[k] = bare;
      laid[k] = line;
      sizesCut++;
    }
  // A screen of mostly `size cut` says less than one of counts alone: past a third of the lines, none
  // keeps its sizes (a choice of this project, no source).
  if (sizesCut * MOST_CUT > laid.length) return everyLineBare(groups, parts, options);
  const screen = {
    parts: made,
    lines: laid.map((l) => l.text),
    sizesLeftOut: false,
    ...cutsOf(laid, made),
    sizesCut: sizesCut > 0,
  };
  // Sizes, or a `size cut`, the key above the lines has no room to explain (a line above a cut would
  // not add up, with nothing on screen saying so): counts only, which the key says in fewer words.
  if (options.sizes && explained !== undefined && !explained(screen))
    return everyLineBare(groups, parts, options);
  return screen;
}

/** Lines over lines that say `size cut`, at most, for the others to keep their sizes (see `screenLines`). */
const MOST_CUT = 3;

/** The screen laid out without sizes, every line (see `screenLines`). */
function everyLineBare<G>(
  groups: readonly G[],
  parts: (group: G, options: NumberOptions) => LineParts,
  options: NumberOptions & LayoutOptions,
): ScreenLines {
  const made = groups.map((g) => parts(g, { ...options, sizes: false }));
  const laid = made.map((p) => laidOutLine(p, options));
  return {
    parts: made,
    lines: laid.map((l) => l.text),
    sizesLeftOut: true,
    ...cutsOf(laid, made),
    sizesCut: false,
  };
}

/**
 * Parts laid out without sizes that say so after their count: `14 nodes, size cut`. Without sizes
 * the fold's count alone (`(13 hidden)`) keeps every number the line's sums need.
 */
function sizeCut(p: LineParts): LineParts {
  const say = (numbers: string) => (numbers ? `${numbers}, ${SIZE_CUT}` : SIZE_CUT);
  return {
    ...p,
    numbers: say(p.numbers),
    compactNumbers: say(p.compactNumbers),
    ...(p.fold ? { foldAllBelow: p.foldTiny, foldAllBelowBare: p.foldBare } : {}),
  };
}

/** What the width took from any of the lines, for the key. */
function cutsOf(laid: readonly LaidOutLine[], parts: readonly LineParts[]): WidthCuts {
  return {
    countsCut: laid.some((l) => l.countCut),
    foldsCut: laid.some((l) => l.foldCut),
    ...(laid.some((l) => l.countInFold) ? { countsInFolds: true } : {}),
    namesCut: laid.some((l) => l.nameCut),
    ...(laid.some((l) => l.valueCut) ? { valuesCut: true } : {}),
    changesCut: laid.some((l) => l.changesCut),
    ...firstDepth(laid, parts),
    ...(laid.some((l) => l.namesLeftOut) ? { namesLeftOut: true } : {}),
  };
}

/** The first line's level printed in digits, if any line prints one, with that line's mark (for the key). */
function firstDepth(
  laid: readonly LaidOutLine[],
  parts: readonly LineParts[],
): Pick<WidthCuts, "depthInDigits"> {
  const k = laid.findIndex((l) => l.depthInDigits !== undefined);
  return k < 0 ? {} : { depthInDigits: { level: laid[k].depthInDigits!, mark: parts[k].mark } };
}
