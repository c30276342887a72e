/**
 * One glob segment: `*` stands for any run of code points (none included), everything else is literal.
 * Matching never backtracks: the literal pieces between stars are found leftmost-first, each with the
 * Knuth-Morris-Pratt search (Knuth, Morris, Pratt, "Fast pattern matching in strings", SIAM J. Comput.
 * 6(2), 1977), so one test costs at most 2·|name| + |pieces| character comparisons, whatever the pattern.
 * Leftmost-first is enough: a later match of a piece leaves no more room for the pieces after it.
 */
export interface Wildcard {
  /** The literal text before the first `*` (the whole pattern when it has none). */
  readonly head: string;
  /** The literal text after the last `*`. */
  readonly tail: string;
  /** Literal pieces between stars, in order, each with its KMP failure table. */
  readonly pieces: readonly Piece[];
  /** Whether the pattern has a `*` at all. */
  readonly star: boolean;
  /** Fewest code units a matching name has: the literal text's length. */
  readonly minLength: number;
}

interface Piece {
  readonly text: string;
  readonly fail: Int32Array;
}

/** Comparisons made by {@link matchWildcard} since the last reset: the benchmark-style bound check reads it. */
export const wildcardWork = { comparisons: 0 };

/** Compiles a segment (already unescaped; `*` marks a wildcard, given as the code unit `star`). */
export function compileWildcard(segment: string, star = "*"): Wildcard {
  const parts = segment.split(star);
  if (parts.length === 1)
    return { head: segment, tail: "", pieces: [], star: false, minLength: segment.length };
  const head = parts[0];
  const tail = parts[parts.length - 1];
  const pieces = parts
    .slice(1, -1)
    .filter((p) => p !== "")
    .map((text) => ({ text, fail: failureTable(text) }));
  const minLength = head.length + tail.length + pieces.reduce((sum, p) => sum + p.text.length, 0);
  return { head, tail, pieces, star: true, minLength };
}

/** Whether `name` matches; linear in the name's length (see {@link Wildcard}). */
export function matchWildcard(w: Wildcard, name: string): boolean {
  if (!w.star) {
    wildcardWork.comparisons += Math.min(name.length, w.head.length) + 1;
    return name === w.head;
  }
  const n = name.length;
  if (n < w.minLength) return false;
  if (!literalAt(name, w.head, 0) || !literalAt(name, w.tail, n - w.tail.length)) return false;
  let from = w.head.length;
  const end = n - w.tail.length;
  for (const piece of w.pieces) {
    const at = search(name, piece, from, end);
    if (at < 0) return false;
    from = at + piece.text.length;
  }
  return true;
}

/** Whether `text` occurs in `name` at `at`, starting and ending on code point boundaries. */
function literalAt(name: string, text: string, at: number): boolean {
  wildcardWork.comparisons += text.length;
  return name.startsWith(text, at) && onBoundary(name, at) && onBoundary(name, at + text.length);
}

/** KMP search for `piece` in `name[from, end)`, leftmost match on code point boundaries; -1 if none. */
function search(name: string, piece: Piece, from: number, end: number): number {
  const { text, fail } = piece;
  const m = text.length;
  let k = 0;
  for (let i = from; i < end; i++) {
    const c = name.charCodeAt(i);
    wildcardWork.comparisons++;
    while (k > 0 && text.charCodeAt(k) !== c) {
      k = fail[k - 1];
      wildcardWork.comparisons++;
    }
    if (text.charCodeAt(k) === c) k++;
    if (k === m) {
      const at = i + 1 - m;
      // A literal that would start or end inside a surrogate pair does not match code points: go on.
      if (onBoundary(name, at) && onBoundary(name, i + 1)) return at;
      k = fail[k - 1];
    }
  }
  return -1;
}

/** KMP failure table: fail[q] is the longest proper border of text[0..q]. */
function failureTable(text: string): Int32Array {
  const fail = new Int32Array(text.length);
  let k = 0;
  for (let q = 1; q < text.length; q++) {
    while (k > 0 && text.charCodeAt(q) !== text.charCodeAt(k)) k = fail[k - 1];
    if (text.charCodeAt(q) === text.charCodeAt(k)) k++;
    fail[q] = k;
  }
  return fail;
}

/** Whether position `at` of `s` falls between code points (not inside a surrogate pair). */
function onBoundary(s: string, at: number): boolean {
  if (at <= 0 || at >= s.length) return true;
  const before = s.charCodeAt(at - 1);
  const after = s.charCodeAt(at);
  return !(before >= 0xd800 && before <= 0xdbff && after >= 0xdc00 && after <= 0xdfff);
}
