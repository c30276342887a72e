import type { PathIndex } from "./path-index.js";
import { pseudonym } from "./pseudonym.js";
import { escapeSegment } from "./segment.js";
import type { Tree } from "./tree.js";

/**
 * How the nodes of one tree are printed: names, paths, row ids and record values, each replaced by its
 * keyed pseudonym under `--pseudonymize` (see pseudonym.ts). Every output, focus suggestion and search
 * goes through this one rule, so none of them shows what another hides.
 */
export interface PrintedNames {
  /** Whether names are pseudonyms (a key is set). */
  readonly pseudonymous: boolean;
  /** Node `i`'s name as printed; a synthetic root (no name in the input) keeps its own. */
  readonly nameOf: (i: number) => string;
  /** Node `i`'s path as printed: what the command line accepts back as a focus. */
  readonly pathOf: (i: number) => string;
  /** Node `i`'s row id as printed; an empty id stays empty; null when rows have no ids. */
  readonly idOf: (i: number) => string | null;
  /** A record field's value as printed; an empty value stays empty. */
  readonly valueOf: (value: string) => string;
}

/** Node `i`'s name as printed with `key` (see {@link PrintedNames.nameOf}), without building any index. */
export function printedNameOf(tree: Tree, key: string | undefined): (i: number) => string {
  if (key === undefined) return (i) => tree.name.get(i);
  return (i) => (i === 0 && tree.syntheticRoot ? tree.name.get(i) : pseudonym(key, tree.name.get(i)));
}

/**
 * The printed names of `tree`, whose paths `index` gives (or builds on first use, when a function: a
 * diff's old version needs paths only for the nodes that moved).
 */
export function printedNames(
  tree: Tree,
  index: PathIndex | (() => PathIndex),
  key: string | undefined,
): PrintedNames {
  const indexOf = typeof index === "function" ? index : () => index;
  const nameOf = printedNameOf(tree, key);
  const ids = tree.ids;
  if (key === undefined) {
    return {
      pseudonymous: false,
      nameOf,
      pathOf: (i) => indexOf().path(i),
      idOf: ids === null ? () => null : (i) => ids.get(i),
      valueOf: (value) => value,
    };
  }
  // One segment function for every path, so the path index's cache of recent paths stays warm.
  const segment = (j: number) => escapeSegment(nameOf(j));
  // An employee number points at a person as surely as the name does: ids are pseudonymised too.
  const hide = (text: string) => (text === "" ? "" : pseudonym(key, text));
  return {
    pseudonymous: true,
    nameOf,
    pathOf: (i) => indexOf().path(i, segment),
    idOf: ids === null ? () => null : (i) => hide(ids.get(i)),
    valueOf: hide,
  };
}
