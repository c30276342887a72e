import { expect } from "vitest";
import { EspalierError } from "../../../src/errors.js";
import type { LoadOptions } from "../../../src/load/load-options.js";
import { loadTreeFromStream } from "../../../src/load/stream/index.js";
import type { Tree } from "../../../src/model/tree.js";
import { prepare } from "../../../src/summarize.js";
import { summaryOf } from "../../helpers/summary.js";
import { loadReference } from "../reference/load-reference.js";

/** The bytes as a stream cut at the given offsets (sorted, inside the input). */
export async function* chunked(bytes: Uint8Array, cuts: readonly number[]): AsyncGenerator<Uint8Array> {
  let from = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    if (cut <= from || cut >= bytes.length) continue;
    yield bytes.slice(from, cut);
    from = cut;
  }
  yield bytes.slice(from);
}

/** Every offset: single-byte chunks. */
export function everyByte(length: number): number[] {
  return Array.from({ length }, (_, k) => k);
}

export function utf8(text: string): Uint8Array {
  return new TextEncoder().encode(text);
}

/**
 * The reference answer for the bytes: decoded as a whole (WHATWG UTF-8, BOM dropped), then read by the
 * whole-text readers in tests/load/reference (JSON.parse and a walk, csv-parse's synchronous parser, a
 * path-list reader on text).
 */
export function loadByReference(bytes: Uint8Array, options: LoadOptions): Tree {
  return loadReference(new TextDecoder("utf-8", { ignoreBOM: false }).decode(bytes), options);
}

export function loadStreamed(
  bytes: Uint8Array,
  options: LoadOptions,
  cuts: readonly number[],
): Promise<Tree> {
  return loadTreeFromStream(chunked(bytes, cuts), options);
}

/** The outcome of a load: the tree, or the error's code and position. */
export type Outcome = { tree: Tree } | { code: string; pos: unknown };

export function outcomeOf(load: () => Tree): Outcome {
  try {
    return { tree: load() };
  } catch (error) {
    if (error instanceof EspalierError) return { code: error.code, pos: error.pos };
    throw error;
  }
}

export async function outcomeOfAsync(load: () => Promise<Tree>): Promise<Outcome> {
  try {
    return { tree: await load() };
  } catch (error) {
    if (error instanceof EspalierError) return { code: error.code, pos: error.pos };
    throw error;
  }
}

/** Every array and flag of the two trees is equal. */
export function expectSameTree(actual: Tree, expected: Tree): void {
  expect(actual.length).toBe(expected.length);
  expect([...actual.parent]).toEqual([...expected.parent]);
  expect([...actual.depth]).toEqual([...expected.depth]);
  expect(actual.name).toEqual(expected.name);
  expect([...actual.ownSize]).toEqual([...expected.ownSize]);
  expect([...actual.origin]).toEqual([...expected.origin]);
  expect(actual.hasSizes).toBe(expected.hasSizes);
  expect(actual.originIsRow).toBe(expected.originIsRow);
  expect(actual.syntheticRoot).toBe(expected.syntheticRoot);
  expect(actual.ids).toEqual(expected.ids);
  expect([...actual.fields]).toEqual([...expected.fields]);
  expect(actual.reading?.folderTotals).toBe(expected.reading?.folderTotals);
}

/** Text and JSON summaries of the tree, focused on node `focus` (by its printed path). */
export function summaries(tree: Tree, focus: number, budget: number) {
  const path = prepare(tree).index.path(focus % tree.length);
  const { text, json } = summaryOf(tree, [path], budget);
  return { text, json };
}

/** A small deterministic generator (mulberry32) for building inputs from a fast-check seed. */
export function rng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (lo: number, hi: number) => lo + Math.floor(next() * (hi - lo + 1)),
    chance: (p: number) => next() < p,
    pick: <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)],
  };
}

export type Rng = ReturnType<typeof rng>;

/** Up to `count` cut offsets in [1, length), biased towards the awkward places `at` says are. */
export function cutsFor(r: Rng, length: number, count: number, awkward: readonly number[] = []): number[] {
  const cuts: number[] = [];
  for (let k = 0; k < count; k++) {
    if (awkward.length > 0 && r.chance(0.6)) cuts.push(r.pick(awkward) + r.int(0, 1));
    else cuts.push(r.int(1, Math.max(1, length - 1)));
  }
  return cuts;
}

/** Offsets where a cut between chunks is awkward: every byte listed in `marks`, and every byte >= 0x80. */
export function awkwardAt(bytes: Uint8Array, marks: readonly number[]): number[] {
  const at: number[] = [];
  bytes.forEach((b, k) => {
    if (b >= 0x80 || marks.includes(b)) at.push(k);
  });
  return at;
}

/** Two loads of the same bytes: the same arrays, and the same summaries for a random focus and budget. */
export function expectSameTreeAndSummaries(r: Rng, actual: Tree, expected: Tree): void {
  expectSameTree(actual, expected);
  const focus = r.int(0, expected.length - 1);
  const budget = expected.depth[focus] + r.int(1, 25);
  expect(summaries(actual, focus, budget)).toEqual(summaries(expected, focus, budget));
}
