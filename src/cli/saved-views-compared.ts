import { EspalierError } from "../errors.js";
import type { Tree } from "../model/tree.js";

/**
 * A diff of a version read as a saved summary's view (load/saved-output.ts): SHAPE, as the diff counts
 * each version's nodes one per line of the tree and would not count what a fold's entry stands for,
 * giving totals other than the saved ones. Says what to run instead: the original inputs, or the JSON
 * texts with --read-as values.
 */
export function refuseSavedViews(trees: readonly [Tree, Tree], files: readonly [string, string]): void {
  trees.forEach((tree, k) => {
    if (!tree.reading?.notes?.some((note) => note.code === "SAVED_VIEW")) return;
    throw new EspalierError(
      "SHAPE",
      "this is an espalier summary (espalier-summary/1), read as the view it holds, and espalier diff does not compare saved views: it would count each fold as one node, not as the nodes it hides; diff the original inputs (which a CI job can keep beside the summary), or compare the two JSON texts with --read-as values",
    ).inFile(files[k]);
  });
}
