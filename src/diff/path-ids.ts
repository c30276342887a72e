import { StringNames } from "../model/names.js";
import { escapeSegment } from "../model/segment.js";
import type { Tree } from "../model/tree.js";

/**
 * The tree with ids that are paths: each full entry's id is its path (names from below the root, RFC
 * 6901 escaped, joined by "/", `~~N` for the Nth sibling of an equal name, as espalier prints paths),
 * and each reference's id is its full entry's. So a document read as nodes whose aliases made
 * references (YAML) can be compared as a graph is: full entries matched by path, references by the
 * (parent, full entry) edge they stand for.
 */
export function withPathIds(tree: Tree): Tree {
  const n = tree.length;
  const ref = tree.referenceTo;
  const ids: string[] = new Array(n);
  ids[0] = "";
  const seen = new Map<string, number>();
  for (let i = 1; i < n; i++) {
    if (ref !== undefined && ref[i] !== -1) continue;
    const p = tree.parent[i];
    const segment = escapeSegment(tree.name.get(i));
    const key = `${p}/${segment}`;
    const count = (seen.get(key) ?? 0) + 1;
    seen.set(key, count);
    const own = count === 1 ? segment : `${segment}~~${count}`;
    ids[i] = p === 0 ? own : `${ids[p]}/${own}`;
  }
  if (ref !== undefined) for (let i = 1; i < n; i++) if (ref[i] !== -1) ids[i] = ids[ref[i]];
  return { ...tree, ids: new StringNames(ids) };
}
