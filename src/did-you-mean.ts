import { distance } from "fastest-levenshtein";

/**
 * The candidate nearest to what was typed (Levenshtein distance, case-insensitive), when it is near
 * enough to be the likely intent: 1 edit for words of up to 3 characters, else 2 or a third of the
 * longer word's length, whichever is more. Ties keep the candidates' order. Nothing rather than
 * something unrelated.
 */
export function didYouMean(typed: string, candidates: Iterable<string>): string | undefined {
  const t = typed.toLowerCase();
  let best: string | undefined;
  let bestDistance = Number.POSITIVE_INFINITY;
  for (const candidate of candidates) {
    const d = distance(t, candidate.toLowerCase());
    if (d < bestDistance && d <= allowed(Math.max(t.length, candidate.length))) {
      best = candidate;
      bestDistance = d;
    }
  }
  return best;
}

/** `; did you mean X?` or nothing. */
export function didYouMeanText(typed: string, candidates: Iterable<string>): string {
  const near = didYouMean(typed, candidates);
  return near === undefined ? "" : `; did you mean ${near}?`;
}

function allowed(length: number): number {
  return length <= 3 ? 1 : Math.max(2, Math.floor(length / 3));
}
