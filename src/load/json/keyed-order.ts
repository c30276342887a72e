import type { NodeSink } from "../node-sink.js";

/**
 * Puts the children of a children-by-name object in the order JSON.parse gives its keys, so the byte
 * loader builds the tree a program holding the parsed value would see: keys that are array indices first, ascending, then
 * the other keys in input order (ECMA-262 OrdinaryOwnPropertyKeys); a repeated key keeps the place of
 * its first occurrence and the value of its last (the earlier values are dropped).
 *
 * `children` lists the children of `owner` in input order; each child's subtree is the index range up to
 * the next child (or the end of the sink), all of it after `mark`. Rewrites that tail of the sink, of
 * the `sized` flags and of the `kept` columns; returns how many nodes the dropped earlier values held.
 */
export function reorderKeyedChildren(
  sink: NodeSink,
  sized: Uint8Array,
  kept: (string | undefined)[][],
  owner: number,
  mark: number,
  children: readonly number[],
): number {
  const end = sink.length;
  const count = children.length;
  const lastOf = new Map<string, number>();
  for (let k = 0; k < count; k++) lastOf.set(sink.name.get(children[k]), k);
  const indices: number[] = [];
  const others: number[] = [];
  const placed = new Set<string>();
  for (let k = 0; k < count; k++) {
    const key = sink.name.get(children[k]);
    if (placed.has(key)) continue;
    placed.add(key);
    (isArrayIndexKey(key) ? indices : others).push(lastOf.get(key)!);
  }
  indices.sort((a, b) => Number(sink.name.get(children[a])) - Number(sink.name.get(children[b])));
  const order = indices.concat(others);

  const blockEnd = (k: number) => (k + 1 < count ? children[k + 1] : end);
  let total = 0;
  for (const k of order) total += blockEnd(k) - children[k];
  const parentOf = new Int32Array(total);
  const ownSize = new Float64Array(total);
  const origin = new Int32Array(total);
  const flags = new Uint8Array(total);
  const name: string[] = new Array(total);
  const columns = kept.map(() => new Array<string | undefined>(total));
  let at = 0;
  for (const k of order) {
    const start = children[k];
    const shift = mark + at - start;
    for (let x = start, stop = blockEnd(k); x < stop; x++, at++) {
      const p = sink.parentOf[x];
      parentOf[at] = p === owner ? owner : p + shift;
      ownSize[at] = sink.ownSize[x];
      origin[at] = sink.origin[x];
      flags[at] = sized[x];
      name[at] = sink.name.get(x);
      for (let f = 0; f < kept.length; f++) columns[f][at] = kept[f][x];
    }
  }
  sink.truncate(mark);
  sink.parentOf.set(parentOf, mark);
  sink.ownSize.set(ownSize, mark);
  sink.origin.set(origin, mark);
  sized.set(flags, mark);
  for (let x = 0; x < total; x++) sink.name.setString(mark + x, name[x]);
  sink.length = mark + total;
  for (let f = 0; f < kept.length; f++) {
    kept[f].length = mark;
    for (let x = 0; x < total; x++) kept[f].push(columns[f][x]);
  }
  return end - mark - total;
}

/** Whether JSON.parse treats `key` as an array index: "0", or digits without a leading 0 up to 2^32 - 2. */
export function isArrayIndexKey(key: string): boolean {
  const n = key.length;
  if (n === 0 || n > 10) return false;
  const first = key.charCodeAt(0);
  if (first === 48) return n === 1;
  if (first < 49 || first > 57) return false;
  for (let k = 1; k < n; k++) {
    const c = key.charCodeAt(k);
    if (c < 48 || c > 57) return false;
  }
  return n < 10 || Number(key) <= 4294967294;
}
