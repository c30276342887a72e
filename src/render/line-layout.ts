import type { ChangeKind } from "../diff/changes.js";
import { CHAIN_JOIN } from "../model/chain-join.js";
import { PSEUDONYM_PREFIX, startsPseudonymous } from "../model/pseudonym.js";
import { formatCount } from "./amount.js";
import { displayWidth, ELLIPSIS, shortenEnd, shortenKeeping, shortenMiddle } from "./display-width.js";
import { noColour, type Palette } from "./palette.js";

/**
 * What one output line says, before it is laid out: every line-based format (terminal text,
 * Markdown, the interactive view's screens) starts from this. Texts are already safe to print
 * (see `safeText`); the fold texts are empty when nothing is folded on the line.
 */
export interface LineParts {
  /** Nesting level: the line is indented two spaces per level. */
  level: number;
  /** The mark that starts the line after the indentation (see marks.ts); it reads without colour. */
  mark: string;
  /** Which style the mark and the label take. */
  role: "focus" | "path" | "other";
  /** A diff's change tag (`[added]`) of the line's last node, or "". */
  tag: string;
  /**
   * The same tag in few words, its old path, old name and values left out: its kind, how many fields
   * were edited, its own size change (`[edited 3 fields, +12 B]`); "" without a tag.
   */
  shortTag: string;
  /**
   * The tag's kind and its own size change (`[edited +12 B]`), for a line whose name would be cut
   * beside more; absent: the kind alone (`[edited]`).
   */
  leastTag?: string;
  /**
   * The widest tag within `room` columns that still says its old path, old name and values, each cut
   * to a readable part (where a value changed, with text on both sides of that), fewer fields where
   * not all fit (`+2 more fields`), and whether it cut a text (`…`); null when none fits, the line
   * then says `shortTag`. The layout asks with the room its name leaves whole; absent where the tag
   * is no wider than `shortTag`.
   */
  tagWithin?: (room: number) => { tag: string; cut: boolean } | null;
  /** The tag's kind, for its colour; null without a tag. */
  tagKind: ChangeKind | null;
  /** The labels the line names: one node, or a chain of only children, top first. */
  labels: string[];
  /**
   * One name: the code units where it first differs from its shown siblings' names, which a cut
   * keeps, so siblings do not print the same; absent: none to tell apart.
   */
  distinct?: readonly number[];
  /** The numbers after the labels, the top node's (`12,121 nodes, 3.0 MiB`), or "". */
  numbers: string;
  /** The same with plain sizes compact (`12,121 nodes, 286M`; a tree line keeps its count whole). */
  compactNumbers: string;
  /**
   * The count alone, exact (`12,121 nodes`), for a narrow line: "" for a single node, which a line
   * without a count is read as.
   */
  countNumbers: string;
  /** What is folded under the last node, in full (`(hidden: 3 children, 41 nodes, 2.0 MiB)`). */
  fold: string;
  /**
   * The fold's numbers without how many children it holds (`(hidden: 41 nodes, 2.0 MiB)`): the line
   * keeps every number a reader needs to check `nodes = 1 + the lines below + hidden`.
   */
  foldCounts: string;
  /** The same with compact numbers. */
  compactFold: string;
  /** The fold with only how many nodes it hides (`(hidden: 41 nodes)`). */
  foldShort: string;
  /** The fold with only how many nodes it hides (`(41 hidden)`; in a diff with how many changed). */
  foldTiny: string;
  /**
   * The fold's numbers in fewest words, its size kept (`(41 hidden, 2.0 MiB)`; in a diff with what
   * changed after a `;`), when the fold has a size; else absent.
   */
  foldSized?: string;
  /** The same with compact numbers. */
  compactFoldSized?: string;
  /** The fold's count alone (`(41 hidden)`), when `foldTiny` says more (a diff's changes); else absent. */
  foldBare?: string;
  /**
   * The fold's count alone (`(41 hidden)`; a diff's with how many changed, `(41 hidden, 2 changed)`)
   * where that keeps every number the line's sums need: on a line with no lines below it, whose fold
   * holds all below the line (its size, and a diff's net, is the line's less the line's own), so the
   * line keeps its sizes without the fold's (see `laidOutWhole`); and on a line that says `size cut`
   * (see `screenLines`). Absent otherwise.
   */
  foldAllBelow?: string;
  /**
   * The line names one node and shows none below it, all below it in its fold: its count is 1 + the
   * fold's, so a narrow line may leave the count out (`mime  (665 hidden)`, not `666 nodes`) and keep
   * more of the name; absent otherwise.
   */
  countInFold?: true;
  /**
   * The fold hides no node, only references (graphs): where not even its count fits, it goes rather
   * than print `(hidden)`, which on a line without a count would leave the count unknown; without it
   * the line reads as the one node it is. Absent otherwise.
   */
  foldOnlyReferences?: true;
  /** A diff's `foldAllBelow` without how many changed (`(41 hidden)`), when that differs. */
  foldAllBelowBare?: string;
  /** The compact fold without how many children it holds, when it differs from `compactFold`. */
  compactFoldCounts?: string;
  /**
   * A diff's compact fold with its changes in one count (`(hidden: 604 nodes, 3.1 MiB; 386 changed,
   * net +1.0 MiB)`): every number a sum needs, not what kinds of change; absent outside a diff.
   */
  compactFoldChanged?: string;
}

export interface LayoutOptions {
  /** Widest line allowed, in terminal columns (UAX #11 widths); unlimited when undefined. */
  width?: number;
  /** Colours for the marks, labels, tags and numbers; none when undefined (see `palette(colour)`). */
  palette?: Palette;
}

/** Narrowest width a line can be laid out in: a deep line's indentation gives way to keep this much. */
export const MIN_WIDTH = 30;

/** A fold at its barest, when not even its count fits: a reader still sees that something is hidden. */
export const FOLD_SIGN = "(hidden)";

/**
 * What stands where a line's own numbers were when they do not fit: a line without numbers reads as
 * one node (the legend says so), which a folded line whose numbers gave way is not.
 */
export const NUMBERS_GONE = "?";

/**
 * What stands on a line in place of its sizes when they do not fit, after its count
 * (`14 nodes, size cut`): the lines around it keep theirs. The line's own sizes and its fold's all
 * go, so no number on it is read as a sum of sizes it is not; the line above it then does not add up
 * by size, which the key says (see `screenLines`).
 */
export const SIZE_CUT = "size cut";

/** Shortest label kept before the line's own numbers give way. */
const MIN_LABEL = 8;

/** Shortest label kept before a tag's old path and its size, then a diff fold's changes, give way. */
const FEW_LABEL = 4;

/** A step's labels cut anyhow, a chain in its middle: only once the count is gone. */
const ANY_CUT = -1;

/** Shortest label kept, two characters and `…`, before a fold's count gives way. */
const SOME_LABEL = 3;

/** Shortest label kept, one character and `…`, before a count gives way. */
const LEAST_LABEL = 2;

const NOTHING_CUT = {
  numbersCut: false,
  countCut: false,
  ownNumbersCut: false,
  foldCut: false,
  countInFold: false,
  nameCut: false,
  changesCut: false,
} as const;

/** The level a line prints in digits (see `LaidOutLine.depthInDigits`), when its indentation does. */
function depthOf(indentation: string, full: string, level: number): { depthInDigits?: number } {
  return indentation === full ? {} : { depthInDigits: level };
}

/** The first of `laidOutLine`'s steps that may leave a number out. */
const FIRST_CUT = 9;

/** A laid-out line, and whether it gave up a number to fit its width. */
export interface LaidOutLine {
  /** The line, styled. */
  text: string;
  /**
   * Whether the line left out a number its parts hold (a size first: `layoutLine` steps 5 and
   * later): with sizes on, the sizes of the lines around it then no longer add up (see `screenLines`).
   */
  numbersCut: boolean;
  /** Whether the line's count gave way (`?` in its place, or nothing at all). */
  countCut: boolean;
  /** Whether the line's own numbers gave way to less than their compact form (`608 nodes` alone). */
  ownNumbersCut: boolean;
  /** Whether the fold kept only its sign (`(hidden)`). */
  foldCut: boolean;
  /** Whether the line left its count out for its fold's to say it (see `LineParts.countInFold`). */
  countInFold: boolean;
  /** Whether a label, or an old path or value in its tag, was cut (`…` marks where). */
  nameCut: boolean;
  /** Whether a diff's fold left out how many changed nodes it holds (`(41 hidden)`). */
  changesCut: boolean;
  /** Whether the tag's old path, old name or a value was cut (`…ger:1.4`), for the key to say. */
  valueCut?: boolean;
  /** Whether a chain left names out of its middle, `(k more)` standing for them. */
  namesLeftOut?: boolean;
  /**
   * The line's level when its indentation, too deep for the width, prints it in digits (`8 : name`,
   * 8 levels below the top line); absent when the line is indented in full.
   */
  depthInDigits?: number;
}

/**
 * One line of text, `<indent><mark> <a> / <b> / [<tag> ]<c>  <numbers>  <fold>`, within `width`
 * columns. A diff's tag stands right before the name it belongs to, the chain's last. The rule: a
 * name gives way before a number, and a number that the lines' sums need (a count) last of all, so
 * that `nodes = 1 + the lines below + hidden` can be checked on every line a screen can hold. When
 * the line is too wide, what gives way, in turn (the first that fits is used):
 *   1. the fold drops how many children it hides and keeps its numbers (`(hidden: 41 nodes, 2.0 MiB)`),
 *      then says them in fewest words (`(41 hidden, 2.0 MiB)`; without a size `(41 hidden)`);
 *   2. the tag's old path, old name and old and new values are cut to the columns the line has for
 *      them with its names whole, down to a readable part each (`…` marks every cut; a value keeps
 *      where it changed and text on both sides of that, see `cutEditValues`), then it says only its
 *      first fields (`+2 more fields`), then only how many (`[edited 3 fields]`), then its kind alone
 *      (`[edited]`, a size change kept): the name is what a reader needs most;
 *   3. the labels are cut, down to 8 columns a name, then to 4: one name at its end, or around where it
 *      differs from its siblings when the end cut would lose that; a chain's longest names at their
 *      ends, every ` / ` kept so its names can be counted; at 4 a long chain keeps its first and
 *      last names around `(k more)`, the k left out of its middle (see `cutChain`);
 *   4. numbers become compact (plain sizes `286M`; the renderers' parts keep counts whole, see
 *      `NumberOptions.countsExact`);
 *   5. the fold's size goes, its count stays (`(hidden: 41 nodes)`; in a diff with how many changed
 *      nodes it holds), then the line's size (`608 nodes`), then the fold's words (`(41 hidden)`);
 *   6. a deep line's indentation shrinks to a third of the width, its level in digits at its end;
 *   7. the labels are cut down to 4 columns again, then the tag's own size change goes (`[moved]`),
 *      then a diff's fold drops how many changed (`(41 hidden)`);
 *   8. the indentation is only the level in digits (`12 `), the labels cut down to two characters
 *      and `…`;
 *   9. the fold keeps only its sign (`(hidden)`: its count is the line's less its names and the
 *      lines below; a graph's fold of references only goes instead, see `foldOnlyReferences`), then the labels are cut down to one character and `…`, then each to `…` alone
 *      (a chain's ` / ` kept), then the line's count goes, `?` standing in its place (a line without
 *      a count reads as one node), then the `?` goes.
 * A line that names one node and shows none below it (see `LineParts.countInFold`) leaves its count
 * out, from step 5 on, where that keeps more of its name: `mime  (665 hidden)`, 666 nodes, no number
 * lost.
 * A fold never goes: a reader always sees that something is hidden. At MIN_WIDTH and wider the line
 * always fits this way; narrower (which the renderers refuse), the line's start is cut instead.
 * Steps from the fold's size on leave a number out: the text renderers then lay the whole screen out again
 * without sizes, so that the sizes on screen always add up (see `screenLines`).
 */
export function layoutLine(p: LineParts, options: LayoutOptions = {}): string {
  return laidOutLine(p, options).text;
}

/** `layoutLine`'s line, and whether it gave up a size to fit (see `LaidOutLine`). */
export function laidOutLine(p: LineParts, options: LayoutOptions = {}): LaidOutLine {
  return layOut(p, options, false)!;
}

/**
 * The line with every number its parts hold (the compact ones at least), or null when it cannot be:
 * `layoutLine`'s steps up to 4 (compact numbers), then a diff's fold with its changes in one count
 * (`386 changed`), its names cut down to 4 columns again, then a deep line's indentation shrunk (step
 * 6), nothing else. A screen whose line would lose a size tries
 * this before the line leaves its sizes out (see `screenLines`).
 */
export function laidOutWhole(p: LineParts, options: LayoutOptions = {}): LaidOutLine | null {
  return layOut(p, options, true);
}

/** `laidOutLine`, or with `keepAll` only the steps that keep every number (null when none fits). */
function layOut(p: LineParts, options: LayoutOptions, keepAll: boolean): LaidOutLine | null {
  const { width } = options;
  const pal = options.palette ?? noColour;
  const label = p.labels.join(CHAIN_JOIN);
  const style = p.role === "focus" ? pal.focus : p.role === "path" ? pal.path : (s: string) => s;
  const tagStyle = p.tagKind ? pal.change[p.tagKind] : (s: string) => s;
  const line = (
    indent: string,
    text: string,
    tag: string,
    numbers: string,
    fold: string,
    styled: boolean,
  ) => {
    const s = styled ? style : (x: string) => x;
    const q = styled ? pal.quiet : (x: string) => x;
    let head: string;
    if (!tag) head = s(`${p.mark} ${text}`);
    else {
      const [before, last] = splitLast(text, p.labels);
      head = `${s(p.mark)} ${before ? s(before) : ""}${styled ? tagStyle(tag) : tag} ${s(last)}`;
    }
    return `${indent}${head}${numbers ? `  ${q(numbers)}` : ""}${fold ? `  ${q(fold)}` : ""}`;
  };
  const indent = "  ".repeat(p.level);
  if (width === undefined)
    return { text: line(indent, label, p.tag, p.numbers, p.fold, true), ...NOTHING_CUT };
  const least = indent.length <= `${p.level} `.length ? indent : `${p.level} `;
  const kindTag = p.tagKind ? `[${p.tagKind}]` : "";
  const gone = p.countNumbers ? NUMBERS_GONE : "";
  const foldBare = p.foldBare ?? p.foldTiny;
  const compactFoldCounts = p.compactFoldCounts ?? p.compactFold;
  const sign = p.fold && !p.foldOnlyReferences ? FOLD_SIGN : "";
  const short = shortIndent(p.level, width);
  // The fold in fewer words, every number kept: `(41 hidden)`, with a size `(41 hidden, 2.0 MiB)`.
  const foldWords = p.foldShort === p.foldCounts ? p.foldTiny : (p.foldSized ?? p.foldCounts);
  // [indentation, tag, fewest label columns (0: whole), numbers, fold]; from FIRST_CUT on a step may
  // leave a number out.
  const compactWords = p.foldShort === p.foldCounts ? p.foldTiny : (p.compactFoldSized ?? compactFoldCounts);
  // The tag's kind and size change: what stays of it beside a name that is cut.
  const fewTag = p.leastTag ?? kindTag;
  // Tags that `tagWithin` gave with a text cut (`…`), which the key must say.
  const cutTags = new Set<string>();
  // The room a tag has beside the whole names, `numbers` and `fold` (the tag and a space after it);
  // the indentation, spaces only, counted by its length (a deep line's is long).
  const roomBeside = (numbers: string, fold: string) =>
    width - indent.length - displayWidth(line("", label, "", numbers, fold, false)) - 1;
  const roomy = once(() => {
    const within = p.tagWithin?.(roomBeside(p.numbers, foldWords)) ?? null;
    if (within === null) return p.shortTag;
    if (within.cut) cutTags.add(within.tag);
    return within.tag;
  });
  // The tag's forms beside the whole names and `numbers` and `fold`, the widest first (see `wholeNameLine`).
  const tagsBeside = (numbers: string, fold: string): string[] => {
    const within = p.tagWithin?.(roomBeside(numbers, fold)) ?? null;
    if (within?.cut) cutTags.add(within.tag);
    return [...new Set([p.tag, ...(within === null ? [] : [within.tag]), p.shortTag, fewTag])];
  };
  const steps: Step[] = [
    [indent, p.tag, 0, p.numbers, p.fold],
    [indent, p.tag, 0, p.numbers, p.foldCounts],
    [indent, p.tag, 0, p.numbers, foldWords],
    [indent, roomy, 0, p.numbers, foldWords],
    [indent, p.shortTag, 0, p.numbers, foldWords],
    [indent, fewTag, 0, p.numbers, foldWords],
    [indent, fewTag, MIN_LABEL, p.numbers, foldWords],
    [indent, fewTag, FEW_LABEL, p.numbers, foldWords],
    [indent, fewTag, MIN_LABEL, p.compactNumbers, compactWords],
    [indent, fewTag, MIN_LABEL, p.compactNumbers, p.foldShort],
    [indent, fewTag, MIN_LABEL, p.countNumbers, p.foldShort],
    [indent, fewTag, MIN_LABEL, p.countNumbers, p.foldTiny],
    [short, fewTag, MIN_LABEL, p.countNumbers, p.foldTiny],
    [short, fewTag, FEW_LABEL, p.countNumbers, p.foldTiny],
    [short, kindTag, FEW_LABEL, p.countNumbers, p.foldTiny],
    [short, kindTag, FEW_LABEL, p.countNumbers, foldBare],
    [least, kindTag, FEW_LABEL, p.countNumbers, foldBare],
    [short, kindTag, SOME_LABEL, p.countNumbers, foldBare],
    [least, kindTag, SOME_LABEL, p.countNumbers, foldBare],
    // The fold's count before the line's, and before a name goes under two characters: the line's
    // count is in the sum of the line above too, and the fold's is then the line's less its names
    // and the lines below.
    [least, kindTag, SOME_LABEL, p.countNumbers, sign],
    [least, kindTag, LEAST_LABEL, p.countNumbers, sign],
    [least, kindTag, 1, p.countNumbers, sign],
    [least, kindTag, LEAST_LABEL, gone, sign],
    [least, kindTag, ANY_CUT, gone, sign],
    [least, kindTag, ANY_CUT, "", sign],
  ];
  // Every number kept: the steps before any gives way, then a deep line's indentation and its names.
  // A diff's fold counts its changes in one number first (`386 changed`): no sum needs their kinds.
  const changed = p.compactFoldChanged ?? compactWords;
  const kept: typeof steps = [
    ...steps.slice(0, FIRST_CUT),
    [indent, fewTag, MIN_LABEL, p.compactNumbers, changed],
    [indent, fewTag, FEW_LABEL, p.compactNumbers, changed],
    [short, fewTag, MIN_LABEL, p.compactNumbers, changed],
    [short, fewTag, FEW_LABEL, p.compactNumbers, changed],
  ];
  // Last, a line with none below it: its fold's count alone, the fold's size in the line's.
  // A tag's own size change then may go too (`[resized]`): no sum on the line needs it.
  for (const all of [p.foldAllBelow, p.foldAllBelowBare])
    for (const tag of [fewTag, kindTag])
      if (all !== undefined)
        kept.push(
          [indent, tag, MIN_LABEL, p.compactNumbers, all],
          [indent, tag, FEW_LABEL, p.compactNumbers, all],
          [short, tag, FEW_LABEL, p.compactNumbers, all],
        );
  // Steps that differ only in how far they cut the names leave the names the same room: measured once.
  const rooms = new Map<string, number>();
  for (const [k, [ind, tagOf, fewest, numbers, fold]] of withoutCount(p, keepAll ? kept : steps, sign)) {
    const tag = typeof tagOf === "string" ? tagOf : tagOf();
    const at = `${ind.length}\u0000${tag}\u0000${numbers}\u0000${fold}`;
    let room = rooms.get(at);
    if (room === undefined) {
      room = width - displayWidth(line(ind, "", tag, numbers, fold, false));
      rooms.set(at, room);
    }
    const whole = displayWidth(label) <= room;
    if (!whole && (fewest === 0 || room < floorOf(p.labels, fewest))) continue;
    // A chain keeps its joins while the line keeps a count: its names are counted in it.
    if (!whole && p.labels.length > 1 && fewest !== ANY_CUT && cutChain(p.labels, room, fewest) === null)
      continue;
    // Before the first step that cuts a name: the names whole where only numbers the line says twice
    // give way (see `wholeNameLine`).
    const keepsName = whole
      ? null
      : wholeNameLine(p, width, tagsBeside, (tag, numbers, all) =>
          line(indent, label, tag, numbers, all, false),
        );
    if (keepsName !== null)
      return {
        text: line(indent, label, keepsName.tag, keepsName.numbers, keepsName.fold, true),
        ...NOTHING_CUT,
        countInFold: keepsName.numbers === "",
        // A tag's old path or value cut is cut as a name is (`…` marks where).
        nameCut: cutTags.has(keepsName.tag),
        ...(cutTags.has(keepsName.tag) ? { valueCut: true } : {}),
      };
    const names = whole
      ? { text: label, elided: false, shortened: false }
      : cutNames(p.labels, room, p.distinct, fewest);
    const text = names.text;
    // From step 5 on, less than the compact numbers and fold is a number (or a change's kind) left out.
    const numbersCut =
      !keepAll &&
      k >= FIRST_CUT &&
      (numbers !== p.compactNumbers ||
        (fold !== compactFoldCounts && fold !== foldWords && fold !== compactWords));
    return {
      text: line(ind, text, tag, numbers, fold, true),
      numbersCut,
      countCut: p.countNumbers !== "" && (numbers === gone || (numbers === "" && fold === FOLD_SIGN)),
      ownNumbersCut: numbers !== p.numbers && numbers !== p.compactNumbers,
      foldCut: fold === FOLD_SIGN,
      countInFold: p.countNumbers !== "" && numbers === "" && fold !== FOLD_SIGN,
      // A tag's old path or value cut is cut as a name is (`…` marks where).
      nameCut: names.shortened || cutTags.has(tag),
      changesCut: (fold === foldBare || fold === FOLD_SIGN) && foldBare !== p.foldTiny,
      ...depthOf(ind, indent, p.level),
      ...(names.elided ? { namesLeftOut: true } : {}),
      ...(cutTags.has(tag) ? { valueCut: true } : {}),
    };
  }
  if (keepAll) return null;
  // Narrower than MIN_WIDTH (the renderers refuse such a width; a small screen may still ask for it):
  // the start of the line is cut, and the fold's sign stays at its end while the width holds it.
  const signed = p.fold ? `  ${FOLD_SIGN}` : "";
  const head = line(least, label, kindTag, "", "", false);
  const room = width - displayWidth(signed);
  const text =
    !signed || room < 3
      ? style(shortenEnd(`${head}${signed}`, width))
      : `${style(shortenEnd(head, room))}${pal.quiet(signed)}`;
  const foldCut = p.fold !== "";
  return {
    text,
    numbersCut: true,
    countCut: p.countNumbers !== "",
    ownNumbersCut: true,
    foldCut,
    countInFold: false,
    nameCut: true,
    changesCut: foldCut && foldBare !== p.foldTiny,
    ...depthOf(least, indent, p.level),
  };
}

/**
 * The tag, numbers and fold of a line whose names stay whole where only numbers the line says twice
 * give way: for a line with none below it (`LineParts.foldAllBelow`), the fold's size (the line's
 * less its own); then, where the line's numbers are its count alone and that count is 1 + the fold's
 * (`LineParts.countInFold`), the count. Null when neither applies or the names do not fit so either.
 */
function wholeNameLine(
  p: LineParts,
  width: number,
  tagsBeside: (numbers: string, fold: string) => string[],
  lineOf: (tag: string, numbers: string, fold: string) => string,
): { tag: string; numbers: string; fold: string } | null {
  const tries: [string, string][] = [];
  if (p.foldAllBelow !== undefined) tries.push([p.numbers, p.foldAllBelow]);
  if (p.countInFold && p.countNumbers !== "" && p.numbers === p.countNumbers)
    tries.push(["", p.foldAllBelow ?? p.foldTiny]);
  for (const [numbers, fold] of tries)
    for (const tag of tagsBeside(numbers, fold))
      if (displayWidth(lineOf(tag, numbers, fold)) <= width) return { tag, numbers, fold };
  return null;
}

/** A step of `laidOutLine`: [indentation, tag, fewest label columns (0: whole), numbers, fold]. */
type Step = [string, string | (() => string), number, string, string];

/**
 * `make`, called the first time it is asked for and remembered: a tag cut to the line's room is worked
 * out only for a line that gets that far (most lines fit at the first steps).
 */
function once(make: () => string): () => string {
  let made: string | undefined;
  return () => {
    made ??= make();
    return made;
  };
}

/**
 * `steps` with their places in the list (a step from FIRST_CUT on may leave a number out), and for a
 * line whose count is 1 + its fold's (see `LineParts.countInFold`), from FIRST_CUT on, each step
 * that would cut the name while its numbers are the count alone tried first without the count, its
 * fold keeping its own (`(hidden)` gives way to `(41 hidden)`): the name then keeps more columns,
 * and no number is lost. The step still comes first where it keeps the name whole.
 */
function withoutCount(p: LineParts, steps: readonly Step[], sign: string): [number, Step][] {
  const out: [number, Step][] = [];
  const bare = p.foldBare ?? p.foldTiny;
  const twinned = p.countInFold && p.countNumbers !== "";
  steps.forEach((step, k) => {
    const [ind, tag, fewest, numbers, fold] = step;
    const counted = numbers === p.countNumbers || numbers === NUMBERS_GONE || numbers === "";
    if (twinned && k >= FIRST_CUT && fewest !== 0 && counted) {
      out.push([k, [ind, tag, 0, numbers, fold]]);
      out.push([k, [ind, tag, fewest, "", fold === sign ? bare : fold]]);
    }
    out.push([k, step]);
  });
  return out;
}

/**
 * The fewest columns labels keep when cut to `fewest` columns a name (a name narrower stays whole;
 * a chain's joins count too): the floor a step of `laidOutLine` keeps them above.
 */
function floorOf(labels: readonly string[], fewest: number): number {
  if (fewest === ANY_CUT) return Math.min(1, displayWidth(labels.join(CHAIN_JOIN)));
  const names = labels.reduce((sum, l) => sum + Math.min(displayWidth(l), fewest), 0);
  const every = names + CHAIN_JOIN.length * (labels.length - 1);
  if (labels.length < 3 || fewest > FEW_LABEL) return every;
  // Or its first and last names around how many are left out (see `cutChain`).
  const ends = [labels[0], labels[labels.length - 1]].reduce(
    (sum, l) => sum + Math.max(1, Math.min(displayWidth(l), fewest)),
    0,
  );
  return Math.min(every, ends + 2 * CHAIN_JOIN.length + displayWidth(moreNames(labels.length - 2)));
}

/**
 * What stands in a chain for the names left out of its middle (`(116 more)`): each is a node of the
 * line's count, so the count can still be checked against the names.
 */
export function moreNames(k: number): string {
  return `(${formatCount(k)} more)`;
}

/**
 * Labels cut to `room` columns: one name at its end (its start is what a reader recognises), unless
 * that would cut away where it differs from its siblings (`distinct`): then that part stays too
 * (`ledger…x64-musl` beside `ledger…linux-x64`). A chain keeps every ` / `, so its names can still be
 * counted (each is a node of the line's count): the longest names are cut at their ends first, to
 * one width (`invent… / wareho…`), each keeping `fewest` columns; a long chain then leaves names out
 * of its middle, `(k more)` standing for them (see `cutChain`); only a chain too long for even that
 * is cut in its middle.
 */
export function cutLabels(labels: string[], room: number, distinct?: readonly number[], fewest = 1): string {
  return cutNames(labels, room, distinct, fewest).text;
}

/** `cutLabels`, and whether a chain left names out of its middle (`(k more)`). */
function cutNames(
  labels: string[],
  room: number,
  distinct: readonly number[] | undefined,
  fewest: number,
): CutChain {
  const text = labels.join(CHAIN_JOIN);
  if (labels.length > 1)
    return (
      cutChain(labels, room, fewest) ??
      cutChain(labels, room, 1) ?? { text: shortenMiddle(text, room), elided: false, shortened: true }
    );
  const cut =
    distinct === undefined || startsPseudonymous(text)
      ? cutName(text, room)
      : shortenKeeping(text, room, distinct);
  return { text: cut, elided: false, shortened: cut !== text };
}

/**
 * A chain within `room`: every name cut at its end to one width (see `cutEach`) while each keeps
 * `fewest` columns (or all of its own); else, from {@link FEW_LABEL} columns down and three names or
 * more, its first and last names and as many more from both ends as fit at `fewest` columns, around
 * `(k more)`, the k names left out of its middle, so the names on the line can still be counted;
 * null when neither fits.
 */
function cutChain(labels: readonly string[], room: number, fewest: number): CutChain | null {
  const every = cutEach(labels, room, fewest);
  if (every !== null)
    return {
      text: every.join(CHAIN_JOIN),
      elided: false,
      shortened: every.some((name, k) => name !== labels[k]),
    };
  const n = labels.length;
  if (n < 3 || fewest > FEW_LABEL) return null;
  // Names from both ends, the top first, while they fit at `fewest` columns with the marker.
  const least = (k: number) => Math.max(1, Math.min(displayWidth(labels[k]), fewest)) + CHAIN_JOIN.length;
  let head = 1;
  let tail = 1;
  let used = least(0) + least(n - 1);
  while (head + tail < n - 1) {
    const next = head <= tail ? head : n - 1 - tail;
    const more = used + least(next) + displayWidth(moreNames(n - head - tail - 1));
    if (more > room) break;
    used += least(next);
    if (next === head) head++;
    else tail++;
  }
  const more = moreNames(n - head - tail);
  const ends = [...labels.slice(0, head), ...labels.slice(n - tail)];
  const cut = cutEach(ends, room - CHAIN_JOIN.length - displayWidth(more), fewest);
  if (cut === null) return null;
  const text = [...cut.slice(0, head), more, ...cut.slice(head)].join(CHAIN_JOIN);
  return { text, elided: true, shortened: cut.some((name, k) => name !== ends[k]) };
}

/** A chain as `cutChain` cut it, and whether names were left out of its middle (`(k more)`). */
interface CutChain {
  text: string;
  elided: boolean;
  /** Whether a name was cut at its end (`…`). */
  shortened: boolean;
}

/**
 * A chain's names cut at their ends to the widest width `cap` that fits `room` with the joins
 * (names narrower than `cap` stay whole; a name cut to one column is `…` alone), or null when that
 * width would be under `fewest` for a name wider than it.
 */
function cutEach(labels: readonly string[], room: number, fewest: number): string[] | null {
  const names = room - CHAIN_JOIN.length * (labels.length - 1);
  if (names < labels.length) return null;
  const widths = labels.map(displayWidth);
  let cap = Math.max(...widths);
  const used = (c: number) => widths.reduce((sum, w) => sum + Math.min(w, c), 0);
  while (cap > 1 && used(cap) > names) cap--;
  if (used(cap) > names || cap < Math.min(fewest, Math.max(...widths))) return null;
  // A wide character the cut could not split leaves columns over: the next cut names take them.
  let spare = names - used(cap);
  const cut = labels.map((l, k) => {
    if (widths[k] <= cap) return l;
    const own = cap + spare;
    const short = cutName(l, own);
    spare = own - displayWidth(short);
    return short;
  });
  return cut;
}

/**
 * A name cut at its end to `width` columns; a pseudonym (`anon-3d86f5f1e9ff`, --pseudonymize) gives
 * up its `anon-` first, which every pseudonym shares, for the hex digits that tell it apart:
 * `…3d86f…`, not `anon-3…`.
 */
function cutName(name: string, width: number): string {
  if (width < 3 || displayWidth(name) <= width || !startsPseudonymous(name)) return shortenEnd(name, width);
  return `${ELLIPSIS}${shortenEnd(name.slice(PSEUDONYM_PREFIX.length), width - 1)}`;
}

/**
 * The indentation of a line too deep for `width`: at most a third of the width, with the level in
 * digits at its end (`12 `), so the nesting can still be read.
 */
function shortIndent(level: number, width: number): string {
  const full = "  ".repeat(level);
  const most = Math.floor(width / 3);
  if (full.length <= most) return full;
  const digits = `${level} `;
  return digits.length >= most ? digits : " ".repeat(most - digits.length) + digits;
}

/**
 * A chain's text split before its last name: the part up to and including the last join, and the
 * rest. A text cut in the middle keeps its end, so the split still finds the last join when one
 * survived; otherwise all of it counts as the last name.
 */
function splitLast(text: string, labels: string[]): [string, string] {
  if (labels.length < 2) return ["", text];
  const at = text.lastIndexOf(CHAIN_JOIN);
  return at < 0 ? ["", text] : [text.slice(0, at + CHAIN_JOIN.length), text.slice(at + CHAIN_JOIN.length)];
}
