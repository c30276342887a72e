import type { Tree } from "../../src/model/tree.js";

/** A graph's slots as "  name" (a full entry) or "  &name" (a reference), indented by depth. */
export function slots(tree: Tree): string[] {
  const out: string[] = [];
  for (let i = 0; i < tree.length; i++) {
    const ref = tree.referenceTo?.[i] ?? -1;
    out.push(`${"  ".repeat(tree.depth[i])}${ref === -1 ? "" : "&"}${tree.name.get(i)}`);
  }
  return out;
}
