import { distance } from "fastest-levenshtein";
import type { PathIndex } from "../model/path-index.js";
import { parseSegment, splitPath } from "../model/segment.js";

/** Characters of a name compared by edit distance. */
const MAX_COMPARED = 256;
/** Segments that may join into one name containing "/". */
const MAX_JOINED = 16;
/** Child lookups spent on such joins for one spec (also bounds the recursion depth). */
const MAX_LOOKUPS = 2_000;

/**
 * The existing path closest to a spec that matched nothing: follow the spec as far as it matches, then
 * take the child whose name is nearest by edit distance; a node anywhere whose name equals the spec's
 * last segment wins when there is one (the usual mistake is a wrong or missing ancestor).
 */
export function suggestPath(
  index: PathIndex,
  spec: string,
  pathOf: (i: number) => string = (i) => index.path(i),
): string | undefined {
  let raw: string[];
  try {
    raw = splitPath(spec);
  } catch {
    return undefined;
  }
  if (raw.length === 0) return undefined;
  let last: string;
  try {
    last = parseSegment(raw[raw.length - 1]).name;
  } catch {
    last = raw[raw.length - 1];
  }
  const { tree } = index;
  // A name that itself contains "/" typed unescaped ("@scope/pkg" for "@scope~1pkg").
  const joined = lenientResolve(index, 0, raw, 0, { left: MAX_LOOKUPS });
  if (joined >= 0) return pathOf(joined);
  for (let i = 1; i < tree.length; i++) if (tree.name.get(i) === last) return pathOf(i);

  let node = 0;
  for (const text of raw) {
    let seg: ReturnType<typeof parseSegment>;
    try {
      seg = parseSegment(text);
    } catch {
      seg = { name: text, rank: 1 };
    }
    const next = index.child(node, seg);
    if (next >= 0) {
      node = next;
      continue;
    }
    let best = -1;
    let bestScore = Number.POSITIVE_INFINITY;
    const wanted = seg.name.slice(0, MAX_COMPARED).toLowerCase();
    for (const [name, list] of index.childrenByName(node)) {
      // Edit distance costs the product of the lengths: a 10 MB name must not stall the error message.
      const score = distance(name.slice(0, MAX_COMPARED).toLowerCase(), wanted);
      if (score < bestScore) {
        bestScore = score;
        best = list[0];
      }
    }
    return best >= 0 ? pathOf(best) : node > 0 ? pathOf(node) : undefined;
  }
  return undefined;
}

/**
 * Resolves segments where a run of them (up to {@link MAX_JOINED}) may form one name containing "/";
 * -1 when none does. `work.left` bounds the lookups, so a crafted spec or tree cannot make it slow.
 */
function lenientResolve(
  index: PathIndex,
  node: number,
  raw: string[],
  k: number,
  work: { left: number },
): number {
  if (k === raw.length) return node;
  for (let j = k; j < raw.length && j < k + MAX_JOINED; j++) {
    if (--work.left < 0) return -1;
    let name: string;
    try {
      name = raw
        .slice(k, j + 1)
        .map((r) => parseSegment(r).name)
        .join("/");
    } catch {
      return -1;
    }
    const list = index.childrenByName(node).get(name);
    if (!list) continue;
    const found = lenientResolve(index, list[0], raw, j + 1, work);
    if (found >= 0) return found;
  }
  return -1;
}
