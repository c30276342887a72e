import { type ChangeCounts, changeKinds } from "../diff/changes.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import { safeText, shownLabel } from "../model/safe-text.js";
import { amount, formatCount, type NumberOptions } from "./amount.js";
import { displayWidth, shortenMiddle } from "./display-width.js";
import { cutEditValues, editValues } from "./edit-values.js";
import { formatSize } from "./format-size.js";
import type { LineGroup } from "./line-groups.js";
import type { LineParts } from "./line-layout.js";
import {
  EMPTY_WORDS,
  foldAmount,
  foldWords,
  hiddenCount,
  hiddenSized,
  hiddenTiny,
  lineParts,
} from "./line-parts.js";
import { referenceText } from "./reference-text.js";

/** Columns an old parent's path or old name keeps in a tag on a narrow line. */
const SHORT_FROM = 8;

/**
 * What the line of `group` says in a diff: the summary's parts (see `lineParts`) plus the change tag
 * of the chain's last node (laid out right before its name), the net size change of the line's top
 * node after its numbers,
 * and what the fold holds: `(hidden: 9 children, 412 nodes, 3.0 MiB; 2 added, net +1.0 KiB)` or
 * `…; none changed)`. A removed node holds no size now, so its numbers show only its count.
 */
export function diffLineParts(group: LineGroup<DiffViewNode>, options: NumberOptions): LineParts {
  const parts = lineParts(group, options);
  const last = group.nodes[group.nodes.length - 1];
  // The numbers are the line's top node's, as in a summary (see `lineParts`); a removed top (then the
  // whole line is removed) holds no size now.
  const top = group.nodes[0];
  const removed = top.change === "removed";
  const say = (o: NumberOptions, summary: string) => {
    if (last.reference) return referenceText(last.reference);
    const numbers = [removed ? amount(top.nodes, 0, { ...o, sizes: false }) : summary];
    if (removed && last.empty) numbers.push(EMPTY_WORDS);
    if (o.sizes && top.nodes > 1 && top.net !== 0) numbers.push(`net ${signed(top.net, o)}`);
    return numbers.filter((s) => s !== "").join(", ");
  };
  const hidden = last.hidden;
  const inside = hidden ? changeSummary(hidden.changes, hidden.delta, options) : "";
  const changed = hidden ? changeKinds.reduce((n, k) => n + hidden.changes[k], 0) : 0;
  const bare = hidden ? `(${hiddenTiny(hidden)})` : "";
  const allChanged =
    hidden !== null && (last.change === "added" || last.change === "removed") && changed === hidden.nodes;
  const few = changed === 0 ? "none changed" : `${formatCount(changed)} changed`;
  // A fold of removed nodes only (below a removed node, every one) holds no size now: as on a removed
  // node's line, it says only its count, and its net change after the `;`.
  const gone = hidden !== null && hidden.size === 0 && hidden.changes.removed === hidden.nodes;
  const sized = (o: NumberOptions) => (gone ? { ...o, sizes: false } : o);
  const amountOf = (o: NumberOptions) => foldAmount(group, last, sized(o));
  const sizedOf = (o: NumberOptions) => hiddenSized(group, last, sized(o));
  const fold = (o: NumberOptions) => (hidden ? `(${foldWords(last)}, ${amountOf(o)}; ${inside})` : "");
  // The changes in one count, and the net change the sums need: `386 changed, net +1.0 MiB`.
  const changedIn = (o: NumberOptions) =>
    o.sizes && hidden !== null && hidden.delta !== 0
      ? `${few}, net ${signed(hidden.delta, { ...o, compact: true })}`
      : few;
  return {
    ...parts,
    ...tagParts(last, options, group.root.name),
    tagKind: last.change,
    numbers: say(options, parts.numbers),
    compactNumbers: say({ ...options, compact: true, countsExact: true }, parts.compactNumbers),
    fold: fold(options),
    foldCounts: hidden ? `(hidden: ${amountOf(options)}; ${inside})` : "",
    compactFold: fold({ ...options, compact: true, countsExact: true }),
    compactFoldCounts: hidden
      ? `(hidden: ${amountOf({ ...options, compact: true, countsExact: true })}; ${inside})`
      : "",
    ...(hidden && changeKinds.filter((k) => hidden.changes[k] > 0).length > 1
      ? {
          compactFoldChanged: `(${sizedOf({ ...options, compact: true, countsExact: true })}; ${changedIn(options)})`,
        }
      : {}),
    // In fewest words, every number kept: `(41 hidden, 2.0 MiB; 2 added, net +1.0 KiB)`.
    ...(hidden && sized(options).sizes
      ? {
          foldSized: `(${sizedOf(options)}; ${inside})`,
          compactFoldSized: `(${sizedOf({ ...options, compact: true, countsExact: true })}; ${inside})`,
        }
      : { foldSized: undefined, compactFoldSized: undefined }),
    // All below the line folded: the fold's size and net are the line's less its own (a fold of
    // removed nodes only, which says no size, too: its net is the line's less the tag's); without
    // sizes, the fold's count and how many changed say all the sums need.
    ...(hidden && last.children.length === 0
      ? {
          foldAllBelow: allChanged ? bare : `(${bare.slice(1, -1)}, ${formatCount(changed)} changed)`,
          foldAllBelowBare: allChanged ? undefined : bare,
        }
      : { foldAllBelow: undefined, foldAllBelowBare: undefined }),
    foldShort: hidden ? `(hidden: ${hiddenCount(hidden.nodes, options, hidden)}; ${few})` : "",
    // Below an added (removed) node every node is added (removed, or moved away): its count says all.
    foldTiny: !hidden ? "" : allChanged ? bare : `(${bare.slice(1, -1)}, ${formatCount(changed)} changed)`,
    foldBare: bare,
  };
}

/**
 * A line's change tag for its last node, in full, with its old paths and values cut to a few
 * columns, and cut to any columns (see `LineParts.tagAt`).
 */
export function tagParts(
  node: DiffViewNode,
  options: NumberOptions,
  rootName?: string,
): Pick<LineParts, "tag" | "shortTag" | "tagAt" | "tagCutWidths"> {
  return {
    tag: changeTag(node, options, undefined, rootName),
    shortTag: changeTag(node, options, SHORT_FROM, rootName),
    ...(node.change !== null
      ? {
          tagAt: (columns: number) => changeTag(node, options, Math.max(1, columns), rootName),
          tagCutWidths: cutTexts(node, rootName).map(displayWidth),
        }
      : {}),
  };
}

/** The texts of a tag that `changeTag` cuts to `fromWidth`: the old path, the old name, each value. */
function cutTexts(node: DiffViewNode, rootName?: string): string[] {
  const texts: string[] = [];
  if (node.movedFrom !== null) texts.push(oldParent(node.movedFrom, rootName));
  if (node.renamedFrom !== null) texts.push(shownLabel(node.renamedFrom));
  for (const edit of node.edits) texts.push(...editValues(edit.old, edit.new).map(editValue));
  return texts;
}

/**
 * A moved node's old parent as its tag says it; the root (an empty path) named, since "from the
 * root" read as "was a top node" (field test: an org chart's report moved from directly under the
 * company).
 */
function oldParent(movedFrom: string, rootName?: string): string {
  if (movedFrom !== "") return safeText(movedFrom);
  return rootName !== undefined ? `${shownLabel(rootName)} (the root)` : "the root";
}

/**
 * `[added]`, `[removed]`, `[moved from OLD/PARENT]`, `[renamed from OLD]`, `[edited FIELD OLD -> NEW]`,
 * `[resized]`, with the node's field edits (`--compare-field`), its old name when a moved node has a new
 * one (`[moved from A, renamed from b]`) and its own size change signed (`[resized +12 B]`,
 * `[moved from A, version 1.2.0 -> 1.3.0, +2 B]`); the old path or name cut to `fromWidth` columns
 * in their middle, each value to as many keeping where it changed (see `cutEditValues`). An empty
 * (absent) value reads `(none)`.
 */
export function changeTag(
  node: DiffViewNode,
  options: NumberOptions,
  fromWidth?: number,
  rootName?: string,
): string {
  if (node.change === null) return "";
  const cut = (text: string) => (fromWidth === undefined ? text : shortenMiddle(text, fromWidth));
  const parts: string[] = [node.change];
  if (node.movedFrom !== null) parts[0] += ` from ${cut(oldParent(node.movedFrom, rootName))}`;
  if (node.renamedFrom !== null) {
    const from = `from ${cut(shownLabel(node.renamedFrom))}`;
    if (node.change === "renamed") parts[0] += ` ${from}`;
    else parts.push(`renamed ${from}`);
  }
  node.edits.forEach((edit, k) => {
    const [old, now] = editValues(edit.old, edit.new).map(editValue);
    const [a, b] = fromWidth === undefined ? [old, now] : cutEditValues(old, now, fromWidth);
    const text = `${safeText(edit.field)} ${a} -> ${b}`;
    if (k === 0 && node.change === "edited") parts[0] += ` ${text}`;
    else parts.push(text);
  });
  if (options.sizes && node.delta !== 0) parts.push(signed(node.delta, options));
  const notes = node.movedFrom !== null || node.renamedFrom !== null || node.edits.length > 0;
  return `[${parts.join(notes ? ", " : " ")}]`;
}

/** A compared field's value on a line: `(none)` when the node has none. */
function editValue(value: string): string {
  return value === "" ? "(none)" : shownLabel(value);
}

/** `2 added, 1 resized, net +1.0 KiB`, or `none changed`. */
export function changeSummary(changes: ChangeCounts, delta: number, options: NumberOptions): string {
  const parts = changeKinds.filter((k) => changes[k] > 0).map((k) => `${formatCount(changes[k])} ${k}`);
  if (options.sizes && delta !== 0) parts.push(`net ${signed(delta, options)}`);
  return parts.length > 0 ? parts.join(", ") : "none changed";
}

/** A size change with its sign: `+12 B`, `-3.0 KiB` (compact plain numbers: `+12.1k`). */
export function signed(value: number, options: NumberOptions): string {
  const text =
    options.compact && options.units === "plain"
      ? formatCount(Math.abs(value), true)
      : formatSize(Math.abs(value), options.units);
  return `${value < 0 ? "-" : "+"}${text}`;
}
