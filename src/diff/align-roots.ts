import { type Names, PrefixedNames } from "../model/names.js";
import type { Tree } from "../model/tree.js";

/**
 * Puts both versions under the same kind of root: when one version has several top-level nodes (so
 * espalier joined them under a synthetic root) and the other has one, the other is put under a
 * synthetic root too, so that the top-level nodes of both versions match each other. A path list's root
 * that stands for the listed folder (`reading.rootIsStart`: `find .`, an empty path's line) is such a
 * root already: two of them, or one and a synthetic root, are compared as one root, never renamed.
 */
export function alignRoots(oldTree: Tree, newTree: Tree): [Tree, Tree] {
  if (standsForFolder(oldTree) && standsForFolder(newTree)) {
    // Compared root to root; two roots with names take NEW's, as synthetic roots do, so the root is
    // never renamed (a name stays a name: --pseudonymize hides it as any other).
    if (oldTree.syntheticRoot || newTree.syntheticRoot) return [oldTree, newTree];
    return [renamedRoot(oldTree, newTree.name.get(0)), newTree];
  }
  // Two roots named after their inputs (saved summaries of files named apart): one root, as a diff of
  // the inputs, which names both after NEW, compares them.
  if (namedAfterInput(oldTree) && namedAfterInput(newTree))
    return [renamedRoot(oldTree, newTree.name.get(0)), newTree];
  if (oldTree.syntheticRoot === newTree.syntheticRoot) return [oldTree, newTree];
  return oldTree.syntheticRoot
    ? [oldTree, underRoot(newTree, oldTree.name.get(0))]
    : [underRoot(oldTree, newTree.name.get(0)), newTree];
}

/**
 * Whether the root is named after the input though it is the input's own: a nameless top node
 * (`reading.rootNamed`), or a whole document read as values (the root is the document).
 */
function namedAfterInput(tree: Tree): boolean {
  const r = tree.reading;
  if (r === undefined || tree.syntheticRoot) return false;
  return r.rootNamed === "nameless" || (r.shape === "values" && r.startAt === undefined);
}

/** Whether the root stands for the whole input rather than a node of it. */
function standsForFolder(tree: Tree): boolean {
  return tree.syntheticRoot || tree.reading?.rootIsStart === true;
}

function renamedRoot(tree: Tree, name: string): Tree {
  return tree.name.get(0) === name ? tree : { ...tree, name: new RootNamed(name, tree.name) };
}

/** `names` with the root's replaced by `root`. */
class RootNamed implements Names {
  constructor(
    private readonly root: string,
    private readonly names: Names,
  ) {}

  get length(): number {
    return this.names.length;
  }

  get(i: number): string {
    return i === 0 ? this.root : this.names.get(i);
  }
}

/** The same tree one level down, under a new synthetic root named `rootName`. */
export function underRoot(tree: Tree, rootName: string): Tree {
  const n = tree.length + 1;
  const parent = new Int32Array(n);
  const depth = new Int32Array(n);
  parent[0] = -1;
  for (let i = 1; i < n; i++) {
    parent[i] = tree.parent[i - 1] + 1;
    depth[i] = tree.depth[i - 1] + 1;
  }
  const ownSize = new Float64Array(n);
  ownSize.set(tree.ownSize, 1);
  const origin = new Int32Array(n);
  origin.set(tree.origin, 1);
  const fields = new Map<string, string[]>();
  for (const [key, values] of tree.fields) fields.set(key, ["", ...values]);
  return {
    length: n,
    parent,
    depth,
    name: new PrefixedNames(rootName, tree.name),
    ownSize,
    hasSizes: tree.hasSizes,
    ids: tree.ids ? new PrefixedNames("", tree.ids) : null,
    origin,
    originIsRow: tree.originIsRow,
    fields,
    syntheticRoot: true,
    ...(tree.referenceTo ? { referenceTo: shifted(tree.referenceTo) } : {}),
    // How the input was read (its size unit, children field, values reading) and which nodes are empty
    // `{}` or have elided descendants stay the tree's: the new root is none of those.
    ...(tree.reading ? { reading: tree.reading } : {}),
    ...(tree.empty ? { empty: oneDown(new Uint8Array(n), tree.empty) } : {}),
    ...(tree.elided ? { elided: oneDown(new Float64Array(n), tree.elided) } : {}),
  };
}

/** `values` one slot down in `out` (slot 0, the new root, left 0). */
function oneDown<T extends Uint8Array | Float64Array>(out: T, values: T): T {
  out.set(values, 1);
  return out;
}

/** A graph's references one slot down, under the new root (which is no reference). */
function shifted(referenceTo: Int32Array): Int32Array {
  const out = new Int32Array(referenceTo.length + 1);
  out[0] = -1;
  for (let i = 0; i < referenceTo.length; i++) out[i + 1] = referenceTo[i] === -1 ? -1 : referenceTo[i] + 1;
  return out;
}
