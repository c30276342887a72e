/**
 * The kinds of change a node can have, in precedence order: a node has exactly one kind, or none. The
 * last two are edges of graphs (see diff/graph-changes.ts): `linked`, a node gained a parent (an edge
 * added to a node that was there); `unlinked`, a node lost one (an edge removed from a node that stays).
 */
export const changeKinds = ["added", "removed", "moved", "renamed", "resized", "linked", "unlinked"] as const;
export type ChangeKind = (typeof changeKinds)[number];

/** The kinds a diff of two trees can have: every kind but the edges of graphs. */
export const treeChangeKinds = changeKinds.slice(0, 5);

/**
 * Kind codes stored per node in a `Uint8Array`: 0 for an unchanged node, else 1 + the kind's position
 * in {@link changeKinds}. A node that is both moved and renamed (or renamed and resized, …) counts
 * under the first of its kinds in that list; its own size change is still reported beside it.
 */
export const KIND = {
  none: 0,
  added: 1,
  removed: 2,
  moved: 3,
  renamed: 4,
  resized: 5,
  linked: 6,
  unlinked: 7,
} as const;

/** Numbers of changed nodes per kind. */
export type ChangeCounts = Record<ChangeKind, number>;

/** The kind word of a code, or null for an unchanged node. */
export function kindName(code: number): ChangeKind | null {
  return code === KIND.none ? null : changeKinds[code - 1];
}

/** Sum of all counts. */
export function totalChanges(c: ChangeCounts): number {
  return c.added + c.removed + c.moved + c.renamed + c.resized + c.linked + c.unlinked;
}

/** Counts of zero for every kind. */
export function noChanges(): ChangeCounts {
  return { added: 0, removed: 0, moved: 0, renamed: 0, resized: 0, linked: 0, unlinked: 0 };
}
