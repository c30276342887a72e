import { buildTree } from "../../src/model/build-tree.js";
import { namesToArray } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";

/**
 * A tree from compact notation: `R{A{A1,A2},B}`; a size may follow a name as `name:12`.
 * Names may not contain `{`, `}`, `,` or `:` here (tests needing those build LinkedNodes directly).
 */
export function makeTree(spec: string): Tree {
  const parentOf: number[] = [];
  const name: string[] = [];
  const size: number[] = [];
  const stack: number[] = [];
  let hasSizes = false;
  let i = 0;
  let last = -1;
  while (i < spec.length) {
    const ch = spec[i];
    if (ch === "{") {
      stack.push(last);
      i++;
    } else if (ch === "}") {
      stack.pop();
      i++;
    } else if (ch === ",") {
      i++;
    } else {
      let j = i;
      while (j < spec.length && !"{},".includes(spec[j])) j++;
      const [label, sz] = spec.slice(i, j).split(":");
      name.push(label);
      size.push(sz === undefined ? 0 : Number(sz));
      if (sz !== undefined) hasSizes = true;
      parentOf.push(stack.length ? stack[stack.length - 1] : -1);
      last = name.length - 1;
      i = j;
    }
  }
  return buildTree({
    parentOf: Int32Array.from(parentOf),
    name,
    ownSize: Float64Array.from(size),
    hasSizes,
    ids: null,
    origin: Int32Array.from(name.map((_, k) => k + 1)),
    originIsRow: false,
    fields: new Map(),
    rootName: "(root)",
  });
}

/** The node whose name is `label` (names unique in the test tree). */
export function nodeNamed(tree: Tree, label: string): number {
  const i = namesToArray(tree.name).indexOf(label);
  if (i < 0) throw new Error(`no node ${label}`);
  return i;
}
