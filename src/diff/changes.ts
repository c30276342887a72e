/**
/**
 * The kinds of change a node can have, in precedence order: a node has exactly one kind, or none.
 * `edited`: a field named by `--compare-field` holds another value (see diff/field-edits.ts). The last
 * two are edges of graphs (see diff/graph-changes.ts): `linked`, a node gained a parent (an edge added
 * to a node that was there); `unlinked`, a node lost one (an edge removed from a node that stays).
 */
export const changeKinds = [
  "added",
  "removed",
  "moved",
  "renamed",
  "edited",
  "resized",
  "linked",
  "unlinked",
] as const;
export type ChangeKind = (typeof changeKinds)[number];

/** The kinds a diff of two trees can have: every kind but the edges of graphs. */
export const treeChangeKinds = changeKinds.slice(0, 6);

/**
 * Kind codes stored per node in a `Uint8Array`: 0 for an unchanged node, else 1 + the kind's position
 * in {@link changeKinds}. A node that is both moved and renamed (or renamed and resized, …) counts
 * under the first of its kinds in that list; its own size change and its field edits are still
 * reported beside it.
 */
export const KIND = {
  none: 0,
  added: 1,
  removed: 2,
  moved: 3,
  renamed: 4,
  edited: 5,
  resized: 6,
  linked: 7,
  unlinked: 8,
} as const;

/** Numbers of changed nodes per kind. */
export type ChangeCounts = Record<ChangeKind, number>;

/** The kind word of a code, or null for an unchanged node. */
export function kindName(code: number): ChangeKind | null {
  return code === KIND.none ? null : changeKinds[code - 1];
}

/** Sum of the counts of every kind. */
export function totalChanges(c: ChangeCounts): number {
  let total = 0;
  for (const kind of changeKinds) total += c[kind];
  return total;
}

/** Counts of zero for every kind. */
export function noChanges(): ChangeCounts {
  return { added: 0, removed: 0, moved: 0, renamed: 0, edited: 0, resized: 0, linked: 0, unlinked: 0 };
}
