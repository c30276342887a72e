import { safeText } from "../model/safe-text.js";
import { displayWidth, shortenEnd } from "./display-width.js";
import type { HeaderOptions } from "./header.js";
import type { LineParts } from "./line-layout.js";
import { MARK } from "./marks.js";

/**
 * Fewest lines a budget must have for the key line to be printed by default: below it, the screen is
 * kept for the tree (the key would take a sixth of the lines or more). A choice of this project, no source.
 */
export const KEY_MIN_BUDGET = 6;

/** What the lines under the key show, so that the key explains those and nothing else. */
export interface KeyFacts {
  /** The marks at the start of the printed lines. */
  readonly marks: ReadonlySet<string>;
  /** Whether a line holds a chain of only children (`a / b`). */
  readonly chains: boolean;
  /** Whether the lines print sizes (the input has them); default true. */
  readonly sizes?: boolean;
  /** What the size measures, as the input calls it (`cost`); default `size`. */
  readonly sizeName?: string;
  /** Whether a printed path writes a `/` or `~` inside a name as `~1` or `~0` (JSON Pointer). */
  readonly pathEscapes?: boolean;
}

/** What the rest of the screen says that the key speaks of: the sizes, their name, the foci's paths. */
export interface KeyContext {
  /** Whether the lines print sizes (the input has them); default true. */
  readonly sizes?: boolean;
  /** What the size measures, as the input calls it (`cost`); default `size`. */
  readonly sizeName?: string;
  /** The foci's paths as the header prints them. */
  readonly foci?: readonly string[];
}

/** The facts a key needs, read off the lines it stands above and the header. */
export function keyFacts(lines: readonly LineParts[], context: KeyContext = {}): KeyFacts {
  // A printed path (a reference's full entry, a focus in the header) writes a / inside a name as ~1
  // (RFC 6901, section 3).
  const escaped = (text: string) => /~[01]/.test(text);
  return {
    marks: new Set(lines.map((l) => l.mark)),
    chains: lines.some((l) => l.labels.length > 1),
    sizes: context.sizes ?? true,
    ...(context.sizeName === undefined ? {} : { sizeName: context.sizeName }),
    pathEscapes:
      lines.some((l) => l.mark === MARK.reference && escaped(l.numbers)) ||
      (context.foci ?? []).some(escaped),
  };
}

/**
 * One line under the header that says what the marks on the screen and its numbers mean, so a reader
 * without the docs can read the screen: printed by default (not with `--bare`, `--legend` or
 * `--no-key`, nor for a budget under {@link KEY_MIN_BUDGET}); the budget counts it. Always one line:
 * within `width` it says less (shorter words for the numbers, then no chain and no pointer to
 * `--legend`, then only the marks, then the marks in a word or two each, cut at the end), never
 * wraps, so it can be counted before the fit.
 */
export function keyLine(
  kind: "summary" | "diff",
  facts: KeyFacts,
  width?: number,
  style: "text" | "markdown" = "text",
): string {
  const marks = markWords(kind, facts.marks, style);
  const compact = style === "markdown" ? marks : markWords(kind, facts.marks, style, true);
  const sizes = facts.sizes ?? true;
  // The size's name comes from the options or a config file: made safe and short as the header does.
  const size = `a ${facts.sizeName === undefined ? "size" : safeText(facts.sizeName, 40)}`;
  const numbers =
    kind === "diff"
      ? `N nodes: the node with all below it (removed ones too)${sizes ? `; ${size}: NEW's, with all below; net: its change` : ""}`
      : `N nodes${sizes ? ` and ${size}` : ""}: the node with all below it`;
  const short = `${sizes ? "totals" : "counts"} include all below`;
  const chain = [
    ...(facts.chains ? ["a / b: b is a's only child"] : []),
    ...(facts.pathEscapes ? ["in a path ~1 is a / inside a name, ~0 a ~"] : []),
  ];
  const more = "--legend explains more";
  const tries = [
    [marks, numbers, ...chain, more],
    [marks, short, ...chain, more],
    [marks, short, more],
    [marks, short],
    [marks],
    // A narrow terminal: each mark in a word or two, so all of them fit before any is cut.
    [compact, short],
    [compact],
  ];
  for (const parts of tries) {
    const text = `key: ${parts.filter((part) => part !== "").join("; ")}`;
    if (width === undefined || displayWidth(text) <= width) return text;
  }
  return shortenEnd(`key: ${compact}`, width!);
}

/**
 * The marks present, each with its meaning, in a fixed order; `compact`: in a word or two each, for a
 * narrow line. Markdown shows them otherwise (see `markdownLine`), and never narrow: a focus says
 * "(focus)" and is bold, a line on the way to one is bold.
 */
function markWords(
  kind: "summary" | "diff",
  marks: ReadonlySet<string>,
  style: "text" | "markdown",
  compact = false,
): string {
  const md = style === "markdown";
  const diff = kind === "diff";
  const words: string[] = [];
  // A mark is quoted: after "key:" a bare `:` would read as punctuation.
  const say = (mark: string, meaning: string) => words.push(`'${mark}' ${meaning}`);
  if (marks.has(MARK.focus) && !md) say(MARK.focus, compact ? "focus" : "a focus");
  if (marks.has(MARK.path)) {
    const meaning = compact
      ? diff
        ? "change or above one"
        : "above a focus"
      : pathWords(kind, marks.has(MARK.focus));
    if (md) words.push(`bold = ${meaning}`);
    else say(MARK.path, meaning);
  }
  // In a diff a line marked `.` holds no change, in it or below it (a change marks every node above it).
  if (marks.has(MARK.other) && (diff || !md)) {
    const meaning = diff
      ? compact
        ? "unchanged"
        : "nothing changed in it"
      : marks.size === 1
        ? "a node"
        : "other";
    if (md) words.push(`not bold = ${meaning}`);
    else say(MARK.other, meaning);
  }
  if (marks.has(MARK.reference)) say(MARK.reference, compact ? "elsewhere" : "shown in full elsewhere");
  return words.join(", ");
}

function pathWords(kind: "summary" | "diff", focus: boolean): string {
  if (kind === "summary") return "on the way to a focus";
  return focus ? "a change, or on the way to a change or a focus" : "a change or on the way to one";
}

/** The key's context from a rendering's options: its sizes, and the header's size name and foci. */
export function keyContext(options: { sizes?: boolean; header?: HeaderOptions }): KeyContext {
  return {
    ...(options.sizes === undefined ? {} : { sizes: options.sizes }),
    ...(options.header?.sizeName === undefined ? {} : { sizeName: options.header.sizeName }),
    ...(options.header ? { foci: options.header.foci } : {}),
  };
}
