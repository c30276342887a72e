import type { Names } from "../model/names.js";
import { nodePath } from "./node-path.js";

/** `node "a/b"`, or for a nameless node its place among its siblings: for messages about node `i`. */
export function describeNode(parentOf: ArrayLike<number>, name: Names, i: number): string {
  if (name.get(i) !== "") return `node "${nodePath(parentOf, name, i)}"`;
  const p = parentOf[i];
  let ordinal = 1;
  for (let k = 0; k < i; k++) if (parentOf[k] === p) ordinal++;
  if (p === -1) return `top-level node #${ordinal}`;
  return `child #${ordinal} of node "${nodePath(parentOf, name, p)}"`;
}
