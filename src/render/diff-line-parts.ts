import { type ChangeCounts, changeKinds } from "../diff/changes.js";
import type { DiffViewNode } from "../diff/diff-view.js";
import { safeText, shownLabel } from "../model/safe-text.js";
import { amount, formatCount, type NumberOptions } from "./amount.js";
import { displayWidth, shortenMiddle } from "./display-width.js";
import { cutEditValues, editFloors, editValues } from "./edit-values.js";
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

/**
 * Fewest columns a tag cuts an old parent's path or an old name to (a value's fewest are its own, see
 * `editFloors`); a tag that cannot keep this much says fewer fields, then only how many (see
 * `tagWithin`). A choice of this project, no source.
 */
export const TAG_TEXT_FLOOR = 14;

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
 * A line's change tag for its last node: in full, in few words, its kind alone, and within any
 * columns (see `LineParts.tagWithin`).
 */
export function tagParts(
  node: DiffViewNode,
  options: NumberOptions,
  rootName?: string,
): Pick<LineParts, "tag" | "shortTag" | "leastTag" | "tagWithin"> {
  const tag = changeTag(node, options, undefined, rootName);
  const shortTag = briefTag(node, options);
  return {
    tag,
    shortTag,
    leastTag: leastTag(node, options),
    ...(node.change !== null && tag !== shortTag
      ? { tagWithin: (room: number) => tagWithin(node, options, rootName, room) }
      : {}),
  };
}

/**
 * The widest tag within `room` columns that says its old path, old name and values, each cut to no
 * fewer than its floor (or whole): {@link TAG_TEXT_FLOOR} columns for a path or name, where a value
 * changed and some text on each side of it for a value (see `editFloors`): every edited field, else the first ones and
 * `+2 more fields`; null when not even the first field fits so (see `LineParts.tagWithin`).
 */
function tagWithin(
  node: DiffViewNode,
  options: NumberOptions,
  rootName: string | undefined,
  room: number,
): { tag: string; cut: boolean } | null {
  const n = node.edits.length;
  const notes = (node.movedFrom !== null ? 1 : 0) + (node.renamedFrom !== null ? 1 : 0);
  const texts = cutTexts(node, rootName);
  const widths = texts.map(displayWidth);
  // Each text's fewest columns: an old path or name's, then each edit's two values'.
  const floors = widths.slice(0, notes).map((w) => Math.min(w, TAG_TEXT_FLOOR));
  for (let k = notes; k < texts.length; k += 2) floors.push(...editFloors(texts[k], texts[k + 1]));
  for (let fields = n; fields >= Math.min(n, 1); fields--) {
    const shown = widths.slice(0, notes + 2 * fields);
    const floor = Math.max(1, ...floors.slice(0, notes + 2 * fields));
    const at = (cap?: number) => changeTag(node, options, cap, rootName, fields);
    const fits = (tag: string) => displayWidth(tag) <= room;
    const whole = at();
    if (fits(whole)) return { tag: whole, cut: false };
    // The first guess: the widest cap whose cuts take off the columns the tag is over, every text
    // cut to the cap (one narrower stays whole); then a column at a time, to the widest that fits
    // (a cut may come out narrower than its cap: a wide character, where the text changed).
    const over = displayWidth(whole) - room;
    const taken = (cap: number) => shown.reduce((sum, w) => sum + Math.max(0, w - cap), 0);
    const widest = Math.max(0, ...shown);
    let cap = widest;
    while (cap > floor && taken(cap) < over) cap--;
    if (widest <= floor) continue;
    let tag = at(cap);
    if (fits(tag))
      for (let next = at(cap + 1); cap + 1 < widest && fits(next); next = at(++cap + 1)) tag = next;
    else while (cap > floor && !fits(tag)) tag = at(--cap);
    if (fits(tag)) return { tag, cut: true };
  }
  return null;
}

/**
 * A tag in few words, its old path, old name and values left out: its kind, that a moved node was
 * renamed too, how many fields were edited and its own size change (`[edited 3 fields]`,
 * `[moved, renamed, 2 fields edited, +12 B]`); the full tag where it says no more.
 */
export function briefTag(node: DiffViewNode, options: NumberOptions): string {
  if (node.change === null) return "";
  const parts: string[] = [node.change];
  if (node.renamedFrom !== null && node.change !== "renamed") parts.push("renamed");
  const n = node.edits.length;
  if (n > 0) {
    const fields = `${formatCount(n)} ${n === 1 ? "field" : "fields"}`;
    if (node.change === "edited") parts[0] += ` ${fields}`;
    else parts.push(`${fields} edited`);
  }
  const worded = parts.length > 1 || parts[0] !== node.change;
  if (options.sizes && node.delta !== 0) parts.push(signed(node.delta, options));
  return `[${parts.join(worded ? ", " : " ")}]`;
}

/** A tag's kind and its own size change (`[edited +12 B]`), which a line's net needs; `[edited]`. */
function leastTag(node: DiffViewNode, options: NumberOptions): string {
  if (node.change === null) return "";
  return options.sizes && node.delta !== 0
    ? `[${node.change} ${signed(node.delta, options)}]`
    : `[${node.change}]`;
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
 * (absent) value reads `(none)`. With `fields` fewer than the edits, only the first `fields` are
 * said, then how many more (`+2 more fields`).
 */
export function changeTag(
  node: DiffViewNode,
  options: NumberOptions,
  fromWidth?: number,
  rootName?: string,
  fields = node.edits.length,
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
  node.edits.slice(0, fields).forEach((edit, k) => {
    const [old, now] = editValues(edit.old, edit.new).map(editValue);
    const [a, b] = fromWidth === undefined ? [old, now] : cutEditValues(old, now, fromWidth);
    const text = `${safeText(edit.field)} ${a} -> ${b}`;
    if (k === 0 && node.change === "edited") parts[0] += ` ${text}`;
    else parts.push(text);
  });
  const more = node.edits.length - fields;
  if (more > 0) parts.push(`+${formatCount(more)} more ${more === 1 ? "field" : "fields"}`);
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
