import type { Tree } from "../../src/model/tree.js";
import { makeTree } from "../helpers/make-tree.js";

/** A tree from the compact notation of `makeTree`, each node's id being its name (names unique). */
export function makeIdTree(spec: string): Tree {
  const tree = makeTree(spec);
  return { ...tree, ids: tree.name };
}
