import { EspalierError, type MessagePart, quoted, quotedList, say } from "../errors.js";
import { indexOfName } from "../model/names.js";
import type { PathIndex } from "../model/path-index.js";
import { printedNameOf, printedNames } from "../model/printed-names.js";
import { pseudonym } from "../model/pseudonym.js";
import { shownLabel } from "../model/safe-text.js";
import { escapeSegment, parseSegment, splitPath } from "../model/segment.js";
import { resolveComposedPath } from "./composed-path.js";
import { isGlob, matchGlob } from "./glob.js";
import { isPrintedChain, resolvePrintedChain } from "./printed-chain.js";
import { suggestFoci } from "./suggest.js";

/** The node an exact path names, or -1. Glob characters are taken literally here. */
export function resolvePath(index: PathIndex, spec: string): number {
  let node = 0;
  for (const raw of splitPath(spec)) {
    node = index.child(node, parseSegment(raw));
    if (node < 0) return -1;
  }
  return node;
}

/**
 * The node a path names as espalier prints it, or -1: each segment compared with its name's printed form
 * (`c\u{9}d` for a name holding a tab, see safeText), so that a path copied from the output reads back.
 * Printed forms are unambiguous: a name's own `\u{` prints as `\u{5c}u{`.
 */
export function resolvePrintedPath(index: PathIndex, spec: string): number {
  let node = 0;
  for (const raw of splitPath(spec)) {
    const seg = parseSegment(raw);
    // A name that prints as itself is found by name; one holding an escape is printed otherwise.
    const list = shownLabel(seg.name) === seg.name ? index.childrenByName(node).get(seg.name) : undefined;
    let next = list && seg.rank <= list.length ? list[seg.rank - 1] : -1;
    if (list === undefined) {
      for (const [name, named] of index.childrenByName(node)) {
        if (shownLabel(name) !== seg.name) continue;
        next = seg.rank <= named.length ? named[seg.rank - 1] : -1;
        break;
      }
    }
    if (next < 0) return -1;
    node = next;
  }
  return node;
}

/** Whether a spec holds a printed escape (`\u{..}`): it is then read as printed first. */
function holdsEscape(spec: string): boolean {
  return /\\u\{[0-9a-f]+\}/.test(spec);
}

/** The node a path of pseudonyms names (as printed with a pseudonym key), or -1. */
export function resolvePseudonymPath(index: PathIndex, spec: string, key: string): number {
  let node = 0;
  for (const raw of splitPath(spec)) {
    const seg = parseSegment(raw);
    let next = -1;
    for (const [name, list] of index.childrenByName(node)) {
      if (pseudonym(key, name) === seg.name) {
        next = seg.rank <= list.length ? list[seg.rank - 1] : -1;
        break;
      }
    }
    if (next < 0) return -1;
    node = next;
  }
  return node;
}

/** The shape of a printed pseudonym. */
const PSEUDONYM = /^anon-[0-9a-f]{12}$/;

/**
 * A focus written as a listing writes its paths, read as espalier's own path: `find DIR` prints every
 * path with DIR in front (`./services/ledger`, `fixtures/external`), and DIR is the tree's root, whose
 * path is "". A leading `./` (POSIX: the same place), or the root's own name and "/", is dropped; the
 * root's name alone (or ".") is the root. Undefined when neither applies. Callers try `spec` as it
 * stands first: a node that is really called "." or like the root wins.
 */
export function pathAsListed(index: PathIndex, spec: string): string | undefined {
  const root = escapeSegment(index.tree.name.get(0));
  // A diff of listings of one folder, one naming it: the path that list writes the folder at.
  const folder = index.tree.reading?.folderPath;
  if (spec === "." || (root !== "" && spec === root) || spec === folder) return "";
  const leads = [
    "./",
    ...(root !== "" && root !== "." ? [`${root}/`] : []),
    ...(folder ? [`${folder}/`] : []),
  ];
  for (const lead of leads) {
    if (spec.startsWith(lead) && spec.length > lead.length) return spec.slice(lead.length);
  }
  return undefined;
}

/**
 * Focus specs -> node indices (sorted, without repeats). Each spec is tried as an exact path, then as a
 * row id (where rows have ids; with a pseudonym key also as a printed pseudonymous id), then as a glob;
 * then, written as a listing writes paths (see {@link pathAsListed}), as a path or glob again. A spec
 * that matches nothing is FOCUS_NO_MATCH suggesting the closest existing paths (`details.suggestions`).
 */
export function resolveFoci(index: PathIndex, specs: readonly string[], pseudonymKey?: string): Int32Array {
  const found = new Set<number>();
  for (const [k, spec] of specs.entries()) {
    const listed = pathAsListed(index, spec);
    const matches =
      matchSpec(index, spec, pseudonymKey, true) ??
      (listed === undefined ? undefined : matchSpec(index, listed, pseudonymKey, false));
    if (matches !== undefined) {
      for (const m of matches) found.add(m);
      continue;
    }
    throw noMatch(index, spec, listed ?? spec, k, specs.length, pseudonymKey);
  }
  return Int32Array.from([...found].sort((a, b) => a - b));
}

/**
 * The nodes `spec` names as a path, (when `ids`) a row id, a glob, or (when `ids`) a chain copied from a
 * printed line (see printed-chain.ts); undefined when none.
 */
function matchSpec(
  index: PathIndex,
  spec: string,
  pseudonymKey: string | undefined,
  ids: boolean,
): readonly number[] | undefined {
  const { tree, measures } = index;
  // A path copied from the output: its escapes are what the names print as (an exact name holding
  // `\u{` prints otherwise, so the printed reading comes first).
  if (holdsEscape(spec)) {
    const printed = resolvePrintedPath(index, spec);
    if (printed >= 0) return [printed];
  }
  const exact = resolvePath(index, spec);
  if (exact >= 0) return [exact];
  if (pseudonymKey !== undefined) {
    const viaPseudonyms = resolvePseudonymPath(index, spec, pseudonymKey);
    if (viaPseudonyms >= 0) return [viaPseudonyms];
  }
  // Letters composed otherwise (NFC, NFD) than the names': canonically equivalent, so the same path.
  if (!/^[\x00-\x7f]*$/.test(spec)) {
    const composed = resolveComposedPath(index, spec);
    if (composed >= 0) return [composed];
  }
  if (ids && tree.ids) {
    const byId = indexOfName(tree.ids, spec);
    if (byId >= 0) return [byId];
    // A printed pseudonymous id reads back with the same secret (one keyed hash per row).
    if (pseudonymKey !== undefined && PSEUDONYM.test(spec)) {
      for (let i = 0; i < tree.length; i++) {
        const id = tree.ids.get(i);
        if (id !== "" && pseudonym(pseudonymKey, id) === spec) return [i];
      }
    }
  }
  if (isGlob(spec)) {
    const matches = matchGlob(tree, measures, spec);
    if (matches.length > 0) return matches;
  }
  // A chain copied from a printed line (`services / ledger / src`), as the spec stands.
  if (ids && isPrintedChain(spec)) {
    const nameOf = pseudonymKey === undefined ? undefined : printedNameOf(tree, pseudonymKey);
    const matches = resolvePrintedChain(index, spec, nameOf);
    if (matches.length > 0) return matches;
  }
  return undefined;
}

/** FOCUS_NO_MATCH for the k-th of n specs, with suggestions when some are near. */
function noMatch(
  index: PathIndex,
  spec: string,
  compared: string,
  k: number,
  n: number,
  key: string | undefined,
): EspalierError {
  if (key === undefined) {
    const names = printedNames(index.tree, index, undefined);
    const near = suggestFoci(index, compared, names);
    const where = near.length === 0 && !isGlob(compared) ? wherePathEnds(index, compared, names.pathOf) : [];
    return new EspalierError(
      "FOCUS_NO_MATCH",
      say`focus ${quoted.value(spec)} matches no node${didYouMean(near)}${where}`,
      undefined,
      { suggestions: near },
    );
  }
  // Only a typed pseudonym is compared, with pseudonyms only: guessing real names learns nothing.
  const near = spec.includes("anon-")
    ? suggestFoci(index, compared, printedNames(index.tree, index, key))
    : [];
  return new EspalierError(
    "FOCUS_NO_MATCH",
    `focus ${k + 1} of ${n} matches no node (not repeated here: --pseudonymize is on)${didYouMean(near)}`,
    undefined,
    { suggestions: near },
  );
}

/** Children named in a FOCUS_NO_MATCH message where a path stops matching. */
const CHILDREN_NAMED = 5;

/**
 * Where a path that matches nothing and is near no node stops: the deepest node its leading segments
 * name, and its first children (`; "harbor/quays" has no child "north": its 12 children include
 * "east", ...`), so the message says what to type instead. Empty when the path cannot be split.
 */
function wherePathEnds(index: PathIndex, spec: string, pathOf: (i: number) => string): MessagePart[] {
  let node = 0;
  let segments: string[];
  try {
    segments = splitPath(spec);
    for (const raw of segments) {
      const next = index.child(node, parseSegment(raw));
      if (next < 0) break;
      node = next;
    }
  } catch {
    return [];
  }
  const { count } = index.measures;
  const children: string[] = [];
  let n = 0;
  for (let c = node + 1; c < node + count[node]; c += count[c], n++)
    if (children.length < CHILDREN_NAMED) children.push(escapeSegment(index.tree.name.get(c)));
  const at = node === 0 ? ["the root"] : say`${quoted.path(pathOf(node))}`;
  const missing = segments[index.tree.depth[node]];
  if (missing === undefined) return [];
  if (n === 0) return say`; ${at} has no children`;
  const list = quotedList("name", children, CHILDREN_NAMED);
  const more = n > children.length ? ` and ${n - children.length} more` : "";
  const what = n === 1 ? say`its one child is ${list}` : say`its ${n} children include ${list}${more}`;
  return say`; ${at} has no child ${quoted.value(missing)}: ${what}`;
}

function didYouMean(near: readonly string[]): string {
  if (near.length === 0) return "";
  const quoted = near.map((s) => JSON.stringify(s));
  const list =
    quoted.length === 1 ? quoted[0] : `${quoted.slice(0, -1).join(", ")} or ${quoted[quoted.length - 1]}`;
  return `; did you mean ${list}?`;
}
