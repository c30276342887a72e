/** What is folded under a shown node: its hidden children and everything below them. */
export interface Folded {
  /** Hidden children of this node. */
  children: number;
  /** Nodes in those children's subtrees. */
  nodes: number;
  /** Size in those children's subtrees. */
  size: number;
  /** Graphs only: references (one-line entries of nodes counted elsewhere) among the hidden slots. */
  references?: number;
  /** Nested input with empty entries (`{}`): how many of the hidden nodes are such. */
  empty?: number;
}

/** Graphs only: where the full entry of the node a reference line stands for is. */
export interface ReferenceTo {
  /** Printed path of the full entry (pseudonymised like every path). */
  path: string;
  /** Whether the full entry is an ancestor of the reference: the edge leads back up a cycle. */
  cycle: boolean;
}

/** A shown node, budget-sized and friendly: the input to every renderer. */
export interface ViewNode {
  /** Pre-order index in the loaded tree. */
  index: number;
  name: string;
  /** Re-readable path (see model/segment.ts). */
  path: string;
  /** Row id, when rows have ids. */
  id: string | null;
  /** Text shown for the node (the name, or the label template filled in). */
  label: string;
  interest: number;
  /** Nodes in the subtree, this node included. */
  nodes: number;
  /** Size of the subtree, this node included. */
  size: number;
  focus: boolean;
  /** A focus or an ancestor of one. */
  onPath: boolean;
  /**
   * Distance 0 to a focus (in a diff, to a focus or a change): the node itself is one. Its only child
   * never continues its line (see `lineCost` in fit/select.ts and `lineGroups` in render/).
   */
  anchor: boolean;
  depth: number;
  children: ViewNode[];
  hidden: Folded | null;
  /** Graphs only: set on a reference line (which counts no node and no size). */
  reference?: ReferenceTo;
  /** Graphs only, on a focus with several parents: how many there are, and how many are not shown. */
  parents?: { count: number; hidden: number };
  /** Nested input with empty entries: set on a node whose object had no field at all (`{}`). */
  empty?: true;
  /**
   * Nested input with empty entries: how many there are in the subtree, this node included (so
   * `emptyBelow` = own + shown children's + `hidden.empty` at every shown node).
   */
  emptyBelow?: number;
}
