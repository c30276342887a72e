import type { Tree } from "../../model/tree.js";

/**
 * How many entries a tree read from a path list lists when they are one folder's and nothing else:
 * every node is that folder, above it, or a leaf in it (`du -sb DIR/*`, `du -sb *`, a package
 * inventory such as `dpkg-query -W`), else 0. Such a list's sizes show no unit by their shape (a
 * folder's line among its contents would), so the caller says how they were read. The folder is the
 * last node's parent (nodes are in preorder: its entries come last); the look ends at the first node
 * that is neither, so a listing of folders and their contents costs a few nodes.
 */
export function oneFolderEntries(tree: Tree): number {
  const { length, parent, depth } = tree;
  if (length < 2) return 0;
  const folder = parent[length - 1];
  if (folder === -1) return 0;
  // The folder and the nodes above it, one at each depth.
  const chain = new Int32Array(depth[folder] + 1);
  for (let k = folder; k !== -1; k = parent[k]) chain[depth[k]] = k;
  let entries = 0;
  for (let i = 0; i < length; i++) {
    if (parent[i] === folder) entries++;
    else if (depth[i] > depth[folder] || chain[depth[i]] !== i) return 0;
  }
  return entries;
}
