import { type Importance, importance, importanceOf } from "../interest/importance.js";
import { type Measures, measure } from "../model/measure.js";
import { PathIndex } from "../model/path-index.js";
import type { Tree } from "../model/tree.js";
import type { ChangeCounts } from "./changes.js";
import type { Combined } from "./combine.js";
import type { ChangeMeasures } from "./measure-changes.js";

/** Whole-diff numbers: the root's counts, and both versions' sizes. */
export interface DiffTotals {
  changes: ChangeCounts;
  /** Each version's nodes and size, and how many of its nodes are empty entries (`{}`), when any are. */
  old: { nodes: number; size: number; empty?: number };
  new: { nodes: number; size: number; empty?: number };
  /** Net size change: new size minus old size. */
  delta: number;
  /** Whether the versions were compared as graphs (edges linked and unlinked are kinds of change). */
  graph: boolean;
}

/**
 * Two versions matched and combined once (see `prepareDiff`), so they can be summarised for many foci
 * and budgets. It owns what those summaries share beside: the a-priori importance of each kind asked
 * for, and the old version's path index (for "moved from" notes, built on first use).
 */
export class PreparedDiff {
  readonly combined: Combined;
  readonly measures: Measures;
  readonly changeMeasures: ChangeMeasures;
  readonly index: PathIndex;
  readonly oldTree: Tree;
  readonly totals: DiffTotals;
  private readonly importances = new Map<Importance, Float64Array>();
  private oldPaths: PathIndex | undefined;
  /** Memory no one reads any more, lent to the first importance computed (see `prepareDiff`). */
  private spare: Float64Array | undefined;

  constructor(parts: {
    combined: Combined;
    measures: Measures;
    changeMeasures: ChangeMeasures;
    oldTree: Tree;
    totals: DiffTotals;
    spare?: Float64Array;
  }) {
    this.combined = parts.combined;
    this.measures = parts.measures;
    this.changeMeasures = parts.changeMeasures;
    this.index = new PathIndex(parts.combined.tree, parts.measures);
    this.oldTree = parts.oldTree;
    this.totals = parts.totals;
    this.spare = parts.spare;
  }

  /**
   * The a-priori importance of a node of the combined tree, worked out when asked: what a summary of the
   * diff reads (its interest scores the nodes near the changes and those its fit looks at), where an
   * array of every node is memory touched for the first time, dear on a big tree. The same doubles as
   * {@link importance}'s.
   */
  importanceOf(kind: Importance): (x: number) => number {
    return importanceOf(this.combined.tree, this.measures, kind);
  }

  /** The a-priori importance of every node of the combined tree, computed once per kind. */
  importance(kind: Importance): Float64Array {
    let api = this.importances.get(kind);
    if (!api) {
      api = importance(this.combined.tree, this.measures, kind, this.spare);
      this.spare = undefined;
      this.importances.set(kind, api);
    }
    return api;
  }

  /** The old version's path index, built the first time a shown node needs an old path. */
  oldIndex(): PathIndex {
    this.oldPaths ??= new PathIndex(this.oldTree, measure(this.oldTree));
    return this.oldPaths;
  }
}
