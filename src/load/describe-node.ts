import { type MessagePart, quoted } from "../errors.js";
import type { Names } from "../model/names.js";
import { nodePath } from "./node-path.js";

/**
 * `node "a/b"`, or for a nameless node its place among its siblings: for messages about node `i`. The
 * path is marked as input text (see `quoted`), so `--pseudonymize` can hide it.
 */
export function describeNode(parentOf: ArrayLike<number>, name: Names, i: number): MessagePart[] {
  if (name.get(i) !== "") return ["node ", quoted.path(nodePath(parentOf, name, i))];
  const p = parentOf[i];
  let ordinal = 1;
  for (let k = 0; k < i; k++) if (parentOf[k] === p) ordinal++;
  if (p === -1) return [`top-level node #${ordinal}`];
  return [`child #${ordinal} of node `, quoted.path(nodePath(parentOf, name, p))];
}
