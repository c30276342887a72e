import type { PathIndex } from "../model/path-index.js";
import type { PrintedNames } from "../model/printed-names.js";
import { escapeSegment, parseSegment, splitPath } from "../model/segment.js";
import { boundedDistance, distanceWork, MAX_DISTANCE_TEXT } from "./bounded-distance.js";
import { isGlob } from "./glob.js";
import { joinedGlob } from "./joined-glob.js";

/** Code units of a path, id or name compared by edit distance. */
const MAX_COMPARED = MAX_DISTANCE_TEXT;
/**
 * Cells of edit-distance tables one search may fill (a few tenths of a second); past it the search
 * stops with what it found, so no tree or spec makes an error message slow.
 */
export const MAX_SUGGEST_WORK = 100_000_000;
/** Most suggestions offered, nearest first. */
export const MAX_SUGGESTIONS = 3;
/** Segments that may join into one name containing "/". */
const MAX_JOINED = 16;
/** Child lookups spent on such joins for one spec (also bounds the recursion depth). */
const MAX_LOOKUPS = 2_000;

/** Edits allowed for a typed text of `n` code units: a third of it, at least one; more is unrelated. */
export function editsAllowed(n: number): number {
  return Math.max(1, Math.ceil(n / 3));
}

interface Candidate {
  text: string;
  score: number;
  /** How far the compared text's length is from the typed one's: at equal distance, nearer comes first. */
  gap: number;
  /** 0 for a whole path or an id, 1 for a path with leading segments left out. */
  partial: number;
  depth: number;
  node: number;
}

/**
 * Up to {@link MAX_SUGGESTIONS} foci close to a spec that matched nothing, nearest first; none when
 * nothing is close ({@link editsAllowed}). Case-insensitive Levenshtein distance between the spec and
 * every node's whole path, every id, its name and its last k segments for a spec of k segments (so a
 * missing or wrong ancestor, or a bare name, still finds the node). The search fills at most
 * {@link MAX_SUGGEST_WORK} cells of distance tables. A glob is compared without its leading `**` segments, and
 * only when no `*` is left. Ties: the text whose length is nearer the typed one's (`vitset` suggests
 * `vitest` before `vite`, both 2 edits away), then whole paths and ids before partial ones, shallower,
 * then input order.
 * Paths, names and ids are compared as `names` prints them: what the user who typed the spec has seen.
 * A glob whose segments, joined, name a name containing "/" is offered escaped ({@link joinedGlob}).
 */
export function suggestFoci(index: PathIndex, spec: string, names: PrintedNames): string[] {
  if (!names.pseudonymous && isGlob(spec)) {
    // A glob whose segments name one name containing "/" typed unescaped (`@scope/pkg/*`).
    const joined = joinedGlob(index, spec);
    if (joined !== undefined) return [joined];
  }
  const whole = comparable(spec);
  if (whole === undefined || whole === "") return [];
  // Lengths compare in full (a cheap bound on the distance); long texts by their ends (textScore).
  const typed = whole.length;
  if (!names.pseudonymous) {
    // A name that itself contains "/" typed unescaped ("@scope/pkg" for "@scope~1pkg").
    const joined = lenientResolve(index, spec);
    if (joined > 0) return [names.pathOf(joined)];
  }
  const allowed = editsAllowed(typed);
  const k = whole.split("/").length;
  const { tree } = index;
  const best: Candidate[] = [];
  const offer = (c: Candidate) => {
    const same = best.findIndex((b) => b.node === c.node && b.text === c.text);
    if (same >= 0) {
      if (byRank(c, best[same]) >= 0) return;
      best.splice(same, 1);
    }
    best.push(c);
    best.sort(byRank);
    if (best.length > MAX_SUGGESTIONS * 2) best.length = MAX_SUGGESTIONS * 2;
  };
  // The path to the current node, one lower-cased segment per depth, and the running lengths.
  const start = distanceWork.cells;
  const segs: string[] = [""];
  const ends: number[] = [0];
  for (let i = 1; i < tree.length; i++) {
    const d = tree.depth[i];
    const seg = escapeSegment(names.nameOf(i));
    segs[d] = seg;
    ends[d] = ends[d - 1] + (d > 1 ? 1 : 0) + seg.length;
    const worst = best.length >= MAX_SUGGESTIONS ? best[MAX_SUGGESTIONS - 1].score : allowed;
    for (let c = 0; c < 3; c++) {
      // The last segment, the last k segments (as many as typed), the whole path: each once.
      const j = c === 0 ? 1 : c === 1 ? k : d;
      if (j > d || (c === 1 && j === 1) || (c === 2 && (j === 1 || j === k))) continue;
      // Levenshtein distance is at least the difference of the lengths: most candidates stop here.
      const length = ends[d] - ends[d - j] - (d - j > 0 ? 1 : 0);
      if (Math.abs(length - typed) > worst) continue;
      const score = scoreOf(segs, d - j + 1, d, length, whole, worst);
      if (score <= worst)
        offer({
          text: "",
          score,
          gap: Math.abs(length - typed),
          partial: j === d ? 0 : 1,
          depth: d,
          node: i,
        });
    }
    const id = names.idOf(i);
    if (id && Math.abs(id.length - typed) <= worst) {
      const score = textScore(id.toLowerCase(), whole, worst);
      if (score <= worst)
        offer({ text: id, score, gap: Math.abs(id.length - typed), partial: 0, depth: d, node: i });
    }
    if (distanceWork.cells - start > MAX_SUGGEST_WORK) break;
  }
  const out: string[] = [];
  for (const c of best) {
    const text = c.text !== "" ? c.text : names.pathOf(c.node);
    if (!out.includes(text)) out.push(text);
    if (out.length === MAX_SUGGESTIONS) break;
  }
  return out;
}

/** The score of the path `segs[from..to]` (`length` code units long) against the typed text. */
function scoreOf(
  segs: readonly string[],
  from: number,
  to: number,
  length: number,
  typed: string,
  max: number,
): number {
  if (length <= MAX_COMPARED)
    return textScore(
      segs
        .slice(from, to + 1)
        .join("/")
        .toLowerCase(),
      typed,
      max,
    );
  let head = segs[from];
  for (let d = from + 1; d <= to && head.length < MAX_COMPARED; d++) head += `/${segs[d]}`;
  let tail = segs[to];
  for (let d = to - 1; d >= from && tail.length < MAX_COMPARED; d--) tail = `${segs[d]}/${tail}`;
  return longScore(head.slice(0, MAX_COMPARED), tail.slice(-MAX_COMPARED), length, typed, max);
}

/**
 * The edit distance of two texts when both fit {@link MAX_COMPARED}; for longer ones the largest of
 * three lower-bound-like measures: the difference of the lengths and the distances of the first and of
 * the last {@link MAX_COMPARED} code units (a typo in the middle of a very long path goes unseen).
 */
function textScore(text: string, typed: string, max: number): number {
  if (text.length <= MAX_COMPARED && typed.length <= MAX_COMPARED) return boundedDistance(text, typed, max);
  return longScore(text.slice(0, MAX_COMPARED), text.slice(-MAX_COMPARED), text.length, typed, max);
}

function longScore(head: string, tail: string, length: number, typed: string, max: number): number {
  const lengths = Math.abs(length - typed.length);
  if (lengths > max) return max + 1;
  const first = boundedDistance(head.toLowerCase(), typed.slice(0, MAX_COMPARED), max);
  if (first > max) return first;
  return Math.max(lengths, first, boundedDistance(tail.toLowerCase(), typed.slice(-MAX_COMPARED), max));
}

function byRank(a: Candidate, b: Candidate): number {
  return a.score - b.score || a.gap - b.gap || a.partial - b.partial || a.depth - b.depth || a.node - b.node;
}

/**
 * The spec as compared: lower-cased, cut to {@link MAX_COMPARED}, without a leading `./` or `/` and,
 * for a glob, without leading `**` segments; undefined when a `*` is left (no single text to compare).
 */
function comparable(spec: string): string | undefined {
  let s = spec;
  for (;;) {
    if (s.startsWith("./")) s = s.slice(2);
    else if (s.startsWith("/")) s = s.slice(1);
    else if (s.startsWith("**/")) s = s.slice(3);
    else break;
  }
  if (s.includes("*")) return undefined;
  return s.toLowerCase();
}

/** The node a spec names when runs of its segments are read as one name containing "/"; -1 if none. */
function lenientResolve(index: PathIndex, spec: string): number {
  let raw: string[];
  try {
    raw = splitPath(spec.startsWith("./") ? spec.slice(2) : spec);
  } catch {
    return -1;
  }
  return joinSegments(index, 0, raw, 0, { left: MAX_LOOKUPS });
}

/**
 * Resolves segments where a run of them (up to {@link MAX_JOINED}) may form one name containing "/";
 * -1 when none does. `work.left` bounds the lookups, so a crafted spec or tree cannot make it slow.
 */
function joinSegments(
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
    const found = joinSegments(index, list[0], raw, j + 1, work);
    if (found >= 0) return found;
  }
  return -1;
}
