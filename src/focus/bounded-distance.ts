/** Longest text compared, in UTF-16 code units; callers cut their texts to it. */
export const MAX_DISTANCE_TEXT = 128;

// One pair of rows, reused: no allocation per comparison.
let prev = new Int32Array(MAX_DISTANCE_TEXT + 2);
let cur = new Int32Array(MAX_DISTANCE_TEXT + 2);

/** Cells of the edit-distance table filled since the last reset (the suggestion search's work budget). */
export const distanceWork = { cells: 0 };

/**
 * The Levenshtein distance of `a` and `b` (insertions, deletions, substitutions of UTF-16 code units)
 * when it is at most `max`, else `max + 1`. Only the diagonal band |i − j| ≤ max of the table is filled
 * and the search stops as soon as a whole row exceeds `max` (Ukkonen, "Algorithms for approximate
 * string matching", Information and Control 64, 1985): O(min(|a|, |b|) · (2·max + 1)) steps. Texts
 * longer than {@link MAX_DISTANCE_TEXT} are compared by that prefix.
 */
export function boundedDistance(a: string, b: string, max: number): number {
  const n = Math.min(a.length, MAX_DISTANCE_TEXT);
  const m = Math.min(b.length, MAX_DISTANCE_TEXT);
  const over = max + 1;
  if (Math.abs(n - m) > max) return over;
  for (let j = 0; j <= m; j++) prev[j] = j <= max ? j : over;
  for (let i = 1; i <= n; i++) {
    const lo = Math.max(1, i - max);
    const hi = Math.min(m, i + max);
    // The cells just outside the band read as "too far", so stale values never leak in.
    cur[lo - 1] = lo === 1 ? Math.min(i, over) : over;
    if (hi < m) cur[hi + 1] = over;
    let rowMin = cur[lo - 1];
    const ca = a.charCodeAt(i - 1);
    for (let j = lo; j <= hi; j++) {
      let v = prev[j - 1] + (ca === b.charCodeAt(j - 1) ? 0 : 1);
      const del = prev[j] + 1;
      const ins = cur[j - 1] + 1;
      if (del < v) v = del;
      if (ins < v) v = ins;
      if (v > over) v = over;
      cur[j] = v;
      if (v < rowMin) rowMin = v;
    }
    distanceWork.cells += hi - lo + 1;
    if (rowMin > max) return over;
    const t = prev;
    prev = cur;
    cur = t;
  }
  return Math.min(prev[m], over);
}
