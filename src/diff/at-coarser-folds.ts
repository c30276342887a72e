import { quoted, say } from "../errors.js";
import { FOLDED_FIELD } from "../load/saved-output.js";
import { StringNames } from "../model/names.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";

/**
 * `fine` as the coarser saved view `coarse` would show it: under each parent where `coarse` has a fold,
 * `fine`'s children that `coarse` does not show (and their subtrees) and `fine`'s own fold there become
 * one fold entry, named as `coarse`'s, that stands for all their nodes and size; what it hid (the
 * field `folded`) says their count of children and nodes as a saved fold does. So a diff compares the
 * two at `coarse`'s folds, each a whole, and never counts a node added or removed that is only folded
 * on one side (a view saved with a bigger budget, another focus, or the input itself). Every count
 * and size of `fine` stays its own. The caller has made sure no node `coarse` shows may lie in one of
 * `fine`'s folds (saved-views-apart.ts): then each fold of `fine` is inside a fold of `coarse`, or
 * holds only nodes `coarse` has no place for (added ones), and the comparison is exact.
 *
 * `keys` are each node's path (the root ""); `coarseVersion` names `coarse` in the COMPARED_AT_FOLDS
 * note the result carries, which counts the folds compared so and names their parents. `fine` has no
 * references (a graph's).
 */
export function atCoarserFolds(
  fine: Tree,
  fineKeys: readonly string[],
  coarse: Tree,
  coarseKeys: readonly string[],
  coarseVersion: "OLD" | "NEW",
): Tree {
  const groups = groupsAt(fine, fineKeys, coarse, coarseKeys);
  if (groups.size === 0) return fine;
  const n = fine.length;
  const fineFolded = fine.fields.get(FOLDED_FIELD);
  // Each node's place in the result, or -1 inside a group; a group's entry follows its parent's last child.
  const parent: number[] = [];
  const depth: number[] = [];
  const names: string[] = [];
  const ids: string[] = [];
  const ownSize: number[] = [];
  const origin: number[] = [];
  const elided: number[] = [];
  const empty: number[] = [];
  const folded: string[] = [];
  const fieldNames = [...fine.fields.keys()].filter((f) => f !== FOLDED_FIELD);
  const fields = fieldNames.map(() => [] as string[]);
  const placed = new Int32Array(n).fill(-1);
  const end = subtreeEnds(fine);
  const open: { at: number; group: Group }[] = [];
  const closeTo = (i: number) => {
    while (open.length > 0 && end[open[open.length - 1].at] <= i) {
      const { at, group } = open.pop()!;
      push(placed[at], group.name, group.id, group.size, 0, group.nodes - 1, 0, group.folded, () => "");
    }
  };
  for (let i = 0; i < n; i++) {
    closeTo(i);
    if (groups.member[i] !== -1) continue;
    const p = fine.parent[i];
    placed[i] = push(
      p < 0 ? -1 : placed[p],
      fine.name.get(i),
      fine.ids?.get(i) ?? "",
      fine.ownSize[i],
      fine.origin[i],
      fine.elided?.[i] ?? 0,
      fine.empty?.[i] ?? 0,
      fineFolded?.[i] ?? "",
      (k) => fine.fields.get(fieldNames[k])![i],
    );
    const group = groups.at.get(i);
    if (group !== undefined) open.push({ at: i, group });
  }
  closeTo(n);
  const allFields = new Map<string, readonly string[]>(fieldNames.map((f, k) => [f, fields[k]]));
  allFields.set(FOLDED_FIELD, folded);
  const reading = fine.reading ?? { shape: "nodes" as const, sizeUnit: "number" as const };
  return {
    length: names.length,
    parent: Int32Array.from(parent),
    depth: Int32Array.from(depth),
    name: new StringNames(names),
    ownSize: Float64Array.from(ownSize),
    hasSizes: fine.hasSizes,
    ids: fine.ids === null ? null : new StringNames(ids),
    origin: Int32Array.from(origin),
    originIsRow: fine.originIsRow,
    fields: allFields,
    syntheticRoot: fine.syntheticRoot,
    elided: Float64Array.from(elided),
    ...(fine.empty ? { empty: Uint8Array.from(empty) } : {}),
    reading: { ...reading, notes: [...(reading.notes ?? []), atFoldsNote(groups, coarseVersion)] },
  };

  function push(
    under: number,
    name: string,
    id: string,
    size: number,
    from: number,
    hidden: number,
    isEmpty: number,
    what: string,
    field: (k: number) => string,
  ): number {
    parent.push(under);
    depth.push(under < 0 ? 0 : depth[under] + 1);
    names.push(name);
    ids.push(id);
    ownSize.push(size);
    origin.push(from);
    elided.push(hidden);
    empty.push(isEmpty);
    folded.push(what);
    for (let k = 0; k < fields.length; k++) fields[k].push(field(k));
    return names.length - 1;
  }
}

/** One fold of the coarse view as `fine` is read at it: the entry that stands for its members. */
interface Group {
  name: string;
  id: string;
  /** The members' nodes (each with its elided descendants) and size. */
  nodes: number;
  size: number;
  /** What the entry hid, as a saved fold's `folded` field says it. */
  folded: string;
  /** The parent's path. */
  under: string;
}

interface Groups {
  /** The group's entry index in `coarse` each node of `fine` is read into, else -1. */
  member: Int32Array;
  /** The groups by their parent's index in `fine`. */
  at: Map<number, Group>;
  size: number;
}

/**
 * Under each parent where `coarse` has a fold: `fine`'s children `coarse` does not show, and `fine`'s
 * fold entries, with all below them; a parent whose only such child is `fine`'s own fold of the same
 * name is left as it is (the two folds compare as they are).
 */
function groupsAt(
  fine: Tree,
  fineKeys: readonly string[],
  coarse: Tree,
  coarseKeys: readonly string[],
): Groups {
  const coarseFolded = coarse.fields.get(FOLDED_FIELD)!;
  const fineFolded = fine.fields.get(FOLDED_FIELD);
  const shown = new Set(coarseKeys);
  const foldUnder = new Map<string, number>();
  for (let j = 1; j < coarse.length; j++)
    if (coarseFolded[j] !== "") foldUnder.set(coarseKeys[coarse.parent[j]], j);
  const n = fine.length;
  const member = new Int32Array(n).fill(-1);
  const top = new Uint8Array(n);
  for (let i = 1; i < n; i++) {
    const p = fine.parent[i];
    if (member[p] !== -1) {
      member[i] = member[p];
      continue;
    }
    const j = foldUnder.get(fineKeys[p]);
    if (j === undefined) continue;
    if ((fineFolded?.[i] ?? "") !== "" || !shown.has(fineKeys[i])) {
      member[i] = j;
      top[i] = 1;
    }
  }
  // Each group's counts, by the coarse entry; a group that is only fine's own fold of that name stays.
  const tally = new Map<
    number,
    { parent: number; nodes: number; size: number; children: number; tops: number; own: boolean }
  >();
  for (let i = 1; i < n; i++) {
    const j = member[i];
    if (j === -1) continue;
    let t = tally.get(j);
    if (t === undefined) {
      t = { parent: -1, nodes: 0, size: 0, children: 0, tops: 0, own: true };
      tally.set(j, t);
    }
    t.nodes += 1 + (fine.elided?.[i] ?? 0);
    t.size += fine.ownSize[i];
    if (top[i] === 0) continue;
    t.parent = fine.parent[i];
    t.tops++;
    const hid = /^(\d+) child/.exec(fineFolded?.[i] ?? "");
    t.children += hid ? Number(hid[1]) : 1;
    t.own &&= hid !== null && fine.name.get(i) === coarse.name.get(j);
  }
  const at = new Map<number, Group>();
  const left = new Set<number>();
  for (const [j, t] of tally) {
    // Only fine's own fold under that parent, named alike: nothing to read into it.
    if (t.own && t.tops === 1) {
      left.add(j);
      continue;
    }
    at.set(t.parent, {
      name: coarse.name.get(j),
      id: coarse.ids?.get(j) ?? `${coarse.name.get(j)} ${fine.ids?.get(t.parent) ?? ""}`,
      nodes: t.nodes,
      size: t.size,
      folded: `${t.children} ${t.children === 1 ? "child" : "children"}, ${t.nodes} ${t.nodes === 1 ? "node" : "nodes"}`,
      under: fineKeys[t.parent],
    });
  }
  if (left.size > 0) for (let i = 1; i < n; i++) if (left.has(member[i])) member[i] = -1;
  return { member, at, size: at.size };
}

/** One past the last node of each node's subtree (nodes in pre-order). */
function subtreeEnds(tree: Tree): Int32Array {
  const end = new Int32Array(tree.length);
  for (let i = tree.length - 1; i >= 0; i--) {
    if (end[i] === 0) end[i] = i + 1;
    const p = tree.parent[i];
    if (p >= 0 && end[p] < end[i]) end[p] = end[i];
  }
  return end;
}

/** The COMPARED_AT_FOLDS note: how many of the coarse view's folds this version was read at, and where. */
function atFoldsNote(groups: Groups, coarse: "OLD" | "NEW"): ReadingNote {
  const under = [...groups.at.entries()].sort((a, b) => a[0] - b[0]).map(([, g]) => g.under);
  const named = under
    .slice(0, 5)
    .flatMap((path, k) => [k === 0 ? "" : ", ", ...(path === "" ? ["the root"] : say`${quoted.path(path)}`)]);
  const count = groups.size;
  return {
    code: "COMPARED_AT_FOLDS",
    count,
    parts: [
      `it shows nodes inside ${count === 1 ? "a fold" : `${count} folds`} of ${coarse}, a saved view (SAVED_VIEW) that folds more (saved with a smaller budget or another focus), and no node ${coarse} shows is in a fold of its own, so it was compared at ${coarse}'s folds: under `,
      ...named,
      under.length > 5 ? `, and ${under.length - 5} more` : "",
      `, its children ${coarse} does not show, and its own fold there, were counted as one fold entry that stands for their nodes and size, compared as a whole with ${coarse}'s; its totals are its own, and a change inside such a fold shows as the fold's count or size`,
    ],
  };
}
