import type { PathIndex } from "../model/path-index.js";
import { parseSegment, splitPath } from "../model/segment.js";

/**
 * The node an exact path names when its letters are composed otherwise than the names' (Unicode
 * normalization forms NFC and NFD, UAX #15: `í` as one code point or as `i` and a combining accent),
 * or -1. A listing made on macOS holds decomposed names; a focus typed or listed elsewhere is composed,
 * and the two are canonically equivalent text that compared as code points matches nothing. Each
 * segment is looked up as typed first; only where no child has that name are the children's names
 * compared in NFC, and then one name must match (two siblings spelled apart only so are ambiguous).
 */
export function resolveComposedPath(index: PathIndex, spec: string): number {
  let node = 0;
  for (const raw of splitPath(spec)) {
    const seg = parseSegment(raw);
    const byName = index.childrenByName(node);
    let named = byName.get(seg.name);
    if (named === undefined) {
      const wanted = seg.name.normalize("NFC");
      for (const [name, list] of byName) {
        if (name.normalize("NFC") !== wanted) continue;
        if (named !== undefined) return -1;
        named = list;
      }
    }
    if (named === undefined || seg.rank > named.length) return -1;
    node = named[seg.rank - 1];
  }
  return node;
}
