import type { NumberOptions } from "./amount.js";
import type { WidthCuts } from "./key-line.js";
import { type LaidOutLine, type LayoutOptions, type LineParts, laidOutLine } from "./line-layout.js";

/** A screen's lines as laid out, the parts they came from, and whether the sizes were left out. */
export interface ScreenLines extends WidthCuts {
  parts: LineParts[];
  lines: string[];
  /**
   * The input has sizes but the lines print none: at this width some line could hold its size only by
   * leaving out a number (see `layoutLine`), and a screen where some lines have sizes and others not
   * cannot be added up. The key says so (see `keyLine`).
   */
  sizesLeftOut: boolean;
}

/**
 * The lines of one screen, each of `groups` made into parts by `parts` and laid out within the width.
 * Sizes are a screen's, not a line's: when one line would have to leave a number out to fit, the whole
 * screen is laid out again without sizes, so every count and size on it adds up from the lines below
 * (a line's size less its lines' sizes and its fold's is its own size).
 */
export function screenLines<G>(
  groups: readonly G[],
  parts: (group: G, options: NumberOptions) => LineParts,
  options: NumberOptions & LayoutOptions,
): ScreenLines {
  const lay = (o: NumberOptions) => {
    const made = groups.map((g) => parts(g, o));
    const laid = made.map((p) => laidOutLine(p, options));
    return { made, laid };
  };
  const first = lay(options);
  const sizesLeftOut = options.sizes && first.laid.some((l) => l.numbersCut);
  const { made, laid } = sizesLeftOut ? lay({ ...options, sizes: false }) : first;
  return { parts: made, lines: laid.map((l) => l.text), sizesLeftOut, ...cutsOf(laid) };
}

/** What the width took from any of the lines, for the key. */
function cutsOf(laid: readonly LaidOutLine[]): WidthCuts {
  return {
    countsCut: laid.some((l) => l.countCut),
    foldsCut: laid.some((l) => l.foldCut),
    namesCut: laid.some((l) => l.nameCut),
    changesCut: laid.some((l) => l.changesCut),
  };
}
