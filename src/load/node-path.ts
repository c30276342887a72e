import type { Names } from "../model/names.js";

/**
 * The path of node `i` among linked nodes, for error messages: names from the top-level node down,
 * joined by "/", with "~" written "~0" and "/" written "~1" (RFC 6901 escaping, as in focus paths).
 */
export function nodePath(parentOf: ArrayLike<number>, name: Names, i: number): string {
  const parts: string[] = [];
  for (let k = i; k !== -1; k = parentOf[k])
    parts.push(name.get(k).replaceAll("~", "~0").replaceAll("/", "~1"));
  return parts.reverse().join("/");
}
