import { EspalierError } from "../errors.js";
import { indexOfName } from "../model/names.js";
import type { PathIndex } from "../model/path-index.js";
import { pseudonym } from "../model/pseudonym.js";
import { escapeSegment, parseSegment, splitPath } from "../model/segment.js";
import { isGlob, matchGlob } from "./glob.js";
import { isPrintedChain, pseudonymNames, resolvePrintedChain } from "./printed-chain.js";
import { suggestPath } from "./suggest.js";

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
 * row id (where rows have ids; with a pseudonym key also as a printed pseudonymous id), then as a glob,
 * then as a chain copied from a printed line (see printed-chain.ts).
 * A spec that matches nothing is an error that suggests the closest existing path.
 */

export function resolveFoci(index: PathIndex, specs: readonly string[], pseudonymKey?: string): Int32Array {
  const { tree, measures } = index;
  const found = new Set<number>();
  for (const spec of specs) {
    const exact = resolvePath(index, spec);
    if (exact >= 0) {
      found.add(exact);
      continue;
    }
    if (pseudonymKey !== undefined) {
      const viaPseudonyms = resolvePseudonymPath(index, spec, pseudonymKey);
      if (viaPseudonyms >= 0) {
        found.add(viaPseudonyms);
        continue;
      }
    }
    if (tree.ids) {
      const byId = indexOfName(tree.ids, spec);
      if (byId >= 0) {
        found.add(byId);
        continue;
      }
      // A printed pseudonymous id reads back with the same secret (one keyed hash per row).
      if (pseudonymKey !== undefined && PSEUDONYM.test(spec)) {
        let hit = -1;
        for (let i = 0; i < tree.length && hit < 0; i++) {
          const id = tree.ids.get(i);
          if (id !== "" && pseudonym(pseudonymKey, id) === spec) hit = i;
        }
        if (hit >= 0) {
          found.add(hit);
          continue;
        }
      }
    }
    if (isGlob(spec)) {
      const matches = matchGlob(tree, measures, spec);
      if (matches.length > 0) {
        for (const m of matches) found.add(m);
        continue;
      }
    }
    // A chain copied from a printed line (`services / ledger / src`).
    if (isPrintedChain(spec)) {
      const nameOf = pseudonymKey === undefined ? undefined : pseudonymNames(index, pseudonymKey);
      const matches = resolvePrintedChain(index, spec, nameOf);
      if (matches.length > 0) {
        for (const m of matches) found.add(m);
        continue;
      }
    }
    // With pseudonyms on, a suggestion must not print a real name either.
    const near = suggestPath(
      index,
      spec,
      pseudonymKey === undefined
        ? undefined
        : (i) => index.path(i, (j) => escapeSegment(pseudonym(pseudonymKey, tree.name.get(j)))),
    );
    throw new EspalierError(
      "FOCUS_NO_MATCH",
      `focus ${JSON.stringify(spec)} matches no node${near !== undefined ? `; did you mean ${JSON.stringify(near)}?` : ""}`,
    );
  }
  return Int32Array.from([...found].sort((a, b) => a - b));
}
