/**
 * What a version's load keeps for the load of a later version read against it (LoadOptions.earlierVersion),
 * by the tree the earlier load built: held no longer than the tree, and taken once.
 */
export class KeptForLater<T> {
  private readonly byTree = new WeakMap<object, T>();

  /** Keeps `kept` for the load of a later version read against `tree`. */
  keep(tree: object, kept: T): void {
    this.byTree.set(tree, kept);
  }

  /** What was kept for `tree`, no longer kept: a later version's load takes it once. */
  take(tree: object): T | undefined {
    const kept = this.byTree.get(tree);
    this.byTree.delete(tree);
    return kept;
  }
}
