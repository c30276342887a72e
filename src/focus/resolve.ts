import { EspalierError, quoted, say } from "../errors.js";
import { indexOfName } from "../model/names.js";
import type { PathIndex } from "../model/path-index.js";
import { pseudonym } from "../model/pseudonym.js";
import { escapeSegment, parseSegment, splitPath } from "../model/segment.js";
import { isGlob, matchGlob } from "./glob.js";
import { realView, type SuggestView, suggestFoci } from "./suggest.js";

/** The node an exact path names, or -1. Glob characters are taken literally here. */
export function resolvePath(index: PathIndex, spec: string): number {
  let node = 0;
  for (const raw of splitPath(spec)) {
    node = index.child(node, parseSegment(raw));
    if (node < 0) return -1;
  }
  return node;
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
 * Focus specs -> node indices (sorted, without repeats). Each spec is tried as an exact path, then as a
 * row id (where rows have ids; with a pseudonym key also as a printed pseudonymous id), then as a glob;
 * a leading `./` (as `find .` prints paths) is dropped when the spec as written matches nothing.
 * A spec that matches nothing is FOCUS_NO_MATCH with the nearest foci that exist ({@link suggestFoci}).
 * With a pseudonym key the message neither repeats the spec nor compares it with real names: it says
 * which focus failed, and suggests only printed pseudonyms near a typed pseudonym.
 */
export function resolveFoci(index: PathIndex, specs: readonly string[], pseudonymKey?: string): Int32Array {
  const found = new Set<number>();
  specs.forEach((spec, k) => {
    const nodes = resolveOne(index, spec, pseudonymKey);
    const bare =
      nodes.length === 0 && spec.startsWith("./") ? resolveOne(index, spec.slice(2), pseudonymKey) : nodes;
    if (bare.length === 0) throw noMatch(index, spec, k, specs.length, pseudonymKey);
    for (const node of bare) found.add(node);
  });
  return Int32Array.from([...found].sort((a, b) => a - b));
}

/** The nodes one spec names (see {@link resolveFoci}); empty when none. */
function resolveOne(index: PathIndex, spec: string, pseudonymKey: string | undefined): number[] {
  const { tree, measures } = index;
  const exact = resolvePath(index, spec);
  if (exact >= 0) return [exact];
  if (pseudonymKey !== undefined) {
    const viaPseudonyms = resolvePseudonymPath(index, spec, pseudonymKey);
    if (viaPseudonyms >= 0) return [viaPseudonyms];
  }
  if (tree.ids) {
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
  return isGlob(spec) ? matchGlob(tree, measures, spec) : [];
}

/** FOCUS_NO_MATCH for the k-th of n specs, with suggestions when some are near. */
function noMatch(
  index: PathIndex,
  spec: string,
  k: number,
  n: number,
  key: string | undefined,
): EspalierError {
  if (key === undefined) {
    const near = suggestFoci(index, spec, realView(index));
    return new EspalierError(
      "FOCUS_NO_MATCH",
      say`focus ${quoted.value(spec)} matches no node${didYouMean(near)}`,
    );
  }
  // Only a typed pseudonym is compared, with pseudonyms only: guessing real names learns nothing.
  const near = spec.includes("anon-") ? suggestFoci(index, spec, pseudonymView(index, key)) : [];
  return new EspalierError(
    "FOCUS_NO_MATCH",
    `focus ${k + 1} of ${n} matches no node (not repeated here: --pseudonymize is on)${didYouMean(near)}`,
  );
}

function didYouMean(near: readonly string[]): string {
  if (near.length === 0) return "";
  const quoted = near.map((s) => JSON.stringify(s));
  const list =
    quoted.length === 1 ? quoted[0] : `${quoted.slice(0, -1).join(", ")} or ${quoted[quoted.length - 1]}`;
  return `; did you mean ${list}?`;
}

/** The tree as printed with pseudonyms: what a user of --pseudonymize has seen. */
function pseudonymView(index: PathIndex, key: string): SuggestView {
  const { tree } = index;
  const base = (j: number) => escapeSegment(pseudonym(key, tree.name.get(j)));
  return {
    segment: base,
    id: (i) => {
      const id = tree.ids?.get(i);
      return id ? pseudonym(key, id) : null;
    },
    path: (i) => index.path(i, base),
    realNames: false,
  };
}
